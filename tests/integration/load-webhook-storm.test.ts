// A webhook storm: thirty orders checked out through the production build, then every
// event Stripe made for them (paid, expired, a delayed payment that failed) delivered three
// times over in a shuffled order, eight deliveries at a time, to the app's own webhook
// route. Every delivery is answered 200 at the first try; each order ends in its one right
// state with one history row for the move, one receipt for a paid order and none for the
// others, and the stock counts what was sold.
import fc from 'fast-check';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { insertListedClutch, speciesIdBySlug } from './support/stock';
import {
	Buyer,
	buyerAddress,
	inLanes,
	insertSupplyListing,
	startLoadShop,
	type LoadShop
} from './support/load-shop';

/** How each of the thirty buyers' sessions ends at Stripe. */
type Ending = 'paid_live' | 'paid_supply' | 'expired' | 'async_failed';
const PLAN: Array<[Ending, number]> = [
	['paid_live', 18],
	['paid_supply', 6],
	['expired', 3],
	['async_failed', 3]
];
const DELIVERIES_EACH = 3;
const LANES = 8;
const ANIMALS = 40;
const BAGS = 20;
// A fresh shuffle each run; the seed is in every failure message so a run can be replayed.
const SEED = Math.floor(Math.random() * 2 ** 31);

/**
 * Where each ending leaves the order. A paid order with a live animal goes on to the ship
 * check, which holds it: no forecast can be had in this test, and a missing forecast means
 * hold. A supply-only order is not weather-gated and stays paid.
 */
const FINAL_STATE: Record<Ending, string> = {
	paid_live: 'weather_hold',
	paid_supply: 'paid',
	expired: 'cancelled',
	async_failed: 'cancelled'
};

