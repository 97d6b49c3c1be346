// A customer's own orders. Every query is scoped to the signed-in user, so
// somebody else's order number finds nothing (and the page answers 404).
import type { Kysely } from 'kysely';
import type { Database } from '../db/schema';
import { customerActorWords } from '$lib/orders/timeline';
import { claimsOfOrder } from '../claims/claims';
import { handedOverBox } from '../fulfilment/tracking-view';
import { claimAvailability } from '$lib/claims/window';
import { resolveShopTimeZone } from '../backoffice/settings';
import type { Db } from '$lib/server/db';
import { claimWindowHours, latestShipCheck, orderTimeline } from './history';

export async function listOwnOrders(db: Kysely<Database>, userId: string) {
	return db
		.selectFrom('customer_order')
		.select(['order_number', 'state', 'service', 'total_cents', 'ship_on', 'created_at'])
		.where('user_id', '=', userId)
		.orderBy('created_at', 'desc')
		.orderBy('id', 'desc')
		.limit(200)
		.execute();
}

export async function ownOrder(db: Kysely<Database>, userId: string, orderNumber: string) {
	const order = await db
		.selectFrom('customer_order')
		.select([
			'id',
			'order_number',
			'state',
			'service',
			'subtotal_cents',
			'shipping_cents',
			'total_cents',
			'refunded_cents',
			'ship_on',
			'delivered_at',
			'created_at',
			'ship_name',
			'ship_line1',
			'ship_line2',
			'ship_city',
			'ship_state',
			'ship_zip'
		])
		.where('order_number', '=', orderNumber)
		.where('user_id', '=', userId)
		.executeTakeFirst();
	if (!order) return null;
	const [lines, events, shipCheck, claims, tracking] = await Promise.all([
		db
			.selectFrom('order_line')
			.select(['id', 'description', 'quantity', 'unit_size', 'line_total_cents', 'is_live'])
			.where('order_id', '=', order.id)
			.orderBy('id')
			.execute(),
		orderTimeline(db, order.id),
		latestShipCheck(db, order.id),
		claimsOfOrder(db, order.id),
		handedOverBox(db, order.id)
	]);
	const { id: _id, ...visible } = order;
	// Staff names and e-mails stay on the server: the customer reads "the shop", "payment", "you".
	const history = events.map((event) => ({
		id: event.id,
		fromState: event.fromState,
		toState: event.toState,
		by: customerActorWords(event, userId),
		note: event.note,
		at: event.at
	}));
	return { ...visible, lines, events: history, shipCheck, claims, tracking };
}

/**
 * A customer's order with what its page needs around it: the shop's zone, the claim
 * window and whether a claim can be filed now. Null when the order is not theirs.
 */
export async function ownOrderWithClaimWindow(
	db: Db,
	userId: string,
	orderNumber: string,
	zoneFallback: string | undefined,
	now: Date = new Date()
) {
	const order = await ownOrder(db, userId, orderNumber);
	if (!order) return null;
	const [timeZone, windowHours] = await Promise.all([
		resolveShopTimeZone(db, zoneFallback),
		claimWindowHours(db)
	]);
	const availability = claimAvailability(
		{
			state: order.state,
			deliveredAt: order.delivered_at ? new Date(order.delivered_at) : null,
			hasLive: order.lines.some((line) => line.is_live),
			hasOpenClaim: order.claims.some((claim) => claim.state === 'open')
		},
		now,
		windowHours,
		timeZone
	);
	return { order, timeZone, windowHours, availability };
}
