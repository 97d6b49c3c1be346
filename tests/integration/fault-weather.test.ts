// The forecast service slow, stalled mid-answer, failing or gone, under the built app:
// estimates, a paid order's ship check and the keeper's ship day all hold (a forecast
// the shop has not read never ships a box), and no page waits longer than the forecast
// client's timeout allows. When the service answers again the same boxes ship.
import { createServer, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import type { CheckoutForm } from '../../src/lib/checkout/schema';
import { createSession } from '../../src/lib/server/auth/sessions';
import type { ShipEstimate } from '../../src/lib/shipping/estimate';
import { startStripeFake, TEST_CARDS, type StripeFake } from '../fakes/stripe/server';
import { startWeatherFake, type WeatherFake } from '../fakes/weather/server';
import { startApp, type RunningApp } from './support/app';
import { scratchDatabase, type ScratchDatabase } from './support/databases';
import { ShopClient, waitFor } from './support/shop-client';
import { insertListedClutch, speciesIdBySlug } from './support/stock';

const API_KEY = 'sk_test_local_fake_fault_weather';
const WEBHOOK_SECRET = 'whsec_local_fake_fault_weather';
/** The app's forecast timeout here: short, so each fault costs the test little. */
const FORECAST_TIMEOUT_MS = 1_500;

// Gulf and south-Atlantic ZIPs, each a place of its own in the forecast fake's "elsewhere"
// profile (lows about 107.5 − 1.9 × latitude °F, so near 50 °F here): boxes that ship.
const WARM_PLACES = [
	['77002', 'Houston', 'TX'],
	['70112', 'New Orleans', 'LA'],
	['32202', 'Jacksonville', 'FL'],
	['78205', 'San Antonio', 'TX'],
	['33602', 'Tampa', 'FL'],
	['36602', 'Mobile', 'AL'],
	['31401', 'Savannah', 'GA'],
	['39530', 'Biloxi', 'MS']
] as const;

function buyerIn(email: string, [zip, city, state]: readonly [string, string, string]) {
	return {
		email,
		ship_name: 'Forecast Test Buyer',
		ship_line1: '1 Harbor Road',
		ship_line2: '',
		ship_city: city,
		ship_state: state,
		ship_zip: zip,
		service: 'overnight',
		terms: true
	} satisfies CheckoutForm;
}

type Mode = 'pass' | 'stall';

/**
 * What the app calls its forecast service: passes requests to the forecast fake, or stalls
 * after the headers and half a body, or is not there at all (refused) until `up()`.
 */
async function startForecastFront(upstream: () => string) {
	let mode: Mode = 'pass';
	const open = new Set<ServerResponse>();
	const server: Server = createServer((request, response) => {
		open.add(response);
		response.on('close', () => open.delete(response));
		if (mode === 'stall') {
			response.writeHead(200, { 'content-type': 'application/json' });
			response.write('{"latitude":35.96,"longitude":-83.92,"daily":{"time":["');
			return;
		}
		const abort = new AbortController();
		response.on('close', () => abort.abort());
		void fetch(`${upstream()}${request.url ?? '/'}`, { signal: abort.signal })
			.then(async (answer) => {
				const body = await answer.text();
				response.writeHead(answer.status, { 'content-type': 'application/json' });
				response.end(body);
			})
			.catch(() => response.destroy());
	});
	const listen = (port: number) =>
		new Promise<void>((resolve, reject) => {
			server.once('error', reject);
			server.listen(port, '127.0.0.1', () => resolve());
		});
	await listen(0);
	const port = (server.address() as AddressInfo).port;
	const close = async () => {
		for (const response of open) response.destroy();
		server.closeAllConnections();
		await new Promise<void>((resolve) => server.close(() => resolve()));
	};
	let listening = true;
	return {
		url: `http://127.0.0.1:${port}`,
		setMode: (next: Mode) => void (mode = next),
		/** Nothing listens on the port: every connection is refused. */
		down: async () => {
			if (listening) await close();
			listening = false;
		},
		up: async () => {
			if (!listening) await listen(port);
			listening = true;
		},
		stop: async () => {
			if (listening) await close();
			listening = false;
		}
	};
}

describe('the forecast service slow, stalled, failing or gone', () => {
	let scratch: ScratchDatabase;
	let app: RunningApp;
	let stripe: StripeFake;
	let weather: WeatherFake;
	let front: Awaited<ReturnType<typeof startForecastFront>>;
	let listingId: number;
	let keeper: ShopClient;
	let visitor: ShopClient;
	let buyers = 0;
	/** The boxes scheduled while the forecast answered, and their ship day. */
	let boxes: number[] = [];
	let shipDay = '';
	/** A box paid for during each fault, held by its ship check. */
	const heldMeanwhile: number[] = [];

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		const speciesId = await speciesIdBySlug(scratch.db, 'cubaris-murina');
		({ listingId } = await insertListedClutch(scratch.db, {
			speciesId,
			code: 'WX-01',
			slug: 'forecast-test-isopods',
			title: 'Forecast-test isopods',
			alive: 40,
			tiers: [{ minQuantity: 1, priceCents: 1800 }]
		}));
		const account = DEMO_ACCOUNTS.find((a) => a.role === 'keeper')!;
		const user = await scratch.db
			.selectFrom('User')
			.select('id')
			.where('email', '=', account.email)
			.executeTakeFirstOrThrow();
		const cookie = `hatchlot.session=${await createSession(scratch.db, user.id)}`;

		weather = await startWeatherFake({ port: 0 });
		front = await startForecastFront(() => weather.url);
		stripe = await startStripeFake({
			port: 0,
			apiKey: API_KEY,
			webhookSecret: WEBHOOK_SECRET,
			retryDelaysMs: [200, 500, 1_000],
			log: () => {}
		});
		const stripeApi = new URL(stripe.url);
		app = await startApp({
			DATABASE_URL: scratch.url,
			WEATHER_API_URL: front.url,
			WEATHER_TIMEOUT_MS: String(FORECAST_TIMEOUT_MS),
			STRIPE_SECRET_KEY: API_KEY,
			STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET,
			STRIPE_API_HOST: stripeApi.hostname,
			STRIPE_API_PORT: stripeApi.port,
			STRIPE_API_PROTOCOL: 'http'
		});
		stripe.setWebhook({ url: `${app.origin}/api/stripe/webhook` });
		keeper = new ShopClient(app.origin, cookie);
		visitor = new ShopClient(app.origin);
	}, 60_000);

	afterAll(async () => {
		await stripe?.stop();
		await app?.stop();
		await front?.stop();
		await weather?.stop();
		await scratch?.drop();
	});

	const orderOf = (orderId: number) =>
		scratch.db
			.selectFrom('customer_order')
			.select(['id', 'state', 'ship_on'])
			.where('id', '=', orderId)
			.executeTakeFirstOrThrow();
	const latestCheckOf = (orderId: number) =>
		scratch.db
			.selectFrom('ship_check')
			.select(['decision', 'reasons'])
			.where('order_id', '=', orderId)
			.orderBy('id', 'desc')
			.limit(1)
			.executeTakeFirstOrThrow();
	const rulesOf = (reasons: unknown) =>
		(reasons as Array<{ rule: string }>).map((reason) => reason.rule);

	/** One animal bought and paid for, shipping to `place`; resolves once its ship check ran. */
	async function paidOrder(place: readonly [string, string, string]): Promise<number> {
		const email = `forecast-${++buyers}@example.com`;
		const buyer = new ShopClient(app.origin);
		expect((await buyer.addToCart(listingId, 1)).status).toBe(200);
		const answer = await buyer.checkout(buyerIn(email, place));
		expect(answer.status, answer.body.slice(0, 300)).toBe(303);
		expect(stripe.pay(answer.sessionId!, TEST_CARDS.paid).paid).toBe(true);
		const payment = await waitFor(
			() =>
				scratch.db
					.selectFrom('payment')
					.innerJoin('customer_order', 'customer_order.id', 'payment.order_id')
					.select(['customer_order.id', 'customer_order.state'])
					.where('payment.stripe_checkout_session_id', '=', answer.sessionId!)
					.executeTakeFirst(),
			(row) => row?.state === 'scheduled' || row?.state === 'weather_hold',
			15_000,
			'the paid order to be checked'
		);
		return payment!.id;
	}

	const estimate = async () => {
		const answer = await visitor.api('/api/ship-estimate?zip=37902&service=overnight');
		expect(answer.status, answer.body.slice(0, 300)).toBe(200);
		return JSON.parse(answer.body) as ShipEstimate;
	};

	it('ships while the forecast answers', async () => {
		boxes = await Promise.all(WARM_PLACES.map((place) => paidOrder(place)));
		const orders = await Promise.all(boxes.map(orderOf));
		expect(orders.map((o) => o.state)).toEqual(boxes.map(() => 'scheduled'));
		shipDay = orders[0]!.ship_on!;
		expect(orders.every((o) => o.ship_on === shipDay)).toBe(true);
		expect((await estimate()).decision).toBe('ship');
	}, 60_000);

	const faults: Array<[string, () => Promise<void>]> = [
		['slow (answers after 30 s)', async () => weather.setMode('slow', 30_000)],
		['stalled after half an answer', async () => front.setMode('stall')],
		['failing (503)', async () => weather.setMode('fail')],
		['gone (connections refused)', () => front.down()]
	];

	describe.each(faults)('while the forecast service is %s', (_name, breakIt) => {
		beforeAll(async () => {
			// A forecast read before the fault would be used while fresh, and rightly so.
			await scratch.db.deleteFrom('forecast_cache').execute();
			await breakIt();
		});
		afterAll(async () => {
			weather.reset();
			front.setMode('pass');
			await front.up();
		});

		it('estimates hold with the reason, without waiting past the timeout', async () => {
			const held = await estimate();
			expect(held.decision).toBe('hold');
			expect(held.shipDate).toBeNull();
			expect(held.reasons.map((reason) => reason.rule)).toContain('no_forecast');
			const cart = await visitor.page('/cart?zip=37902');
			expect(cart.status).toBe(200);
		});

		it('holds a box paid for meanwhile, and the payment stands', async () => {
			const orderId = await paidOrder(WARM_PLACES[0]);
			expect((await orderOf(orderId)).state).toBe('weather_hold');
			const payment = await scratch.db
				.selectFrom('payment')
				.select('status')
				.where('order_id', '=', orderId)
				.executeTakeFirstOrThrow();
			expect(payment.status).toBe('succeeded');
			const check = await latestCheckOf(orderId);
			expect(check.decision).toBe('hold');
			expect(rulesOf(check.reasons)).toContain('no_forecast');
			heldMeanwhile.push(orderId);
		});

		it("shows the keeper's ship day and packs nothing the forecast has not cleared", async () => {
			const page = await keeper.page(`/manage/ship-day?date=${shipDay}`);
			expect(page.status).toBe(200);
			const fields = new URLSearchParams(boxes.map((id) => ['orderIds', String(id)]));
			const packed = await keeper.request('/manage/ship-day?/pack', {
				method: 'POST',
				headers: {
					accept: 'text/html,application/xhtml+xml',
					'content-type': 'application/x-www-form-urlencoded'
				},
				body: fields.toString()
			});
			expect(packed.status).toBe(409);
			const states = await Promise.all(boxes.map(async (id) => (await orderOf(id)).state));
			expect(states).toEqual(boxes.map(() => 'scheduled'));
		});

		it('keeps the box held when the keeper checks it again', async () => {
			const orderId = heldMeanwhile.at(-1)!;
			const again = await keeper.request('/manage/ship-day?/recheck', {
				method: 'POST',
				headers: {
					accept: 'text/html,application/xhtml+xml',
					'content-type': 'application/x-www-form-urlencoded'
				},
				body: new URLSearchParams({ orderId: String(orderId) }).toString()
			});
			expect(again.status).toBe(200);
			expect((await orderOf(orderId)).state).toBe('weather_hold');
		});
	});

	it('ships the held boxes once the forecast answers again', async () => {
		expect(heldMeanwhile).toHaveLength(faults.length);
		expect((await estimate()).decision).toBe('ship');
		for (const orderId of heldMeanwhile) {
			const again = await keeper.request('/manage/ship-day?/recheck', {
				method: 'POST',
				headers: {
					accept: 'text/html,application/xhtml+xml',
					'content-type': 'application/x-www-form-urlencoded'
				},
				body: new URLSearchParams({ orderId: String(orderId) }).toString()
			});
			expect(again.status).toBe(200);
			expect((await orderOf(orderId)).state).toBe('scheduled');
		}
	});
});
