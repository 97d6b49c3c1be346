import { fail } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { env } from '$env/dynamic/private';
import { profileSchema } from '$lib/accounts/schemas';
import { leaveEntrySchema, leaveFormId } from '$lib/waitlist/schemas';
import { loadProfile, saveProfile } from '$lib/server/accounts/profile';
import { zipProblem } from '$lib/server/accounts/zip';
import { requireUser } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import {
	customerAllowsWaitlistMail,
	leaveAsCustomer,
	listCustomerEntries
} from '$lib/server/waitlist/entries';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	const db = getDb();
	const [profile, waitlists, waitlistMailAllowed, timeZone] = await Promise.all([
		loadProfile(db, user.id),
		listCustomerEntries(db, user),
		customerAllowsWaitlistMail(db, user.id),
		resolveShopTimeZone(db, env.SHOP_TIME_ZONE)
	]);
	const waitlistLeaveForms = Object.fromEntries(
		await Promise.all(
			waitlists.map(
				async (entry) =>
					[
						entry.id,
						await superValidate({ entryId: entry.id }, zod4(leaveEntrySchema), {
							id: leaveFormId(entry.id),
							errors: false
						})
					] as const
			)
		)
	);
	return {
		email: user.email,
		role: user.role,
		passwordChanged: event.url.searchParams.get('changed') === 'password',
		welcome: event.url.searchParams.get('welcome') === '1',
		form: await superValidate(profile, zod4(profileSchema), { errors: false }),
		waitlists,
		waitlistLeaveForms,
		waitlistMailAllowed,
		timeZone
	};
};

export const actions: Actions = {
	profile: async (event) => {
		const user = requireUser(event);
		const form = await superValidate(event.request, zod4(profileSchema));
		if (!form.valid) return fail(400, { form });
		if (form.data.ship_zip) {
			const problem = zipProblem(form.data.ship_zip, form.data.ship_state);
			if (problem) return setError(form, 'ship_zip', problem);
		}
		await saveProfile(getDb(), user.id, form.data, clientAddress(event));
		return message(form, 'Saved.');
	},
	leaveWaitlist: async (event) => {
		const user = requireUser(event);
		// No id option: superforms takes the posted form's own id, so the right row answers.
		const form = await superValidate(event.request, zod4(leaveEntrySchema));
		if (!form.valid) return fail(400, { form });
		const result = await leaveAsCustomer(getDb(), user, form.data.entryId, {
			userId: user.id,
			ip: clientAddress(event)
		});
		if (!result.ok) {
			return message(
				form,
				'That waitlist entry was gone already; the list shows it as it is now.',
				{
					status: 404
				}
			);
		}
		return { form, left: { commonName: result.species.commonName } };
	}
};