describe('every event of 30 orders delivered three times, shuffled', () => {
	let shop: LoadShop;

	beforeAll(async () => {
		// Events are kept, not sent, until the storm starts.
		shop = await startLoadShop({ deliverEvents: false });
	}, 90_000);
	afterAll(async () => {
		await shop?.stop();
	});

	it('applies each event once and leaves every order in its right state', async () => {
		const note = `shuffle seed ${SEED}`;
		const speciesId = await speciesIdBySlug(shop.db, 'cubaris-murina');
		const live = await insertListedClutch(shop.db, {
			speciesId,
			code: 'STORM-A',
			slug: 'storm-juveniles',
			title: 'Storm juveniles',
			alive: ANIMALS,
			tiers: [{ minQuantity: 1, priceCents: 1800 }]
		});
		const bags = await insertSupplyListing(shop.db, {
			slug: 'storm-leaf-litter',
			title: 'Storm leaf litter, one quart',
			stock: BAGS,
			priceCents: 750
		});

		const buyers = PLAN.flatMap(([ending, count]) =>
			Array.from({ length: count }, (_, i) => ({
				ending,
				buyer: new Buyer(shop.app.origin, `storm-${ending}-${i}@example.com`)
			}))
		);
		const sessions = await inLanes(buyers, 10, async ({ ending, buyer }) => {
			const listingId = ending === 'paid_supply' ? bags : live.listingId;
			expect(await buyer.add(listingId, 1)).toEqual({ ok: true });
			const started = await buyer.checkout(buyerAddress(buyer.email));
			if (!started.ok) throw new Error(`${buyer.email}: checkout refused: ${started.words}`);
			return { ending, buyer, ...started };
		});
		for (const { ending, payUrl, sessionId, buyer } of sessions) {
			if (ending === 'paid_live' || ending === 'paid_supply')
				expect((await buyer.pay(payUrl)).ok).toBe(true);
			else if (ending === 'expired') await shop.stripe.checkout.sessions.expire(sessionId);
			else shop.fake.failAsyncPayment(sessionId);
		}
		// The stand-in's own first sends (to no address yet) finish before the address is set.
		await shop.fake.idle();
		const events = shop.fake.events();
		// 24 completions, 3 expiries, and for each failed delayed payment an unpaid completion
		// and then the failure: 33 events, none delivered yet.
		expect(events).toHaveLength(24 + 3 + 2 * 3);
		expect(events.every((e) => e.deliveries.length === 0)).toBe(true);

		const deliveries = events.flatMap((e) => Array.from({ length: DELIVERIES_EACH }, () => e.id));
		const shuffled = fc.sample(fc.shuffledSubarray(deliveries, { minLength: deliveries.length }), {
			seed: SEED,
			numRuns: 1
		})[0]!;
		shop.fake.setWebhook({ url: shop.webhookUrl });
		await inLanes(shuffled, LANES, (id) => shop.fake.redeliver(id));
		await shop.fake.idle();

		// Every delivery answered 200 the first time: a repeat is acknowledged, never an error.
		const attempts = shop.fake.events().flatMap((e) => e.deliveries);
		expect(
			attempts.filter((a) => a.status !== 200).map((a) => `${a.type}: ${a.status ?? a.error}`),
			`${note}\n${shop.app.output().slice(-3000)}`
		).toEqual([]);
		// No event came of the storm itself (a refund of a late payment would make one).
		expect(
			shop.fake
				.events()
				.filter((e) => !deliveries.includes(e.id))
				.map((e) => `${e.type} ${JSON.stringify(e.event).slice(0, 600)}`),
			note
		).toEqual([]);
		expect(attempts, note).toHaveLength(deliveries.length);
		const stored = await shop.db
			.selectFrom('payment_event')
			.select(sql<number>`count(*)::int`.as('n'))
			.where(
				'stripe_event_id',
				'in',
				events.map((e) => e.id)
			)
			.executeTakeFirstOrThrow();
		expect(stored.n, note).toBe(events.length);

		for (const { ending, buyer, sessionId } of sessions) {
			const who = `${buyer.email} (${ending}, ${note})`;
			const order = await shop.db
				.selectFrom('payment')
				.innerJoin('customer_order', 'customer_order.id', 'payment.order_id')
				.select([
					'customer_order.id',
					'customer_order.state',
					'customer_order.total_cents',
					'customer_order.paid_cents',
					'payment.status as payment'
				])
				.where('payment.stripe_checkout_session_id', '=', sessionId)
				.executeTakeFirstOrThrow();
			expect(order.state, who).toBe(FINAL_STATE[ending]);
			const paid = ending === 'paid_live' || ending === 'paid_supply';
			expect(order.payment, who).toBe(
				paid ? 'succeeded' : ending === 'expired' ? 'expired' : 'failed'
			);
			expect(order.paid_cents, who).toBe(paid ? order.total_cents : 0);
			// One history row per move: to paid once (then to the hold once), or to cancelled once.
			const moves = await shop.db
				.selectFrom('order_event')
				.select('to_state')
				.where('order_id', '=', order.id)
				.orderBy('id')
				.execute();
			expect(
				moves.map((m) => m.to_state),
				who
			).toEqual(
				ending === 'paid_live' ? ['paid', 'weather_hold'] : paid ? ['paid'] : ['cancelled']
			);
			const holds = await shop.db
				.selectFrom('reservation')
				.select(['state', 'quantity'])
				.where('order_id', '=', order.id)
				.execute();
			expect(holds, who).toEqual([{ state: paid ? 'converted' : 'released', quantity: 1 }]);
			// One e-mail for a paid order, the receipt; none for one that never paid.
			const mail = await shop.db
				.selectFrom('outgoing_mail')
				.select('kind')
				.where('to_address', '=', buyer.email)
				.execute();
			expect(
				mail.map((m) => m.kind),
				who
			).toEqual(paid ? ['order_receipt'] : []);
			if (ending === 'paid_live') {
				const checks = await shop.db
					.selectFrom('ship_check')
					.select('decision')
					.where('order_id', '=', order.id)
					.execute();
				expect(checks, who).toEqual([{ decision: 'hold' }]);
			}
		}

		// Sold: 18 juveniles and 6 bags; the expired and failed ones went back on offer.
		const stock = await sql<{ free: number; shelf: number; held: number }>`
			select clutch_free_animals(${live.clutchId}) as free,
				(select supply_stock from listing where id = ${bags}) as shelf,
				(select count(*)::int from reservation
					where listing_id in (${live.listingId}, ${bags}) and state = 'held') as held`.execute(shop.db);
		expect(stock.rows[0], note).toEqual({ free: ANIMALS - 18, shelf: BAGS - 6, held: 0 });
	}, 80_000);
});
