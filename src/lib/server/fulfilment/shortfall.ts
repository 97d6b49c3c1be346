// A shortfall: a clutch whose alive count fell below what is already sold from it (a
// loss recorded after the sale). Picking takes nothing off by itself, since the sale
// did, so this is the only place the gap shows; it blocks packing the orders it touches
// until a keeper substitutes another clutch or an admin refunds the line.
import { sql, type Kysely } from 'kysely';
import type { Database } from '../db/schema';

/** Orders whose boxes have not gone out: the ones a shortfall can still hurt. */
export const UNSHIPPED_STATES = ['paid', 'scheduled', 'weather_hold', 'packed'] as const;

export interface ClutchShortfall {
	clutchId: number;
	clutchCode: string;
	speciesName: string;
	/** Animals alive in the clutch now. */
	alive: number;
	/** Animals sold from it on paid-or-later, non-cancelled orders, less restocked ones. */
	sold: number;
	/** sold − alive, above 0. */
	short: number;
	/** Unshipped orders with animals from this clutch, oldest first. */
	orders: { orderId: number; orderNumber: string; animals: number }[];
}

/**
 * Every clutch that is short, with the unshipped orders it touches; only clutches in
 * `clutchIds` when given. A clutch whose short orders have all shipped is left out:
 * nothing can be done on a ship day about a box already gone.
 */
export async function clutchShortfalls(
	db: Kysely<Database>,
	options: { clutchIds?: readonly number[] } = {}
): Promise<ClutchShortfall[]> {
	if (options.clutchIds && options.clutchIds.length === 0) return [];
	let sold = db
		.selectFrom('order_line as ol')
		.innerJoin('customer_order as o', 'o.id', 'ol.order_id')
		.select([
			'ol.clutch_id',
			sql<string>`sum((ol.quantity - ol.restocked_quantity) * ol.unit_size)`.as('sold')
		])
		.where('ol.clutch_id', 'is not', null)
		.where('o.state', 'not in', ['cancelled', 'awaiting_payment'])
		.groupBy('ol.clutch_id');
	if (options.clutchIds) sold = sold.where('ol.clutch_id', 'in', options.clutchIds);
	const rows = await db
		.with('sold', () => sold)
		.selectFrom('sold')
		.innerJoin('clutch as c', 'c.id', 'sold.clutch_id')
		.innerJoin('species as s', 's.id', 'c.species_id')
		.select(['c.id', 'c.code', 'c.count_alive', 's.common_name', 's.scientific_name', 'sold.sold'])
		.where(sql<boolean>`sold.sold > c.count_alive`)
		.orderBy('c.code')
		.execute();
	if (rows.length === 0) return [];
	const touched = await db
		.selectFrom('order_line as ol')
		.innerJoin('customer_order as o', 'o.id', 'ol.order_id')
		.select([
			'ol.clutch_id',
			'o.id',
			'o.order_number',
			sql<string>`sum((ol.quantity - ol.restocked_quantity) * ol.unit_size)`.as('animals')
		])
		.where(
			'ol.clutch_id',
			'in',
			rows.map((r) => r.id)
		)
		.where('o.state', 'in', UNSHIPPED_STATES)
		.groupBy(['ol.clutch_id', 'o.id', 'o.order_number'])
		.orderBy('o.id')
		.execute();
	return rows
		.map((row) => {
			const soldCount = Number(row.sold);
			return {
				clutchId: row.id,
				clutchCode: row.code,
				speciesName: `${row.common_name} (${row.scientific_name})`,
				alive: row.count_alive,
				sold: soldCount,
				short: soldCount - row.count_alive,
				orders: touched
					.filter((t) => t.clutch_id === row.id && Number(t.animals) > 0)
					.map((t) => ({ orderId: t.id, orderNumber: t.order_number, animals: Number(t.animals) }))
			};
		})
		.filter((shortfall) => shortfall.orders.length > 0);
}

/** The shortfalls that touch each of the given orders (orders with none are absent). */
export async function shortfallsForOrders(
	db: Kysely<Database>,
	orderIds: readonly number[]
): Promise<Map<number, ClutchShortfall[]>> {
	const byOrder = new Map<number, ClutchShortfall[]>();
	if (orderIds.length === 0) return byOrder;
	const clutches = await db
		.selectFrom('order_line')
		.select('clutch_id')
		.distinct()
		.where('order_id', 'in', orderIds)
		.where('clutch_id', 'is not', null)
		.execute();
	const shortfalls = await clutchShortfalls(db, {
		clutchIds: clutches.map((c) => c.clutch_id as number)
	});
	for (const shortfall of shortfalls)
		for (const order of shortfall.orders)
			if (orderIds.includes(order.orderId))
				byOrder.set(order.orderId, [...(byOrder.get(order.orderId) ?? []), shortfall]);
	return byOrder;
}
