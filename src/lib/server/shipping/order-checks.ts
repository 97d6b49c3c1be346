// Ship checks on orders: the one module that writes ship_check rows for an order and
// moves it between paid, scheduled and weather_hold. Forecasts are fetched before any
// transaction opens; the move itself runs under a row lock on the order, so a check
// racing another (or a keeper's override) decides from the row as it really is.
//
// Mail follows the customer's point of view: a held order that gets a date, a date
// that moves, and a date that is lost each send one e-mail; a check that changes
// nothing sends none, so running the daily job twice sends nothing twice.
//
// State changes go through `moveOrder` (server/orders/transitions.ts), which checks them
// against the order state machine; a date moved within `scheduled` is a history note.
import type { Kysely, Transaction } from 'kysely';
import { addDays, formatShopDate, type IsoDate } from '$lib/format/dates';
import { writeAudit, type Actor } from '$lib/server/audit';
import { shopClock } from '$lib/server/backoffice/settings';
import type { Database, OrderState, Pack, Service, ShopSetting } from '$lib/server/db/schema';
import { queueMail } from '$lib/server/mail';
import { hasLiveLine, moveOrder, noteOrder, type OrderActor } from '$lib/server/orders/transitions';
import type { ForecastSource } from '$lib/server/weather/source';
import { deliveryDateFor } from '$lib/shipping/calendar';
import { overrideReasonProblem, overrideShipDateProblem } from '$lib/shipping/override';
import { describeReason } from '$lib/shipping/reasons';
import { shipCheck, type Reason, type ShipCheckResult } from '$lib/shipping/ship-check';
import { buildShipCheckInput, rememberingSource, RULE_VERSION } from './inputs';
import { logger } from '../log';

type Db = Kysely<Database>;

/** The states a ship check applies to; packed and later orders are never touched. */
export const CHECKED_STATES = ['paid', 'scheduled', 'weather_hold'] as const;
export type CheckedState = (typeof CHECKED_STATES)[number];

/** Who runs a check: the daily job (system) or a keeper pressing "check again" (user). */
export type CheckActor = { kind: 'system' | 'user'; userId?: string | null; ip?: string | null };

export type ShipCheckMail = 'ship_date_set' | 'ship_date_lost';

export type SkipReason =
	| 'not_found'
	| 'not_checked_state'
	| 'nothing_live'
	| 'override_stands'
	| 'changed_meanwhile'
	| 'refused';

export type OrderCheckOutcome =
	| {
			outcome: 'checked';
			orderId: number;
			orderNumber: string;
			shipCheckId: number;
			result: ShipCheckResult;
			fromState: CheckedState;
			toState: 'scheduled' | 'weather_hold';
			shipOn: IsoDate | null;
			previousShipOn: IsoDate | null;
			/** True when the state or the ship date changed. */
			moved: boolean;
			mailed: ShipCheckMail | null;
			/** One sentence for the keeper who asked. */
			message: string;
	  }
	| { outcome: 'skipped'; orderId: number; why: SkipReason; message: string };

/** A stored ship check, as the board and the order page read it. */
export type StoredShipCheck = {
	id: number;
	orderId: number | null;
	firstDate: IsoDate;
	service: Service;
	decision: 'ship' | 'hold';
	shipDate: IsoDate | null;
	deliveryDate: IsoDate | null;
	recheckDate: IsoDate | null;
	packs: Pack[];
	facilityPickup: boolean;
	reasons: Reason[];
	inputs: unknown;
	ruleVersion: string;
	overrideReason: string | null;
	overriddenBy: string | null;
	checkedAt: Date;
};

export type OverrideDecision =
	{ decision: 'ship'; shipDate: IsoDate; reason: string } | { decision: 'hold'; reason: string };

export type OverrideOutcome =
	| {
			ok: true;
			shipCheckId: number;
			fromState: CheckedState;
			toState: 'scheduled' | 'weather_hold';
			shipOn: IsoDate | null;
			mailed: ShipCheckMail | null;
	  }
	/** `field` names the form field the problem belongs to ('' for the form as a whole). */
	| { ok: false; field: 'reason' | 'shipDate' | ''; problem: string };

export type RecheckCounts = {
	/** Open orders the run looked at. */
	considered: number;
	scheduled: number;
	held: number;
	/** Orders whose state or ship date changed. */
	moved: number;
	mailed: number;
	skipped: number;
	failed: number;
};

