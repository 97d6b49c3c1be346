import { fail } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { profileSchema } from '$lib/accounts/schemas';
import { loadProfile, saveProfile } from '$lib/server/accounts/profile';
import { zipProblem } from '$lib/server/accounts/zip';
import { requireUser } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	const profile = await loadProfile(getDb(), user.id);
	return {
		email: user.email,
		role: user.role,
		passwordChanged: event.url.searchParams.get('changed') === 'password',
		welcome: event.url.searchParams.get('welcome') === '1',
		form: await superValidate(profile, zod4(profileSchema), { errors: false })
	};
};

export const actions: Actions = {
	default: async (event) => {
		const user = requireUser(event);
		const form = await superValidate(event.request, zod4(profileSchema));
		if (!form.valid) return fail(400, { form });
		if (form.data.ship_zip) {
			const problem = zipProblem(form.data.ship_zip, form.data.ship_state);
			if (problem) return setError(form, 'ship_zip', problem);
		}
		await saveProfile(getDb(), user.id, form.data, clientAddress(event));
		return message(form, 'Saved.');
	}
};
