// Adds the benchmark's order history to a database that holds the demo and the bench
// catalogue: 100,000 paid orders over the three years before `today` by default, with
// lines on the listings on offer, payments, ship checks, boxes, events, refunds and DOA
// claims (seed/bench-order-plan.ts plans them). A fixture: rows are written directly,
// without audit entries or mail, each table in a few set-based inserts (a batch of rows
// as one JSON parameter), all in one transaction.
import { sql, type RawBuilder } from 'kysely';
import { tiersProblem, type PriceTier } from '../src/lib/money/pricing';
import type { Db } from '../src/lib/server/db/connect';
import {
	planBenchOrders,
	type BenchActor,
	type BenchOrderPlan,
	type OfferListing,
	type PlannedOrder,
	type ShopRules
} from './bench-order-plan';

export const BENCH_ORDERS = 100_000;
/** Bench order numbers start here: seven digits, clear of the demo's HL-1xxxx. */
const FIRST_BENCH_NUMBER = 1_000_001;
/** Orders per round of inserts: each statement carries a few megabytes of JSON. */
const BATCH_ORDERS = 10_000;

export const BENCH_ORDER_TABLES = [
	'customer_order',
	'order_line',
	'order_event',
	'payment',
	'ship_check',
	'shipment',
	'refund',
	'refund_line',
	'claim',
	'claim_line'
] as const;
export type BenchOrderTable = (typeof BENCH_ORDER_TABLES)[number];

export interface BenchOrdersResult {
	/** Rows written per table. */
	counts: Record<BenchOrderTable, number>;
	/** Orders by the state they end in. */
	states: Record<string, number>;
	planMs: number;
	insertMs: number;
}

type PgType = 'int4' | 'text' | 'bool' | 'date' | 'timestamptz' | 'uuid' | 'json' | 'text[]';
type Column<R> = readonly [name: string, type: PgType, value: (row: R) => unknown];

/**
 * `json_to_recordset(<one JSON array>) as t(<names and types>, ord)`: a batch of rows in
 * one parameter, which PostgreSQL reads far faster than an array per column of escaped
 * text. `ord` is the row's place in the batch, for inserts whose ids follow the plan.
 */
function recordsOf<R>(rows: readonly R[], columns: readonly Column<R>[]): RawBuilder<unknown> {
	const records = rows.map((row, ord) => {
		const record: Record<string, unknown> = { ord };
		for (const [name, , value] of columns) record[name] = value(row);
		return record;
	});
	const definitions = columns.map(([name, type]) => sql`${sql.id(name)} ${sql.raw(type)}`);
	return sql`json_to_recordset(${JSON.stringify(records)}::json) as t(${sql.join([
		...definitions,
		sql`ord int4`
	])})`;
}

function chunks<T>(rows: readonly T[], size: number): T[][] {
	const out: T[][] = [];
	for (let i = 0; i < rows.length; i += size) out.push(rows.slice(i, i + size));
	return out;
}

async function shopRules(db: Db): Promise<ShopRules> {
	const s = await db
		.selectFrom('shop_setting')
		.selectAll()
		.where('id', '=', true)
		.executeTakeFirst();
	if (!s) throw new Error('bench orders: no shop_setting row; seed the demo first');
	return {
		timeZone: s.time_zone,
		originZip: s.origin_zip,
		shipWeekdays: { overnight: s.ship_weekdays_overnight, two_day: s.ship_weekdays_two_day },
		feeCents: { overnight: s.fee_overnight_cents, two_day: s.fee_two_day_cents },
		thresholds: {
			heatPackBelowF: s.heat_pack_below_f,
			holdBelowF: s.hold_below_f,
			coldPackAboveF: s.cold_pack_above_f,
			holdAboveF: s.hold_above_f
		},
		extraClosedDates: s.extra_closed_dates,
		forecastHorizonDays: s.forecast_horizon_days,
		claimWindowHours: s.claim_window_hours
	};
}