// Calendar dates carry no zone; 'UTC' only tells the formatter not to shift the day.
const day = (date: IsoDate) => formatShopDate(date, 'UTC');

function isCheckedState(state: OrderState): state is CheckedState {
	return (CHECKED_STATES as readonly string[]).includes(state);
}

/** jsonb arrives parsed; anything not shaped like a fired rule is dropped. */
function asReasons(value: unknown): Reason[] {
	if (!Array.isArray(value)) return [];
	return value.filter(
		(item): item is Reason =>
			typeof item === 'object' &&
			item !== null &&
			typeof (item as Reason).rule === 'string' &&
			typeof (item as Reason).date === 'string' &&
			typeof (item as Reason).place === 'string' &&
			typeof (item as Reason).valueF === 'number' &&
			typeof (item as Reason).limitF === 'number'
	);
}

/** "with a heat pack", "with a cold pack", or nothing. */
function packWords(packs: readonly Pack[]): string {
	return packs.length ? ` with a ${packs.join(' and ')} pack` : '';
}

/** The sentences of a hold's reasons, each said once (two-day routes see a day twice). */
function reasonSentences(reasons: readonly Reason[]): string[] {
	return [...new Set(reasons.map(describeReason))];
}

/**
 * The latest ship check of an order (the last one written), or undefined. Ordered by
 * id, not checked_at: the id is the order the decisions were made in.
 */
export async function latestShipCheck(
	db: Db,
	orderId: number
): Promise<StoredShipCheck | undefined> {
	const row = await db
		.selectFrom('ship_check')
		.selectAll()
		.where('order_id', '=', orderId)
		.orderBy('id', 'desc')
		.limit(1)
		.executeTakeFirst();
	if (!row) return undefined;
	return {
		id: row.id,
		orderId: row.order_id,
		firstDate: row.first_date,
		service: row.service,
		decision: row.decision,
		shipDate: row.ship_date,
		deliveryDate: row.delivery_date,
		recheckDate: row.recheck_date,
		packs: row.packs,
		facilityPickup: row.facility_pickup,
		reasons: asReasons(row.reasons),
		inputs: row.inputs,
		ruleVersion: row.rule_version,
		overrideReason: row.override_reason,
		overriddenBy: row.overridden_by,
		checkedAt: row.checked_at
	};
}

type OrderRow = {
	id: number;
	order_number: string;
	state: OrderState;
	service: Service;
	ship_zip: string;
	ship_on: IsoDate | null;
	ship_name: string;
	email: string;
};

async function readOrder(db: Db, orderId: number, lock: boolean): Promise<OrderRow | undefined> {
	let query = db
		.selectFrom('customer_order')
		.select(['id', 'order_number', 'state', 'service', 'ship_zip', 'ship_on', 'ship_name', 'email'])
		.where('id', '=', orderId);
	if (lock) query = query.forUpdate();
	return query.executeTakeFirst();
}

async function settingsOf(db: Db): Promise<ShopSetting> {
	const settings = await db
		.selectFrom('shop_setting')
		.selectAll()
		.where('id', '=', true)
		.executeTakeFirst();
	if (!settings) throw new Error('shop_setting has no row: the shop settings must exist first');
	return settings;
}

/**
 * The first day a check may pick. A scheduled order keeps its date while that date is
 * still safe: the check starts from it, so a recheck only ever moves a date later
 * (weather closing in) and never pulls a box forward that the keeper planned for.
 */
function firstDateFor(order: OrderRow, today: IsoDate): IsoDate {
	if (order.state === 'scheduled' && order.ship_on && order.ship_on > today) return order.ship_on;
	return today;
}

type Move = {
	to: 'scheduled' | 'weather_hold';
	shipOn: IsoDate | null;
	/** For the ship_date_set mail. */
	deliveryDate: IsoDate | null;
	packs: Pack[];
	facilityPickup: boolean;
	/** For the ship_date_lost mail: who held it, and the forecast's sentences. */
	heldBy: 'forecast' | 'keeper';
	holdSentences: string[];
};

