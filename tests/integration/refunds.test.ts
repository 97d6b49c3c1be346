// Refunds on a real PostgreSQL, with the local Stripe stand-in started in this process
// and reached through the real `stripe` package, as checkout.test.ts does. Amounts are
// in cents: USD has two minor units (ISO 4217), so $100.00 is 10000.
import { isHttpError } from '@sveltejs/kit';
import { sql } from 'kysely';
import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { startCheckout } from '../../src/lib/server/payments/checkout';
import {
	refundableCents,
	refundOrder,
	type RefundInput
} from '../../src/lib/server/payments/refunds';
import type { Db } from '../../src/lib/server/db/connect';
import type { Actor } from '../../src/lib/server/audit';
import { seedDemo } from '../../seed/demo';
import type { SessionUser } from '../../src/lib/server/auth/guard';
import { actions as orderPageActions } from '../../src/routes/manage/orders/[number]/+page.server';
import type { StripeFake } from '../fakes/stripe/server';
import { checkoutAddress, startPaymentsHarness, type PaymentsHarness } from './support/payments';
import { guestCartWith, insertListedClutch } from './support/stock';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const API_KEY = 'sk_test_local_fake_refunds';
const SECRET = 'whsec_local_fake_refunds';
const ORIGIN = 'http://127.0.0.1:5998';

const address = checkoutAddress('refund.buyer@example.com');

