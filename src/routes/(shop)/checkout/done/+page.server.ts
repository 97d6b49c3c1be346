// Back from Stripe's pay page: the order as it stands. The webhook may not have come
// yet, so an order still awaiting payment asks Stripe whether the session was paid.
// The session id is the guest's proof; an account's order shows only to its owner.
import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { stripeClient } from '$lib/server/payments/stripe';
import type { PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

export const load: PageServerLoad = async (event) => {
	const sessionId = event.url.searchParams.get('session_id') ?? '';
	if (!/^cs_[A-Za-z0-9_]{8,200}$/.test(sessionId)) error(404, 'There is no such order.');
	const db = getDb();
	const found = await db
		.selectFrom('payment')
		.innerJoin('customer_order', 'customer_order.id', 'payment.order_id')
		.select([
			'customer_order.id',
			'customer_order.order_number',
			'customer_order.user_id',
			'customer_order.state',
			'customer_order.email',
			'customer_order.subtotal_cents',
			'customer_order.shipping_cents',
			'customer_order.total_cents',
			'customer_order.service',
			'customer_order.ship_on',
			'customer_order.created_at',
			'payment.status as payment_status'
		])
		.where('payment.stripe_checkout_session_id', '=', sessionId)
		.executeTakeFirst();
	if (!found) error(404, 'There is no such order.');
	const user = event.locals.user;
	if (found.user_id && found.user_id !== user?.id) {
		error(user ? 403 : 401, 'Sign in with the account that placed this order to see it.');
	}
	const lines = await db
		.selectFrom('order_line')
		.select(['id', 'description', 'quantity', 'line_total_cents'])
		.where('order_id', '=', found.id)
		.orderBy('id')
		.execute();
	// Until the webhook lands, Stripe's word on the session says whether the money came.
	let confirming = false;
	let stripeProblem = false;
	if (found.state === 'awaiting_payment') {
		try {
			const session = await stripeClient().checkout.sessions.retrieve(sessionId);
			confirming = session.payment_status === 'paid';
		} catch (cause) {
			logger.error({ err: cause }, '[checkout/done] session lookup failed');
			stripeProblem = true;
		}
	}
	return {
		order: {
			number: found.order_number,
			state: found.state,
			email: found.email,
			subtotalCents: found.subtotal_cents,
			shippingCents: found.shipping_cents,
			totalCents: found.total_cents,
			service: found.service,
			shipOn: found.ship_on,
			mine: found.user_id !== null
		},
		lines,
		confirming,
		stripeProblem,
		sessionId,
		timeZone: await resolveShopTimeZone(db, env.SHOP_TIME_ZONE)
	};
};
