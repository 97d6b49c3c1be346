import { error, fail } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { refundFormSchema, refundRequestOf } from '$lib/orders/refund-form';
import { clientAddress } from '$lib/server/auth/requests';
import {
	refundableCents,
	refundedLinesOf,
	refundOrder,
	refundsOf
} from '$lib/server/payments/refunds';
import { keeperActorWords } from '$lib/orders/timeline';
import { formatCents } from '$lib/format/money';
import { requireRole } from '$lib/server/auth/guard';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { claimsOfOrder } from '$lib/server/claims/claims';
import { keeperOrder } from '$lib/server/orders/keeper';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'keeper');
	const db = getDb();
	const [order, timeZone] = await Promise.all([
		keeperOrder(db, event.params.number.slice(0, 20)),
		resolveShopTimeZone(db, env.SHOP_TIME_ZONE)
	]);
	if (!order) error(404, 'No order has that number.');
	const { id: orderId, user_id, events, ...visible } = order;
	const claims = (await claimsOfOrder(db, orderId)).map((claim) => ({
		id: claim.id,
		state: claim.state,
		filedAt: claim.filedAt,
		dead: claim.lines.reduce((sum, line) => sum + line.deadCount, 0)
	}));
	// Money and refunds are the owner's: a keeper's page never loads them.
	const refunds =
		me.role === 'admin'
			? await (async () => {
					const [refundable, past, taken] = await Promise.all([
						refundableCents(db, order.order_number),
						refundsOf(db, orderId),
						refundedLinesOf(db, orderId)
					]);
					const form = await superValidate(
						{
							lineId: order.lines.map((line) => line.id),
							lineQuantity: order.lines.map(() => ''),
							restock: [],
							amount: '',
							reason: ''
						},
						zod4(refundFormSchema),
						{ errors: false }
					);
					return {
						refundable,
						past,
						lines: order.lines.map((line) => ({
							id: line.id,
							left: line.quantity - (taken.get(line.id)?.refundedQuantity ?? 0),
							restockLeft: line.quantity - (taken.get(line.id)?.restockedQuantity ?? 0)
						})),
						form
					};
				})()
			: null;
	return {
		order: {
			...visible,
			guest: user_id === null,
			events: events.map((e) => ({
				id: e.id,
				fromState: e.fromState,
				toState: e.toState,
				by: keeperActorWords({ ...e, name: e.actorName, email: e.actorEmail }),
				note: e.note,
				at: e.at
			}))
		},
		showMoney: me.role === 'admin',
		claims,
		refunds,
		timeZone
	};
};

export const actions: Actions = {
	refund: async (event) => {
		const me = requireRole(event, 'admin');
		const form = await superValidate(event.request, zod4(refundFormSchema));
		if (!form.valid) return fail(400, { form });
		const request = refundRequestOf(form.data);
		const outcome = await refundOrder(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			{ orderNumber: event.params.number.slice(0, 20), reason: form.data.reason, ...request }
		);
		if (!outcome.ok) {
			if (outcome.field === 'reason') return setError(form, 'reason', outcome.problem);
			if (outcome.field === 'lines') return setError(form, 'lineQuantity._errors', outcome.problem);
			if (outcome.field === 'amountCents') return setError(form, 'amount', outcome.problem);
			return message(form, { ok: false, text: outcome.problem }, { status: 400 });
		}
		const done = await superValidate(
			{
				...form.data,
				lineQuantity: form.data.lineId.map(() => ''),
				restock: [],
				amount: '',
				reason: ''
			},
			zod4(refundFormSchema),
			{ errors: false }
		);
		// The emptied form does not pass the schema (no reason), and message() would answer
		// a 400 for it, which skips the page's reload; the refund went through, so say success.
		done.message = {
			ok: true,
			text: `Refunded ${formatCents(outcome.amountCents)}; the buyer is e-mailed.`
		};
		return { form: done };
	}
};