/** Which mail the customer gets for a move, if any; from paid they have had no date yet. */
function mailFor(order: OrderRow, move: Move): ShipCheckMail | null {
	if (move.to === 'scheduled') {
		if (order.state === 'weather_hold') return 'ship_date_set';
		if (order.state === 'scheduled' && order.ship_on !== null && order.ship_on !== move.shipOn)
			return 'ship_date_set';
		return null;
	}
	return order.state === 'scheduled' && order.ship_on !== null ? 'ship_date_lost' : null;
}

/** The state machine refused a move; thrown inside the transaction so nothing is kept. */
class MoveRefused extends Error {}

type AuditOf = { action: string; detail: Record<string, unknown> };

/**
 * Applies a move to a locked order: a state change through `moveOrder` (with the
 * caller's audit entry, when given), or a ship date moved in place with its history
 * note (when `event.note` is given), then the customer's mail. Returns the mail
 * queued, and whether the caller's audit entry has been written.
 */
async function applyMove(
	trx: Transaction<Database>,
	order: OrderRow,
	move: Move,
	event: { note: string | null; actor: OrderActor; audit?: AuditOf }
): Promise<{ mailed: ShipCheckMail | null; audited: boolean }> {
	const changed = order.state !== move.to || order.ship_on !== move.shipOn;
	let audited = false;
	if (order.state !== move.to) {
		const moved = await moveOrder(trx, order.id, move.to, event.actor, event.note ?? '', {
			set: { ship_on: move.shipOn },
			audit: event.audit,
			expectFrom: order.state
		});
		if (!moved.ok) throw new MoveRefused(moved.problem);
		audited = event.audit !== undefined;
	} else {
		if (changed) {
			await trx
				.updateTable('customer_order')
				.set({ ship_on: move.shipOn, updated_at: new Date() })
				.where('id', '=', order.id)
				.execute();
		}
		if (event.note !== null) await noteOrder(trx, order.id, event.actor, event.note);
	}
	const mailed = await mailOf(trx, order, move, changed);
	return { mailed, audited };
}

/** Queues the customer's mail for a move, if it calls for one. */
async function mailOf(
	trx: Transaction<Database>,
	order: OrderRow,
	move: Move,
	changed: boolean
): Promise<ShipCheckMail | null> {
	const mail = changed ? mailFor(order, move) : null;
	if (mail === 'ship_date_set' && move.shipOn && move.deliveryDate) {
		await queueMail(trx, {
			kind: 'ship_date_set',
			to: order.email,
			name: order.ship_name,
			orderNumber: order.order_number,
			service: order.service,
			shipDate: move.shipOn,
			deliveryDate: move.deliveryDate,
			packs: move.packs,
			facilityPickup: move.facilityPickup,
			previousShipDate: order.state === 'scheduled' ? order.ship_on : null
		});
		return mail;
	}
	if (mail === 'ship_date_lost' && order.ship_on) {
		await queueMail(trx, {
			kind: 'ship_date_lost',
			to: order.email,
			name: order.ship_name,
			orderNumber: order.order_number,
			previousShipDate: order.ship_on,
			heldBy: move.heldBy,
			reasons: move.holdSentences
		});
		return mail;
	}
	return null;
}

function moveOf(result: ShipCheckResult): Move {
	if (result.decision === 'ship') {
		return {
			to: 'scheduled',
			shipOn: result.shipDate,
			deliveryDate: result.deliveryDate,
			packs: [...result.packs],
			facilityPickup: result.facilityPickup,
			heldBy: 'forecast',
			holdSentences: []
		};
	}
	return {
		to: 'weather_hold',
		shipOn: null,
		deliveryDate: null,
		packs: [],
		facilityPickup: false,
		heldBy: 'forecast',
		holdSentences: reasonSentences(result.reasons)
	};
}

/** The order_event note of a checked move, or null when nothing an event records changed. */
function checkEventNote(order: OrderRow, result: ShipCheckResult): string | null {
	if (result.decision === 'ship') {
		const what = `ships ${day(result.shipDate)}${packWords(result.packs)}`;
		const pickup = result.facilityPickup ? ', held at a carrier facility for pickup' : '';
		if (order.state !== 'scheduled') return `Ship check: ${what}${pickup}.`;
		if (order.ship_on !== result.shipDate)
			return `Ship check: ship date moved${order.ship_on ? ` from ${day(order.ship_on)}` : ''}; ${what}${pickup}.`;
		return null;
	}
	if (order.state === 'weather_hold') return null;
	const first = result.reasons[0];
	return `Ship check: weather hold. ${first ? describeReason(first) : 'No safe ship date within the forecast.'}`;
}

