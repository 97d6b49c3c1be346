// The owner's read of dead-on-arrival claims: the list (open ones first, oldest filed
// first, so nobody waits longest), and one claim with everything a decision rests on —
// when it arrived and when it was reported, the ship check that let the box go, and the
// forecast stored with that check for the delivery day. Reads only; claims.ts and
// refund.ts own the writes.
import { sql } from 'kysely';
import { deliveryDayWeather, type DeliveryWeather } from '$lib/claims/delivery-weather';
import { CLAIM_LIST_LIMIT, type ClaimListFilters } from '$lib/claims/list-filters';
import { hoursBetween } from '$lib/claims/timing';
import { claimWindowProblem } from '$lib/claims/window';
import { todayInZone, type IsoDate } from '$lib/format/dates';
import { lineRefundCents } from '$lib/orders/refund-amount';
import { resolveShopTimeZone } from '../backoffice/settings';
import type { Db } from '../db/connect';
import type { ClaimState, OrderState, RefundStatus, Service } from '../db/schema';
import type { OrderShipCheck } from '../orders/history';
import { asReasons } from '../shipping/dispatch';
import { claimDeadLines } from './claims';

export interface ClaimListRow {
	id: number;
	state: ClaimState;
	orderNumber: string;
	customerName: string;
	email: string;
	filedAt: Date;
	deliveredAt: Date | null;
	/** Hours from delivery to filing; null when the order has no delivery time. */
	hoursAfterDelivery: number | null;
	deadCount: number;
	decidedAt: Date | null;
}

export interface ClaimList {
	rows: ClaimListRow[];
	/** Claims matching the filter, of which at most `limit` are in `rows`. */
	total: number;
	/** Open claims whatever the filter: the page head shows it. */
	openCount: number;
	countsByState: Record<ClaimState, number>;
	limit: number;
}

/**
 * Claims for the owner's list: open ones first, oldest filed first (the customer who has
 * waited longest is at the top); decided ones after, newest decision first.
 */
export async function listClaims(
	db: Db,
	filters: ClaimListFilters = {},
	options: { limit?: number } = {}
): Promise<ClaimList> {
	const limit = options.limit ?? CLAIM_LIST_LIMIT;
	let query = db
		.selectFrom('claim as c')
		.innerJoin('customer_order as o', 'o.id', 'c.order_id')
		.leftJoin('User as u', 'u.id', 'o.user_id')
		.select((eb) => [
			'c.id',
			'c.state',
			'c.filed_at',
			'c.decided_at',
			'o.order_number',
			'o.email',
			'o.ship_name',
			'o.delivered_at',
			'u.name',
			eb
				.selectFrom('claim_line as cl')
				.select(sql<number>`coalesce(sum(cl.dead_count), 0)::int`.as('dead'))
				.whereRef('cl.claim_id', '=', 'c.id')
				.as('dead_count')
		]);
	if (filters.state) query = query.where('c.state', '=', filters.state);
	const [rows, counted] = await Promise.all([
		query
			.orderBy(sql`c.state = 'open'`, 'desc')
			.orderBy(sql`case when c.state = 'open' then c.filed_at end`, 'asc')
			.orderBy(sql`c.decided_at desc nulls last`)
			.orderBy('c.id', 'desc')
			.limit(limit)
			.execute(),
		db
			.selectFrom('claim')
			.select(['state', (eb) => eb.fn.countAll<number>().as('n')])
			.groupBy('state')
			.execute()
	]);
	const countsByState: Record<ClaimState, number> = {
		open: 0,
		refunded: 0,
		reshipped: 0,
		declined: 0
	};
	for (const row of counted) countsByState[row.state] = Number(row.n);
	const total = filters.state
		? countsByState[filters.state]
		: Object.values(countsByState).reduce((sum, n) => sum + n, 0);
	return {
		rows: rows.map((row) => ({
			id: row.id,
			state: row.state,
			orderNumber: row.order_number,
			customerName: row.name?.trim() || row.ship_name,
			email: row.email,
			filedAt: row.filed_at,
			deliveredAt: row.delivered_at,
			hoursAfterDelivery: row.delivered_at ? hoursBetween(row.delivered_at, row.filed_at) : null,
			deadCount: row.dead_count ?? 0,
			decidedAt: row.decided_at
		})),
		total,
		openCount: countsByState.open,
		countsByState,
		limit
	};
}

