import { fail, redirect } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { newPasswordSchema } from '$lib/accounts/schemas';
import { peekResetToken, resetPassword } from '$lib/server/auth/accounts';
import { passwordProblem } from '$lib/server/auth/passwords';
import { clientAddress, startSession } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import type { Actions, PageServerLoad } from './$types';

const problems = {
	expired: 'That reset link has expired: ask for a new one.',
	used: 'That reset link was already used: ask for a new one if you need it.',
	unknown: 'That reset link is not one we sent, or a newer one replaced it.'
} as const;

export const load: PageServerLoad = async ({ params }) => {
	const outcome = await peekResetToken(getDb(), params.token);
	return {
		problem: outcome.ok ? null : problems[outcome.reason],
		form: await superValidate(zod4(newPasswordSchema))
	};
};

export const actions: Actions = {
	default: async (event) => {
		const form = await superValidate(event.request, zod4(newPasswordSchema));
		const password = form.data.password;
		form.data.password = '';
		form.data.confirm = '';
		if (!form.valid) return fail(400, { form });
		const weak = passwordProblem(password);
		if (weak) return setError(form, 'password', weak);
		const outcome = await resetPassword(getDb(), event.params.token, password, {
			ip: clientAddress(event)
		});
		if (!outcome.ok) return setError(form, 'password', problems[outcome.reason]);
		await startSession(event.cookies, outcome.userId, null);
		redirect(303, '/account?changed=password');
	}
};
