// The ship-day read model: for one date, the boxes to pack, the boxes packed and waiting
// for the carrier, and the boxes already handed over; the pick list for what is still
// to pack; clutches that are short; and, for today or later, each box's ship check run
// again against the current forecast (nothing is written: a keeper re-checks to act).
import { sql, type Kysely } from 'kysely';
import { checkChange, type CheckChange } from '$lib/fulfilment/check-change';
import { buildPickList, type PickList } from '$lib/fulfilment/pick-list';
import type { IsoDate } from '$lib/format/dates';
import type { Database, OrderState, Pack, Service } from '../db/schema';
import type { ForecastSource } from '../weather/source';
import { rememberingSource } from '../shipping/inputs';
import { latestShipCheck, previewShipCheck } from '../shipping/order-checks';
import { shortfallsForOrders, type ClutchShortfall } from './shortfall';

export interface ShipDayLine {
	id: number;
	description: string;
	quantity: number;
	unitSize: number;
	animals: number;
	isLive: boolean;
	clutchId: number | null;
	clutchCode: string | null;
	speciesName: string | null;
	stage: string | null;
}

export interface ShipDayOrder {
	id: number;
	orderNumber: string;
	state: Extract<OrderState, 'scheduled' | 'packed' | 'shipped' | 'delivered'>;
	service: Service;
	shipTo: { name: string; city: string; state: string; zip: string };
	lines: ShipDayLine[];
	/** From the ship check the order was scheduled (or packed) on. */
	packs: Pack[];
	facilityPickup: boolean;
	deliveryDate: IsoDate | null;
	/** What the forecast says now, when it differs; only looked at for boxes not yet gone. */
	change: CheckChange | null;
	/** The forecast could not be reached: the box must not go out on the old check unseen. */
	checkUnavailable: string | null;
	shortfalls: ClutchShortfall[];
	shipment: {
		carrier: string;
		trackingNumber: string | null;
		packedAt: Date | null;
		shippedAt: Date | null;
		expectedDeliveryOn: IsoDate | null;
		deliveredAt: Date | null;
	} | null;
}

export interface ShipDay {
	date: IsoDate;
	toPack: ShipDayOrder[];
	packed: ShipDayOrder[];
	shipped: ShipDayOrder[];
	pickList: PickList;
	/** Clutches short for this day's unshipped boxes. */
	shortfalls: ClutchShortfall[];
}

/**
 * The box's ship check run again now from its ship day, against what it was scheduled
 * (or packed) with; `unavailable` says why when the forecast could not be read.
 */
export async function lookAgainAt(
	db: Kysely<Database>,
	source: ForecastSource,
	box: {
		service: Service;
		shipZip: string;
		shipOn: IsoDate;
		scheduled: { packs: readonly Pack[]; facilityPickup: boolean };
	}
): Promise<{ change: CheckChange | null; unavailable: string | null }> {
	try {
		const fresh = await previewShipCheck(db, source, {
			service: box.service,
			destinationZip: box.shipZip,
			firstDate: box.shipOn
		});
		return {
			change: checkChange({ shipOn: box.shipOn, ...box.scheduled }, fresh),
			unavailable: null
		};
	} catch (failure) {
		return {
			change: null,
			unavailable: failure instanceof Error ? failure.message : 'The forecast could not be read.'
		};
	}
}

/** How many boxes' checks run at once: a day's distinct ZIPs, without flooding the forecast service. */
const CHECKS_AT_ONCE = 16;

/** Whether each given order's check changed since it was scheduled, as the ship-day page shows it. */
export async function changedChecks(
	db: Kysely<Database>,
	source: ForecastSource,
	orderIds: readonly number[],
	today: IsoDate
): Promise<Map<number, CheckChange | null>> {
	const changes = new Map<number, CheckChange | null>();
	if (orderIds.length === 0) return changes;
	// Every box asks for the shop's own forecast: fetch it (and each ZIP's) once.
	const forecasts = rememberingSource(source);
	const rows = await db
		.selectFrom('customer_order as o')
		.select([
			'o.id',
			'o.service',
			'o.ship_zip',
			'o.ship_on',
			(eb) =>
				eb
					.exists(
						eb
							.selectFrom('order_line')
							.select('id')
							.whereRef('order_line.order_id', '=', 'o.id')
							.where('is_live', '=', true)
					)
					.as('live')
		])
		.where('o.id', 'in', orderIds)
		.where('o.state', '=', 'scheduled')
		.execute();
	// Boxes side by side, a few at a time: with the forecast service slow, one box after another
	// would keep the keeper waiting its timeout once per destination, and the page would hang.
	const checkOne = async (row: (typeof rows)[number]) => {
		if (!row.live || !row.ship_on || row.ship_on < today) {
			changes.set(row.id, null);
			return;
		}
		const check = await latestShipCheck(db, row.id);
		const fresh = await lookAgainAt(db, forecasts, {
			service: row.service,
			shipZip: row.ship_zip,
			shipOn: row.ship_on,
			scheduled: {
				packs: check?.decision === 'ship' ? check.packs : [],
				facilityPickup: check?.decision === 'ship' ? check.facilityPickup : false
			}
		});
		// A forecast that cannot be read counts as changed: the keeper confirms, never the server.
		changes.set(
			row.id,
			fresh.change ??
				(fresh.unavailable
					? {
							kind: 'hold',
							summary: `The forecast could not be read: ${fresh.unavailable}`,
							reasons: []
						}
					: null)
		);
	};
	for (let start = 0; start < rows.length; start += CHECKS_AT_ONCE)
		await Promise.all(rows.slice(start, start + CHECKS_AT_ONCE).map(checkOne));
	return changes;
}