/** The ship check that let the order go, as the order pages show a check. */
export type ReleasingShipCheck = OrderShipCheck & { id: number; inputs: unknown };

export interface ClaimReview {
	claim: {
		id: number;
		state: ClaimState;
		note: string;
		filedAt: Date;
		decidedAt: Date | null;
		decidedByName: string | null;
		decisionNote: string;
		refund: { id: number; amountCents: number; status: RefundStatus } | null;
		reshipOrder: { number: string; state: OrderState; shipOn: IsoDate | null } | null;
	};
	order: {
		id: number;
		number: string;
		state: OrderState;
		customerName: string;
		email: string;
		shipCity: string;
		shipState: string;
		shipZip: string;
		service: Service;
		shippedAt: Date | null;
		deliveredAt: Date | null;
		lines: Array<{
			id: number;
			description: string;
			quantity: number;
			lineTotalCents: number;
			isLive: boolean;
		}>;
	};
	deadLines: Array<{
		orderLineId: number;
		description: string;
		/** Animals, not units: a group of 5 counts 5. */
		deadCount: number;
		/** Units sold on the line (groups, for a group listing). */
		quantity: number;
		/** Animals the line sent: units × animals per unit. */
		animals: number;
		lineTotalCents: number;
		/** The dead animals' share of the line's price, as the refund suggestion counts it. */
		deadShareCents: number;
	}>;
	/** Hours from delivery to filing; null when the order has no delivery time. */
	hoursAfterDelivery: number | null;
	windowHours: number;
	/** Whether it was filed inside the window, by the rule filing uses; null without a delivery time. */
	filedInsideWindow: boolean | null;
	/** The delivery day in the shop's zone. */
	deliveredOn: IsoDate | null;
	/** Null when no ship check cleared the order to ship. */
	shipCheck: ReleasingShipCheck | null;
	weather: DeliveryWeather;
	timeZone: string;
}

