import { redirect } from '@sveltejs/kit';
import { finishSession } from '$lib/server/auth/requests';
import type { Actions, PageServerLoad } from './$types';

// Signing out is a form post (a link would let any page sign you out); the page itself only offers the button.
export const load: PageServerLoad = async ({ locals }) => {
	if (!locals.user) redirect(303, '/');
	return {};
};

export const actions: Actions = {
	default: async ({ cookies, locals }) => {
		await finishSession(cookies, locals.sessionToken);
		redirect(303, '/');
	}
};
