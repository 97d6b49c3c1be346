// The ship-day marks on an order — packed, shipped, delivered — an admin's undo of each,
// and the late-delivery e-mail. The one module that writes shipment rows. Every mark
// locks the order row first, so two keepers (or a keeper and a carrier update) marking
// the same box take turns and the second is judged from the state the first left. The
// state change goes through moveOrder, and the shipment row, the customer's mail and the
// audit entry are written in the same transaction, so a refused mark leaves nothing.
import type { Kysely, Transaction } from 'kysely';
import { daysBetween, formatShopDate, formatShopDateTime, todayInZone } from '$lib/format/dates';
import type { IsoDate } from '$lib/format/dates';
import { expectedDeliveryOn } from '$lib/fulfilment/expected-delivery';
import {
	DELIVERY_CLOCK_SLACK_MS,
	REVERSAL_TO,
	type ReversibleMark
} from '$lib/fulfilment/mark-forms';
import {
	carrierFrom,
	carrierLabels,
	describeCarrier,
	normalizeTrackingNumber,
	trackingLink,
	trackingProblem,
	type Carrier
} from '$lib/fulfilment/tracking';
import { orderStateLabels } from '$lib/format/labels';
import { MOVE_REASON_MIN_LENGTH } from '$lib/orders/state-machine';
import { writeAudit, type Actor } from '$lib/server/audit';
import { hasActiveRole } from '$lib/server/auth/active-role';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import type {
	Database,
	OrderState,
	Pack,
	Role,
	Service,
	TrackingStatus
} from '$lib/server/db/schema';
import { queueMail } from '$lib/server/mail';
import { hasLiveLine, moveOrder, noteOrder, type OrderActor } from '$lib/server/orders/transitions';
import { shortfallsForOrders, type ClutchShortfall } from './shortfall';

type Db = Kysely<Database>;
type Trx = Transaction<Database>;

/** Where the links in the customer's mail point: the shop's public origin. */
export type MarkLinks = { origin: string };

/** The form field a refusal belongs to, when it belongs to one. */
export type MarkField =
	'carrier' | 'trackingNumber' | 'deliveredAt' | 'reason' | 'from' | 'confirmOffDay';

/** A mark that was not made; nothing was written. `status` suits an action's fail(). */
export type MarkRefusal = {
	ok: false;
	status: 400 | 403 | 404 | 409;
	problem: string;
	field?: MarkField;
};

/** Who marks a box delivered: a keeper, or a carrier's signed tracking update. */
export type DeliveryMarker = Actor | { kind: 'tracking'; trackingEventId?: number };

const HOUR_MS = 3_600_000;

function refusal(status: MarkRefusal['status'], problem: string, field?: MarkField): MarkRefusal {
	return field ? { ok: false, status, problem, field } : { ok: false, status, problem };
}

/** Thrown inside a transaction to roll back what it wrote; caught outside and returned. */
class Refused extends Error {
	constructor(readonly refusal: MarkRefusal) {
		super(refusal.problem);
	}
}

async function settle<T>(work: Promise<T>): Promise<T | MarkRefusal> {
	try {
		return await work;
	} catch (error) {
		if (error instanceof Refused) return error.refusal;
		throw error;
	}
}

/** Whether the actor holds `minimum` now (read from the database, never from the session). */
function hasRole(db: Db, actor: Actor, minimum: Role): Promise<boolean> {
	return hasActiveRole(db, actor.userId, minimum);
}

const KEEPERS_ONLY = refusal(403, 'Only keepers and the shop owner mark boxes.');

const userActor = (actor: Actor): OrderActor => ({
	kind: 'user',
	userId: actor.userId,
	ip: actor.ip
});

const stateWord = (state: OrderState) => orderStateLabels[state].toLowerCase();

type LockedOrder = {
	id: number;
	order_number: string;
	state: OrderState;
	ship_on: IsoDate | null;
	service: Service;
	email: string;
	ship_name: string;
	user_id: string | null;
};

