// The order's state machine: every legal move written out as data, who may make it,
// and the one sentence that says why a move is refused. Pure (no I/O, no clock);
// the server's `moveOrder` (src/lib/server/orders/transitions.ts) is its only writer.
//
// Decisions kept here, so every caller gets the same answer:
// - `cancelled` and `refunded` are final: nothing moves an order out of them.
// - A full refund may follow paid, scheduled, weather_hold, packed, shipped, delivered
//   and part_refunded. `part_refunded` is for a delivered order only: before delivery a
//   partial refund leaves the order where it is (its remaining animals still ship), so
//   the refund is recorded on the order without a move (see `stateAfterRefund`).
// - Cancelling is for an order holding no money (unpaid, or a no-charge reship); an
//   order that took money ends as `refunded` instead.
// - The marks packed, shipped and delivered are undone only as explicit reversals,
//   by an admin, with a written reason.
// - A box with live animals leaves `paid` only through the ship check (scheduled or
//   weather hold); `paid → packed` is for orders with nothing live in them.
// - A webhook (a payment or tracking event) only ever moves an order forward, so a
//   late or repeated event never pulls an order back.
import { orderStateLabels } from '$lib/format/labels';
import type { OrderState, Role } from '$lib/server/db/schema';

/**
 * A reversal or a cancel must say why: the order's history and the audit log keep it.
 * The same length a ship-check override asks for (src/lib/shipping/override.ts, which
 * is server-only because its calendar carries every country's holidays).
 */
export const MOVE_REASON_MIN_LENGTH = 10;

function reasonProblem(reason: string): string | null {
	if (reason.trim().length < MOVE_REASON_MIN_LENGTH)
		return `Write why in a sentence (at least ${MOVE_REASON_MIN_LENGTH} characters): the order's history keeps it.`;
	return null;
}

export const ORDER_STATES = [
	'awaiting_payment',
	'paid',
	'scheduled',
	'weather_hold',
	'packed',
	'shipped',
	'delivered',
	'cancelled',
	'refunded',
	'part_refunded'
] as const satisfies readonly OrderState[];

/** States nothing moves an order out of. */
export const FINAL_STATES: readonly OrderState[] = ['cancelled', 'refunded'];

export function isFinal(state: OrderState): boolean {
	return FINAL_STATES.includes(state);
}

/**
 * How far along an order is. A forward move goes to a higher rank; scheduled and
 * weather_hold share a rank (a hold is a sideways step, not progress), and the two
 * final states share the top.
 */
export const ORDER_RANK = {
	awaiting_payment: 0,
	paid: 1,
	scheduled: 2,
	weather_hold: 2,
	packed: 3,
	shipped: 4,
	delivered: 5,
	part_refunded: 6,
	refunded: 7,
	cancelled: 7
} as const satisfies Record<OrderState, number>;

/** True when `to` is further along than `from`: the only moves a webhook may make. */
export function isForward(from: OrderState, to: OrderState): boolean {
	return ORDER_RANK[to] > ORDER_RANK[from];
}

/** Who asks for a move. A user's role is read from the database by the server, never sent. */
export type MoveActor = { kind: 'system' } | { kind: 'webhook' } | { kind: 'user'; role: Role };

/** Who a move is open to; customers never move an order themselves. */
export type Mover = 'system' | 'webhook' | 'keeper' | 'admin';

export type MoveKind = 'forward' | 'sideways' | 'reversal';

export type MoveRule = {
	from: OrderState;
	to: OrderState;
	by: readonly Mover[];
	kind: MoveKind;
	/** A written reason is required (reversals and an admin's cancel). */
	needsReason?: true;
	/** Only for an order with nothing live in it. */
	nothingLive?: true;
	/** Only for an order holding no money (paid less refunded is 0). */
	nothingHeld?: true;
};

const STAFF_AND_SYSTEM: readonly Mover[] = ['system', 'keeper', 'admin'];
const REFUNDERS: readonly Mover[] = ['system', 'webhook', 'admin'];

/** Where a full refund may come from. */
export const REFUNDABLE_STATES: readonly OrderState[] = [
	'paid',
	'scheduled',
	'weather_hold',
	'packed',
	'shipped',
	'delivered',
	'part_refunded'
];

