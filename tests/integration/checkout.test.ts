// Checkout and Stripe's events on a real PostgreSQL, with the local Stripe stand-in
// started in this process and reached through the real `stripe` package. Signatures are
// made and checked by that package (stripe.webhooks.generateTestHeaderString and
// constructEvent): Stripe's published signing scheme is the outside reference.
import { sql } from 'kysely';
import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { CartOwner } from '../../src/lib/server/cart/cart';
import { onOfferOf } from '../../src/lib/server/listings/offer';
import { startCheckout } from '../../src/lib/server/payments/checkout';
import { handleStripeWebhook, type WebhookDeps } from '../../src/lib/server/payments/webhook';
import type { CheckoutForm } from '../../src/lib/checkout/schema';
import type { Db } from '../../src/lib/server/db/connect';
import { seedDemo } from '../../seed/demo';
import type { StripeFake } from '../fakes/stripe/server';
import { checkoutAddress, startPaymentsHarness, type PaymentsHarness } from './support/payments';
import { guestCartWith, insertListedClutch } from './support/stock';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const API_KEY = 'sk_test_local_fake_checkout';
const SECRET = 'whsec_local_fake_checkout';
const ORIGIN = 'http://127.0.0.1:5999';

const address = checkoutAddress('buyer@example.com');

