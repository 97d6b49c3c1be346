import { fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { newSpeciesForm, speciesFormSchema, speciesValuesFromForm } from '$lib/care/species-schema';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import { createSpecies } from '$lib/server/species/species';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	// Start from the common-practice defaults without showing their errors yet.
	return {
		form: await superValidate(newSpeciesForm(), zod4(speciesFormSchema), { errors: false })
	};
};

export const actions: Actions = {
	default: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(speciesFormSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await createSpecies(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			speciesValuesFromForm(form.data),
			{ slugTyped: form.data.slug !== '' }
		);
		if (!outcome.ok) {
			for (const [field, problem] of Object.entries(outcome.fieldErrors)) {
				setError(form, field as keyof typeof form.data, problem);
			}
			return fail(400, { form });
		}
		redirect(303, `${resolve('/manage/species/[slug]', { slug: outcome.species.slug })}?saved=new`);
	}
};
