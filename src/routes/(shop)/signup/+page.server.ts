import { fail, redirect } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { signUpSchema } from '$lib/accounts/schemas';
import { origin } from '$lib/server/auth';
import { signUp } from '$lib/server/auth/accounts';
import { passwordProblem } from '$lib/server/auth/passwords';
import { clientAddress, limitProblem } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user) redirect(303, '/account');
	const email = url.searchParams.get('email') ?? '';
	return { form: await superValidate({ email }, zod4(signUpSchema), { errors: false }) };
};

export const actions: Actions = {
	default: async (event) => {
		const form = await superValidate(event.request, zod4(signUpSchema));
		const password = form.data.password;
		form.data.password = '';
		if (!form.valid) return fail(400, { form });
		const weak = passwordProblem(password, [
			form.data.email,
			form.data.name,
			...form.data.email.split('@')
		]);
		if (weak) return setError(form, 'password', weak);
		const tooMany = await limitProblem(event, 'sign_up', form.data.email);
		if (tooMany) return message(form, tooMany, { status: 429 });
		await signUp(getDb(), { ...form.data, password }, origin(), { ip: clientAddress(event) });
		redirect(303, '/signin/check-email?for=signup');
	}
};
