import { fail, redirect } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { linkSignInSchema, passwordSignInSchema, safeNext } from '$lib/accounts/schemas';
import { accountLimits, authJsConfig, origin } from '$lib/server/auth';
import { checkPassword } from '$lib/server/auth/accounts';
import { requestSignInLink } from '$lib/server/auth/authjs';
import { limitProblem, startSession } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import type { Actions, PageServerLoad } from './$types';
import { describeFailure, logger } from '$lib/server/log';

export const load: PageServerLoad = async ({ url, locals }) => {
	const next = safeNext(url.searchParams.get('next'));
	if (locals.user) redirect(303, next);
	return {
		passwordForm: await superValidate({ next }, zod4(passwordSignInSchema), {
			id: 'password',
			errors: false
		}),
		linkForm: await superValidate({ next }, zod4(linkSignInSchema), { id: 'link', errors: false })
	};
};

export const actions: Actions = {
	password: async (event) => {
		const form = await superValidate(event.request, zod4(passwordSignInSchema), { id: 'password' });
		const password = form.data.password;
		// Never send the password back to the page.
		form.data.password = '';
		if (!form.valid) return fail(400, { passwordForm: form });
		const tooMany = await limitProblem(event, 'sign_in', form.data.email);
		if (tooMany) return message(form, tooMany, { status: 429 });

		const outcome = await checkPassword(getDb(), form.data.email, password);
		if (!outcome.ok) {
			const text =
				outcome.reason === 'unverified'
					? 'Confirm your e-mail address first: use the link we sent, or sign up again to get a new one.'
					: 'That e-mail and password do not match an account that can sign in.';
			return setError(form, 'password', text);
		}
		await accountLimits().forgetEmail('sign_in', form.data.email);
		await startSession(event.cookies, outcome.user.id, event.locals.sessionToken);
		redirect(303, safeNext(form.data.next));
	},

	link: async (event) => {
		const form = await superValidate(event.request, zod4(linkSignInSchema), { id: 'link' });
		if (!form.valid) return fail(400, { linkForm: form });
		const tooMany = await limitProblem(event, 'sign_in_link', form.data.email);
		if (tooMany) return message(form, tooMany, { status: 429 });
		try {
			await requestSignInLink(
				authJsConfig(),
				origin(),
				form.data.email.toLowerCase(),
				safeNext(form.data.next)
			);
		} catch (failure) {
			// A refused request (a disabled account) looks the same from outside.
			logger.warn(`[auth] sign-in link not sent: ${describeFailure(failure)}`);
		}
		redirect(303, `/signin/check-email?for=link`);
	}
};