async function lockOrder(trx: Trx, orderId: number): Promise<LockedOrder | undefined> {
	return trx
		.selectFrom('customer_order')
		.select(['id', 'order_number', 'state', 'ship_on', 'service', 'email', 'ship_name', 'user_id'])
		.where('id', '=', orderId)
		.forUpdate()
		.executeTakeFirst();
}

async function lockShipment(trx: Trx, orderId: number) {
	return trx
		.selectFrom('shipment')
		.selectAll()
		.where('order_id', '=', orderId)
		.forUpdate()
		.executeTakeFirst();
}

async function shopSettings(trx: Trx) {
	const row = await trx
		.selectFrom('shop_setting')
		.select(['extra_closed_dates', 'claim_window_hours'])
		.where('id', '=', true)
		.executeTakeFirst();
	return {
		timeZone: await resolveShopTimeZone(trx),
		extraClosedDates: row?.extra_closed_dates ?? [],
		claimWindowHours: row?.claim_window_hours ?? 2
	};
}

type CheckRow = {
	id: number;
	decision: 'ship' | 'hold';
	ship_date: IsoDate | null;
	delivery_date: IsoDate | null;
	packs: Pack[];
	facility_pickup: boolean;
};

/** The ship check a box was packed on, else the order's latest one (by id: decision order). */
async function checkOf(trx: Trx, orderId: number, shipCheckId: number | null) {
	let query = trx
		.selectFrom('ship_check')
		.select(['id', 'decision', 'ship_date', 'delivery_date', 'packs', 'facility_pickup'])
		.where('order_id', '=', orderId);
	query = shipCheckId === null ? query : query.where('id', '=', shipCheckId);
	const row: CheckRow | undefined = await query.orderBy('id', 'desc').limit(1).executeTakeFirst();
	return row;
}

/**
 * Where the customer sees their order: their account's order page, or for a guest the
 * page after paying, whose Checkout Session id is a guest's proof of the order.
 */
async function orderUrl(trx: Trx, links: MarkLinks, order: LockedOrder): Promise<string> {
	const origin = links.origin.replace(/\/$/, '');
	const account = `${origin}/account/orders/${encodeURIComponent(order.order_number)}`;
	if (order.user_id) return account;
	const payment = await trx
		.selectFrom('payment')
		.select('stripe_checkout_session_id')
		.where('order_id', '=', order.id)
		.where('status', '=', 'succeeded')
		.orderBy('id', 'desc')
		.limit(1)
		.executeTakeFirst();
	return payment
		? `${origin}/checkout/done?session_id=${encodeURIComponent(payment.stripe_checkout_session_id)}`
		: account;
}

function packWords(packs: readonly Pack[]): string {
	return packs.length ? `with a ${packs.join(' and a ')} pack` : 'with no pack';
}

function isUniqueViolation(error: unknown): boolean {
	return (error as { code?: unknown } | null)?.code === '23505';
}

// ---------------------------------------------------------------- packed

/**
 * One order to pack. `checkChanged` is the ship-day page's own verdict (its fresh look
 * at the forecast); a changed check packs only with `confirmChangedCheck`. `packs`, when
 * given, are the packs the keeper really puts in (a confirmed change asking for others).
 */
export type PackItem = {
	orderId: number;
	checkChanged?: boolean;
	confirmChangedCheck?: boolean;
	packs?: readonly Pack[];
};

export type PackedOrder = {
	orderId: number;
	orderNumber: string;
	shipmentId: number;
	packs: Pack[];
	shipCheckId: number | null;
};

export type PackRefused = {
	orderId: number;
	orderNumber: string | null;
	problem: string;
	/** The shortfalls that block it, when that is why. */
	shortfalls: ClutchShortfall[];
};

export type PackOutcome = { packed: PackedOrder[]; refused: PackRefused[] };

function shortfallSentence(orderNumber: string, shortfalls: readonly ClutchShortfall[]): string {
	const clutches = shortfalls
		.map(
			(s) => `clutch ${s.clutchCode} (${s.speciesName}) has ${s.alive} alive against ${s.sold} sold`
		)
		.join('; ');
	return `${orderNumber} cannot be packed: ${clutches}. Substitute a clutch of the same species and stage, or refund the line, first.`;
}