/** Every legal move. Anything not listed here is refused. */
export const ORDER_MOVES: readonly MoveRule[] = [
	{ from: 'awaiting_payment', to: 'paid', by: ['system', 'webhook'], kind: 'forward' },
	{
		from: 'awaiting_payment',
		to: 'cancelled',
		by: ['system', 'webhook', 'admin'],
		kind: 'forward'
	},
	{ from: 'paid', to: 'scheduled', by: STAFF_AND_SYSTEM, kind: 'forward' },
	{ from: 'paid', to: 'weather_hold', by: STAFF_AND_SYSTEM, kind: 'forward' },
	{ from: 'paid', to: 'packed', by: ['keeper', 'admin'], kind: 'forward', nothingLive: true },
	{ from: 'scheduled', to: 'weather_hold', by: STAFF_AND_SYSTEM, kind: 'sideways' },
	{ from: 'weather_hold', to: 'scheduled', by: STAFF_AND_SYSTEM, kind: 'sideways' },
	{ from: 'scheduled', to: 'packed', by: ['keeper', 'admin'], kind: 'forward' },
	{ from: 'packed', to: 'shipped', by: ['keeper', 'admin'], kind: 'forward' },
	{
		from: 'shipped',
		to: 'delivered',
		by: ['system', 'webhook', 'keeper', 'admin'],
		kind: 'forward'
	},
	...(['paid', 'scheduled', 'weather_hold'] as const).map((from): MoveRule => ({
		from,
		to: 'cancelled',
		by: ['admin'],
		kind: 'forward',
		needsReason: true,
		nothingHeld: true
	})),
	{ from: 'packed', to: 'scheduled', by: ['admin'], kind: 'reversal', needsReason: true },
	{ from: 'shipped', to: 'packed', by: ['admin'], kind: 'reversal', needsReason: true },
	{ from: 'delivered', to: 'shipped', by: ['admin'], kind: 'reversal', needsReason: true },
	...REFUNDABLE_STATES.map((from): MoveRule => ({
		from,
		to: 'refunded',
		by: REFUNDERS,
		kind: 'forward'
	})),
	{ from: 'delivered', to: 'part_refunded', by: REFUNDERS, kind: 'forward' }
];

/** The rule for a move, or undefined when the move is not in the table. */
export function moveRule(from: OrderState, to: OrderState): MoveRule | undefined {
	return ORDER_MOVES.find((rule) => rule.from === from && rule.to === to);
}

/** What the server knows about the order beyond its state; unknown facts count against the move. */
export type MoveFacts = {
	/** The written reason (the order_event note). */
	reason?: string | null;
	/** Whether any line is a live animal; unknown is taken as live. */
	live?: boolean;
	/** paid_cents less refunded_cents; unknown is taken as money held. */
	heldCents?: number;
};

const word = (state: OrderState) => orderStateLabels[state].toLowerCase();

function moverOf(actor: MoveActor): Mover | 'customer' {
	return actor.kind === 'user' ? actor.role : actor.kind;
}

const MOVER_WORDS: Record<Mover, string> = {
	system: 'the shop’s own jobs',
	webhook: 'a payment or tracking event',
	keeper: 'a keeper',
	admin: 'an admin'
};

function listWords(movers: readonly Mover[]): string {
	const words = movers.map((mover) => MOVER_WORDS[mover]);
	if (words.length < 2) return words.join('');
	return `${words.slice(0, -1).join(', ')} or ${words.at(-1)}`;
}

/** Why a move is refused, as one sentence, or null when it is allowed. */
export function moveProblem(
	from: OrderState,
	to: OrderState,
	actor: MoveActor,
	facts: MoveFacts = {}
): string | null {
	if (from === to) return `The order is already ${word(from)}.`;
	if (isFinal(from)) return `A ${word(from)} order is final: nothing moves it now.`;
	const mover = moverOf(actor);
	// Checked before the table so a late event gets the sentence that explains it.
	if (mover === 'webhook' && !isForward(from, to))
		return `An event only moves an order forward, and this order is already ${word(from)}.`;
	const rule = moveRule(from, to);
	if (!rule) return `An order cannot go from ${word(from)} to ${word(to)}.`;
	if (mover === 'customer') return 'Customers cannot change an order’s state; the shop does.';
	if (!rule.by.includes(mover))
		return `Only ${listWords(rule.by)} can move an order from ${word(from)} to ${word(to)}.`;
	if (rule.needsReason) {
		const problem = reasonProblem(facts.reason ?? '');
		if (problem) return problem;
	}
	if (rule.nothingLive && facts.live !== false)
		return 'It has live animals: they ship only on a date the ship check set, so schedule it first.';
	if (rule.nothingHeld && facts.heldCents !== 0)
		return 'It took money: refund it instead, and the refund closes it.';
	return null;
}

export function canMove(
	from: OrderState,
	to: OrderState,
	actor: MoveActor,
	facts: MoveFacts = {}
): boolean {
	return moveProblem(from, to, actor, facts) === null;
}

/**
 * The state an order moves to after a refund succeeds, or null when it stays where it
 * is: a full refund closes it; a partial one marks a delivered order part refunded and
 * leaves an order still to ship (or on its way) in its place.
 */
export function stateAfterRefund(state: OrderState, fullyRefunded: boolean): OrderState | null {
	if (fullyRefunded) return REFUNDABLE_STATES.includes(state) ? 'refunded' : null;
	return state === 'delivered' ? 'part_refunded' : null;
}
