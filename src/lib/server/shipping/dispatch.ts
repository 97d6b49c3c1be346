// The dispatch board's read model: every paid order not yet packed, with its latest
// ship check, live line summary and destination, in ship-date order.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type { OrderState, Pack, Service } from '$lib/server/db/schema';
import type { Reason } from '$lib/shipping/ship-check';
import type { IsoDate } from '$lib/format/dates';

export interface DispatchOrder {
	id: number;
	orderNumber: string;
	state: Extract<OrderState, 'paid' | 'scheduled' | 'weather_hold'>;
	service: Service;
	shipOn: IsoDate | null;
	shipTo: { name: string; city: string; state: string; zip: string };
	lines: { description: string; quantity: number; isLive: boolean }[];
	check: {
		decision: 'ship' | 'hold';
		shipDate: IsoDate | null;
		deliveryDate: IsoDate | null;
		recheckDate: IsoDate | null;
		packs: Pack[];
		facilityPickup: boolean;
		reasons: Reason[];
		checkedAt: Date;
		overrideReason: string | null;
	} | null;
}

export interface DispatchBoard {
	held: DispatchOrder[];
	/** Scheduled orders grouped by ship date, earliest first. */
	scheduled: { shipOn: IsoDate; orders: DispatchOrder[] }[];
	unchecked: DispatchOrder[];
}

const BOARD_STATES = ['paid', 'scheduled', 'weather_hold'] as const;

/** jsonb arrives parsed; anything not shaped like a reason is dropped rather than shown. */
export function asReasons(value: unknown): Reason[] {
	if (!Array.isArray(value)) return [];
	return value.filter(
		(item): item is Reason =>
			typeof item === 'object' &&
			item !== null &&
			typeof (item as Reason).rule === 'string' &&
			typeof (item as Reason).date === 'string'
	);
}

export async function loadDispatchBoard(db: Db): Promise<DispatchBoard> {
	const rows = await db
		.selectFrom('customer_order as o')
		.leftJoinLateral(
			(eb) =>
				eb
					.selectFrom('ship_check')
					.selectAll()
					.whereRef('ship_check.order_id', '=', 'o.id')
					.orderBy('checked_at', 'desc')
					.orderBy('id', 'desc')
					.limit(1)
					.as('c'),
			(join) => join.onTrue()
		)
		.select([
			'o.id',
			'o.order_number',
			'o.state',
			'o.service',
			'o.ship_on',
			'o.ship_name',
			'o.ship_city',
			'o.ship_state',
			'o.ship_zip',
			'c.decision',
			'c.ship_date',
			'c.delivery_date',
			'c.recheck_date',
			'c.packs',
			'c.facility_pickup',
			'c.reasons',
			'c.checked_at',
			'c.override_reason'
		])
		.where('o.state', 'in', BOARD_STATES)
		.orderBy(sql`o.ship_on nulls last`)
		.orderBy('o.created_at')
		.execute();
	const lines =
		rows.length === 0
			? []
			: await db
					.selectFrom('order_line')
					.select(['order_id', 'description', 'quantity', 'is_live'])
					.where(
						'order_id',
						'in',
						rows.map((row) => row.id)
					)
					.orderBy('order_id')
					.orderBy('id')
					.execute();
	const orders: DispatchOrder[] = rows.map((row) => ({
		id: row.id,
		orderNumber: row.order_number,
		state: row.state as DispatchOrder['state'],
		service: row.service,
		shipOn: row.ship_on,
		shipTo: { name: row.ship_name, city: row.ship_city, state: row.ship_state, zip: row.ship_zip },
		lines: lines
			.filter((line) => line.order_id === row.id)
			.map((line) => ({
				description: line.description,
				quantity: line.quantity,
				isLive: line.is_live
			})),
		check:
			row.decision && row.checked_at
				? {
						decision: row.decision,
						shipDate: row.ship_date,
						deliveryDate: row.delivery_date,
						recheckDate: row.recheck_date,
						packs: row.packs ?? [],
						facilityPickup: row.facility_pickup ?? false,
						reasons: asReasons(row.reasons),
						checkedAt: row.checked_at,
						overrideReason: row.override_reason
					}
				: null
	}));
	const scheduled = new Map<IsoDate, DispatchOrder[]>();
	for (const order of orders)
		if (order.state === 'scheduled' && order.shipOn)
			scheduled.set(order.shipOn, [...(scheduled.get(order.shipOn) ?? []), order]);
	return {
		held: orders.filter((order) => order.state === 'weather_hold'),
		scheduled: [...scheduled].map(([shipOn, list]) => ({ shipOn, orders: list })),
		unchecked: orders.filter(
			(order) => order.state === 'paid' || (order.state === 'scheduled' && !order.shipOn)
		)
	};
}
