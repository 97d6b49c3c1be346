// The "check again now" form action the dispatch board and the ship-day page share: a
// keeper runs one order's ship check against today's forecast, which may reschedule it.
import { error, fail, type RequestEvent } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { recheckSchema } from '$lib/shipping/dispatch-forms';
import { requireRole } from '../auth/guard';
import { clientAddress } from '../auth/requests';
import { getDb } from '../db';
import { forecastSource } from '../weather';
import { checkOrder } from './order-checks';
import { logger } from '../log';

export async function recheckAction(event: RequestEvent, page: string) {
	const me = requireRole(event, 'keeper');
	const form = await superValidate(event.request, zod4(recheckSchema));
	if (!form.valid) return fail(400, { form });
	const db = getDb();
	try {
		const outcome = await checkOrder(db, forecastSource(db), form.data.orderId, {
			kind: 'user',
			userId: me.id,
			ip: clientAddress(event)
		});
		return message(form, outcome.message);
	} catch (cause) {
		logger.error({ err: cause }, `[${page}] re-check failed`);
		error(503, 'The ship check could not run just now; nothing was changed.');
	}
}
