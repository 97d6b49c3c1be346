import { fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { linkButtonSchema } from '$lib/waitlist/schemas';
import { clientAddress } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import { waitlistLinks } from '$lib/server/waitlist/app';
import { leaveByToken, peekLeaveLink } from '$lib/server/waitlist/entries';
import type { Actions, PageServerLoad } from './$types';

// Like the confirm link: opening it only shows the page, and the button's POST leaves.
export const load: PageServerLoad = async ({ params }) => {
	return {
		link: await peekLeaveLink(getDb(), waitlistLinks().secret, params.token),
		form: await superValidate(zod4(linkButtonSchema))
	};
};

export const actions: Actions = {
	default: async (event) => {
		const form = await superValidate(event.request, zod4(linkButtonSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await leaveByToken(getDb(), waitlistLinks().secret, event.params.token, {
			userId: event.locals.user?.id ?? null,
			ip: clientAddress(event)
		});
		return outcome.ok ? { form, outcome } : fail(410, { form, outcome });
	}
};
