import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { OrderState } from '$lib/server/db/schema';
import {
	canMove,
	FINAL_STATES,
	isForward,
	moveProblem,
	ORDER_MOVES,
	ORDER_STATES,
	stateAfterRefund,
	type MoveActor,
	type MoveFacts
} from './state-machine';

// The expected matrix, written out by hand from PRODUCT.md's order ("awaiting payment →
// paid → scheduled or weather hold → packed → shipped → delivered; cancelled; refunded /
// part refunded") and the decisions at the top of state-machine.ts. Rows are the state
// an order is in, columns the state asked for, in this order:
//   AP awaiting_payment, PD paid, SC scheduled, WH weather_hold, PK packed,
//   SH shipped, DL delivered, CA cancelled, RF refunded, PR part_refunded.
// A cell lists who may make the move (s system, w webhook, k keeper, a admin), given
// the facts that favour it (a reason written, nothing live, no money held); '-' is never.
const COLUMNS = ['AP', 'PD', 'SC', 'WH', 'PK', 'SH', 'DL', 'CA', 'RF', 'PR'] as const;
// prettier-ignore
const EXPECTED: Record<OrderState, string> = {
	//                 AP   PD   SC   WH   PK   SH   DL    CA   RF   PR
	awaiting_payment: '-    sw   -    -    -    -    -     swa  -    -',
	paid:             '-    -    ska  ska  ka   -    -     a    swa  -',
	scheduled:        '-    -    -    ska  ka   -    -     a    swa  -',
	weather_hold:     '-    -    ska  -    -    -    -     a    swa  -',
	packed:           '-    -    a    -    -    ka   -     -    swa  -',
	shipped:          '-    -    -    -    a    -    swka  -    swa  -',
	delivered:        '-    -    -    -    -    a    -     -    swa  swa',
	cancelled:        '-    -    -    -    -    -    -     -    -    -',
	refunded:         '-    -    -    -    -    -    -     -    -    -',
	part_refunded:    '-    -    -    -    -    -    -     -    swa  -'
};

const ACTORS: Record<string, MoveActor> = {
	s: { kind: 'system' },
	w: { kind: 'webhook' },
	k: { kind: 'user', role: 'keeper' },
	a: { kind: 'user', role: 'admin' },
	c: { kind: 'user', role: 'customer' }
};
const FAVOURING: MoveFacts = {
	reason: 'Buyer asked by phone to cancel.',
	live: false,
	heldCents: 0
};

function expectedCell(from: OrderState, to: OrderState): string {
	const cells = EXPECTED[from].trim().split(/\s+/);
	expect(cells).toHaveLength(COLUMNS.length);
	return cells[ORDER_STATES.indexOf(to)]!;
}

const stateArb = fc.constantFrom(...ORDER_STATES);
const actorArb = fc.constantFrom(...Object.values(ACTORS));

