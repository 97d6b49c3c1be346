// One listing: its fields and tiers, putting it on sale and taking it off, its photos,
// and what it offers now. Every action checks the role and hands the change to
// $lib/server/listings, which locks the rows and checks everything again.
import { error, fail, redirect, type RequestEvent } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { resolve } from '$app/paths';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { speciesChoices } from '$lib/server/clutches/clutches';
import { getDb } from '$lib/server/db';
import {
	editListing,
	getListingPage,
	publishListing,
	withdrawListing,
	type ListingRefusal
} from '$lib/server/listings/listings';
import { listingInputOf, refusedListing, tierRowAction } from '$lib/server/listings/forms';
import { listPhotos } from '$lib/server/uploads/photos';
import {
	listingFormSchema,
	listingStateSchema,
	publishProblem,
	tierRowsOf
} from '$lib/stock/listing-rules';
import type { Actions, PageServerLoad } from './$types';

const LISTING_FORM = 'listing';

function keeper(event: RequestEvent) {
	const user = requireRole(event, 'keeper');
	return { userId: user.id, ip: clientAddress(event) };
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const db = getDb();
	const page = await getListingPage(db, event.params.slug);
	if (!page) error(404, `No listing has the address ${event.params.slug}.`);
	const { listing, clutch } = page;
	const quiet = { errors: false } as const;
	const [{ timeZone }, photos, clutchPhotos, species] = await Promise.all([
		shopClock(db, env.SHOP_TIME_ZONE),
		listPhotos(db, { kind: 'listing', id: listing.id }),
		clutch ? listPhotos(db, { kind: 'clutch', id: clutch.id }) : Promise.resolve([]),
		listing.kind === 'supply' ? speciesChoices(db) : Promise.resolve([])
	]);
	return {
		...page,
		timeZone,
		photos,
		clutchPhotos,
		speciesOptions: species.map((s) => ({
			value: s.id,
			label: `${s.commonName} (${s.scientificName})`
		})),
		// Said beside the sale button before it is pressed; the server checks again on press.
		publishHint:
			listing.state === 'live'
				? null
				: publishProblem({
						kind: listing.kind,
						state: listing.state,
						tierCount: listing.tiers.length,
						unitSize: listing.unitSize,
						clutch: clutch
							? {
									code: clutch.code,
									state: clutch.state,
									pausedReason: clutch.pausedReason,
									countAlive: clutch.countAlive
								}
							: null,
						supplyStock: listing.supplyStock
					}),
		form: await superValidate(
			{
				kind: listing.kind,
				clutchCode: clutch?.code ?? '',
				title: listing.title,
				description: listing.description,
				unitSize: listing.unitSize,
				sex: listing.sex,
				isLive: listing.isLive,
				speciesId: listing.speciesId ?? undefined,
				supplyStock: listing.supplyStock ?? undefined,
				stamp: listing.stamp,
				...tierRowsOf(listing.tiers)
			},
			zod4(listingFormSchema),
			{ id: LISTING_FORM, ...quiet }
		),
		publishForm: await superValidate({ stamp: listing.stamp }, zod4(listingStateSchema), {
			id: 'publish',
			...quiet
		}),
		withdrawForm: await superValidate({ stamp: listing.stamp }, zod4(listingStateSchema), {
			id: 'withdraw',
			...quiet
		})
	};
};

/** A stale refusal also hands back the listing as it is now, so the page shows it. */
function withCurrent<T>(failure: T, refusal: ListingRefusal) {
	if (refusal.notFound) error(404, refusal.problem);
	return refusal.current ? { failure, current: refusal.current } : { failure, current: null };
}

export const actions: Actions = {
	save: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(listingFormSchema), { id: LISTING_FORM });
		if (!form.valid) return fail(400, { form });
		const outcome = await editListing(getDb(), actor, event.params.slug, {
			...listingInputOf(form.data),
			stamp: form.data.stamp
		});
		if (!outcome.ok) {
			const { failure, current } = withCurrent(refusedListing(form, outcome), outcome);
			return current ? fail(400, { form, current }) : failure;
		}
		if (outcome.listing.slug !== event.params.slug)
			redirect(303, resolve('/manage/listings/[slug]', { slug: outcome.listing.slug }));
		form.data = {
			...form.data,
			stamp: outcome.listing.stamp,
			...tierRowsOf(outcome.listing.tiers)
		};
		const changed = Object.keys(outcome.changes).length;
		return message(form, changed ? 'Saved.' : 'Nothing was changed, so nothing was saved.');
	},
	addTier: async (event) => {
		requireRole(event, 'keeper');
		return tierRowAction(event, 'add', LISTING_FORM);
	},
	removeTier: async (event) => {
		requireRole(event, 'keeper');
		return tierRowAction(event, 'remove', LISTING_FORM);
	},
	publish: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(listingStateSchema), { id: 'publish' });
		if (!form.valid) return fail(400, { form });
		const outcome = await publishListing(getDb(), actor, event.params.slug, form.data);
		if (!outcome.ok) {
			const { failure, current } = withCurrent(setError(form, outcome.problem), outcome);
			return current ? fail(400, { form, current }) : failure;
		}
		form.data.stamp = outcome.listing.stamp;
		return message(
			form,
			`On sale: ${outcome.onOffer} ${outcome.onOffer === 1 ? 'unit' : 'units'} on offer now.`
		);
	},
	withdraw: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(listingStateSchema), { id: 'withdraw' });
		if (!form.valid) return fail(400, { form });
		const outcome = await withdrawListing(getDb(), actor, event.params.slug, form.data);
		if (!outcome.ok) {
			const { failure, current } = withCurrent(setError(form, outcome.problem), outcome);
			return current ? fail(400, { form, current }) : failure;
		}
		form.data.stamp = outcome.listing.stamp;
		return message(
			form,
			outcome.clutchState === 'ready'
				? 'Taken off sale. Its clutch is back to ready.'
				: 'Taken off sale.'
		);
	}
};