function notPackable(order: LockedOrder): string | null {
	const number = order.order_number;
	switch (order.state) {
		case 'scheduled':
		case 'paid':
			return null; // the state machine decides (paid packs only with nothing live)
		case 'packed':
			return `${number} is packed already.`;
		case 'shipped':
		case 'delivered':
		case 'part_refunded':
			return `${number} has already left the shop.`;
		case 'weather_hold':
			return `${number} is on weather hold: it packs once the ship check sets a safe date.`;
		case 'awaiting_payment':
			return `${number} is not paid yet.`;
		default:
			return `${number} is ${stateWord(order.state)}: there is nothing to pack.`;
	}
}

async function packOne(trx: Trx, actor: Actor, item: PackItem): Promise<PackedOrder | PackRefused> {
	const refuse = (
		orderNumber: string | null,
		problem: string,
		shortfalls: ClutchShortfall[] = []
	) => ({ orderId: item.orderId, orderNumber, problem, shortfalls }) satisfies PackRefused;
	const order = await lockOrder(trx, item.orderId);
	if (!order) return refuse(null, `There is no order #${item.orderId}.`);
	const stateProblem = notPackable(order);
	if (stateProblem) return refuse(order.order_number, stateProblem);
	const shortfalls = (await shortfallsForOrders(trx, [order.id])).get(order.id) ?? [];
	if (shortfalls.length > 0)
		return refuse(
			order.order_number,
			shortfallSentence(order.order_number, shortfalls),
			shortfalls
		);
	const confirmed = item.checkChanged === true && item.confirmChangedCheck === true;
	if (item.checkChanged && !confirmed)
		return refuse(
			order.order_number,
			`${order.order_number}: the ship check changed since it was scheduled. Look at what changed, then tick that you have seen it to pack it anyway.`
		);

	const check = await checkOf(trx, order.id, null);
	const checkPacks = check?.decision === 'ship' ? check.packs : [];
	const packs = item.packs ? [...new Set(item.packs)].sort() : [...checkPacks];
	const note = `Packed ${packWords(packs)}.${confirmed ? ' The keeper saw the changed ship check and packed it anyway.' : ''}`;
	const moved = await moveOrder(trx, order.id, 'packed', userActor(actor), note, {
		audit: {
			action: 'shipment.pack',
			detail: {
				shipCheckId: check?.id ?? null,
				packs,
				checkPacks,
				checkChanged: item.checkChanged === true,
				confirmedChange: confirmed
			}
		}
	});
	if (!moved.ok) return refuse(order.order_number, moved.problem);
	const now = new Date();
	const shipment = await trx
		.insertInto('shipment')
		.values({
			order_id: order.id,
			// The carrier is chosen when the box is handed over.
			carrier: '',
			packs,
			packed_at: now,
			ship_check_id: check?.id ?? null,
			created_by: actor.userId
		})
		.onConflict((conflict) =>
			conflict
				.column('order_id')
				.doUpdateSet({ packs, packed_at: now, ship_check_id: check?.id ?? null })
		)
		.returning('id')
		.executeTakeFirstOrThrow();
	return {
		orderId: order.id,
		orderNumber: order.order_number,
		shipmentId: shipment.id,
		packs,
		shipCheckId: check?.id ?? null
	};
}

/**
 * Marks each order packed, each in its own transaction: one box refused (a shortfall,
 * a changed ship check not confirmed, a state that cannot move) never holds back the
 * rest of a batch. Creates the order's one shipment row with the packs of its latest
 * ship check (or the keeper's, for a confirmed change) and the check it was packed on.
 */
