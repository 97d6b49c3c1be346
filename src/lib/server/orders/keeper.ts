// The back office's view of orders: a filtered list, newest first, in pages, and one
// order in full. Callers check the keeper role before calling.
import { sql } from 'kysely';
import { handedOverBox } from '$lib/server/fulfilment/tracking-view';
import type { Db } from '$lib/server/db';
import { ORDER_PAGE_SIZE, type OrderListFilters } from '$lib/orders/list-filters';
import { latestShipCheck, orderTimeline } from './history';

/** `%` and `_` typed into the search box are literal characters, not wildcards. */
function likeContaining(text: string): string {
	return `%${text.replace(/[\\%_]/g, (char) => `\\${char}`)}%`;
}

export async function listOrders(db: Db, filters: OrderListFilters, timeZone: string) {
	// "Placed" dates are the shop's calendar days, not UTC ones.
	const placedOn = sql<string>`(o.created_at at time zone ${timeZone})::date`;
	let query = db.selectFrom('customer_order as o');
	if (filters.state) query = query.where('o.state', '=', filters.state);
	if (filters.service) query = query.where('o.service', '=', filters.service);
	if (filters.q) {
		const pattern = likeContaining(filters.q);
		query = query.where((eb) =>
			eb.or([eb('o.order_number', 'ilike', pattern), eb('o.email', 'ilike', pattern)])
		);
	}
	if (filters.from) query = query.where(placedOn, '>=', sql<string>`${filters.from}::date`);
	if (filters.to) query = query.where(placedOn, '<=', sql<string>`${filters.to}::date`);

	const [rows, counted] = await Promise.all([
		query
			.select([
				'o.order_number',
				'o.created_at',
				'o.email',
				'o.ship_city',
				'o.ship_state',
				'o.ship_zip',
				'o.service',
				'o.state',
				'o.ship_on',
				'o.total_cents'
			])
			.orderBy('o.created_at', 'desc')
			.orderBy('o.id', 'desc')
			.limit(ORDER_PAGE_SIZE)
			.offset((filters.page - 1) * ORDER_PAGE_SIZE)
			.execute(),
		query.select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow()
	]);
	const total = Number(counted.n);
	return {
		rows,
		total,
		page: filters.page,
		pages: Math.max(1, Math.ceil(total / ORDER_PAGE_SIZE))
	};
}

export type OrderListPage = Awaited<ReturnType<typeof listOrders>>;

/** One order with its lines, history and latest ship check, or null for an unknown number. */
export async function keeperOrder(db: Db, orderNumber: string) {
	const order = await db
		.selectFrom('customer_order')
		.select([
			'id',
			'order_number',
			'user_id',
			'email',
			'state',
			'service',
			'subtotal_cents',
			'shipping_cents',
			'total_cents',
			'paid_cents',
			'refunded_cents',
			'ship_on',
			'delivered_at',
			'terms_accepted_at',
			'created_at',
			'ship_name',
			'ship_line1',
			'ship_line2',
			'ship_city',
			'ship_state',
			'ship_zip'
		])
		.where('order_number', '=', orderNumber)
		.executeTakeFirst();
	if (!order) return null;
	const [lines, events, shipCheck, tracking] = await Promise.all([
		db
			.selectFrom('order_line')
			.select([
				'id',
				'description',
				'quantity',
				'unit_size',
				'sex',
				'line_total_cents',
				'is_live',
				'restocked_quantity'
			])
			.where('order_id', '=', order.id)
			.orderBy('id')
			.execute(),
		orderTimeline(db, order.id),
		latestShipCheck(db, order.id),
		handedOverBox(db, order.id)
	]);
	return { ...order, lines, events, shipCheck, tracking };
}