function checkedMessage(order: OrderRow, result: ShipCheckResult, moved: boolean): string {
	if (result.decision === 'ship') {
		const pickup = result.facilityPickup ? '; suggest facility pickup' : '';
		const base = `${order.order_number} ships ${day(result.shipDate)}${packWords(result.packs)}, arriving ${day(result.deliveryDate)}${pickup}`;
		return moved ? `${base}.` : `${base} (unchanged).`;
	}
	const first = result.reasons[0];
	return `${order.order_number} is on weather hold${moved ? '' : ' (unchanged)'}; the forecast is looked at again on ${day(result.recheckDate)}.${first ? ` ${describeReason(first)}` : ''}`;
}

function skipped(orderId: number, why: SkipReason, message: string): OrderCheckOutcome {
	return { outcome: 'skipped', orderId, why, message };
}

/**
 * The ship check as it would come out now for a route starting on `firstDate`, with
 * nothing written: the ship-day page's look at whether a scheduled box still holds.
 */
export async function previewShipCheck(
	db: Db,
	source: ForecastSource,
	route: { service: Service; destinationZip: string; firstDate: IsoDate }
): Promise<ShipCheckResult> {
	return shipCheck(await buildShipCheckInput(source, await settingsOf(db), route));
}

/**
 * Runs the ship check for one order in paid, scheduled or weather_hold and moves it:
 * a ship decision schedules it on the ship date, a hold puts it on weather hold with
 * no ship date. Writes the ship_check row (inputs snapshot, result, rule version),
 * an order_event when the state or date changes, the customer's mail, and for a
 * keeper's check an audit entry, all in one transaction under a lock on the order.
 *
 * The daily job (actor 'system') leaves an order alone while a keeper's override is
 * its latest check; a keeper's own check replaces the override. `options.today` is
 * the shop-local date (the shop's clock when not given).
 */
export async function checkOrder(
	db: Db,
	source: ForecastSource,
	orderId: number,
	actor: CheckActor,
	options: { today?: IsoDate } = {}
): Promise<OrderCheckOutcome> {
	if (actor.kind === 'user' && !actor.userId) throw new Error('a keeper check needs the userId');
	const order = await readOrder(db, orderId, false);
	if (!order) return skipped(orderId, 'not_found', `There is no order #${orderId}.`);
	const fromState = order.state;
	if (!isCheckedState(fromState)) {
		return skipped(
			orderId,
			'not_checked_state',
			`${order.order_number} is ${order.state.replaceAll('_', ' ')}; ship checks apply only to paid, scheduled and held orders.`
		);
	}
	if (!(await hasLiveLine(db, orderId))) {
		return skipped(
			orderId,
			'nothing_live',
			`${order.order_number} has nothing live in it, so the weather does not gate it.`
		);
	}
	const overrideStands = (latest: StoredShipCheck | undefined) =>
		actor.kind === 'system' && latest?.overrideReason != null;
	if (overrideStands(await latestShipCheck(db, orderId))) {
		return skipped(
			orderId,
			'override_stands',
			`${order.order_number}: a keeper's override stands until a keeper checks it again.`
		);
	}

	const today = options.today ?? (await shopClock(db)).today;
	const settings = await settingsOf(db);
	const firstDate = firstDateFor(order, today);
	// Network first, outside any transaction: a slow forecast never holds a row lock.
	const input = await buildShipCheckInput(source, settings, {
		service: order.service,
		destinationZip: order.ship_zip,
		firstDate
	});
	const result = shipCheck(input);

	const orderActor: OrderActor =
		actor.kind === 'user'
			? { kind: 'user', userId: actor.userId ?? '', ip: actor.ip ?? null }
			: { kind: 'system' };
	const checking = db.transaction().execute(async (trx): Promise<OrderCheckOutcome> => {
		const locked = await readOrder(trx, orderId, true);
		if (
			!locked ||
			locked.state !== order.state ||
			locked.ship_on !== order.ship_on ||
			locked.service !== order.service ||
			locked.ship_zip !== order.ship_zip
		) {
			return skipped(
				orderId,
				'changed_meanwhile',
				`${order.order_number} changed while it was being checked; nothing was written. Check it again.`
			);
		}
		if (overrideStands(await latestShipCheck(trx, orderId))) {
			return skipped(
				orderId,
				'override_stands',
				`${order.order_number}: a keeper's override stands until a keeper checks it again.`
			);
		}
		const inserted = await trx
			.insertInto('ship_check')
			.values({
				order_id: orderId,
				first_date: firstDate,
				service: order.service,
				decision: result.decision,
				ship_date: result.decision === 'ship' ? result.shipDate : null,
				delivery_date: result.decision === 'ship' ? result.deliveryDate : null,
				recheck_date: result.decision === 'hold' ? result.recheckDate : null,
				packs: result.decision === 'ship' ? result.packs : [],
				facility_pickup: result.decision === 'ship' && result.facilityPickup,
				reasons: JSON.stringify(result.reasons),
				inputs: JSON.stringify(input),
				rule_version: RULE_VERSION
			})
			.returning('id')
			.executeTakeFirstOrThrow();

		const move = moveOf(result);
		const moved = locked.state !== move.to || locked.ship_on !== move.shipOn;
		// A keeper's check is audited as such; the daily job's state changes get the
		// state machine's own entry.
		const audit: AuditOf | undefined =
			actor.kind === 'user'
				? {
						action: 'ship_check.run',
						detail: {
							shipCheckId: inserted.id,
							decision: result.decision,
							shipDate: move.shipOn,
							fromState: locked.state,
							toState: move.to
						}
					}
				: undefined;
		const { mailed, audited } = await applyMove(trx, locked, move, {
			note: checkEventNote(locked, result),
			actor: orderActor,
			audit
		});
		if (audit && !audited && orderActor.kind === 'user') {
			await writeAudit(trx, {
				actorUserId: orderActor.userId,
				actorIp: orderActor.ip,
				entity: 'customer_order',
				entityId: orderId,
				...audit
			});
		}
		return {
			outcome: 'checked',
			orderId,
			orderNumber: locked.order_number,
			shipCheckId: inserted.id,
			result,
			fromState,
			toState: move.to,
			shipOn: move.shipOn,
			previousShipOn: locked.ship_on,
			moved,
			mailed,
			message: checkedMessage(locked, result, moved)
		};
	});
	try {
		return await checking;
	} catch (error) {
		if (!(error instanceof MoveRefused)) throw error;
		return skipped(orderId, 'refused', error.message);
	}
}

