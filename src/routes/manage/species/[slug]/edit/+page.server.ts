import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	speciesFormFromRow,
	speciesFormSchema,
	speciesValuesFromForm
} from '$lib/care/species-schema';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import { getSpeciesBySlug, updateSpecies } from '$lib/server/species/species';
import type { Actions, PageServerLoad } from './$types';

async function speciesOr404(slug: string) {
	const species = await getSpeciesBySlug(getDb(), slug);
	if (!species) error(404, 'No species has that web name.');
	return species;
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const species = await speciesOr404(event.params.slug);
	return {
		species: {
			slug: species.slug,
			commonName: species.common_name,
			scientificName: species.scientific_name
		},
		form: await superValidate(speciesFormFromRow(species), zod4(speciesFormSchema))
	};
};

export const actions: Actions = {
	default: async (event) => {
		const me = requireRole(event, 'keeper');
		const species = await speciesOr404(event.params.slug);
		const form = await superValidate(event.request, zod4(speciesFormSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await updateSpecies(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			species.id,
			speciesValuesFromForm(form.data),
			{ slugTyped: form.data.slug !== '' }
		);
		if (!outcome) error(404, 'That species is no longer recorded.');
		if (!outcome.ok) {
			for (const [field, problem] of Object.entries(outcome.fieldErrors)) {
				setError(form, field as keyof typeof form.data, problem);
			}
			return fail(400, { form });
		}
		redirect(
			303,
			`${resolve('/manage/species/[slug]', { slug: outcome.species.slug })}?saved=edit`
		);
	}
};