/** Live listings the shop sells now, with their tiers, and each listed clutch's free animals. */
async function offer(db: Db) {
	const rows = await db
		.selectFrom('listing as l')
		.leftJoin('clutch as c', 'c.id', 'l.clutch_id')
		.select([
			'l.id',
			'l.kind',
			'l.title',
			'l.clutch_id',
			'c.code as clutch_code',
			'l.species_id',
			'c.stage',
			'l.unit_size',
			'l.sex',
			'l.is_live'
		])
		.where('l.state', '=', 'live')
		.where('l.published_at', 'is not', null)
		.where((eb) => eb.or([eb('l.kind', '=', 'supply'), eb('c.state', '=', 'listed')]))
		.orderBy('l.id')
		.execute();
	const tierRows = await db
		.selectFrom('price_tier')
		.select(['listing_id', 'min_quantity', 'price_cents'])
		.orderBy('listing_id')
		.orderBy('min_quantity')
		.execute();
	const tiers = new Map<number, PriceTier[]>();
	for (const t of tierRows) {
		const list = tiers.get(t.listing_id) ?? [];
		list.push({ minQuantity: t.min_quantity, priceCents: t.price_cents });
		tiers.set(t.listing_id, list);
	}
	const listings: OfferListing[] = rows.flatMap((r) => {
		const own = tiers.get(r.id) ?? [];
		// A listing without a price for one unit cannot sell any quantity: leave it out.
		if (tiersProblem(own) !== null) return [];
		return [
			{
				id: r.id,
				kind: r.kind,
				title: r.title,
				clutchId: r.clutch_id,
				clutchCode: r.clutch_code,
				speciesId: r.species_id,
				stage: r.stage,
				unitSize: r.unit_size,
				sex: r.sex,
				isLive: r.is_live,
				tiers: own
			}
		];
	});
	const free = await db
		.selectFrom('clutch')
		.select(['id', sql<number>`clutch_free_animals(clutch.id)`.as('free')])
		.where('state', '=', 'listed')
		.orderBy('id')
		.execute();
	return { listings, freeAnimals: new Map(free.map((c) => [c.id, Number(c.free)])) };
}

async function staffIds(db: Db): Promise<{ keeper: string | null; admin: string | null }> {
	const staff = await db
		.selectFrom('user_role')
		.select(['user_id', 'role'])
		.where('role', 'in', ['keeper', 'admin'])
		.where('disabled_at', 'is', null)
		.orderBy('created_at')
		.orderBy('user_id')
		.execute();
	const admin = staff.find((s) => s.role === 'admin')?.user_id ?? null;
	const keeper = staff.find((s) => s.role === 'keeper')?.user_id ?? admin;
	return { keeper, admin };
}

async function firstFreeNumber(db: Db): Promise<number> {
	const { top } = await db
		.selectFrom('customer_order')
		.select(sql<string>`coalesce(max(substring(order_number from 4)::bigint), 0)::text`.as('top'))
		.executeTakeFirstOrThrow();
	return Math.max(FIRST_BENCH_NUMBER, Number(top) + 1);
}

/** Throws unless a statement wrote exactly the rows the plan has. */
function expectRows<T>(table: BenchOrderTable, rows: T[], expected: number): T[] {
	expectCount(table, rows.length, expected);
	return rows;
}

function expectCount(table: BenchOrderTable, written: number | bigint, expected: number): number {
	if (Number(written) !== expected)
		throw new Error(`bench orders: ${table} wrote ${written} rows, the plan has ${expected}`);
	return expected;
}

function required<K, V>(map: ReadonlyMap<K, V>, key: K, what: string): V {
	const value = map.get(key);
	if (value === undefined) throw new Error(`bench orders: no ${what} for ${String(key)}`);
	return value;
}

/** The history planned on what this database offers now; nothing is written. */
export async function planBenchOrdersFor(
	db: Db,
	opts: { today: string; orders?: number }
): Promise<BenchOrderPlan> {
	const shop = await shopRules(db);
	const { listings, freeAnimals } = await offer(db);
	return planBenchOrders(listings, freeAnimals, shop, {
		today: opts.today,
		orders: opts.orders ?? BENCH_ORDERS,
		firstNumber: await firstFreeNumber(db)
	});
}

/**
 * Plans the history and writes it. Each insert returns its ids, and the rows that hang
 * off them carry those ids, so no statement has to look a parent up again.
 */