/**
 * The daily re-check: every order in paid, scheduled or weather_hold whose ship date
 * is unset or not yet past, checked one by one for the shop-local `today`. One
 * order's failure is logged and the rest go on. Packed and shipped orders are never
 * selected, and one forecast per ZIP is asked for in a run.
 */
export async function recheckOpenOrders(
	db: Db,
	source: ForecastSource,
	today: IsoDate,
	options: { log?: (line: string) => void } = {}
): Promise<RecheckCounts> {
	const log = options.log ?? ((line: string) => logger.warn(line));
	const orders = await db
		.selectFrom('customer_order')
		.select(['id', 'order_number'])
		.where('state', 'in', CHECKED_STATES)
		.where((eb) => eb.or([eb('ship_on', 'is', null), eb('ship_on', '>=', today)]))
		.orderBy('id')
		.execute();
	const counts: RecheckCounts = {
		considered: orders.length,
		scheduled: 0,
		held: 0,
		moved: 0,
		mailed: 0,
		skipped: 0,
		failed: 0
	};
	const oncePerZip = rememberingSource(source);
	for (const order of orders) {
		try {
			const outcome = await checkOrder(db, oncePerZip, order.id, { kind: 'system' }, { today });
			if (outcome.outcome === 'skipped') {
				counts.skipped++;
				continue;
			}
			if (outcome.toState === 'scheduled') counts.scheduled++;
			else counts.held++;
			if (outcome.moved) counts.moved++;
			if (outcome.mailed) counts.mailed++;
		} catch (error) {
			counts.failed++;
			log(
				`[ship-recheck] ${order.order_number}: ${error instanceof Error ? error.message : String(error)}`
			);
		}
	}
	return counts;
}

/** One line for the job log. */
export function describeRecheckCounts(counts: RecheckCounts): string {
	return `${counts.considered} open orders: ${counts.scheduled} scheduled, ${counts.held} on hold, ${counts.moved} moved, ${counts.mailed} e-mailed, ${counts.skipped} skipped, ${counts.failed} failed`;
}