describe('checkout and the Stripe webhook', () => {
	let scratch: ScratchDatabase;
	let db: Db;
	let fake: StripeFake;
	let stripe: Stripe;
	let payments: PaymentsHarness;
	let deps: WebhookDeps;
	let speciesId: number;
	const answers: number[] = [];

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
		// The app's webhook, as the route calls it: the raw body and the signature header.
		payments = await startPaymentsHarness(db, {
			apiKey: API_KEY,
			secret: SECRET,
			origin: ORIGIN,
			forcedAnswers: answers
		});
		({ fake, stripe, deps } = payments);
	});
	afterAll(async () => {
		await payments?.stop();
		await scratch?.drop();
	});
	beforeEach(async () => {
		await fake.idle();
		answers.length = 0;
	});

	let serial = 0;
	/** A listed clutch of `alive` animals and a live listing of it at $18.00 for one, $48.00 for three. */
	async function listedClutch(alive: number) {
		serial += 1;
		return insertListedClutch(db, {
			speciesId,
			code: `CHK-T${serial}`,
			slug: `checkout-test-listing-${serial}`,
			title: `Checkout isopods ${serial}`,
			alive,
			tiers: [
				{ minQuantity: 1, priceCents: 1800 },
				{ minQuantity: 3, priceCents: 4800 }
			]
		});
	}

	async function cartWith(listingId: number, quantity: number): Promise<CartOwner> {
		const owner = await guestCartWith(db, listingId, quantity);
		expect(owner).not.toBeNull();
		return owner!;
	}

	const checkout = (owner: CartOwner, form: Partial<CheckoutForm> = {}) =>
		startCheckout(db, stripe, owner, { ...address, ...form }, { origin: ORIGIN, clientIp: null });

	async function orderOf(orderId: number) {
		return db
			.selectFrom('customer_order')
			.selectAll()
			.where('id', '=', orderId)
			.executeTakeFirstOrThrow();
	}
	const count = async (table: 'order_event' | 'payment' | 'refund', orderId: number) =>
		Number(
			(
				await db
					.selectFrom(table)
					.select(sql<number>`count(*)`.as('n'))
					.where('order_id', '=', orderId)
					.executeTakeFirstOrThrow()
			).n
		);
	const receipts = async (orderNumber: string) =>
		(
			await db
				.selectFrom('outgoing_mail')
				.select('id')
				.where('kind', '=', 'order_receipt')
				.where('subject', 'like', `%${orderNumber}%`)
				.execute()
		).length;
	const holdsOf = (orderId: number) =>
		db
			.selectFrom('reservation')
			.select(['state', 'quantity'])
			.where('order_id', '=', orderId)
			.execute();

	it('makes one order and one session when checkout is clicked twice at once, in cents', async () => {
		const { listingId } = await listedClutch(10);
		const owner = await cartWith(listingId, 3);
		const [a, b] = await Promise.all([checkout(owner), checkout(owner)]);
		expect(a.ok && b.ok).toBe(true);
		if (!a.ok || !b.ok) return;
		expect(a.orderId).toBe(b.orderId);
		expect(a.sessionId).toBe(b.sessionId);
		expect(a.orderNumber).toMatch(/^HL-\d{5,}$/);
		// A third click later reuses it too.
		const c = await checkout(owner);
		expect(c.ok && c.sessionId).toBe(a.sessionId);

		const order = await orderOf(a.orderId);
		expect(order.state).toBe('awaiting_payment');
		// 3 at the three-for-$48.00 tier: USD has two minor units (ISO 4217), so 4800 cents.
		expect(order.subtotal_cents).toBe(4800);
		expect(order.total_cents).toBe(order.subtotal_cents + order.shipping_cents);
		expect(order.terms_accepted_at).not.toBeNull();
		const session = await stripe.checkout.sessions.retrieve(a.sessionId);
		expect(session.amount_total).toBe(order.total_cents);
		expect(session.currency).toBe('usd');
		expect(session.client_reference_id).toBe(order.order_number);
		expect(session.metadata?.order_id).toBe(String(order.id));
		expect(session.success_url).toBe(`${ORIGIN}/checkout/done?session_id={CHECKOUT_SESSION_ID}`);
		expect(await count('payment', a.orderId)).toBe(1);
		const created = fake
			.requests()
			.filter((r) => r.method === 'POST' && r.path === '/v1/checkout/sessions');
		expect(new Set(created.map((r) => r.idempotencyKey)).size).toBe(1);
		const orders = await db
			.selectFrom('customer_order')
			.select('id')
			.where('email', '=', address.email)
			.where('state', '=', 'awaiting_payment')
			.where('total_cents', '=', order.total_cents)
			.execute();
		expect(orders.filter((o) => o.id === a.orderId)).toHaveLength(1);
		const holds = await holdsOf(a.orderId);
		expect(holds).toEqual([{ state: 'held', quantity: 3 }]);
	});

	it('replaces an order whose holds ran out, closing its session, so one cart never has two to pay', async () => {
		const { listingId } = await listedClutch(6);
		const owner = await cartWith(listingId, 2);
		const first = await checkout(owner);
		if (!first.ok) throw new Error(first.problem);
		// The hold ran out and the sweep let it go.
		await db
			.updateTable('reservation')
			.set({ state: 'released', expires_at: sql`now() - interval '1 minute'` })
			.where('order_id', '=', first.orderId)
			.execute();
		const second = await checkout(owner);
		if (!second.ok) throw new Error(second.problem);
		expect(second.orderId).not.toBe(first.orderId);
		expect(second.sessionId).not.toBe(first.sessionId);
		expect((await orderOf(first.orderId)).state).toBe('cancelled');
		expect((await stripe.checkout.sessions.retrieve(first.sessionId)).status).toBe('expired');
		expect(await holdsOf(second.orderId)).toEqual([{ state: 'held', quantity: 2 }]);
		await fake.idle();
		expect((await orderOf(second.orderId)).state).toBe('awaiting_payment');
	});

	it('refuses a ZIP that does not exist, is in another state, or is outside the shipping area', async () => {
		const { listingId } = await listedClutch(5);
		const owner = await cartWith(listingId, 1);
		const nowhere = await checkout(owner, { ship_zip: '00000' });
		expect(nowhere).toMatchObject({ ok: false, field: 'ship_zip' });
		const elsewhere = await checkout(owner, { ship_zip: '10001' });
		expect(elsewhere).toMatchObject({ ok: false, field: 'ship_zip' });
		// 99501 is Anchorage, AK (outside the contiguous states).
		const alaska = await checkout(owner, {
			ship_zip: '99501',
			ship_state: 'AK',
			ship_city: 'Anchorage'
		});
		expect(alaska).toMatchObject({ ok: false, field: 'ship_state' });
		expect(await onOfferOf(db, listingId)).toBe(5);
	});

	it('refuses, with nothing held, when the stock moved under the cart', async () => {
		const { listingId } = await listedClutch(2);
		const owner = await cartWith(listingId, 2);
		const rival = await cartWith(listingId, 2);
		expect((await checkout(rival)).ok).toBe(true);
		const outcome = await checkout(owner);
		expect(outcome.ok).toBe(false);
		if (outcome.ok) return;
		expect(outcome.lines[0]).toMatchObject({ listingId, available: 0 });
	});

	it('sells once when the same completed event arrives 10 times at once', async () => {
		const { listingId, clutchId } = await listedClutch(3);
		const owner = await cartWith(listingId, 3);
		const started = await checkout(owner);
		if (!started.ok) throw new Error(started.problem);
		expect(fake.pay(started.sessionId, '4242 4242 4242 4242').paid).toBe(true);
		await fake.idle();
		const event = fake
			.events()
			.find(
				(e) =>
					e.type === 'checkout.session.completed' &&
					(e.event as { data: { object: { id: string } } }).data.object.id === started.sessionId
			);
		expect(event).toBeDefined();
		await fake.redeliver(event!.id, { times: 10, concurrent: true });
		await fake.idle();
		// Every repeat is acknowledged: Stripe would otherwise keep retrying it.
		const attempts = fake.events().find((e) => e.id === event!.id)!.deliveries;
		expect(attempts.length).toBeGreaterThanOrEqual(11);
		expect(attempts.every((a) => a.status === 200)).toBe(true);

		const order = await orderOf(started.orderId);
		expect(order.state).toBe('paid');
		expect(order.paid_cents).toBe(order.total_cents);
		const toPaid = await db
			.selectFrom('order_event')
			.select('id')
			.where('order_id', '=', started.orderId)
			.where('to_state', '=', 'paid')
			.execute();
		expect(toPaid).toHaveLength(1);
		expect(await receipts(order.order_number)).toBe(1);
		expect(await holdsOf(started.orderId)).toEqual([{ state: 'converted', quantity: 3 }]);
		const cartLeft = await db
			.selectFrom('cart_line')
			.select('id')
			.where('cart_id', '=', owner.guestCartId!)
			.execute();
		expect(cartLeft).toHaveLength(0);
		const payment = await db
			.selectFrom('payment')
			.selectAll()
			.where('order_id', '=', started.orderId)
			.executeTakeFirstOrThrow();
		expect(payment.status).toBe('succeeded');
		expect(payment.stripe_payment_intent_id).toMatch(/^pi_/);
		const stored = await db
			.selectFrom('payment_event')
			.select('id')
			.where('stripe_event_id', '=', event!.id)
			.execute();
		expect(stored).toHaveLength(1);
		// Every animal of the clutch sold: one decrement, and the clutch closes.
		expect(await onOfferOf(db, listingId)).toBe(0);
		const clutch = await db
			.selectFrom('clutch')
			.select('state')
			.where('id', '=', clutchId)
			.executeTakeFirstOrThrow();
		expect(clutch.state).toBe('sold_out');
	});

	it('refuses a bad signature, an old timestamp and a tampered body, changing nothing', async () => {
		const { listingId } = await listedClutch(4);
		const owner = await cartWith(listingId, 1);
		const started = await checkout(owner);
		if (!started.ok) throw new Error(started.problem);
		const payload = JSON.stringify({
			id: 'evt_forged_1',
			object: 'event',
			type: 'checkout.session.completed',
			data: {
				object: {
					id: started.sessionId,
					object: 'checkout.session',
					payment_status: 'paid',
					amount_total: 1,
					payment_intent: 'pi_forged'
				}
			}
		});
		const signed = (body: string, secret: string, timestamp?: number) =>
			stripe.webhooks.generateTestHeaderString({ payload: body, secret, timestamp });
		const verdicts = [
			await handleStripeWebhook(deps, payload, signed(payload, 'whsec_someone_else')),
			await handleStripeWebhook(deps, payload, null),
			// Stripe's default tolerance is 300 seconds; this was signed 10 minutes ago.
			await handleStripeWebhook(
				deps,
				payload,
				signed(payload, SECRET, Math.floor(Date.now() / 1000) - 600)
			),
			await handleStripeWebhook(
				deps,
				payload.replace('"amount_total":1', '"amount_total":2'),
				signed(payload, SECRET)
			)
		];
		expect(verdicts.map((a) => a.status)).toEqual([400, 400, 400, 400]);
		expect((await orderOf(started.orderId)).state).toBe('awaiting_payment');
		const stored = await db
			.selectFrom('payment_event')
			.select('id')
			.where('stripe_event_id', '=', 'evt_forged_1')
			.execute();
		expect(stored).toHaveLength(0);
		// The same body, rightly signed, is accepted: the refusals were the signature's.
		const good = await handleStripeWebhook(deps, payload, signed(payload, SECRET));
		expect(good.status).toBe(200);
	});

	it('acknowledges an event for a session it does not know, changing nothing', async () => {
		const payload = JSON.stringify({
			id: 'evt_unknown_session',
			object: 'event',
			type: 'checkout.session.completed',
			data: { object: { id: 'cs_test_nobody', object: 'checkout.session', payment_status: 'paid' } }
		});
		const header = stripe.webhooks.generateTestHeaderString({ payload, secret: SECRET });
		expect((await handleStripeWebhook(deps, payload, header)).status).toBe(200);
		const row = await db
			.selectFrom('payment_event')
			.select(['order_id', 'processed_at'])
			.where('stripe_event_id', '=', 'evt_unknown_session')
			.executeTakeFirstOrThrow();
		expect(row.order_id).toBeNull();
	});

	it('releases the holds once when the session expires, and cancels the order', async () => {
		const { listingId } = await listedClutch(4);
		const owner = await cartWith(listingId, 4);
		const started = await checkout(owner);
		if (!started.ok) throw new Error(started.problem);
		expect(await onOfferOf(db, listingId)).toBe(0);
		await stripe.checkout.sessions.expire(started.sessionId);
		await fake.idle();
		const event = fake
			.events()
			.find(
				(e) =>
					e.type === 'checkout.session.expired' &&
					(e.event as { data: { object: { id: string } } }).data.object.id === started.sessionId
			);
		await fake.redeliver(event!.id, { times: 3, concurrent: true });
		await fake.idle();
		expect((await orderOf(started.orderId)).state).toBe('cancelled');
		expect(await holdsOf(started.orderId)).toEqual([{ state: 'released', quantity: 4 }]);
		expect(await onOfferOf(db, listingId)).toBe(4);
		const cancels = await db
			.selectFrom('order_event')
			.select('id')
			.where('order_id', '=', started.orderId)
			.where('to_state', '=', 'cancelled')
			.execute();
		expect(cancels).toHaveLength(1);
		const payment = await db
			.selectFrom('payment')
			.select('status')
			.where('order_id', '=', started.orderId)
			.executeTakeFirstOrThrow();
		expect(payment.status).toBe('expired');
	});

	it('lets the stock go when a delayed payment fails, after the unpaid completion changed nothing', async () => {
		const { listingId } = await listedClutch(3);
		const owner = await cartWith(listingId, 3);
		const started = await checkout(owner);
		if (!started.ok) throw new Error(started.problem);
		fake.failAsyncPayment(started.sessionId);
		await fake.idle();
		const types = fake
			.events()
			.filter(
				(e) =>
					(e.event as { data: { object: { id: string } } }).data.object.id === started.sessionId
			)
			.map((e) => e.type);
		expect(types).toContain('checkout.session.async_payment_failed');
		expect((await orderOf(started.orderId)).state).toBe('cancelled');
		expect(await holdsOf(started.orderId)).toEqual([{ state: 'released', quantity: 3 }]);
		expect(await onOfferOf(db, listingId)).toBe(3);
		const payment = await db
			.selectFrom('payment')
			.select('status')
			.where('order_id', '=', started.orderId)
			.executeTakeFirstOrThrow();
		expect(payment.status).toBe('failed');
	});

	it('refunds a payment that arrives after its hold expired and the stock was sold', async () => {
		const { listingId } = await listedClutch(2);
		const late = await cartWith(listingId, 2);
		const started = await checkout(late);
		if (!started.ok) throw new Error(started.problem);
		// The hold runs out; another buyer takes both animals and pays.
		await db
			.updateTable('reservation')
			.set({ expires_at: sql`now() - interval '1 minute'` })
			.where('order_id', '=', started.orderId)
			.execute();
		const rival = await cartWith(listingId, 2);
		const rivalStarted = await checkout(rival);
		if (!rivalStarted.ok) throw new Error(rivalStarted.problem);
		expect(fake.pay(rivalStarted.sessionId, '4242 4242 4242 4242').paid).toBe(true);
		await fake.idle();
		expect((await orderOf(rivalStarted.orderId)).state).toBe('paid');

		// Now the first buyer's payment lands.
		expect(fake.pay(started.sessionId, '4242 4242 4242 4242').paid).toBe(true);
		await fake.idle();
		const order = await orderOf(started.orderId);
		expect(order.state).toBe('cancelled');
		expect(order.paid_cents).toBe(order.total_cents);
		expect(order.refunded_cents).toBe(order.total_cents);
		const refund = await db
			.selectFrom('refund')
			.selectAll()
			.where('order_id', '=', started.orderId)
			.executeTakeFirstOrThrow();
		expect(refund.amount_cents).toBe(order.total_cents);
		expect(refund.stripe_refund_id).toMatch(/^re_/);
		const atStripe = await stripe.refunds.retrieve(refund.stripe_refund_id!);
		expect(atStripe.amount).toBe(order.total_cents);
		const flag = await db
			.selectFrom('audit_log')
			.select('id')
			.where('action', '=', 'order.flag_late_payment')
			.where('entity_id', '=', String(started.orderId))
			.execute();
		expect(flag).toHaveLength(1);
		expect(await receipts(order.order_number)).toBe(0);
		// Never oversold: the clutch's two animals went to one order only.
		const sold = await sql<{ n: number }>`select coalesce(sum(ol.quantity), 0)::int as n
			from order_line ol join customer_order o on o.id = ol.order_id
			where ol.listing_id = ${listingId} and o.state not in ('cancelled', 'awaiting_payment')`.execute(
			db
		);
		expect(sold.rows[0]!.n).toBe(2);
	});

	it('sells a late payment when the stock is still free after the hold ran out', async () => {
		const { listingId } = await listedClutch(5);
		const owner = await cartWith(listingId, 2);
		const started = await checkout(owner);
		if (!started.ok) throw new Error(started.problem);
		await db
			.updateTable('reservation')
			.set({ expires_at: sql`now() - interval '1 minute'` })
			.where('order_id', '=', started.orderId)
			.execute();
		expect(fake.pay(started.sessionId, '4242 4242 4242 4242').paid).toBe(true);
		await fake.idle();
		expect((await orderOf(started.orderId)).state).toBe('paid');
		expect(await count('refund', started.orderId)).toBe(0);
		expect(await onOfferOf(db, listingId)).toBe(3);
	});

	it('answers 500 while the database is down, and the retry applies the event once', async () => {
		const { listingId } = await listedClutch(3);
		const owner = await cartWith(listingId, 1);
		const started = await checkout(owner);
		if (!started.ok) throw new Error(started.problem);
		// A database that refuses every statement, as one that is down does.
		const broken = scratch.db.withPlugin({
			transformQuery: () => {
				throw new Error('connection refused');
			},
			transformResult: (args) => Promise.resolve(args.result)
		});
		const healthy = deps.db;
		deps.db = broken;
		fake.pay(started.sessionId, '4242 4242 4242 4242');
		await new Promise((resolve) => setTimeout(resolve, 80));
		deps.db = healthy;
		await fake.idle();
		const event = fake
			.events()
			.find(
				(e) =>
					e.type === 'checkout.session.completed' &&
					(e.event as { data: { object: { id: string } } }).data.object.id === started.sessionId
			)!;
		expect(event.deliveries[0]!.status).toBe(500);
		expect(event.deliveries.at(-1)!.status).toBe(200);
		expect((await orderOf(started.orderId)).state).toBe('paid');
		expect(await count('order_event', started.orderId)).toBe(1);
	});
});