export async function markPacked(
	db: Db,
	actor: Actor,
	input: { orders: readonly PackItem[] }
): Promise<PackOutcome> {
	const outcome: PackOutcome = { packed: [], refused: [] };
	const items = [...new Map(input.orders.map((item) => [item.orderId, item])).values()];
	if (!(await hasRole(db, actor, 'keeper'))) {
		outcome.refused = items.map((item) => ({
			orderId: item.orderId,
			orderNumber: null,
			problem: KEEPERS_ONLY.problem,
			shortfalls: []
		}));
		return outcome;
	}
	for (const item of items) {
		const result = await db.transaction().execute((trx) => packOne(trx, actor, item));
		if ('shipmentId' in result) outcome.packed.push(result);
		else outcome.refused.push(result);
	}
	return outcome;
}

// ---------------------------------------------------------------- shipped

export type ShipInput = {
	orderId: number;
	carrier: string;
	trackingNumber: string;
	/** The keeper knows a live box goes out on another day than its ship check cleared. */
	confirmOffDay?: boolean;
};

export type ShipOutcome =
	| {
			ok: true;
			orderId: number;
			orderNumber: string;
			shipmentId: number;
			carrier: Carrier;
			trackingNumber: string | null;
			trackingUrl: string | null;
			expectedDeliveryOn: IsoDate;
			/** The queued ship_notice (outgoing_mail.id). */
			mailId: number;
	  }
	| MarkRefusal;

function notShippable(order: LockedOrder): string {
	const number = order.order_number;
	if (order.state === 'scheduled' || order.state === 'paid')
		return `${number} is not packed yet: mark it packed first.`;
	if (['shipped', 'delivered', 'part_refunded'].includes(order.state))
		return `${number} is ${stateWord(order.state)} already.`;
	return `${number} is ${stateWord(order.state)}: only a packed box can be marked shipped.`;
}

/**
 * Marks a packed box shipped: checks the tracking number against the carrier's published
 * formats (hand delivery needs none), records carrier, number, the time and the expected
 * delivery day, moves the order to shipped and queues exactly one ship notice, all in
 * one transaction under the order's lock — a second click finds it shipped and sends nothing.
 */
