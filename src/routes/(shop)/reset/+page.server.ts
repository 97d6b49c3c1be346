import { fail, redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { resetRequestSchema } from '$lib/accounts/schemas';
import { origin } from '$lib/server/auth';
import { requestPasswordReset } from '$lib/server/auth/accounts';
import { limitProblem } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => ({
	form: await superValidate(zod4(resetRequestSchema))
});

export const actions: Actions = {
	default: async (event) => {
		const form = await superValidate(event.request, zod4(resetRequestSchema));
		if (!form.valid) return fail(400, { form });
		const tooMany = await limitProblem(event, 'reset', form.data.email);
		if (tooMany) return message(form, tooMany, { status: 429 });
		await requestPasswordReset(getDb(), form.data.email, origin());
		redirect(303, '/signin/check-email?for=reset');
	}
};