/** Everything the owner decides a claim on, or null when there is no such claim. */
export async function claimForReview(
	db: Db,
	claimId: number,
	options: { timeZone?: string } = {}
): Promise<ClaimReview | null> {
	const row = await db
		.selectFrom('claim as c')
		.innerJoin('customer_order as o', 'o.id', 'c.order_id')
		.leftJoin('User as customer', 'customer.id', 'o.user_id')
		.leftJoin('User as decider', 'decider.id', 'c.decided_by')
		.leftJoin('refund as r', 'r.id', 'c.refund_id')
		.leftJoin('customer_order as reship', 'reship.id', 'c.reship_order_id')
		.select([
			'c.id',
			'c.state',
			'c.note',
			'c.filed_at',
			'c.decided_at',
			'c.decision_note',
			'decider.name as decider_name',
			'decider.email as decider_email',
			'r.id as refund_id',
			'r.amount_cents as refund_cents',
			'r.status as refund_status',
			'reship.order_number as reship_number',
			'reship.state as reship_state',
			'reship.ship_on as reship_ship_on',
			'o.id as order_id',
			'o.order_number',
			'o.state as order_state',
			'o.email',
			'o.ship_name',
			'customer.name as customer_name',
			'o.ship_city',
			'o.ship_state',
			'o.ship_zip',
			'o.service',
			'o.delivered_at'
		])
		.where('c.id', '=', claimId)
		.executeTakeFirst();
	if (!row) return null;

	const [timeZone, setting, lines, dead, shipped, check] = await Promise.all([
		options.timeZone ?? resolveShopTimeZone(db),
		db
			.selectFrom('shop_setting')
			.select('claim_window_hours')
			.where('id', '=', true)
			.executeTakeFirst(),
		db
			.selectFrom('order_line')
			.select(['id', 'description', 'quantity', 'line_total_cents', 'is_live'])
			.where('order_id', '=', row.order_id)
			.orderBy('id')
			.execute(),
		claimDeadLines(db, claimId),
		// The order keeps no shipped time of its own; its history has the move.
		db
			.selectFrom('order_event')
			.select('created_at')
			.where('order_id', '=', row.order_id)
			.where('to_state', '=', 'shipped')
			.orderBy('id', 'desc')
			.limit(1)
			.executeTakeFirst(),
		// The last check that said ship is the one the box went on; later holds did not stop it.
		db
			.selectFrom('ship_check')
			.selectAll()
			.where('order_id', '=', row.order_id)
			.where('decision', '=', 'ship')
			.orderBy('id', 'desc')
			.limit(1)
			.executeTakeFirst()
	]);

	const shipCheck: ReleasingShipCheck | null = check
		? {
				id: check.id,
				decision: check.decision,
				shipDate: check.ship_date,
				deliveryDate: check.delivery_date,
				recheckDate: check.recheck_date,
				packs: check.packs,
				facilityPickup: check.facility_pickup,
				reasons: asReasons(check.reasons),
				overrideReason: check.override_reason,
				checkedAt: check.checked_at,
				inputs: check.inputs
			}
		: null;
	// The shop's default window when the settings row is missing (PRODUCT.md: 2 hours).
	const windowHours = setting?.claim_window_hours ?? 2;
	const deliveredOn = row.delivered_at ? todayInZone(timeZone, row.delivered_at) : null;
	const weather: DeliveryWeather = shipCheck
		? deliveryDayWeather(shipCheck.inputs, { deliveredOn, plannedOn: shipCheck.deliveryDate })
		: {
				found: false,
				day: deliveredOn,
				problem: 'No ship check cleared this order, so no forecast is stored for it.'
			};

	return {
		claim: {
			id: row.id,
			state: row.state,
			note: row.note,
			filedAt: row.filed_at,
			decidedAt: row.decided_at,
			decidedByName: row.decider_name?.trim() || row.decider_email || null,
			decisionNote: row.decision_note,
			refund:
				row.refund_id !== null && row.refund_cents !== null && row.refund_status !== null
					? { id: row.refund_id, amountCents: row.refund_cents, status: row.refund_status }
					: null,
			reshipOrder:
				row.reship_number !== null && row.reship_state !== null
					? { number: row.reship_number, state: row.reship_state, shipOn: row.reship_ship_on }
					: null
		},
		order: {
			id: row.order_id,
			number: row.order_number,
			state: row.order_state,
			customerName: row.customer_name?.trim() || row.ship_name,
			email: row.email,
			shipCity: row.ship_city,
			shipState: row.ship_state,
			shipZip: row.ship_zip,
			service: row.service,
			shippedAt: shipped?.created_at ?? null,
			deliveredAt: row.delivered_at,
			lines: lines.map((line) => ({
				id: line.id,
				description: line.description,
				quantity: line.quantity,
				lineTotalCents: line.line_total_cents,
				isLive: line.is_live
			}))
		},
		deadLines: dead.map((line) => {
			const animals = line.quantity * line.unit_size;
			return {
				orderLineId: line.id,
				description: line.description,
				deadCount: line.dead_count,
				quantity: line.quantity,
				animals,
				lineTotalCents: line.line_total_cents,
				// Spread over every animal the line sent, as suggestedClaimRefundCents spreads it.
				deadShareCents: lineRefundCents(
					{ quantity: animals, lineTotalCents: line.line_total_cents },
					line.dead_count
				)
			};
		}),
		hoursAfterDelivery: row.delivered_at ? hoursBetween(row.delivered_at, row.filed_at) : null,
		windowHours,
		filedInsideWindow: row.delivered_at
			? claimWindowProblem(row.delivered_at, row.filed_at, windowHours, timeZone) === null
			: null,
		deliveredOn,
		shipCheck,
		weather,
		timeZone
	};
}