export async function markShipped(
	db: Db,
	actor: Actor,
	input: ShipInput,
	links: MarkLinks,
	options: { now?: Date } = {}
): Promise<ShipOutcome> {
	if (!(await hasRole(db, actor, 'keeper'))) return KEEPERS_ONLY;
	const carrier = carrierFrom(input.carrier);
	if (!carrier) return refusal(400, 'Pick the carrier, or hand delivery.', 'carrier');
	const numberProblem = trackingProblem(carrier, input.trackingNumber);
	if (numberProblem) return refusal(400, numberProblem, 'trackingNumber');
	const trackingNumber = carrier === 'hand' ? null : normalizeTrackingNumber(input.trackingNumber);
	const now = options.now ?? new Date();

	const shipping = db.transaction().execute(async (trx): Promise<ShipOutcome> => {
		const order = await lockOrder(trx, input.orderId);
		if (!order) return refusal(404, `There is no order #${input.orderId}.`);
		if (order.state !== 'packed') return refusal(409, notShippable(order));
		if (trackingNumber) {
			const taken = await trx
				.selectFrom('shipment as s')
				.innerJoin('customer_order as o', 'o.id', 's.order_id')
				.select('o.order_number')
				.where('s.carrier', '=', carrier)
				.where('s.tracking_number', '=', trackingNumber)
				.where('s.order_id', '<>', order.id)
				.executeTakeFirst();
			if (taken)
				return refusal(
					409,
					`That ${carrierLabels[carrier]} number is already on order ${taken.order_number}.`,
					'trackingNumber'
				);
		}
		let shipment = await lockShipment(trx, order.id);
		if (!shipment) {
			// Packed before shipments were recorded: the box still gets its one row.
			const latest = await checkOf(trx, order.id, null);
			await trx
				.insertInto('shipment')
				.values({
					order_id: order.id,
					carrier: '',
					packs: latest?.decision === 'ship' ? latest.packs : [],
					packed_at: now,
					ship_check_id: latest?.id ?? null,
					created_by: actor.userId
				})
				.execute();
			shipment = await lockShipment(trx, order.id);
			if (!shipment) throw new Error(`the shipment of order ${order.id} was not written`);
		}
		const settings = await shopSettings(trx);
		const check = await checkOf(trx, order.id, shipment.ship_check_id);
		const shippedOn = todayInZone(settings.timeZone, now);
		// The forecast cleared one day for live animals; another day needs the keeper's word.
		if (
			carrier !== 'hand' &&
			order.ship_on &&
			order.ship_on !== shippedOn &&
			!input.confirmOffDay &&
			(await hasLiveLine(trx, order.id))
		)
			return refusal(
				409,
				`${order.order_number}'s ship check cleared ${formatShopDate(order.ship_on, 'UTC')} for its animals, not today. Re-check it, or tick that you ship it today anyway.`,
				'confirmOffDay'
			);
		const expected = expectedDeliveryOn({
			shippedOn,
			service: order.service,
			carrier,
			check:
				check?.decision === 'ship'
					? { shipDate: check.ship_date, deliveryDate: check.delivery_date }
					: null,
			extraClosedDates: settings.extraClosedDates
		});
		const how = describeCarrier(carrier, trackingNumber);
		const moved = await moveOrder(
			trx,
			order.id,
			'shipped',
			userActor(actor),
			carrier === 'hand'
				? 'Handed over in person; nothing to track.'
				: `Shipped by ${how}; due ${formatShopDate(expected, 'UTC')}.`,
			{
				expectFrom: 'packed',
				audit: {
					action: 'shipment.ship',
					detail: {
						shipmentId: shipment.id,
						carrier,
						trackingNumber,
						expectedDeliveryOn: expected
					}
				}
			}
		);
		if (!moved.ok) throw new Refused(refusal(409, moved.problem));
		await trx
			.updateTable('shipment')
			.set({
				carrier,
				tracking_number: trackingNumber,
				shipped_at: now,
				expected_delivery_on: expected,
				delivered_at: null,
				delivered_by: null,
				late_notice_sent_at: null
			})
			.where('id', '=', shipment.id)
			.execute();
		const url = trackingLink(carrier, trackingNumber);
		const mailId = await queueMail(trx, {
			kind: 'ship_notice',
			to: order.email,
			name: order.ship_name,
			orderNumber: order.order_number,
			service: order.service,
			carrier,
			trackingNumber,
			trackingUrl: url,
			shippedOn,
			expectedDeliveryOn: expected,
			packs: shipment.packs,
			facilityPickup: check?.decision === 'ship' && check.facility_pickup,
			hasLive: await hasLiveLine(trx, order.id),
			claimWindowHours: settings.claimWindowHours,
			orderUrl: await orderUrl(trx, links, order)
		});
		return {
			ok: true,
			orderId: order.id,
			orderNumber: order.order_number,
			shipmentId: shipment.id,
			carrier,
			trackingNumber,
			trackingUrl: url,
			expectedDeliveryOn: expected,
			mailId
		};
	});
	try {
		return await settle(shipping);
	} catch (error) {
		// Two boxes given one number at the same moment: the unique key stops the second.
		if (isUniqueViolation(error))
			return refusal(
				409,
				`That ${carrierLabels[carrier]} number was just saved on another order.`,
				'trackingNumber'
			);
		throw error;
	}
}

// ---------------------------------------------------------------- delivered

export type DeliverOutcome =
	| {
			ok: true;
			orderId: number;
			orderNumber: string;
			deliveredAt: Date;
			deliveredBy: 'keeper' | 'tracking';
			/** The end of the DOA claim window the delivery opened. */
			claimWindowClosesAt: Date;
	  }
	| MarkRefusal;

/**
 * Marks a shipped order delivered inside the caller's transaction (the tracking webhook
 * stores its event in the same one). The order's and the shipment's delivered_at are
 * set together: that instant opens the DOA claim window. Refusals write nothing.
 */
