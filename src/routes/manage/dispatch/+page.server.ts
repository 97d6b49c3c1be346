import { fail } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { overrideSchema, recheckSchema } from '$lib/shipping/dispatch-forms';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { loadDispatchBoard } from '$lib/server/shipping/dispatch';
import { overrideShipCheck } from '$lib/server/shipping/order-checks';
import { recheckAction } from '$lib/server/shipping/recheck-action';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const db = getDb();
	const [{ timeZone, today }, board] = await Promise.all([
		shopClock(db, env.SHOP_TIME_ZONE),
		loadDispatchBoard(db)
	]);
	const all = [
		...board.held,
		...board.scheduled.flatMap((group) => group.orders),
		...board.unchecked
	];
	// One pair of forms per order, each with its own id so their results stay apart.
	const forms = Object.fromEntries(
		await Promise.all(
			all.map(
				async (order) =>
					[
						order.id,
						{
							recheck: await superValidate({ orderId: order.id }, zod4(recheckSchema), {
								id: `recheck-${order.id}`,
								errors: false
							}),
							override: await superValidate(
								{
									orderId: order.id,
									decision: order.state === 'weather_hold' ? 'ship' : 'hold',
									shipDate: order.shipOn ?? '',
									reason: ''
								},
								zod4(overrideSchema),
								{ id: `override-${order.id}`, errors: false }
							)
						}
					] as const
			)
		)
	);
	return { board, forms, timeZone, today };
};

export const actions: Actions = {
	recheck: (event) => recheckAction(event, 'dispatch'),
	override: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(overrideSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await overrideShipCheck(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			form.data.orderId,
			form.data.decision === 'ship'
				? { decision: 'ship', shipDate: form.data.shipDate, reason: form.data.reason }
				: { decision: 'hold', reason: form.data.reason }
		);
		if (!outcome.ok) return setError(form, outcome.field, outcome.problem);
		return message(form, 'Override saved; the order moved and the audit log has your reason.');
	}
};
