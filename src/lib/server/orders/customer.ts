// A customer's own orders. Every query is scoped to the signed-in user, so
// somebody else's order number finds nothing (and the page answers 404).
import type { Kysely } from 'kysely';
import type { Database } from '../db/schema';
import { customerActorWords } from '$lib/orders/timeline';
import { latestShipCheck, orderTimeline } from './history';

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
	const [lines, events, shipCheck] = await Promise.all([
		db
			.selectFrom('order_line')
			.select(['id', 'description', 'quantity', 'unit_size', 'line_total_cents', 'is_live'])
			.where('order_id', '=', order.id)
			.orderBy('id')
			.execute(),
		orderTimeline(db, order.id),
		latestShipCheck(db, order.id)
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
	return { ...visible, lines, events: history, shipCheck };
}