export async function markDeliveredIn(
	trx: Trx,
	by: DeliveryMarker,
	input: { orderId: number; at: Date },
	options: { now?: Date } = {}
): Promise<DeliverOutcome> {
	const now = options.now ?? new Date();
	const byTracking = 'kind' in by;
	if (Number.isNaN(input.at.getTime()))
		return refusal(400, 'Pick the day and time it was delivered.', 'deliveredAt');
	if (input.at.getTime() > now.getTime() + DELIVERY_CLOCK_SLACK_MS)
		return refusal(
			400,
			'That is in the future: mark it delivered once it has arrived.',
			'deliveredAt'
		);
	const order = await lockOrder(trx, input.orderId);
	if (!order) return refusal(404, `There is no order #${input.orderId}.`);
	const settings = await shopSettings(trx);
	if (order.state !== 'shipped') {
		const words =
			order.state === 'delivered' || order.state === 'part_refunded'
				? `${order.order_number} is delivered already.`
				: `${order.order_number} is ${stateWord(order.state)}: only a shipped box can be marked delivered.`;
		return refusal(409, words);
	}
	const shipment = await lockShipment(trx, order.id);
	if (!shipment?.shipped_at)
		return refusal(409, `${order.order_number} has no shipment on record that left the shop.`);
	if (!byTracking && input.at < shipment.shipped_at)
		return refusal(
			400,
			`That is before the box left the shop (${formatShopDateTime(shipment.shipped_at, settings.timeZone)}).`,
			'deliveredAt'
		);
	const when = formatShopDateTime(input.at, settings.timeZone);
	const moved = await moveOrder(
		trx,
		order.id,
		'delivered',
		byTracking ? { kind: 'webhook' } : userActor(by),
		byTracking
			? `The carrier reported it delivered, ${when}.`
			: `Delivered ${when}, marked by the shop.`,
		{
			set: { delivered_at: input.at },
			expectFrom: 'shipped',
			audit: {
				action: 'shipment.deliver',
				detail: {
					shipmentId: shipment.id,
					deliveredAt: input.at.toISOString(),
					deliveredBy: byTracking ? 'tracking' : 'keeper',
					...(byTracking && by.trackingEventId ? { trackingEventId: by.trackingEventId } : {})
				}
			}
		}
	);
	if (!moved.ok) return refusal(409, moved.problem);
	await trx
		.updateTable('shipment')
		.set({ delivered_at: input.at, delivered_by: byTracking ? 'tracking' : 'keeper' })
		.where('id', '=', shipment.id)
		.execute();
	return {
		ok: true,
		orderId: order.id,
		orderNumber: order.order_number,
		deliveredAt: input.at,
		deliveredBy: byTracking ? 'tracking' : 'keeper',
		claimWindowClosesAt: new Date(input.at.getTime() + settings.claimWindowHours * HOUR_MS)
	};
}

/**
 * Marks a shipped order delivered at `at`, by a keeper or from a carrier's update: this
 * opens the DOA claim window (claim_window_hours from that instant).
 */
export async function markDelivered(
	db: Db,
	by: DeliveryMarker,
	input: { orderId: number; at: Date },
	options: { now?: Date } = {}
): Promise<DeliverOutcome> {
	if (!('kind' in by) && !(await hasRole(db, by, 'keeper'))) return KEEPERS_ONLY;
	return db.transaction().execute((trx) => markDeliveredIn(trx, by, input, options));
}

// ---------------------------------------------------------------- undo

export type ReverseOutcome =
	| { ok: true; orderId: number; orderNumber: string; from: ReversibleMark; to: OrderState }
	| MarkRefusal;

function isReversible(state: OrderState): state is ReversibleMark {
	return state in REVERSAL_TO;
}

/**
 * An admin's undo of the latest mark, with a written reason: packed → scheduled,
 * shipped → packed, delivered → shipped (the state machine's reversals), clearing the
 * shipment's matching times. `from` is the mark the admin saw, so a page gone stale
 * undoes nothing. A delivery a claim was filed against stays: the claim rests on it.
 */
