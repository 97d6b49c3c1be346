import { error, fail } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { MailQueueUnavailableError } from '$lib/server/mail';
import { listOutgoingMail, resendFailedMail } from '$lib/server/mail/admin';
import type { Actions, PageServerLoad } from './$types';
import { resendFormId, resendSchema } from './resend';
import { logger } from '$lib/server/log';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'admin');
	const db = getDb();
	const [ledger, timeZone] = await Promise.all([
		listOutgoingMail(db),
		resolveShopTimeZone(db, env.SHOP_TIME_ZONE)
	]).catch((cause: unknown) => {
		logger.error({ err: cause }, '[admin/mail] outgoing mail unavailable');
		error(503, 'Outgoing mail cannot be read just now. Check that PostgreSQL is running.');
	});
	const failed = ledger.entries.filter((entry) => entry.status === 'failed');
	const resendForms = Object.fromEntries(
		await Promise.all(
			failed.map(
				async (entry) =>
					[
						entry.id,
						await superValidate({ id: entry.id }, zod4(resendSchema), {
							id: resendFormId(entry.id),
							errors: false
						})
					] as const
			)
		)
	);
	return { ...ledger, timeZone, resendForms };
};

export const actions: Actions = {
	resend: async (event) => {
		const admin = requireRole(event, 'admin');
		// No id option: superforms takes the posted form's own id, so the right row answers.
		const form = await superValidate(event.request, zod4(resendSchema));
		if (!form.valid) return fail(400, { form });
		try {
			const resent = await resendFailedMail(getDb(), form.data.id, {
				userId: admin.id,
				ip: clientAddress(event)
			});
			if (!resent) {
				return message(
					form,
					'That mail is not marked failed any more; the list shows it as it is now.',
					{
						status: 409
					}
				);
			}
			// The row leaves the failed list at once, so the page (not the row) says it worked.
			form.message = `Mail #${resent.id} to ${resent.toAddress} is queued again.`;
			return { form, resent };
		} catch (cause) {
			logger.error({ err: cause }, '[admin/mail] send again failed');
			const reason =
				cause instanceof MailQueueUnavailableError
					? 'The job queue is not running yet, so nothing was changed. Try again in a minute.'
					: 'The mail could not be queued just now, so nothing was changed. Try again in a minute.';
			return message(form, reason, { status: 503 });
		}
	}
};