export async function addBenchOrders(
	db: Db,
	opts: { today: string; orders?: number }
): Promise<BenchOrdersResult> {
	const planStarted = performance.now();
	const plan = await planBenchOrdersFor(db, opts);
	const staff = await staffIds(db);
	const planMs = performance.now() - planStarted;
	const actorId = (actor: BenchActor) =>
		actor === 'keeper' ? staff.keeper : actor === 'admin' ? staff.admin : null;

	const counts = Object.fromEntries(BENCH_ORDER_TABLES.map((t) => [t, 0])) as Record<
		BenchOrderTable,
		number
	>;
	const orderIds = new Map<string, number>();
	// An order lists a listing once, so (order, listing) names a line.
	const lineIds = new Map<string, number>();
	const lineKey = (orderId: number, listingId: number) => `${orderId}:${listingId}`;
	const refundIds = new Map<number, number>();
	const insertStarted = performance.now();
	await db.transaction().execute(async (trx) => {
		for (const batch of chunks(plan.orders, BATCH_ORDERS)) {
			const insertedOrders = await trx
				.insertInto('customer_order')
				.columns([
					'order_number',
					'email',
					'ship_name',
					'ship_line1',
					'ship_line2',
					'ship_city',
					'ship_state',
					'ship_zip',
					'service',
					'state',
					'subtotal_cents',
					'shipping_cents',
					'total_cents',
					'paid_cents',
					'refunded_cents',
					'ship_on',
					'delivered_at',
					'terms_accepted_at',
					'created_at',
					'updated_at'
				])
				.expression(
					sql`select t.order_number, t.email, t.ship_name, t.ship_line1, t.ship_line2,
						t.ship_city, t.ship_state, t.ship_zip, t.service, t.state, t.subtotal_cents,
						t.shipping_cents, t.total_cents, t.paid_cents, t.refunded_cents, t.ship_on,
						t.delivered_at, t.created_at, t.created_at, t.updated_at
					from ${recordsOf<PlannedOrder>(batch, [
						['order_number', 'text', (o) => o.number],
						['email', 'text', (o) => o.email],
						['ship_name', 'text', (o) => o.shipName],
						['ship_line1', 'text', (o) => o.shipLine1],
						['ship_line2', 'text', (o) => o.shipLine2],
						['ship_city', 'text', (o) => o.shipCity],
						['ship_state', 'text', (o) => o.shipState],
						['ship_zip', 'text', (o) => o.shipZip],
						['service', 'text', (o) => o.service],
						['state', 'text', (o) => o.state],
						['subtotal_cents', 'int4', (o) => o.subtotalCents],
						['shipping_cents', 'int4', (o) => o.shippingCents],
						['total_cents', 'int4', (o) => o.totalCents],
						['paid_cents', 'int4', (o) => o.paidCents],
						['refunded_cents', 'int4', (o) => o.refundedCents],
						['ship_on', 'date', (o) => o.shipOn],
						['delivered_at', 'timestamptz', (o) => o.deliveredAt],
						['created_at', 'timestamptz', (o) => o.createdAt],
						['updated_at', 'timestamptz', (o) => o.updatedAt]
					])}
					order by t.ord`
				)
				.returning(['id', 'order_number'])
				.execute();
			for (const o of expectRows('customer_order', insertedOrders, batch.length))
				orderIds.set(o.order_number, o.id);
			counts.customer_order += insertedOrders.length;
			const idOf = (o: PlannedOrder) => required(orderIds, o.number, 'order id');

			// Lines, events, payments and ship checks need only the order ids: they go out back
			// to back on the connection, each built here while PostgreSQL writes the one before.
			const lines = batch.flatMap((o) => o.lines.map((line) => ({ orderId: idOf(o), line })));
			const linesSent = trx
				.insertInto('order_line')
				.columns([
					'order_id',
					'listing_id',
					'clutch_id',
					'species_id',
					'description',
					'stage',
					'sex',
					'unit_size',
					'quantity',
					'line_total_cents',
					'is_live',
					'restocked_quantity'
				])
				.expression(
					sql`select t.order_id, t.listing_id, t.clutch_id, t.species_id, t.description,
						t.stage, t.sex, t.unit_size, t.quantity, t.line_total_cents, t.is_live,
						t.restocked_quantity
					from ${recordsOf(lines, [
						['order_id', 'int4', (r) => r.orderId],
						['listing_id', 'int4', (r) => r.line.listingId],
						['clutch_id', 'int4', (r) => r.line.clutchId],
						['species_id', 'int4', (r) => r.line.speciesId],
						['description', 'text', (r) => r.line.description],
						['stage', 'text', (r) => r.line.stage],
						['sex', 'text', (r) => r.line.sex],
						['unit_size', 'int4', (r) => r.line.unitSize],
						['quantity', 'int4', (r) => r.line.quantity],
						['line_total_cents', 'int4', (r) => r.line.lineTotalCents],
						['is_live', 'bool', (r) => r.line.isLive],
						['restocked_quantity', 'int4', (r) => r.line.restockedQuantity]
					])}
					order by t.ord`
				)
				.returning(['id', 'order_id', 'listing_id'])
				.execute();

			const events = batch.flatMap((o) => o.events.map((event) => ({ orderId: idOf(o), event })));
			const eventsSent = trx
				.insertInto('order_event')
				.columns([
					'order_id',
					'from_state',
					'to_state',
					'actor_kind',
					'actor_user_id',
					'note',
					'created_at'
				])
				.expression(
					sql`select t.order_id, t.from_state, t.to_state, t.actor_kind, t.actor_user_id,
							t.note, t.created_at
						from ${recordsOf(events, [
							['order_id', 'int4', (r) => r.orderId],
							['from_state', 'text', (r) => r.event.fromState],
							['to_state', 'text', (r) => r.event.toState],
							['actor_kind', 'text', (r) => r.event.actorKind],
							['actor_user_id', 'uuid', (r) => actorId(r.event.actor)],
							['note', 'text', (r) => r.event.note],
							['created_at', 'timestamptz', (r) => r.event.at]
						])}
						order by t.ord`
				)
				.executeTakeFirstOrThrow();

			const paid = batch.filter((o) => o.payment !== null);
			const paymentsSent = trx
				.insertInto('payment')
				.columns([
					'order_id',
					'stripe_checkout_session_id',
					'stripe_payment_intent_id',
					'amount_cents',
					'status',
					'created_at',
					'updated_at'
				])
				.expression(
					// updated_at is the moment the payment succeeded: nothing writes it after.
					sql`select t.order_id, t.session_id, t.intent_id, t.amount_cents, 'succeeded',
						t.created_at, t.paid_at
					from ${recordsOf(paid, [
						['order_id', 'int4', idOf],
						['session_id', 'text', (o) => o.payment?.checkoutSessionId],
						['intent_id', 'text', (o) => o.payment?.paymentIntentId],
						['amount_cents', 'int4', (o) => o.totalCents],
						['created_at', 'timestamptz', (o) => o.createdAt],
						['paid_at', 'timestamptz', (o) => o.payment?.paidAt]
					])}
					order by t.ord`
				)
				.returning(['id', 'order_id'])
				.execute();

			const checks = batch.flatMap((o) => o.shipChecks.map((check) => ({ o, check })));
			const checksSent = trx
				.insertInto('ship_check')
				.columns([
					'order_id',
					'first_date',
					'service',
					'decision',
					'ship_date',
					'delivery_date',
					'recheck_date',
					'packs',
					'facility_pickup',
					'reasons',
					'inputs',
					'rule_version',
					'checked_at'
				])
				.expression(
					// The snapshot and reasons arrive as json and are stored as jsonb.
					sql`select t.order_id, t.first_date, t.service, t.decision, t.ship_date,
						t.delivery_date, t.recheck_date, t.packs, t.facility_pickup, t.reasons::jsonb,
						t.inputs::jsonb, 'bench', t.checked_at
					from ${recordsOf(checks, [
						['order_id', 'int4', (r) => idOf(r.o)],
						['first_date', 'date', (r) => r.check.firstDate],
						['service', 'text', (r) => r.o.service],
						['decision', 'text', (r) => r.check.decision],
						['ship_date', 'date', (r) => r.check.shipDate],
						['delivery_date', 'date', (r) => r.check.deliveryDate],
						['recheck_date', 'date', (r) => r.check.recheckDate],
						['packs', 'text[]', (r) => r.check.packs],
						['facility_pickup', 'bool', (r) => r.check.facilityPickup],
						['reasons', 'json', (r) => r.check.reasons],
						['inputs', 'json', (r) => r.check.inputs],
						['checked_at', 'timestamptz', (r) => r.check.checkedAt]
					])}
					order by t.ord`
				)
				.returning(['id', 'order_id', 'decision'])
				.execute();
			const [insertedLines, insertedEvents, insertedPayments, insertedChecks] = await Promise.all([
				linesSent,
				eventsSent,
				paymentsSent,
				checksSent
			]);
			for (const l of expectRows('order_line', insertedLines, lines.length))
				lineIds.set(lineKey(l.order_id, l.listing_id), l.id);
			counts.order_line += insertedLines.length;
			// The biggest tables report a count only: their ids are needed by nothing.
			counts.order_event += expectCount(
				'order_event',
				insertedEvents.numInsertedOrUpdatedRows ?? 0n,
				events.length
			);
			const paymentIds = new Map(
				expectRows('payment', insertedPayments, paid.length).map((p) => [p.order_id, p.id])
			);
			counts.payment += insertedPayments.length;
			// The box goes out on its order's ship decision (one per order in the plan).
			const shipCheckIds = new Map(
				expectRows('ship_check', insertedChecks, checks.length)
					.filter((c) => c.decision === 'ship')
					.map((c) => [c.order_id, c.id])
			);
			counts.ship_check += insertedChecks.length;

			const boxes = batch.filter((o) => o.shipment !== null);
			const boxesSent = trx
				.insertInto('shipment')
				.columns([
					'order_id',
					'carrier',
					'tracking_number',
					'packs',
					'packed_at',
					'shipped_at',
					'expected_delivery_on',
					'delivered_at',
					'delivered_by',
					'created_by',
					'created_at',
					'ship_check_id'
				])
				.expression(
					sql`select t.order_id, t.carrier, t.tracking_number, t.packs, t.packed_at,
							t.shipped_at, t.expected_delivery_on, t.delivered_at,
							case when t.delivered_at is not null then 'tracking' end,
							${staff.keeper}::uuid, t.packed_at, t.ship_check_id
						from ${recordsOf(boxes, [
							['order_id', 'int4', idOf],
							['carrier', 'text', (o) => o.shipment?.carrier],
							['tracking_number', 'text', (o) => o.shipment?.trackingNumber],
							['packs', 'text[]', (o) => o.shipment?.packs],
							['packed_at', 'timestamptz', (o) => o.shipment?.packedAt],
							['shipped_at', 'timestamptz', (o) => o.shipment?.shippedAt],
							['expected_delivery_on', 'date', (o) => o.shipment?.expectedDeliveryOn],
							['delivered_at', 'timestamptz', (o) => o.shipment?.deliveredAt],
							// Supplies-only boxes go out without a ship check.
							['ship_check_id', 'int4', (o) => shipCheckIds.get(idOf(o)) ?? null]
						])}
						order by t.ord`
				)
				.executeTakeFirstOrThrow();

			const refunded = batch.filter((o) => o.refund !== null);
			const refundsSent = trx
				.insertInto('refund')
				.columns([
					'order_id',
					'payment_id',
					'stripe_refund_id',
					'idempotency_key',
					'amount_cents',
					'reason',
					'status',
					'created_by',
					'created_at',
					'updated_at'
				])
				.expression(
					sql`select t.order_id, t.payment_id, t.stripe_refund_id, t.idempotency_key,
						t.amount_cents, t.reason, 'succeeded', ${staff.admin}::uuid, t.at, t.at
					from ${recordsOf(refunded, [
						['order_id', 'int4', idOf],
						['payment_id', 'int4', (o) => required(paymentIds, idOf(o), 'payment')],
						['stripe_refund_id', 'text', (o) => o.refund?.stripeRefundId],
						['idempotency_key', 'text', (o) => o.refund?.idempotencyKey],
						['amount_cents', 'int4', (o) => o.refund?.amountCents],
						['reason', 'text', (o) => o.refund?.reason],
						['at', 'timestamptz', (o) => o.refund?.at]
					])}
					order by t.ord`
				)
				.returning(['id', 'order_id'])
				.execute();
			const [insertedBoxes, insertedRefunds] = await Promise.all([boxesSent, refundsSent]);
			counts.shipment += expectCount(
				'shipment',
				insertedBoxes.numInsertedOrUpdatedRows ?? 0n,
				boxes.length
			);
			for (const r of expectRows('refund', insertedRefunds, refunded.length))
				refundIds.set(r.order_id, r.id);
			counts.refund += insertedRefunds.length;

			const refundLines = refunded.flatMap((o) =>
				(o.refund?.lines ?? []).map((line) => ({ orderId: idOf(o), line }))
			);
			if (refundLines.length > 0)
				counts.refund_line += expectRows(
					'refund_line',
					await trx
						.insertInto('refund_line')
						.columns(['refund_id', 'order_line_id', 'quantity', 'restock'])
						.expression(
							sql`select t.refund_id, t.order_line_id, t.quantity, t.restock
							from ${recordsOf(refundLines, [
								['refund_id', 'int4', (x) => required(refundIds, x.orderId, 'refund')],
								[
									'order_line_id',
									'int4',
									(x) => required(lineIds, lineKey(x.orderId, x.line.listingId), 'line')
								],
								['quantity', 'int4', (x) => x.line.quantity],
								['restock', 'bool', (x) => x.line.restock]
							])}
							order by t.ord`
						)
						.returning('refund_id')
						.execute(),
					refundLines.length
				).length;
		}

		// Claims last: a reshipped claim names its reship, which may be in a later batch.
		const claimed = plan.orders.filter((o) => o.claim !== null);
		if (claimed.length === 0) return;
		const idOf = (o: PlannedOrder) => required(orderIds, o.number, 'order id');
		const insertedClaims = await trx
			.insertInto('claim')
			.columns([
				'order_id',
				'note',
				'state',
				'filed_at',
				'decided_at',
				'decided_by',
				'decision_note',
				'refund_id',
				'reship_order_id'
			])
			.expression(
				sql`select t.order_id, t.note, t.state, t.filed_at, t.decided_at,
					case when t.decided_at is not null then ${staff.admin}::uuid end,
					t.decision_note, t.refund_id, t.reship_order_id
				from ${recordsOf(claimed, [
					['order_id', 'int4', idOf],
					['note', 'text', (o) => o.claim?.note],
					['state', 'text', (o) => o.claim?.state],
					['filed_at', 'timestamptz', (o) => o.claim?.filedAt],
					['decided_at', 'timestamptz', (o) => o.claim?.decidedAt],
					['decision_note', 'text', (o) => o.claim?.decisionNote],
					[
						'refund_id',
						'int4',
						(o) => (o.claim?.usesRefund ? required(refundIds, idOf(o), 'refund') : null)
					],
					[
						'reship_order_id',
						'int4',
						(o) =>
							o.claim?.reshipNumber ? required(orderIds, o.claim.reshipNumber, 'reship') : null
					]
				])}
				order by t.ord`
			)
			.returning(['id', 'order_id', 'reship_order_id'])
			.execute();
		counts.claim += expectRows('claim', insertedClaims, claimed.length).length;
		const claimIds = new Map(insertedClaims.map((c) => [c.order_id, c.id]));

		const claimLines = claimed.flatMap((o) =>
			(o.claim?.lines ?? []).map((line) => ({ orderId: idOf(o), line }))
		);
		counts.claim_line += expectRows(
			'claim_line',
			await trx
				.insertInto('claim_line')
				.columns(['claim_id', 'order_line_id', 'dead_count'])
				.expression(
					sql`select t.claim_id, t.order_line_id, t.dead_count
					from ${recordsOf(claimLines, [
						['claim_id', 'int4', (x) => required(claimIds, x.orderId, 'claim')],
						[
							'order_line_id',
							'int4',
							(x) => required(lineIds, lineKey(x.orderId, x.line.listingId), 'line')
						],
						['dead_count', 'int4', (x) => x.line.deadCount]
					])}
					order by t.ord`
				)
				.returning('claim_id')
				.execute(),
			claimLines.length
		).length;

		// Each reship points back at the claim it answers.
		const reships = insertedClaims.filter((c) => c.reship_order_id !== null);
		if (reships.length > 0)
			await trx
				.updateTable('customer_order')
				.set({
					reship_of_claim_id: sql<number>`(select c.id from claim c where c.reship_order_id = customer_order.id)`
				})
				.where(
					'id',
					'in',
					reships.map((c) => c.reship_order_id as number)
				)
				.execute();
	});
	// Fresh planner statistics, as a shop that has been running would have.
	await sql`analyze ${sql.join(BENCH_ORDER_TABLES.map((t) => sql.table(t)))}`.execute(db);
	const insertMs = performance.now() - insertStarted;

	const states: Record<string, number> = {};
	for (const o of plan.orders) states[o.state] = (states[o.state] ?? 0) + 1;
	return { counts, states, planMs, insertMs };
}
