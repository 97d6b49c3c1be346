import { fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { env } from '$env/dynamic/private';
import { linkButtonSchema } from '$lib/waitlist/schemas';
import { clientAddress } from '$lib/server/auth/requests';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { confirmByToken, peekConfirmLink } from '$lib/server/waitlist/entries';
import type { Actions, PageServerLoad } from './$types';

// Opening the link only shows the page; the entry is confirmed by the button's POST, so a
// mail scanner that follows every link confirms nothing.
export const load: PageServerLoad = async ({ params }) => {
	const db = getDb();
	return {
		link: await peekConfirmLink(db, params.token),
		timeZone: await resolveShopTimeZone(db, env.SHOP_TIME_ZONE),
		form: await superValidate(zod4(linkButtonSchema))
	};
};

export const actions: Actions = {
	default: async (event) => {
		const form = await superValidate(event.request, zod4(linkButtonSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await confirmByToken(getDb(), event.params.token, {
			userId: event.locals.user?.id ?? null,
			ip: clientAddress(event)
		});
		return outcome.ok ? { form, outcome } : fail(410, { form, outcome });
	}
};