/** Overnight boxes first (they go first), then two-day, then by order number. */
const SERVICE_ORDER: Record<Service, number> = { overnight: 0, two_day: 1 };

/**
 * The day's boxes. `source` and `today` make the fresh look at the forecast; pass no
 * source to skip it (a past day, or a page that only lists).
 */
export async function loadShipDay(
	db: Kysely<Database>,
	date: IsoDate,
	options: { source?: ForecastSource; today: IsoDate; timeZone: string }
): Promise<ShipDay> {
	const rows = await db
		.selectFrom('customer_order as o')
		.leftJoin('shipment as s', 's.order_id', 'o.id')
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
			's.carrier',
			's.tracking_number',
			's.packed_at',
			's.shipped_at',
			's.expected_delivery_on',
			's.delivered_at',
			's.packs as shipment_packs'
		])
		.where((eb) =>
			eb.or([
				eb.and([eb('o.state', 'in', ['scheduled', 'packed']), eb('o.ship_on', '=', date)]),
				eb.and([
					eb('o.state', 'in', ['shipped', 'delivered']),
					eb(sql<string>`(s.shipped_at at time zone ${options.timeZone})::date`, '=', date)
				])
			])
		)
		.execute();
	rows.sort(
		(a, b) =>
			SERVICE_ORDER[a.service] - SERVICE_ORDER[b.service] ||
			a.order_number.localeCompare(b.order_number, 'en', { numeric: true })
	);
	const ids = rows.map((r) => r.id);
	const lines =
		ids.length === 0
			? []
			: await db
					.selectFrom('order_line as l')
					.leftJoin('clutch as c', 'c.id', 'l.clutch_id')
					.leftJoin('species as sp', 'sp.id', 'l.species_id')
					.select([
						'l.id',
						'l.order_id',
						'l.description',
						'l.quantity',
						'l.unit_size',
						'l.restocked_quantity',
						'l.is_live',
						'l.clutch_id',
						'l.stage',
						'c.code as clutch_code',
						'sp.common_name',
						'sp.scientific_name'
					])
					.where('l.order_id', 'in', ids)
					.orderBy('l.id')
					.execute();
	const unshipped = rows.filter((r) => r.state === 'scheduled' || r.state === 'packed');
	const shortfallsByOrder = await shortfallsForOrders(
		db,
		unshipped.map((r) => r.id)
	);
	// Every box asks for the shop's own forecast: fetch it (and each ZIP's) once.
	const forecasts =
		options.source !== undefined && date >= options.today
			? rememberingSource(options.source)
			: null;

	const orders = await Promise.all(
		rows.map(async (row): Promise<ShipDayOrder> => {
			const check = await latestShipCheck(db, row.id);
			const packs = row.shipment_packs ?? (check?.decision === 'ship' ? check.packs : []);
			const facilityPickup = check?.decision === 'ship' ? check.facilityPickup : false;
			let change: CheckChange | null = null;
			let checkUnavailable: string | null = null;
			const live = lines.some((l) => l.order_id === row.id && l.is_live);
			if (forecasts && live && (row.state === 'scheduled' || row.state === 'packed')) {
				const look = await lookAgainAt(db, forecasts, {
					service: row.service,
					shipZip: row.ship_zip,
					shipOn: date,
					scheduled: { packs, facilityPickup }
				});
				change = look.change;
				checkUnavailable = look.unavailable;
			}
			return {
				id: row.id,
				orderNumber: row.order_number,
				state: row.state as ShipDayOrder['state'],
				service: row.service,
				shipTo: {
					name: row.ship_name,
					city: row.ship_city,
					state: row.ship_state,
					zip: row.ship_zip
				},
				lines: lines
					.filter((l) => l.order_id === row.id)
					.map((l) => ({
						id: l.id,
						description: l.description,
						quantity: l.quantity - l.restocked_quantity,
						unitSize: l.unit_size,
						animals: (l.quantity - l.restocked_quantity) * l.unit_size,
						isLive: l.is_live,
						clutchId: l.clutch_id,
						clutchCode: l.clutch_code,
						speciesName: l.common_name ? `${l.common_name} (${l.scientific_name})` : null,
						stage: l.stage
					})),
				packs,
				facilityPickup,
				deliveryDate:
					row.expected_delivery_on ?? (check?.decision === 'ship' ? check.deliveryDate : null),
				change,
				checkUnavailable,
				shortfalls: shortfallsByOrder.get(row.id) ?? [],
				shipment:
					row.carrier === null
						? null
						: {
								carrier: row.carrier,
								trackingNumber: row.tracking_number,
								packedAt: row.packed_at,
								shippedAt: row.shipped_at,
								expectedDeliveryOn: row.expected_delivery_on,
								deliveredAt: row.delivered_at
							}
			};
		})
	);
	const toPack = orders.filter((o) => o.state === 'scheduled');
	const shortfalls = [
		...new Map(orders.flatMap((o) => o.shortfalls).map((s) => [s.clutchId, s] as const)).values()
	];
	return {
		date,
		toPack,
		packed: orders.filter((o) => o.state === 'packed'),
		shipped: orders.filter((o) => o.state === 'shipped' || o.state === 'delivered'),
		pickList: buildPickList(toPack.map((o) => ({ orderNumber: o.orderNumber, lines: o.lines }))),
		shortfalls
	};
}
