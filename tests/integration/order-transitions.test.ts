// Order state changes against a real database: a legal move writes the state, one
// history row and one audit entry; a refused one writes nothing; two moves racing from
// the same state take turns on the row lock and the second is judged from the state
// the first left; an event never pulls an order back.
import { sql, type Transaction } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import type { Database, OrderState } from '../../src/lib/server/db/schema';
import { addDays } from '../../src/lib/format/dates';
import { moveOrder, type OrderActor } from '../../src/lib/server/orders/transitions';
import { checkOrder, overrideShipCheck } from '../../src/lib/server/shipping/order-checks';
import type { ForecastSource } from '../../src/lib/server/weather/source';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const system: OrderActor = { kind: 'system' };
const webhook: OrderActor = { kind: 'webhook' };
const DAY1 = '2026-12-01'; // a Tuesday (Python: datetime.date(2026, 12, 1).strftime('%A'))

/** Mild days everywhere: inside every default limit (PRODUCT.md, Computations 1). */
const mild: ForecastSource = {
	async daily(_zip, days) {
		return {
			ok: true,
			from: 'service',
			days: Array.from({ length: days }, (_, i) => ({
				date: addDays(DAY1, i),
				lowF: 55,
				highF: 70
			}))
		};
	}
};

describe('moving orders between states', () => {
	let scratch: ScratchDatabase;
	let admin: OrderActor;
	let keeper: OrderActor;
	let customer: OrderActor;
	let listingId: number;
	let orderSeq = 30000;

	const userIdOf = async (role: string) =>
		(
			await scratch.db
				.selectFrom('User')
				.select('id')
				.where('email', '=', DEMO_ACCOUNTS.find((account) => account.role === role)!.email)
				.executeTakeFirstOrThrow()
		).id;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		admin = { kind: 'user', userId: await userIdOf('admin'), ip: '192.0.2.20' };
		keeper = { kind: 'user', userId: await userIdOf('keeper'), ip: '192.0.2.21' };
		customer = { kind: 'user', userId: await userIdOf('customer'), ip: '192.0.2.22' };
		listingId = (
			await scratch.db
				.selectFrom('listing')
				.select('id')
				.where('kind', '=', 'animal')
				.orderBy('id')
				.executeTakeFirstOrThrow()
		).id;
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	/** An order in `state` with one line; `paidCents` 0 makes it a no-charge order. */
	async function placeOrder(
		state: OrderState,
		options: { live?: boolean; paidCents?: number } = {}
	): Promise<number> {
		orderSeq++;
		const paid = options.paidCents ?? (state === 'awaiting_payment' ? 0 : 7500);
		const order = await scratch.db
			.insertInto('customer_order')
			.values({
				order_number: `HL-${orderSeq}`,
				email: `buyer-${orderSeq}@example.test`,
				ship_name: 'Sample Buyer',
				ship_line1: '1 Sample Row',
				ship_city: 'Sampleton',
				ship_state: 'TN',
				ship_zip: '37902',
				service: 'overnight',
				state,
				subtotal_cents: 3000,
				shipping_cents: 4500,
				total_cents: 7500,
				paid_cents: paid,
				// Fixed in the past, so a write is seen as a change of updated_at.
				updated_at: new Date('2026-11-01T12:00:00Z')
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await scratch.db
			.insertInto('order_line')
			.values({
				order_id: order.id,
				listing_id: listingId,
				description: options.live === false ? 'Leaf litter, 2 quarts' : 'Sample live animals',
				quantity: 1,
				line_total_cents: 3000,
				is_live: options.live ?? true
			})
			.execute();
		return order.id;
	}

	const orderRow = (id: number) =>
		scratch.db
			.selectFrom('customer_order')
			.select(['state', 'updated_at', 'ship_on'])
			.where('id', '=', id)
			.executeTakeFirstOrThrow();
	const eventsOf = (id: number) =>
		scratch.db
			.selectFrom('order_event')
			.selectAll()
			.where('order_id', '=', id)
			.orderBy('id')
			.execute();
	const auditOf = (id: number) =>
		scratch.db
			.selectFrom('audit_log')
			.selectAll()
			.where('entity', '=', 'customer_order')
			.where('entity_id', '=', String(id))
			.orderBy('id')
			.execute();
	const move = (id: number, to: OrderState, actor: OrderActor, note: string) =>
		scratch.db.transaction().execute((trx) => moveOrder(trx, id, to, actor, note));

	it('writes the state, one history row and one audit entry for a legal move', async () => {
		const id = await placeOrder('shipped');
		const reason = 'Carrier scanned the wrong box; this one is still on the bench.';
		const outcome = await move(id, 'packed', admin, reason);
		expect(outcome).toMatchObject({ ok: true, from: 'shipped', to: 'packed' });

		const row = await orderRow(id);
		expect(row.state).toBe('packed');
		expect(row.updated_at.getTime()).toBeGreaterThan(new Date('2026-11-01T12:00:00Z').getTime());
		const events = await eventsOf(id);
		expect(events).toHaveLength(1);
		expect(events[0]).toMatchObject({
			from_state: 'shipped',
			to_state: 'packed',
			actor_kind: 'user',
			actor_user_id: admin.kind === 'user' ? admin.userId : null,
			note: reason
		});
		const audit = await auditOf(id);
		expect(audit).toHaveLength(1);
		expect(audit[0]).toMatchObject({
			action: 'order.move',
			actor_user_id: admin.kind === 'user' ? admin.userId : null,
			actor_ip: '192.0.2.20'
		});
		expect(audit[0]!.detail).toMatchObject({
			fromState: 'shipped',
			toState: 'packed',
			actorKind: 'user',
			orderEventId: events[0]!.id
		});
	});

	it('refuses illegal moves and writes nothing, even when the caller commits', async () => {
		const cases: Array<[OrderState, OrderState, OrderActor, RegExp]> = [
			['delivered', 'paid', admin, /cannot go from delivered to paid/],
			['cancelled', 'paid', webhook, /cancelled order is final/],
			['refunded', 'scheduled', system, /refunded order is final/],
			['packed', 'scheduled', keeper, /Only an admin/],
			['shipped', 'packed', admin, /at least 10 characters/],
			['packed', 'shipped', customer, /Customers cannot change/]
		];
		for (const [from, to, actor, problem] of cases) {
			const id = await placeOrder(from);
			const before = await orderRow(id);
			// The caller's transaction goes on and commits: the refusal itself wrote nothing.
			const outcome = await move(id, to, actor, from === 'shipped' ? 'oops' : 'Asked for.');
			expect(outcome, `${from} → ${to}`).toMatchObject({ ok: false, from });
			if (!outcome.ok) expect(outcome.problem).toMatch(problem);
			expect(await orderRow(id)).toEqual(before);
			expect(await eventsOf(id)).toEqual([]);
			expect(await auditOf(id)).toEqual([]);
		}
	});

	it('packs a box of live animals only after the ship check, and cancels only what took no money', async () => {
		const live = await placeOrder('paid');
		const refusedPack = await move(live, 'packed', keeper, 'Packing.');
		expect(refusedPack.ok).toBe(false);
		if (!refusedPack.ok) expect(refusedPack.problem).toMatch(/live animals/);

		const supplies = await placeOrder('paid', { live: false });
		expect(await move(supplies, 'packed', keeper, 'Packed with the morning run.')).toMatchObject({
			ok: true
		});

		const reason = 'Buyer asked to cancel before it was scheduled.';
		const paid = await placeOrder('paid');
		const refusedCancel = await move(paid, 'cancelled', admin, reason);
		expect(refusedCancel.ok).toBe(false);
		if (!refusedCancel.ok) expect(refusedCancel.problem).toMatch(/refund it instead/);
		const reship = await placeOrder('scheduled', { paidCents: 0 });
		expect(await move(reship, 'cancelled', admin, reason)).toMatchObject({ ok: true });
	});

	it('lets an event move an order only forward: a late payment never pulls it back', async () => {
		const id = await placeOrder('shipped');
		const late = await move(id, 'paid', webhook, 'checkout.session.completed');
		expect(late).toMatchObject({ ok: false, from: 'shipped' });
		if (!late.ok) expect(late.problem).toContain('only moves an order forward');
		expect(await eventsOf(id)).toEqual([]);

		const delivered = await move(id, 'delivered', webhook, 'Tracking: delivered.');
		expect(delivered).toMatchObject({ ok: true, from: 'shipped', to: 'delivered' });
		expect((await eventsOf(id)).map((event) => event.actor_kind)).toEqual(['webhook']);

		// An event that expects a state refuses once the order has left it.
		const expected = await scratch.db
			.transaction()
			.execute((trx) =>
				moveOrder(trx, id, 'refunded', webhook, 'charge.refunded', { expectFrom: 'shipped' })
			);
		expect(expected).toMatchObject({ ok: false, from: 'delivered' });
	});

	it('lets exactly one of two racing moves from the same state win, on the row lock', async () => {
		const id = await placeOrder('awaiting_payment');
		let moved: () => void = () => undefined;
		const firstMoved = new Promise<void>((resolve) => (moved = resolve));
		let open: () => void = () => undefined;
		const gate = new Promise<void>((resolve) => (open = resolve));
		// The payment lands and its transaction stays open...
		const payment = scratch.db.transaction().execute(async (trx) => {
			const outcome = await moveOrder(trx, id, 'paid', webhook, 'Payment received.');
			moved();
			await gate;
			return outcome;
		});
		await firstMoved;
		// ...while the hold expiry, which read the order as awaiting payment, tries to cancel it.
		const expiry = scratch.db
			.transaction()
			.execute((trx) => moveOrder(trx, id, 'cancelled', system, 'Payment window closed.'));
		await new Promise((resolve) => setTimeout(resolve, 300));
		open();
		const [paid, cancelled] = await Promise.all([payment, expiry]);
		expect(paid).toMatchObject({ ok: true, to: 'paid' });
		// Judged from the state the payment left: only an admin cancels a paid order.
		expect(cancelled).toMatchObject({ ok: false, from: 'paid' });
		expect((await orderRow(id)).state).toBe('paid');
		expect((await eventsOf(id)).map((event) => event.to_state)).toEqual(['paid']);
		expect(await auditOf(id)).toHaveLength(1);
	});

	it('turns eight copies of the same payment event at once into one move', async () => {
		const id = await placeOrder('awaiting_payment');
		const outcomes = await Promise.all(
			Array.from({ length: 8 }, () => move(id, 'paid', webhook, 'Payment received.'))
		);
		expect(outcomes.filter((outcome) => outcome.ok)).toHaveLength(1);
		for (const outcome of outcomes.filter((outcome) => !outcome.ok)) {
			if (!outcome.ok) expect(outcome.problem).toContain('already paid');
		}
		expect(await eventsOf(id)).toHaveLength(1);
		expect(await auditOf(id)).toHaveLength(1);
	});

	describe('ship checks, which move orders through the state machine', () => {
		const shipChecks = async (id: number) =>
			(
				await sql<{
					n: number;
				}>`select count(*)::int as n from ship_check where order_id = ${id}`.execute(scratch.db)
			).rows[0]!.n;

		it('audits the daily job’s move as the state machine’s own entry', async () => {
			const id = await placeOrder('paid');
			const outcome = await checkOrder(scratch.db, mild, id, { kind: 'system' }, { today: DAY1 });
			expect(outcome).toMatchObject({ outcome: 'checked', toState: 'scheduled', shipOn: DAY1 });
			expect((await eventsOf(id)).map((event) => [event.from_state, event.to_state])).toEqual([
				['paid', 'scheduled']
			]);
			const audit = await auditOf(id);
			expect(audit.map((entry) => [entry.action, entry.actor_user_id])).toEqual([
				['order.move', null]
			]);
			expect(audit[0]!.detail).toMatchObject({ actorKind: 'system', toState: 'scheduled' });
		});

		it('keeps one audit entry, the keeper’s own, for a keeper’s check that moves the order', async () => {
			const id = await placeOrder('weather_hold');
			const userId = keeper.kind === 'user' ? keeper.userId : '';
			const outcome = await checkOrder(
				scratch.db,
				mild,
				id,
				{ kind: 'user', userId, ip: '192.0.2.21' },
				{ today: DAY1 }
			);
			expect(outcome).toMatchObject({ outcome: 'checked', toState: 'scheduled' });
			const audit = await auditOf(id);
			expect(audit.map((entry) => [entry.action, entry.actor_user_id])).toEqual([
				['ship_check.run', userId]
			]);
		});

		it('refuses a check or an override from a customer’s account and keeps no ship check', async () => {
			const id = await placeOrder('paid');
			const userId = customer.kind === 'user' ? customer.userId : '';
			const checked = await checkOrder(
				scratch.db,
				mild,
				id,
				{ kind: 'user', userId, ip: null },
				{ today: DAY1 }
			);
			expect(checked).toMatchObject({ outcome: 'skipped', why: 'refused' });
			const overridden = await overrideShipCheck(
				scratch.db,
				{ userId, ip: null },
				id,
				{ decision: 'hold', reason: 'Trying to hold my own order.' },
				{ today: DAY1 }
			);
			expect(overridden).toMatchObject({ ok: false, field: '' });
			expect(await shipChecks(id)).toBe(0);
			expect((await orderRow(id)).state).toBe('paid');
			expect(await eventsOf(id)).toEqual([]);
			expect(await auditOf(id)).toEqual([]);
		});
	});

	it('runs only inside the caller’s transaction', async () => {
		const id = await placeOrder('paid');
		await expect(
			moveOrder(scratch.db as unknown as Transaction<Database>, id, 'scheduled', system, 'Outside.')
		).rejects.toThrow(/inside the caller/);
		// And rolls back with it.
		await expect(
			scratch.db.transaction().execute(async (trx) => {
				await moveOrder(trx, id, 'scheduled', system, 'Ship check: ships Wed.');
				throw new Error('the caller failed after the move');
			})
		).rejects.toThrow(/caller failed/);
		expect((await orderRow(id)).state).toBe('paid');
		expect(await eventsOf(id)).toEqual([]);
		const count = await sql<{
			n: number;
		}>`select count(*)::int as n from audit_log where entity_id = ${String(id)}`.execute(
			scratch.db
		);
		expect(count.rows[0]!.n).toBe(0);
	});
});
