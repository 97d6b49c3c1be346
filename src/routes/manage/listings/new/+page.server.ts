// A new listing: first what it sells (a ready clutch, or a supply from the shelf, chosen
// by a link so it works without JavaScript), then its words, unit and prices. It is
// saved as a draft; photos and going live happen on its own page.
import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { resolve } from '$app/paths';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { speciesChoices } from '$lib/server/clutches/clutches';
import { getDb } from '$lib/server/db';
import {
	clutchForListing,
	createListing,
	listableClutches,
	type ClutchForListing
} from '$lib/server/listings/listings';
import { listingInputOf, refusedListing, tierRowAction } from '$lib/server/listings/forms';
import { listPhotos } from '$lib/server/uploads/photos';
import {
	draftFromClutchProblem,
	listingFormSchema,
	newTierRows,
	suggestedDescription,
	suggestedTitle
} from '$lib/stock/listing-rules';
import type { Actions, PageServerLoad } from './$types';

/** What the address asks to list: a clutch by its code, a supply, or nothing yet. */
function chosen(url: URL): { kind: 'animal'; code: string } | { kind: 'supply' } | null {
	const code = url.searchParams.get('clutch')?.trim();
	if (code) return { kind: 'animal', code: code.slice(0, 40) };
	if (url.searchParams.get('kind') === 'supply') return { kind: 'supply' };
	return null;
}

async function chooser(problem: string | null) {
	return {
		mode: 'choose' as const,
		problem,
		clutches: await listableClutches(getDb())
	};
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const db = getDb();
	const choice = chosen(event.url);
	if (!choice) return chooser(null);

	if (choice.kind === 'supply') {
		const species = await speciesChoices(db);
		return {
			mode: 'supply' as const,
			speciesOptions: species.map((s) => ({
				value: s.id,
				label: `${s.commonName} (${s.scientificName})`
			})),
			form: await superValidate(
				{ kind: 'supply', isLive: false, unitSize: 1, sex: 'unsexed', ...newTierRows() },
				zod4(listingFormSchema),
				{ errors: false }
			)
		};
	}

	const clutch: ClutchForListing | null = await clutchForListing(db, choice.code);
	if (!clutch) return chooser(`No clutch has the code ${choice.code}.`);
	const problem = draftFromClutchProblem(clutch.state, clutch.code);
	if (problem) return chooser(problem);
	return {
		mode: 'clutch' as const,
		clutch,
		clutchPhotos: await listPhotos(db, { kind: 'clutch', id: clutch.id }),
		form: await superValidate(
			{
				kind: 'animal',
				clutchCode: clutch.code,
				title: suggestedTitle({
					commonName: clutch.species.commonName,
					scientificName: clutch.species.scientificName,
					stage: clutch.stage,
					unitSize: 1,
					sex: 'unsexed'
				}),
				description: suggestedDescription({
					generation: clutch.generation,
					stage: clutch.stage,
					clutchCode: clutch.code,
					animalGroup: clutch.species.animalGroup
				}),
				unitSize: 1,
				sex: 'unsexed',
				isLive: true,
				...newTierRows()
			},
			zod4(listingFormSchema),
			{ errors: false }
		)
	};
};

export const actions: Actions = {
	create: async (event) => {
		const user = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(listingFormSchema));
		if (!form.valid) return fail(400, { form });
		const input = listingInputOf(form.data);
		const outcome = await createListing(
			getDb(),
			{ userId: user.id, ip: clientAddress(event) },
			form.data.kind === 'animal'
				? { ...input, kind: 'animal', clutchCode: form.data.clutchCode }
				: { ...input, kind: 'supply' }
		);
		if (!outcome.ok) return refusedListing(form, outcome);
		redirect(303, `${resolve('/manage/listings/[slug]', { slug: outcome.listing.slug })}?made=1`);
	},
	addTier: async (event) => {
		requireRole(event, 'keeper');
		return tierRowAction(event, 'add');
	},
	removeTier: async (event) => {
		requireRole(event, 'keeper');
		return tierRowAction(event, 'remove');
	}
};
