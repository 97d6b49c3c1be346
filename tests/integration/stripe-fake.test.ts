// The local Stripe stand-in driven only through the real `stripe` npm package, as the
// shop will drive it. Webhooks are verified with stripe.webhooks.constructEvent: Stripe's
// published signature scheme, through Stripe's own package, is the outside reference.
// The fake needs no database, so this file never copies the template.
import { createServer, type IncomingHttpHeaders, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { startStripeFake, type StripeFake } from '../fakes/stripe/server';

const API_KEY = 'sk_test_local_fake_integration';
const SECRET = 'whsec_local_fake_integration';

interface Received {
	headers: IncomingHttpHeaders;
	raw: string;
	at: number;
}

/** A small webhook receiver: records each delivery and answers from a queue (200 when empty). */
async function startReceiver() {
	const received: Received[] = [];
	const answers: number[] = [];
	const server: Server = createServer((request, response) => {
		const chunks: Buffer[] = [];
		request.on('data', (chunk: Buffer) => chunks.push(chunk));
		request.on('end', () => {
			received.push({
				headers: request.headers,
				raw: Buffer.concat(chunks).toString('utf8'),
				at: Date.now()
			});
			response.writeHead(answers.shift() ?? 200).end();
		});
	});
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
	const port = (server.address() as AddressInfo).port;
	return {
		url: `http://127.0.0.1:${port}/api/stripe/webhook`,
		received,
		answers,
		clear() {
			received.length = 0;
			answers.length = 0;
		},
		stop: () => new Promise<void>((resolve) => server.close(() => resolve()))
	};
}

async function waitFor<T>(check: () => T | undefined | false, what: string, ms = 5000): Promise<T> {
	const until = Date.now() + ms;
	for (;;) {
		const value = check();
		if (value) return value;
		if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
		await new Promise((resolve) => setTimeout(resolve, 20));
	}
}

describe('the local Stripe stand-in through the stripe package', () => {
	let fake: StripeFake;
	let receiver: Awaited<ReturnType<typeof startReceiver>>;
	let stripe: Stripe;

	const eventsOf = () =>
		receiver.received.map((delivery) =>
			stripe.webhooks.constructEvent(
				delivery.raw,
				delivery.headers['stripe-signature'] as string,
				SECRET
			)
		);

	const control = async (path: string, body: unknown = {}) => {
		const response = await fetch(`${fake.url}${path}`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify(body)
		});
		return { status: response.status, body: (await response.json()) as Record<string, unknown> };
	};

	// 3 slings at $18.00 and one adult at $45.50: USD has two minor-unit digits (ISO 4217),
	// so the amounts are 1800 and 4550 cents and the total $99.50 is 9950.
	const createSession = (extra: Partial<Stripe.Checkout.SessionCreateParams> = {}, key?: string) =>
		stripe.checkout.sessions.create(
			{
				mode: 'payment',
				line_items: [
					{
						price_data: {
							currency: 'usd',
							unit_amount: 1800,
							product_data: { name: 'Brachypelma hamorii, 1st instar sling' }
						},
						quantity: 3
					},
					{
						price_data: {
							currency: 'usd',
							unit_amount: 4550,
							product_data: { name: 'Gromphadorhina portentosa, adult' }
						},
						quantity: 1
					}
				],
				success_url: 'http://127.0.0.1:3197/checkout/done?session={CHECKOUT_SESSION_ID}',
				cancel_url: 'http://127.0.0.1:3197/cart',
				client_reference_id: 'order-1017',
				customer_email: 'dagny.halvorsen@example.com',
				metadata: { order: '1017' },
				...extra
			},
			key ? { idempotencyKey: key } : undefined
		);

	const paidSession = async () => {
		const session = await createSession();
		const paid = await control(`/test/sessions/${session.id}/pay`, { card: '4242 4242 4242 4242' });
		expect(paid.status).toBe(200);
		await waitFor(() => receiver.received.length >= 1, 'the completed event');
		receiver.clear();
		const retrieved = await stripe.checkout.sessions.retrieve(session.id);
		return { session: retrieved, paymentIntent: retrieved.payment_intent as string };
	};

	beforeAll(async () => {
		receiver = await startReceiver();
		fake = await startStripeFake({
			port: 0,
			apiKey: API_KEY,
			webhookSecret: SECRET,
			webhookUrl: receiver.url,
			retryDelaysMs: [50, 100]
		});
		const address = new URL(fake.url);
		stripe = new Stripe(API_KEY, {
			host: address.hostname,
			port: Number(address.port),
			protocol: 'http',
			maxNetworkRetries: 0
		});
	});

	afterAll(async () => {
		await fake?.stop();
		await receiver?.stop();
	});

	beforeEach(async () => {
		await fake.idle();
		fake.reset();
		receiver.clear();
	});

	it('creates and retrieves a Checkout Session with amounts in cents', async () => {
		// Intl's currency data follows ISO 4217: USD has 2 minor-unit digits.
		expect(
			new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' }).resolvedOptions()
				.maximumFractionDigits
		).toBe(2);
		const before = Math.floor(Date.now() / 1000);
		const session = await createSession();
		expect(session.id).toMatch(/^cs_test_[A-Za-z0-9]+$/);
		expect(session).toMatchObject({
			object: 'checkout.session',
			amount_total: 9950,
			amount_subtotal: 9950,
			currency: 'usd',
			status: 'open',
			payment_status: 'unpaid',
			payment_intent: null,
			client_reference_id: 'order-1017',
			metadata: { order: '1017' },
			livemode: false,
			cancel_url: 'http://127.0.0.1:3197/cart'
		});
		expect(session.url).toBe(`${fake.url}/pay/${session.id}`);
		expect(session.expires_at).toBeGreaterThanOrEqual(before + 86_400);
		expect(session.expires_at).toBeLessThanOrEqual(before + 86_401);

		// The package's bracket encoding arrives as the nested parameters it was given.
		const sent = fake.requests()[0];
		expect(sent?.body.line_items).toEqual([
			{
				price_data: {
					currency: 'usd',
					unit_amount: '1800',
					product_data: { name: 'Brachypelma hamorii, 1st instar sling' }
				},
				quantity: '3'
			},
			{
				price_data: {
					currency: 'usd',
					unit_amount: '4550',
					product_data: { name: 'Gromphadorhina portentosa, adult' }
				},
				quantity: '1'
			}
		]);

		const retrieved = await stripe.checkout.sessions.retrieve(session.id, {
			expand: ['line_items']
		});
		expect(retrieved.id).toBe(session.id);
		expect(retrieved.line_items?.data.map((line) => [line.quantity, line.amount_total])).toEqual([
			[3, 5400],
			[1, 4550]
		]);
		await expect(stripe.checkout.sessions.retrieve('cs_test_nothing')).rejects.toMatchObject({
			type: 'StripeInvalidRequestError',
			statusCode: 404,
			code: 'resource_missing'
		});
	});

	it('refuses bad parameters with Stripe’s error shape', async () => {
		await expect(
			createSession({
				line_items: [
					{ price_data: { currency: 'usd', unit_amount: 1800, product_data: { name: 'x' } } }
				]
			})
		).rejects.toMatchObject({ statusCode: 400, param: 'line_items[0][quantity]' });
		await expect(createSession({ success_url: 'not a url' })).rejects.toMatchObject({
			statusCode: 400,
			param: 'success_url',
			code: 'url_invalid'
		});
	});

	it('replays an idempotent create and refuses the key with another body', async () => {
		const first = await createSession({}, 'order-1017-attempt-1');
		const again = await createSession({}, 'order-1017-attempt-1');
		expect(again.id).toBe(first.id);
		expect(again.lastResponse.headers['idempotent-replayed']).toBe('true');
		await expect(
			createSession({ client_reference_id: 'order-1018' }, 'order-1017-attempt-1')
		).rejects.toMatchObject({
			type: 'StripeIdempotencyError',
			statusCode: 400,
			rawType: 'idempotency_error'
		});
		const other = await createSession({}, 'order-1017-attempt-2');
		expect(other.id).not.toBe(first.id);
	});

	it('refuses a wrong key with 401', async () => {
		const address = new URL(fake.url);
		const wrong = new Stripe('sk_test_not_the_key', {
			host: address.hostname,
			port: Number(address.port),
			protocol: 'http',
			maxNetworkRetries: 0
		});
		await expect(wrong.checkout.sessions.retrieve('cs_test_x')).rejects.toMatchObject({
			type: 'StripeAuthenticationError',
			statusCode: 401,
			rawType: 'invalid_request_error',
			message: expect.stringMatching(/^Invalid API Key provided/)
		});
	});

	it('pays with 4242 and delivers a signed checkout.session.completed', async () => {
		const session = await createSession();
		const paid = await control(`/test/sessions/${session.id}/pay`, { card: '4242 4242 4242 4242' });
		expect(paid.status).toBe(200);
		await waitFor(() => receiver.received.length === 1, 'one delivery');

		const [delivery] = receiver.received;
		if (!delivery) throw new Error('no delivery');
		const header = delivery.headers['stripe-signature'] as string;
		expect(header).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
		const event = stripe.webhooks.constructEvent(delivery.raw, header, SECRET);
		expect(event.id).toMatch(/^evt_/);
		expect(event).toMatchObject({
			object: 'event',
			type: 'checkout.session.completed',
			livemode: false,
			api_version: '2026-10-28.endive'
		});
		const object = event.data.object as Stripe.Checkout.Session;
		expect(object).toMatchObject({
			id: session.id,
			status: 'complete',
			payment_status: 'paid',
			amount_total: 9950,
			client_reference_id: 'order-1017'
		});

		// A changed body, another secret, or a signature older than the 300 s tolerance fail.
		const tampered = delivery.raw.replace('"amount_total": 9950', '"amount_total": 1');
		expect(tampered).not.toBe(delivery.raw);
		expect(() => stripe.webhooks.constructEvent(tampered, header, SECRET)).toThrow();
		expect(() => stripe.webhooks.constructEvent(delivery.raw, header, 'whsec_other')).toThrow();
		// receivedAt is in milliseconds: 301 s after the signature was made.
		const signedAt = Number(/^t=(\d+)/.exec(header)?.[1]);
		expect(() =>
			stripe.webhooks.constructEvent(
				delivery.raw,
				header,
				SECRET,
				300,
				undefined,
				(signedAt + 301) * 1000
			)
		).toThrow(/tolerance/i);
		expect(
			stripe.webhooks.constructEvent(
				delivery.raw,
				header,
				SECRET,
				300,
				undefined,
				(signedAt + 299) * 1000
			).id
		).toBe(event.id);

		const retrieved = await stripe.checkout.sessions.retrieve(session.id);
		expect(retrieved).toMatchObject({ status: 'complete', payment_status: 'paid', url: null });
		const intent = await stripe.paymentIntents.retrieve(retrieved.payment_intent as string);
		expect(intent.id).toMatch(/^pi_/);
		expect(intent).toMatchObject({ status: 'succeeded', amount: 9950, currency: 'usd' });
		expect(intent.latest_charge).toMatch(/^ch_/);
	});

	it('leaves the session unpaid after declined cards, and the pay page lets the buyer try again', async () => {
		const session = await createSession();
		const declined = await control(`/test/sessions/${session.id}/pay`, {
			card: '4000 0000 0000 0002'
		});
		expect(declined).toMatchObject({
			status: 402,
			body: {
				error: { type: 'card_error', code: 'card_declined', decline_code: 'generic_decline' }
			}
		});
		const short = await control(`/test/sessions/${session.id}/pay`, { card: '4000000000009995' });
		expect(short.body).toMatchObject({ error: { decline_code: 'insufficient_funds' } });
		expect(await stripe.checkout.sessions.retrieve(session.id)).toMatchObject({
			status: 'open',
			payment_status: 'unpaid',
			payment_intent: null
		});

		const url = session.url as string;
		const page = await fetch(url);
		expect(page.status).toBe(200);
		expect(await page.text()).toContain('Local test payment page');
		const post = (card: string) =>
			fetch(url, {
				method: 'POST',
				redirect: 'manual',
				headers: { 'content-type': 'application/x-www-form-urlencoded' },
				body: new URLSearchParams({ card }).toString()
			});
		const refused = await post('4000 0000 0000 9995');
		expect(refused.status).toBe(402);
		const html = await refused.text();
		expect(html).toContain('Your card has insufficient funds.');
		expect(html).toContain('href="http://127.0.0.1:3197/cart"');
		await new Promise((resolve) => setTimeout(resolve, 100));
		expect(receiver.received).toHaveLength(0);

		const ok = await post('4242 4242 4242 4242');
		expect(ok.status).toBe(303);
		expect(ok.headers.get('location')).toBe(
			`http://127.0.0.1:3197/checkout/done?session=${session.id}`
		);
		await waitFor(() => receiver.received.length === 1, 'the completed event');
		expect(eventsOf()[0]?.type).toBe('checkout.session.completed');
	});

	it('expires an open session with checkout.session.expired, once', async () => {
		const session = await createSession();
		const expired = await stripe.checkout.sessions.expire(session.id);
		expect(expired).toMatchObject({ status: 'expired', payment_status: 'unpaid', url: null });
		await waitFor(() => receiver.received.length === 1, 'the expired event');
		const [event] = eventsOf();
		expect(event?.type).toBe('checkout.session.expired');
		expect((event?.data.object as Stripe.Checkout.Session).id).toBe(session.id);
		// The event names the API request that caused it.
		expect(event?.request).toEqual({
			id: expired.lastResponse.requestId,
			idempotency_key: expect.stringMatching(/^stripe-node-retry-/)
		});
		await expect(stripe.checkout.sessions.expire(session.id)).rejects.toMatchObject({
			statusCode: 400
		});
		const paying = await control(`/test/sessions/${session.id}/pay`, { card: '4242424242424242' });
		expect(paying.status).toBe(400);
	});

	it('completes unpaid, then reports a failed delayed payment', async () => {
		const session = await createSession();
		await control(`/test/sessions/${session.id}/async-payment-failed`);
		await waitFor(() => receiver.received.length === 2, 'two events');
		expect(eventsOf().map((event) => event.type)).toEqual([
			'checkout.session.completed',
			'checkout.session.async_payment_failed'
		]);
		expect((eventsOf()[1]?.data.object as Stripe.Checkout.Session).payment_status).toBe('unpaid');
		// Its payment intent never succeeded, so there is nothing to refund.
		const retrieved = await stripe.checkout.sessions.retrieve(session.id);
		expect(retrieved).toMatchObject({ status: 'complete', payment_status: 'unpaid' });
		await expect(
			stripe.refunds.create({ payment_intent: retrieved.payment_intent as string })
		).rejects.toMatchObject({ statusCode: 400, param: 'payment_intent' });
	});

	it('refunds part and the rest, refuses more than was captured, and reports a failed refund', async () => {
		const { paymentIntent } = await paidSession();
		const part = await stripe.refunds.create(
			{ payment_intent: paymentIntent, amount: 3000, reason: 'requested_by_customer' },
			{ idempotencyKey: 'refund-1017-1' }
		);
		expect(part.id).toMatch(/^re_/);
		expect(part).toMatchObject({
			object: 'refund',
			amount: 3000,
			currency: 'usd',
			status: 'succeeded',
			payment_intent: paymentIntent
		});
		expect(await stripe.refunds.retrieve(part.id)).toMatchObject({ id: part.id, amount: 3000 });
		await waitFor(() => receiver.received.length === 1, 'charge.refunded');
		const [refunded] = eventsOf();
		expect(refunded?.type).toBe('charge.refunded');
		expect(refunded?.data.object).toMatchObject({
			object: 'charge',
			amount_captured: 9950,
			amount_refunded: 3000,
			refunded: false
		});

		// 9950 - 3000 = 6950 is left; one cent more is refused before anything changes.
		await expect(
			stripe.refunds.create({ payment_intent: paymentIntent, amount: 6951 })
		).rejects.toMatchObject({
			type: 'StripeInvalidRequestError',
			statusCode: 400,
			rawType: 'invalid_request_error',
			param: 'amount',
			code: 'amount_too_large'
		});
		const rest = await stripe.refunds.create({ payment_intent: paymentIntent, amount: 6950 });
		expect(rest.amount).toBe(6950);
		await expect(
			stripe.refunds.create({ payment_intent: paymentIntent, amount: 1 })
		).rejects.toMatchObject({ code: 'charge_already_refunded' });
		await waitFor(() => receiver.received.length === 2, 'second charge.refunded');
		expect(eventsOf()[1]?.data.object).toMatchObject({ amount_refunded: 9950, refunded: true });

		const failed = await control(`/test/refunds/${rest.id}/fail`);
		expect(failed.body).toMatchObject({
			status: 'failed',
			failure_reason: 'expired_or_canceled_card'
		});
		await waitFor(() => receiver.received.length === 3, 'refund.updated');
		expect(eventsOf()[2]).toMatchObject({
			type: 'refund.updated',
			data: {
				object: { id: rest.id, status: 'failed' },
				previous_attributes: { status: 'succeeded' }
			}
		});
		expect(await stripe.refunds.retrieve(rest.id)).toMatchObject({ status: 'failed' });

		const unpaid = await createSession();
		await expect(
			stripe.refunds.create({ payment_intent: `pi_${unpaid.id}` })
		).rejects.toMatchObject({ statusCode: 404, code: 'resource_missing' });
	});

	it('knows a payment made before it started (a seeded order’s) and refunds only what is left of it', async () => {
		// $117.00 paid, $20.00 already refunded: 11700 and 2000 cents (USD has two minor units, ISO 4217).
		const adopted = await control('/test/payment-intents', {
			id: 'pi_test_demo_10002',
			amount: 11700,
			amountRefunded: 2000
		});
		expect(adopted.status).toBe(200);
		expect(await stripe.paymentIntents.retrieve('pi_test_demo_10002')).toMatchObject({
			object: 'payment_intent',
			amount: 11700,
			currency: 'usd',
			status: 'succeeded'
		});
		await expect(
			stripe.refunds.create({ payment_intent: 'pi_test_demo_10002', amount: 9701 })
		).rejects.toMatchObject({ code: 'amount_too_large' });
		const refund = await stripe.refunds.create({
			payment_intent: 'pi_test_demo_10002',
			amount: 9700
		});
		expect(refund).toMatchObject({ status: 'succeeded', amount: 9700 });
		const bad = await control('/test/payment-intents', { id: 'ch_not_an_intent', amount: 100 });
		expect(bad.status).toBe(400);
	});

	it('retries a delivery the receiver answers with 500', async () => {
		receiver.answers.push(500);
		const session = await createSession();
		await stripe.checkout.sessions.expire(session.id);
		await waitFor(() => receiver.received.length === 2, 'the retry');
		const [first, second] = eventsOf();
		expect(second?.id).toBe(first?.id);
		const record = fake.events()[0];
		expect(record?.deliveries.map((attempt) => [attempt.attempt, attempt.status])).toEqual([
			[1, 500],
			[2, 200]
		]);
	});

	it('gives up after the configured retries when the receiver is down', async () => {
		receiver.answers.push(503, 503, 503, 503);
		const session = await createSession();
		await stripe.checkout.sessions.expire(session.id);
		await fake.idle();
		// One try and two retries (retryDelaysMs has two waits).
		expect(receiver.received).toHaveLength(3);
		expect(fake.events()[0]?.deliveries.every((attempt) => !attempt.ok)).toBe(true);
	});

	it('delivers an event again, twice, and late', async () => {
		const session = await createSession();
		await stripe.checkout.sessions.expire(session.id);
		await waitFor(() => receiver.received.length === 1, 'the first delivery');
		const eventId = eventsOf()[0]?.id as string;
		const again = await control(`/test/events/${eventId}/deliver`, { times: 2 });
		expect(again.status).toBe(202);
		await waitFor(() => receiver.received.length === 3, 'two more deliveries');
		expect(new Set(eventsOf().map((event) => event.id))).toEqual(new Set([eventId]));

		const asked = Date.now();
		await control(`/test/events/${eventId}/deliver`, { delayMs: 300 });
		await waitFor(() => receiver.received.length === 4, 'the late delivery');
		expect((receiver.received[3]?.at ?? 0) - asked).toBeGreaterThanOrEqual(280);

		// Ten at once, as a burst of retries can arrive at the shop.
		await fake.redeliver(eventId, { times: 10, concurrent: true });
		expect(receiver.received).toHaveLength(14);
		expect(new Set(eventsOf().map((event) => event.id)).size).toBe(1);
	});

	it('holds events and releases them out of order', async () => {
		expect((await control('/test/hold')).status).toBe(200);
		const session = await createSession();
		await control(`/test/sessions/${session.id}/pay`, { card: '4242 4242 4242 4242' });
		expect(fake.events().map((event) => event.type)).toEqual(['checkout.session.completed']);
		const paid = await stripe.checkout.sessions.retrieve(session.id);
		const refund = await stripe.refunds.create({
			payment_intent: paid.payment_intent as string,
			amount: 500
		});
		await control(`/test/refunds/${refund.id}/fail`);
		expect(receiver.received).toHaveLength(0);

		const released = await control('/test/release', { order: 'reverse' });
		expect(released).toMatchObject({ status: 202, body: { releasing: 3 } });
		await waitFor(() => receiver.received.length === 3, 'the held events');
		expect(eventsOf().map((event) => event.type)).toEqual([
			'refund.updated',
			'charge.refunded',
			'checkout.session.completed'
		]);
	}, 15_000);

	it('releases held events in an order given by id', async () => {
		fake.hold();
		const first = await createSession();
		const second = await createSession();
		await stripe.checkout.sessions.expire(first.id);
		await stripe.checkout.sessions.expire(second.id);
		const [one, two] = fake.events();
		expect(await fake.release([two?.id as string, one?.id as string])).toEqual([two?.id, one?.id]);
		expect(eventsOf().map((event) => (event.data.object as Stripe.Checkout.Session).id)).toEqual([
			second.id,
			first.id
		]);
	});

	it('refuses an expires_at outside 30 minutes to 24 hours', async () => {
		const now = Math.floor(Date.now() / 1000);
		await expect(createSession({ expires_at: now + 600 })).rejects.toMatchObject({
			statusCode: 400,
			param: 'expires_at'
		});
		const soon = await createSession({ expires_at: now + 1900 });
		expect(soon.expires_at).toBe(now + 1900);
	});

	it('answers 500 or hangs up in fail mode, as a Stripe outage looks to the client', async () => {
		fake.setMode('fail');
		await expect(createSession()).rejects.toMatchObject({
			type: 'StripeAPIError',
			statusCode: 500
		});
		fake.setMode('close');
		await expect(createSession()).rejects.toMatchObject({ type: 'StripeConnectionError' });
		await control('/test/mode', { mode: 'ok' });
		expect((await createSession()).status).toBe('open');
	});

	it('expires an open session by itself once its expires_at has passed', async () => {
		let clock = new Date('2026-12-01T15:00:00Z');
		const own = await startStripeFake({
			port: 0,
			apiKey: API_KEY,
			webhookSecret: SECRET,
			webhookUrl: receiver.url,
			now: () => clock
		});
		try {
			const address = new URL(own.url);
			const client = new Stripe(API_KEY, {
				host: address.hostname,
				port: Number(address.port),
				protocol: 'http',
				maxNetworkRetries: 0
			});
			const session = await createSessionWith(client);
			clock = new Date(clock.getTime() + 86_399_000);
			await new Promise((resolve) => setTimeout(resolve, 1200));
			expect((await client.checkout.sessions.retrieve(session.id)).status).toBe('open');
			clock = new Date(clock.getTime() + 2000);
			await waitFor(() => receiver.received.length === 1, 'the expired event');
			const delivery = receiver.received[0];
			const event = client.webhooks.constructEvent(
				delivery?.raw ?? '',
				delivery?.headers['stripe-signature'] as string,
				SECRET,
				300,
				undefined,
				clock.getTime()
			);
			expect(event.type).toBe('checkout.session.expired');
			expect((await client.checkout.sessions.retrieve(session.id)).status).toBe('expired');
		} finally {
			await own.stop();
		}
	});
});

function createSessionWith(client: Stripe) {
	return client.checkout.sessions.create({
		mode: 'payment',
		line_items: [
			{
				price_data: {
					currency: 'usd',
					unit_amount: 2500,
					product_data: { name: 'Isopod culture' }
				},
				quantity: 1
			}
		],
		success_url: 'http://127.0.0.1:3197/checkout/done?session={CHECKOUT_SESSION_ID}'
	});
}