describe('refunds', () => {
	let scratch: ScratchDatabase;
	let db: Db;
	let fake: StripeFake;
	let stripe: Stripe;
	let payments: PaymentsHarness;
	let speciesId: number;
	let admin: Actor;
	let keeper: Actor;
	let shippingCents = 0;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		db = scratch.db;
		await seedDemo(db, { today: '2026-12-01' });
		speciesId = (
			await db
				.selectFrom('species')
				.select('id')
				.where('slug', '=', 'cubaris-murina')
				.executeTakeFirstOrThrow()
		).id;
		const userOf = async (email: string): Promise<Actor> => ({
			userId: (
				await db
					.selectFrom('User')
					.select('id')
					.where('email', '=', email)
					.executeTakeFirstOrThrow()
			).id,
			ip: '127.0.0.1'
		});
		admin = await userOf('wren@mossback.example.com');
		keeper = await userOf('teo@mossback.example.com');
		payments = await startPaymentsHarness(db, { apiKey: API_KEY, secret: SECRET, origin: ORIGIN });
		({ fake, stripe } = payments);
		// What overnight shipping costs to the test address, so an order can total $100.00.
		const probe = await listed(1000, 5);
		const cart = await cartOf(probe, 1);
		const started = await startCheckout(db, stripe, cart, address, {
			origin: ORIGIN,
			clientIp: null
		});
		if (!started.ok) throw new Error('probe checkout refused');
		shippingCents = (
			await db
				.selectFrom('customer_order')
				.select('shipping_cents')
				.where('id', '=', started.orderId)
				.executeTakeFirstOrThrow()
		).shipping_cents;
	});
	afterAll(async () => {
		await payments?.stop();
		await scratch?.drop();
	});
	beforeEach(async () => {
		fake.setMode('ok');
		await fake.idle();
	});

	let serial = 0;
	/** A live listing of a fresh clutch, `priceCents` for one animal. */
	async function listed(priceCents: number, alive: number): Promise<number> {
		serial += 1;
		const { listingId } = await insertListedClutch(db, {
			speciesId,
			code: `RFD-T${serial}`,
			slug: `refund-test-listing-${serial}`,
			title: `Refund isopods ${serial}`,
			alive,
			tiers: [{ minQuantity: 1, priceCents }]
		});
		return listingId;
	}

	async function cartOf(listingId: number, quantity: number) {
		const owner = await guestCartWith(db, listingId, quantity);
		expect(owner).not.toBeNull();
		return owner!;
	}

	/** An order paid by card, totalling `totalCents` with shipping, of `quantity` animals. */
	async function paidOrder(totalCents: number, quantity = 1) {
		const goods = totalCents - shippingCents;
		expect(goods % quantity).toBe(0);
		const listingId = await listed(goods / quantity, quantity + 2);
		const started = await startCheckout(db, stripe, await cartOf(listingId, quantity), address, {
			origin: ORIGIN,
			clientIp: null
		});
		if (!started.ok) throw new Error('checkout refused');
		expect(fake.pay(started.sessionId, '4242 4242 4242 4242').paid).toBe(true);
		await fake.idle();
		const order = await orderOf(started.orderId);
		expect(order.state).toBe('paid');
		expect(order.paid_cents).toBe(totalCents);
		const line = await db
			.selectFrom('order_line')
			.select(['id', 'quantity', 'line_total_cents'])
			.where('order_id', '=', order.id)
			.executeTakeFirstOrThrow();
		return { ...order, line, listingId };
	}

	const orderOf = (orderId: number) =>
		db.selectFrom('customer_order').selectAll().where('id', '=', orderId).executeTakeFirstOrThrow();
	const refundCalls = () =>
		fake.requests().filter((r) => r.method === 'POST' && r.path === '/v1/refunds').length;
	const refundsOf = (orderId: number) =>
		db
			.selectFrom('refund')
			.select(['id', 'amount_cents', 'status', 'stripe_refund_id'])
			.where('order_id', '=', orderId)
			.orderBy('id')
			.execute();
	const refund = (orderNumber: string, input: Partial<RefundInput>) =>
		refundOrder(db, admin, { orderNumber, reason: 'Two arrived dead.', ...input }, { stripe });
	const mails = async (kind: string, orderNumber: string) =>
		(
			await db
				.selectFrom('outgoing_mail')
				.select('to_address')
				.where('kind', '=', kind)
				.where('subject', 'like', `%${orderNumber}%`)
				.execute()
		).map((m) => m.to_address);

	it('lets only one of two refunds of $60.00 at once through on a $100.00 order', async () => {
		const order = await paidOrder(10000);
		const before = refundCalls();
		const [a, b] = await Promise.all([
			refund(order.order_number, { amountCents: 6000 }),
			refund(order.order_number, { amountCents: 6000 })
		]);
		expect([a.ok, b.ok].sort()).toEqual([false, true]);
		const refused = a.ok ? b : a;
		expect(refused).toMatchObject({ ok: false, field: 'amountCents' });
		expect(refundCalls() - before).toBe(1);
		const after = await orderOf(order.id);
		expect(after.refunded_cents).toBe(6000);
		// $60.00 of $100.00 before delivery: the rest still ships, so the order stays paid.
		expect(after.state).toBe('paid');
		expect(await refundableCents(db, order.order_number)).toBe(4000);
		expect((await refundsOf(order.id)).map((r) => r.status)).toEqual(['succeeded']);
		expect(await mails('refund_issued', order.order_number)).toEqual([address.email]);
		const charge = await stripe.paymentIntents.retrieve(
			(
				await db
					.selectFrom('payment')
					.select('stripe_payment_intent_id')
					.where('order_id', '=', order.id)
					.executeTakeFirstOrThrow()
			).stripe_payment_intent_id!
		);
		expect(charge.amount).toBe(10000);
	});

	it('refunds $30.00 + $30.00 + $40.00, then refuses the next cent before Stripe is asked', async () => {
		const order = await paidOrder(10000);
		for (const cents of [3000, 3000, 4000]) {
			const outcome = await refund(order.order_number, { amountCents: cents });
			expect(outcome).toMatchObject({ ok: true, amountCents: cents });
		}
		const after = await orderOf(order.id);
		expect(after.refunded_cents).toBe(10000);
		// All of it back: a paid order is closed as refunded, through the state machine.
		expect(after.state).toBe('refunded');
		const before = refundCalls();
		const next = await refund(order.order_number, { amountCents: 1 });
		expect(next).toMatchObject({ ok: false, field: 'amountCents' });
		expect(refundCalls()).toBe(before);
		expect(await refundableCents(db, order.order_number)).toBe(0);
		const history = await db
			.selectFrom('order_event')
			.select(['from_state', 'to_state'])
			.where('order_id', '=', order.id)
			.where('note', 'like', 'Refunded %')
			.orderBy('id')
			.execute();
		expect(history.map((h) => `${h.from_state}>${h.to_state}`)).toEqual([
			'paid>paid',
			'paid>paid',
			'paid>refunded'
		]);
		const audit = await db
			.selectFrom('audit_log')
			.select('action')
			.where('action', 'like', 'refund.%')
			.where(sql<string>`detail->>'orderNumber'`, '=', order.order_number)
			.execute();
		expect(audit.filter((a) => a.action === 'refund.requested')).toHaveLength(3);
	});

	it('refuses 0, negative, fractional, above refundable and unpaid before Stripe is asked', async () => {
		const order = await paidOrder(10000);
		const before = refundCalls();
		for (const amountCents of [0, -500, 12.5, 10001])
			expect(await refund(order.order_number, { amountCents })).toMatchObject({
				ok: false,
				field: 'amountCents'
			});
		expect(await refund(order.order_number, { amountCents: 100, reason: '   ' })).toMatchObject({
			ok: false,
			field: 'reason'
		});
		// A keeper is not an admin.
		const byKeeper = await refundOrder(
			db,
			keeper,
			{ orderNumber: order.order_number, amountCents: 100, reason: 'Keeper tries.' },
			{ stripe }
		);
		expect(byKeeper.ok).toBe(false);
		// An order still waiting for payment.
		const listingId = await listed(2000, 3);
		const unpaid = await startCheckout(db, stripe, await cartOf(listingId, 1), address, {
			origin: ORIGIN,
			clientIp: null
		});
		if (!unpaid.ok) throw new Error('checkout refused');
		const unpaidNumber = (await orderOf(unpaid.orderId)).order_number;
		expect((await refund(unpaidNumber, { amountCents: 100 })).ok).toBe(false);
		expect(refundCalls()).toBe(before);
		expect(await refundsOf(order.id)).toEqual([]);
		expect(await refundsOf(unpaid.orderId)).toEqual([]);
		expect((await orderOf(order.id)).refunded_cents).toBe(0);
	});

	it('refuses a keeper at the order page’s refund action on the server', async () => {
		const order = await paidOrder(10000);
		const before = refundCalls();
		const user: SessionUser = {
			id: keeper.userId,
			name: 'Teo Marsh',
			email: 'teo@mossback.example.com',
			role: 'keeper'
		};
		const body = new FormData();
		body.set('amount', '10.00');
		body.set('reason', 'A keeper should not get this far.');
		const refundAction = orderPageActions.refund!;
		type ActionEvent = Parameters<typeof refundAction>[0];
		const event = {
			url: new URL(`${ORIGIN}/manage/orders/${order.order_number}?/refund`),
			params: { number: order.order_number },
			locals: { user, sessionToken: null },
			request: new Request(`${ORIGIN}/manage/orders/${order.order_number}?/refund`, {
				method: 'POST',
				body
			}),
			getClientAddress: () => '127.0.0.1'
		} as unknown as ActionEvent;
		const status = await Promise.resolve()
			.then(() => refundAction(event))
			.then(
				() => 'done',
				(cause: unknown) => (isHttpError(cause) ? cause.status : cause)
			);
		expect(status).toBe(403);
		expect(refundCalls()).toBe(before);
		expect(await refundsOf(order.id)).toEqual([]);
	});

	it('shows the error and counts nothing when Stripe is failing', async () => {
		const order = await paidOrder(10000);
		fake.setMode('fail');
		const outcome = await refund(order.order_number, { amountCents: 2500 });
		fake.setMode('ok');
		expect(outcome.ok).toBe(false);
		if (outcome.ok) return;
		expect(outcome.problem).toMatch(/nothing was refunded/i);
		expect((await refundsOf(order.id)).map((r) => r.status)).toEqual(['failed']);
		const after = await orderOf(order.id);
		expect(after.refunded_cents).toBe(0);
		expect(after.state).toBe('paid');
		expect(await refundableCents(db, order.order_number)).toBe(10000);
		expect(await mails('refund_issued', order.order_number)).toEqual([]);
		// Stripe up again: the same amount goes through.
		expect(await refund(order.order_number, { amountCents: 2500 })).toMatchObject({ ok: true });
	});

	it('refunds by line at the line’s price, and restocks a line only once', async () => {
		const goods = 3 * 2000;
		const order = await paidOrder(goods + shippingCents, 3);
		const one = await refund(order.order_number, {
			lines: [{ orderLineId: order.line.id, quantity: 1, restock: true }]
		});
		// One of three animals at $20.00 each.
		expect(one).toMatchObject({ ok: true, amountCents: 2000 });
		const line = () =>
			db
				.selectFrom('order_line')
				.select('restocked_quantity')
				.where('id', '=', order.line.id)
				.executeTakeFirstOrThrow();
		expect((await line()).restocked_quantity).toBe(1);
		const twice = await refund(order.order_number, {
			lines: [{ orderLineId: order.line.id, quantity: 3, restock: false }]
		});
		expect(twice).toMatchObject({ ok: false, field: 'lines' });
		const two = await refund(order.order_number, {
			lines: [{ orderLineId: order.line.id, quantity: 2, restock: false }]
		});
		expect(two).toMatchObject({ ok: true, amountCents: 4000 });
		expect((await line()).restocked_quantity).toBe(1);
		// Every animal of the line is refunded; none is left to refund again.
		const again = await refund(order.order_number, {
			lines: [{ orderLineId: order.line.id, quantity: 1, restock: true }]
		});
		expect(again).toMatchObject({ ok: false, field: 'lines' });
		expect((await line()).restocked_quantity).toBe(1);
		expect(await refundableCents(db, order.order_number)).toBe(shippingCents);
	});

	it('puts the amount back once when Stripe reports the refund failed, and tells the admins', async () => {
		const order = await paidOrder(10000);
		const outcome = await refund(order.order_number, { amountCents: 10000 });
		expect(outcome.ok).toBe(true);
		expect((await orderOf(order.id)).state).toBe('refunded');
		const [row] = await refundsOf(order.id);
		await fake.idle();
		fake.failRefund(row!.stripe_refund_id!);
		await fake.idle();
		const event = fake
			.events()
			.filter((e) => e.type === 'refund.updated')
			.find(
				(e) =>
					(e.event as { data: { object: { id: string } } }).data.object.id === row!.stripe_refund_id
			);
		expect(event).toBeDefined();
		await fake.redeliver(event!.id, { times: 3, concurrent: true });
		await fake.idle();
		const after = await orderOf(order.id);
		expect(after.refunded_cents).toBe(0);
		expect(after.state).toBe('paid');
		expect((await refundsOf(order.id)).map((r) => r.status)).toEqual(['failed']);
		expect(await refundableCents(db, order.order_number)).toBe(10000);
		expect(await mails('refund_failed', order.order_number)).toEqual(['wren@mossback.example.com']);
		const flagged = await db
			.selectFrom('audit_log')
			.select('id')
			.where('action', '=', 'refund.turned_back')
			.where('entity_id', '=', String(row!.id))
			.execute();
		expect(flagged).toHaveLength(1);
		const back = await db
			.selectFrom('order_event')
			.select('id')
			.where('order_id', '=', order.id)
			.where('from_state', '=', 'refunded')
			.where('to_state', '=', 'paid')
			.execute();
		expect(back).toHaveLength(1);
		// The money is held again, so it can be refunded again.
		expect(await refund(order.order_number, { amountCents: 10000 })).toMatchObject({ ok: true });
	});
});