export async function reverseMark(
	db: Db,
	actor: Actor,
	input: { orderId: number; reason: string; from?: ReversibleMark }
): Promise<ReverseOutcome> {
	if (!(await hasRole(db, actor, 'admin')))
		return refusal(403, 'Only the shop owner can undo a mark.');
	const reason = input.reason.trim();
	if (reason.length < MOVE_REASON_MIN_LENGTH)
		return refusal(
			400,
			`Write why in a sentence (at least ${MOVE_REASON_MIN_LENGTH} characters): the order's history keeps it.`,
			'reason'
		);
	const reversing = db.transaction().execute(async (trx): Promise<ReverseOutcome> => {
		const order = await lockOrder(trx, input.orderId);
		if (!order) return refusal(404, `There is no order #${input.orderId}.`);
		const from = order.state;
		if (!isReversible(from))
			return refusal(
				409,
				`${order.order_number} is ${stateWord(from)}: only a packed, shipped or delivered mark can be undone.`
			);
		if (input.from && input.from !== from)
			return refusal(
				409,
				`${order.order_number} is ${stateWord(from)} now, not ${stateWord(input.from)}; nothing was undone. Look at it again.`,
				'from'
			);
		if (from === 'delivered') {
			const claim = await trx
				.selectFrom('claim')
				.select('id')
				.where('order_id', '=', order.id)
				.limit(1)
				.executeTakeFirst();
			if (claim)
				return refusal(
					409,
					`A DOA claim was filed against ${order.order_number}'s delivery, so its delivery time stays on record.`
				);
		}
		const to = REVERSAL_TO[from];
		const shipment = await lockShipment(trx, order.id);
		const moved = await moveOrder(trx, order.id, to, userActor(actor), reason, {
			expectFrom: from,
			set: from === 'delivered' ? { delivered_at: null } : undefined,
			audit: {
				action: 'shipment.reverse',
				detail: { undid: from, reason, shipmentId: shipment?.id ?? null }
			}
		});
		if (!moved.ok) return refusal(409, moved.problem);
		if (shipment) {
			await trx
				.updateTable('shipment')
				.set(
					from === 'packed'
						? { packed_at: null }
						: from === 'shipped'
							? {
									carrier: '',
									tracking_number: null,
									shipped_at: null,
									expected_delivery_on: null,
									late_notice_sent_at: null
								}
							: { delivered_at: null, delivered_by: null }
				)
				.where('id', '=', shipment.id)
				.execute();
		}
		return { ok: true, orderId: order.id, orderNumber: order.order_number, from, to };
	});
	return settle(reversing);
}

// ---------------------------------------------------------------- late

export type LateShipment = {
	orderId: number;
	orderNumber: string;
	customerName: string;
	email: string;
	service: Service;
	carrier: string;
	/** "UPS 1Z…", or the hand-delivery words. */
	carrierWords: string;
	trackingNumber: string | null;
	trackingUrl: string | null;
	shippedAt: Date;
	expectedDeliveryOn: IsoDate;
	/** Whole days past the expected day, 1 or more. */
	daysLate: number;
	/** When the customer was e-mailed about it; null while they have not been. */
	lateNoticeSentAt: Date | null;
	/** The carrier's latest word on it, if any came. */
	lastUpdate: { status: TrackingStatus; occurredAt: Date; detail: string } | null;
};

/**
 * Boxes shipped and not delivered whose expected day is before `today` (shop-local),
 * the longest overdue first.
 */