/**
 * A keeper's override of the computed decision: ship on a chosen business day, or
 * hold. Needs a written reason, refuses a date in the past or one a carrier cannot
 * take, and records a ship_check row (the previous check's inputs, the override's
 * decision and reason), an order_event with the reason as its note, the audit entry
 * and the customer's mail, in one transaction under a lock on the order.
 */
export async function overrideShipCheck(
	db: Db,
	actor: Actor,
	orderId: number,
	decision: OverrideDecision,
	options: { today?: IsoDate } = {}
): Promise<OverrideOutcome> {
	const reason = decision.reason.trim();
	const reasonProblem = overrideReasonProblem(reason);
	if (reasonProblem) return { ok: false, field: 'reason', problem: reasonProblem };
	const today = options.today ?? (await shopClock(db)).today;
	const settings = await settingsOf(db);

	const overriding = db.transaction().execute(async (trx): Promise<OverrideOutcome> => {
		const order = await readOrder(trx, orderId, true);
		if (!order) return { ok: false, field: '', problem: `There is no order #${orderId}.` };
		const fromState = order.state;
		if (!isCheckedState(fromState)) {
			return {
				ok: false,
				field: '',
				problem: `${order.order_number} is ${order.state.replaceAll('_', ' ')}; only paid, scheduled and held orders take an override.`
			};
		}
		const previous = await latestShipCheck(trx, orderId);
		let move: Move;
		if (decision.decision === 'ship') {
			const dateProblem = overrideShipDateProblem({
				shipDate: decision.shipDate,
				today,
				service: order.service,
				extraClosedDates: settings.extra_closed_dates
			});
			if (dateProblem) return { ok: false, field: 'shipDate', problem: dateProblem };
			const deliveryDate = deliveryDateFor(
				decision.shipDate,
				order.service,
				settings.extra_closed_dates
			);
			if (!deliveryDate) throw new Error('a checked override date has no delivery date');
			const shipped = previous?.decision === 'ship';
			move = {
				to: 'scheduled',
				shipOn: decision.shipDate,
				deliveryDate,
				packs: shipped ? [...previous.packs] : [],
				facilityPickup: shipped ? previous.facilityPickup : false,
				heldBy: 'keeper',
				holdSentences: []
			};
		} else {
			move = {
				to: 'weather_hold',
				shipOn: null,
				deliveryDate: null,
				packs: [],
				facilityPickup: false,
				// The keeper's reason is for the back office; the customer hears the shop held it.
				heldBy: 'keeper',
				holdSentences: []
			};
		}

		const inserted = await trx
			.insertInto('ship_check')
			.values({
				order_id: orderId,
				first_date: today,
				service: order.service,
				decision: decision.decision,
				ship_date: move.shipOn,
				delivery_date: move.deliveryDate,
				// The table wants a date on every hold: the override holds until a keeper looks again.
				recheck_date: decision.decision === 'hold' ? addDays(today, 1) : null,
				packs: move.packs,
				facility_pickup: move.facilityPickup,
				reasons: JSON.stringify(previous?.reasons ?? []),
				inputs: JSON.stringify(previous?.inputs ?? {}),
				rule_version: RULE_VERSION,
				override_reason: reason,
				overridden_by: actor.userId
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const audit: AuditOf = {
			action: 'ship_check.override',
			detail: {
				shipCheckId: inserted.id,
				decision: decision.decision,
				shipDate: move.shipOn,
				reason,
				fromState: order.state,
				toState: move.to,
				previousShipCheckId: previous?.id ?? null,
				previousDecision: previous?.decision ?? null
			}
		};
		const { mailed, audited } = await applyMove(trx, order, move, {
			note: reason,
			actor: { kind: 'user', userId: actor.userId, ip: actor.ip },
			audit
		});
		if (!audited) {
			await writeAudit(trx, {
				actorUserId: actor.userId,
				actorIp: actor.ip,
				entity: 'customer_order',
				entityId: orderId,
				...audit
			});
		}
		return {
			ok: true,
			shipCheckId: inserted.id,
			fromState,
			toState: move.to,
			shipOn: move.shipOn,
			mailed
		};
	});
	try {
		return await overriding;
	} catch (error) {
		if (!(error instanceof MoveRefused)) throw error;
		return { ok: false, field: '', problem: error.message };
	}
}
