// A drop: a clutch of 12 juveniles goes live and 50 people try to buy one each at the same
// moment, through the production build: the add-to-cart route, the checkout form, the
// Stripe stand-in's pay page and the webhook it sends back. Five rounds, fresh stock each.
// Exactly 12 are sold, the other 38 are told in words that the animals are gone, and no
// count of free animals or holds ever goes below zero, watched while the race runs.
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { insertListedClutch, speciesIdBySlug } from './support/stock';
import { Buyer, buyerAddress, startLoadShop, type LoadShop } from './support/load-shop';

/** What the add-to-cart button says to someone who comes when none is left. */
const SOLD_OUT_TO_ADD =
	'Sold out: every one is sold or held for another buyer who is checking out.';
const BUYERS = 50;
const ANIMALS = 12;
const ROUNDS = 5;
/** $24.00 for one juvenile, in cents (USD has two minor units, ISO 4217). */
const PRICE_CENTS = 2400;

type Fate =
	| { kind: 'bought'; orderNumber: string }
	| { kind: 'refused_at_add'; status: number; words: string }
	| { kind: 'refused_at_checkout'; status: number; words: string };

describe('a drop of 12 juveniles to 50 buyers at once', () => {
	let shop: LoadShop;
	let speciesId: number;
	let overnightFee: number;

	beforeAll(async () => {
		shop = await startLoadShop({ deliverEvents: true });
		speciesId = await speciesIdBySlug(shop.db, 'cubaris-murina');
		overnightFee = (
			await shop.db
				.selectFrom('shop_setting')
				.select('fee_overnight_cents')
				.executeTakeFirstOrThrow()
		).fee_overnight_cents;
	}, 90_000);
	afterAll(async () => {
		await shop?.stop();
	});

	/** Free animals and live holds of the clutch as PostgreSQL counts them, never clamped at 0. */
	async function stockOf(clutchId: number) {
		const row = await sql<{ free: number; held: number; sold: number }>`
			select clutch_free_animals(${clutchId}) as free,
				(select coalesce(sum(r.quantity), 0)::int from reservation r
					join listing l on l.id = r.listing_id
					where l.clutch_id = ${clutchId} and r.state = 'held' and r.expires_at > now()) as held,
				(select coalesce(sum(ol.quantity), 0)::int from order_line ol
					join customer_order o on o.id = ol.order_id
					where ol.clutch_id = ${clutchId} and o.state not in ('cancelled', 'awaiting_payment')) as sold`.execute(
			shop.db
		);
		return row.rows[0]!;
	}

	/** One person: add one juvenile, check out, pay, and look at the page Stripe sends them back to. */
	async function buyOne(buyer: Buyer, listingId: number): Promise<Fate> {
		const added = await buyer.add(listingId, 1);
		if (!added.ok) return { kind: 'refused_at_add', status: added.status, words: added.message };
		const started = await buyer.checkout(buyerAddress(buyer.email));
		if (!started.ok)
			return { kind: 'refused_at_checkout', status: started.status, words: started.words };
		const paid = await buyer.pay(started.payUrl);
		if (!paid.ok) throw new Error(`${buyer.email}: the pay page answered ${paid.status}`);
		const done = await buyer.page(paid.doneUrl);
		const orderNumber = /HL-\d{5,}/.exec(done.html)?.[0];
		if (done.status !== 200 || !orderNumber)
			throw new Error(`${buyer.email}: the page after paying answered ${done.status}`);
		return { kind: 'bought', orderNumber };
	}

	for (let round = 1; round <= ROUNDS; round++) {
		it(`round ${round}: sells exactly ${ANIMALS} and tells the other ${BUYERS - ANIMALS} they are sold out`, async () => {
			const { clutchId, listingId } = await insertListedClutch(shop.db, {
				speciesId,
				code: `DROP-R${round}`,
				slug: `drop-round-${round}`,
				title: `Drop round ${round} juveniles`,
				alive: ANIMALS,
				tiers: [{ minQuantity: 1, priceCents: PRICE_CENTS }]
			});

			// Watch the counts while the buyers race: none may ever go below zero or past the clutch.
			const seen: Array<{ free: number; held: number; sold: number }> = [];
			let racing = true;
			const watching = (async () => {
				while (racing) {
					seen.push(await stockOf(clutchId));
					await new Promise((resolve) => setTimeout(resolve, 15));
				}
			})();
			const buyers = Array.from(
				{ length: BUYERS },
				(_, i) => new Buyer(shop.app.origin, `drop-${round}-${i}@example.com`)
			);
			let fates: Fate[];
			try {
				fates = await Promise.all(buyers.map((buyer) => buyOne(buyer, listingId)));
				// Every payment's event reaches the app and is answered before the counts are read.
				await shop.fake.idle();
			} finally {
				racing = false;
				await watching;
			}

			// No buyer ever met a server error, at any step.
			const errors = buyers.flatMap((b) => b.statuses.filter((s) => s >= 500));
			expect(errors, shop.app.output().slice(-3000)).toEqual([]);

			const bought = fates.filter((f) => f.kind === 'bought');
			const refused = fates.filter((f) => f.kind !== 'bought');
			expect(bought).toHaveLength(ANIMALS);
			expect(refused).toHaveLength(BUYERS - ANIMALS);
			expect(new Set(bought.map((f) => f.orderNumber)).size).toBe(ANIMALS);
			// The words each refused buyer read: on the checkout page's alert, or from the cart button.
			for (const fate of refused) {
				if (fate.kind === 'refused_at_checkout') {
					expect(fate.status).toBe(409);
					expect(fate.words).toContain('Sold out since you added it.');
					expect(fate.words).toContain('nothing was held');
				} else if (fate.kind === 'refused_at_add') {
					expect(fate.status).toBe(409);
					expect(fate.words).toBe(SOLD_OUT_TO_ADD);
				}
			}

			// Never below zero, never more held and sold than the clutch has, at any moment seen.
			expect(seen.length).toBeGreaterThan(0);
			for (const moment of seen) {
				// (A hold's own quantity is at least 1 by a CHECK; the sums are what can go wrong.)
				expect(moment.free).toBeGreaterThanOrEqual(0);
				expect(moment.held + moment.sold).toBeLessThanOrEqual(ANIMALS);
			}
			expect(await stockOf(clutchId)).toEqual({ free: 0, held: 0, sold: ANIMALS });

			const orders = await shop.db
				.selectFrom('customer_order')
				.innerJoin('order_line', 'order_line.order_id', 'customer_order.id')
				.select([
					'customer_order.order_number',
					'customer_order.state',
					'customer_order.subtotal_cents',
					'customer_order.shipping_cents',
					'customer_order.total_cents',
					'customer_order.paid_cents',
					'order_line.quantity'
				])
				.where('order_line.listing_id', '=', listingId)
				.execute();
			// Refused checkouts made no order at all: all or nothing.
			expect(orders).toHaveLength(ANIMALS);
			expect(orders.map((o) => o.order_number).sort()).toEqual(
				bought.map((f) => f.orderNumber).sort()
			);
			for (const order of orders) {
				expect(order.quantity).toBe(1);
				// Paid, then held by the ship check: no forecast can be had in this test.
				expect(order.state).toBe('weather_hold');
				expect(order.subtotal_cents).toBe(PRICE_CENTS);
				expect(order.shipping_cents).toBe(overnightFee);
				expect(order.total_cents).toBe(PRICE_CENTS + overnightFee);
				expect(order.paid_cents).toBe(order.total_cents);
			}
			const holds = await shop.db
				.selectFrom('reservation')
				.select([
					'state',
					sql<number>`count(*)::int`.as('n'),
					sql<number>`sum(quantity)::int`.as('q')
				])
				.where('listing_id', '=', listingId)
				.groupBy('state')
				.execute();
			expect(holds).toEqual([{ state: 'converted', n: ANIMALS, q: ANIMALS }]);
			const receipts = await shop.db
				.selectFrom('outgoing_mail')
				.select('subject')
				.where('kind', '=', 'order_receipt')
				.where(
					'to_address',
					'in',
					buyers.map((b) => b.email)
				)
				.execute();
			expect(receipts).toHaveLength(ANIMALS);
			const clutch = await shop.db
				.selectFrom('clutch')
				.select('state')
				.where('id', '=', clutchId)
				.executeTakeFirstOrThrow();
			expect(clutch.state).toBe('sold_out');
			// Someone who comes a moment later is told so at the add-to-cart button.
			const latecomer = new Buyer(shop.app.origin, `drop-${round}-late@example.com`);
			expect(await latecomer.add(listingId, 1)).toEqual({
				ok: false,
				status: 409,
				message: SOLD_OUT_TO_ADD
			});
		}, 60_000);
	}
});