describe('the order state machine', () => {
	it('allows exactly the moves in the expected matrix, for each kind of actor', () => {
		const pairs = ORDER_STATES.flatMap((from) => ORDER_STATES.map((to) => [from, to] as const));
		expect(pairs).toHaveLength(100);
		for (const [from, to] of pairs) {
			const cell = expectedCell(from, to);
			const allowed = cell === '-' ? '' : cell;
			for (const [letter, actor] of Object.entries(ACTORS)) {
				expect(
					canMove(from, to, actor, FAVOURING),
					`${from} → ${to} by ${letter}: expected ${allowed.includes(letter) ? 'allowed' : 'refused'}`
				).toBe(allowed.includes(letter));
				// A refusal always comes with a sentence; an allowed move with none.
				const problem = moveProblem(from, to, actor, FAVOURING);
				if (allowed.includes(letter)) expect(problem).toBeNull();
				else expect(problem).toMatch(/^[A-Z].*\.$/);
			}
		}
	});

	it('says why in words the shop uses', () => {
		const admin = ACTORS.a!;
		expect(moveProblem('delivered', 'paid', admin)).toBe(
			'An order cannot go from delivered to paid.'
		);
		expect(moveProblem('cancelled', 'paid', ACTORS.w!)).toBe(
			'A cancelled order is final: nothing moves it now.'
		);
		expect(moveProblem('shipped', 'paid', ACTORS.w!)).toBe(
			'An event only moves an order forward, and this order is already shipped.'
		);
		expect(moveProblem('paid', 'paid', admin)).toBe('The order is already paid.');
		expect(moveProblem('packed', 'shipped', ACTORS.c!)).toBe(
			'Customers cannot change an order’s state; the shop does.'
		);
		expect(moveProblem('packed', 'scheduled', ACTORS.k!, FAVOURING)).toBe(
			'Only an admin can move an order from packed to scheduled.'
		);
		expect(moveProblem('scheduled', 'weather_hold', ACTORS.w!)).toBe(
			'An event only moves an order forward, and this order is already scheduled.'
		);
	});

	it('asks an admin for a reason before undoing a mark or cancelling', () => {
		const admin = ACTORS.a!;
		expect(moveProblem('shipped', 'packed', admin, { reason: 'oops' })).toMatch(/at least 10/);
		expect(moveProblem('shipped', 'packed', admin, {})).toMatch(/at least 10/);
		expect(canMove('shipped', 'packed', admin, { reason: 'Wrong box was marked shipped.' })).toBe(
			true
		);
		expect(moveProblem('paid', 'cancelled', admin, { ...FAVOURING, reason: '  ' })).toMatch(
			/at least 10/
		);
	});

	it('never packs a box of live animals without the ship check, nor when unsure', () => {
		const keeper = ACTORS.k!;
		expect(moveProblem('paid', 'packed', keeper, { live: true })).toMatch(/live animals/);
		expect(moveProblem('paid', 'packed', keeper, {})).toMatch(/live animals/);
		expect(canMove('paid', 'packed', keeper, { live: false })).toBe(true);
		// From scheduled the ship check has already set the date.
		expect(canMove('scheduled', 'packed', keeper, { live: true })).toBe(true);
	});

	it('cancels only an order that holds no money, and refunds otherwise', () => {
		const admin = ACTORS.a!;
		const reason = 'Reship no longer wanted by the buyer.';
		expect(canMove('scheduled', 'cancelled', admin, { reason, heldCents: 0 })).toBe(true);
		expect(moveProblem('scheduled', 'cancelled', admin, { reason, heldCents: 7500 })).toMatch(
			/refund it instead/
		);
		expect(moveProblem('paid', 'cancelled', admin, { reason })).toMatch(/refund it instead/);
		// An unpaid order's expiry needs no facts at all.
		expect(canMove('awaiting_payment', 'cancelled', ACTORS.s!)).toBe(true);
	});

	it('moves an order after a refund: full closes it, partial only marks a delivered one', () => {
		expect(stateAfterRefund('scheduled', true)).toBe('refunded');
		expect(stateAfterRefund('part_refunded', true)).toBe('refunded');
		expect(stateAfterRefund('delivered', false)).toBe('part_refunded');
		expect(stateAfterRefund('scheduled', false)).toBeNull();
		expect(stateAfterRefund('part_refunded', false)).toBeNull();
		expect(stateAfterRefund('awaiting_payment', true)).toBeNull();
		expect(stateAfterRefund('cancelled', true)).toBeNull();
		// Whatever it answers is a move the refunding admin may make.
		for (const state of ORDER_STATES) {
			for (const full of [true, false]) {
				const next = stateAfterRefund(state, full);
				if (next) expect(canMove(state, next, ACTORS.a!)).toBe(true);
			}
		}
	});

	it('lists each move once and only between known states', () => {
		const keys = ORDER_MOVES.map((rule) => `${rule.from}>${rule.to}`);
		expect(new Set(keys).size).toBe(keys.length);
		for (const rule of ORDER_MOVES) {
			expect(ORDER_STATES).toContain(rule.from);
			expect(ORDER_STATES).toContain(rule.to);
			// The kind written beside a move agrees with the rank.
			if (rule.kind === 'forward') expect(isForward(rule.from, rule.to)).toBe(true);
			else expect(isForward(rule.from, rule.to)).toBe(false);
		}
	});

	it('has no move out of a final state, for anybody, whatever the facts', () => {
		fc.assert(
			fc.property(
				fc.constantFrom(...FINAL_STATES),
				stateArb,
				actorArb,
				fc.record({
					reason: fc.option(fc.string(), { nil: undefined }),
					live: fc.option(fc.boolean(), { nil: undefined }),
					heldCents: fc.option(fc.nat(), { nil: undefined })
				}),
				(from, to, actor, facts) => !canMove(from, to, actor, facts)
			)
		);
	});

	it('lets a webhook make only forward moves', () => {
		fc.assert(
			fc.property(stateArb, stateArb, (from, to) => {
				if (canMove(from, to, ACTORS.w!, FAVOURING)) return isForward(from, to);
				return true;
			})
		);
	});

	it('never revisits a state along forward moves (they cannot loop)', () => {
		// A walk taking any allowed forward move, by anyone, for as long as one exists.
		fc.assert(
			fc.property(stateArb, fc.array(fc.nat(), { maxLength: 20 }), (start, picks) => {
				const seen = new Set<OrderState>([start]);
				let at: OrderState = start;
				for (const pick of picks) {
					const next = ORDER_MOVES.filter(
						(rule) => rule.from === at && isForward(rule.from, rule.to)
					);
					if (!next.length) break;
					at = next[pick % next.length]!.to;
					if (seen.has(at)) return false;
					seen.add(at);
				}
				return true;
			})
		);
	});

	it('reaches delivered from awaiting payment, and every state from there', () => {
		// Every state is reachable from where checkout leaves an order.
		const reached = new Set<OrderState>(['awaiting_payment']);
		let grew = true;
		while (grew) {
			grew = false;
			for (const rule of ORDER_MOVES) {
				if (reached.has(rule.from) && !reached.has(rule.to)) {
					reached.add(rule.to);
					grew = true;
				}
			}
		}
		expect([...reached].sort()).toEqual([...ORDER_STATES].sort());
	});
});