export async function lateShipments(db: Db, today: IsoDate): Promise<LateShipment[]> {
	const rows = await db
		.selectFrom('shipment as s')
		.innerJoin('customer_order as o', 'o.id', 's.order_id')
		.select([
			's.id as shipment_id',
			'o.id',
			'o.order_number',
			'o.ship_name',
			'o.email',
			'o.service',
			's.carrier',
			's.tracking_number',
			's.shipped_at',
			's.expected_delivery_on',
			's.late_notice_sent_at'
		])
		.where('o.state', '=', 'shipped')
		.where('s.shipped_at', 'is not', null)
		.where('s.delivered_at', 'is', null)
		.where('s.expected_delivery_on', '<', today)
		.orderBy('s.expected_delivery_on')
		.orderBy('o.order_number')
		.execute();
	const events =
		rows.length === 0
			? []
			: await db
					.selectFrom('tracking_event')
					.select(['shipment_id', 'status', 'occurred_at', 'detail'])
					.where(
						'shipment_id',
						'in',
						rows.map((row) => row.shipment_id)
					)
					.orderBy('occurred_at', 'desc')
					.orderBy('id', 'desc')
					.execute();
	return rows.map((row) => {
		const last = events.find((event) => event.shipment_id === row.shipment_id);
		const carrier = carrierFrom(row.carrier);
		const expected = row.expected_delivery_on as IsoDate;
		return {
			orderId: row.id,
			orderNumber: row.order_number,
			customerName: row.ship_name,
			email: row.email,
			service: row.service,
			carrier: row.carrier,
			carrierWords: describeCarrier(row.carrier, row.tracking_number),
			trackingNumber: row.tracking_number,
			trackingUrl: carrier ? trackingLink(carrier, row.tracking_number) : null,
			shippedAt: row.shipped_at as Date,
			expectedDeliveryOn: expected,
			daysLate: daysBetween(expected, today),
			lateNoticeSentAt: row.late_notice_sent_at,
			lastUpdate: last
				? { status: last.status, occurredAt: last.occurred_at, detail: last.detail }
				: null
		};
	});
}

export type LateNoticeOutcome =
	{ ok: true; orderId: number; orderNumber: string; mailId: number } | MarkRefusal;

/**
 * E-mails the customer that their box is late and what to do, once per shipment: the
 * shipment's late_notice_sent_at is set in the same transaction as the queued mail.
 */
export async function sendLateNotice(
	db: Db,
	actor: Actor,
	input: { orderId: number },
	links: MarkLinks,
	options: { now?: Date } = {}
): Promise<LateNoticeOutcome> {
	if (!(await hasRole(db, actor, 'keeper'))) return KEEPERS_ONLY;
	const now = options.now ?? new Date();
	return db.transaction().execute(async (trx): Promise<LateNoticeOutcome> => {
		const order = await lockOrder(trx, input.orderId);
		if (!order) return refusal(404, `There is no order #${input.orderId}.`);
		if (order.state !== 'shipped')
			return refusal(
				409,
				`${order.order_number} is ${stateWord(order.state)}: only a box on its way can be late.`
			);
		const shipment = await lockShipment(trx, order.id);
		if (!shipment?.shipped_at || !shipment.expected_delivery_on || shipment.delivered_at)
			return refusal(409, `${order.order_number} has no box on its way.`);
		const settings = await shopSettings(trx);
		const today = todayInZone(settings.timeZone, now);
		if (shipment.expected_delivery_on >= today)
			return refusal(
				409,
				`${order.order_number} is not late: it is due ${formatShopDate(shipment.expected_delivery_on, 'UTC')}.`
			);
		if (shipment.late_notice_sent_at)
			return refusal(
				409,
				`The customer was told it is late on ${formatShopDateTime(shipment.late_notice_sent_at, settings.timeZone)}; that e-mail goes once per box.`
			);
		const carrier = carrierFrom(shipment.carrier) ?? 'hand';
		const mailId = await queueMail(trx, {
			kind: 'delivery_late',
			to: order.email,
			name: order.ship_name,
			orderNumber: order.order_number,
			carrier,
			trackingNumber: shipment.tracking_number,
			trackingUrl: trackingLink(carrier, shipment.tracking_number),
			expectedDeliveryOn: shipment.expected_delivery_on,
			hasLive: await hasLiveLine(trx, order.id),
			claimWindowHours: settings.claimWindowHours,
			orderUrl: await orderUrl(trx, links, order)
		});
		await trx
			.updateTable('shipment')
			.set({ late_notice_sent_at: now })
			.where('id', '=', shipment.id)
			.execute();
		await noteOrder(
			trx,
			order.id,
			userActor(actor),
			'The customer was e-mailed that the box is later than expected.'
		);
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'shipment.late_notice',
			entity: 'customer_order',
			entityId: order.id,
			detail: { shipmentId: shipment.id, expectedDeliveryOn: shipment.expected_delivery_on, mailId }
		});
		return { ok: true, orderId: order.id, orderNumber: order.order_number, mailId };
	});
}
