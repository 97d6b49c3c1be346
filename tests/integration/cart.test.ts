// Carts and holds on a real PostgreSQL: what a cart may ask for, how a line reads when
// stock moves under it, holds that never add up to more than is on offer (20 buyers
// racing for 3 animals), holds that expire on their own, and a guest cart joining the
// account's on sign-in.
import { sql } from 'kysely';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import {
	changeLine,
	findCartId,
	holdCart,
	mergeGuestCart,
	readCart,
	removeLine,
	sweepExpiredHolds,
	type CartOwner
} from '../../src/lib/server/cart/cart';
import { onOfferOf } from '../../src/lib/server/listings/offer';
import type { Db } from '../../src/lib/server/db/connect';
import { seedDemo } from '../../seed/demo';
import { scratchDatabase, type ScratchDatabase } from './support/databases';
import { guestCartWith as guestCart, insertListedClutch } from './support/stock';

describe('cart and holds', () => {
	let scratch: ScratchDatabase;
	let db: Db;
	let speciesId: number;
	let dagnyId: string;

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
		dagnyId = (
			await db
				.selectFrom('User')
				.select('id')
				.where('email', '=', 'dagny.halvorsen@example.com')
				.executeTakeFirstOrThrow()
		).id;
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	let serial = 0;
	/** A listed clutch of `alive` animals and a live listing of it, priced 1 for $6, 5 for $26. */
	async function listedClutch(alive: number, unitSize = 1) {
		serial += 1;
		return insertListedClutch(db, {
			speciesId,
			code: `CART-T${serial}`,
			slug: `cart-test-listing-${serial}`,
			title: `Test isopods ${serial}`,
			alive,
			unitSize,
			stage: 'sub_adult',
			tiers: [
				{ minQuantity: 1, priceCents: 600 },
				{ minQuantity: 5, priceCents: 2600 }
			]
		});
	}

	async function guestCartWith(listingId: number, quantity: number): Promise<CartOwner> {
		const owner = await guestCart(db, listingId, quantity);
		expect(owner).not.toBeNull();
		return owner!;
	}

	beforeEach(async () => {
		await db.deleteFrom('reservation').where('cart_id', 'is not', null).execute();
	});

	it('prices a cart on the server from the tiers, per listing, plus the fee', async () => {
		const { listingId } = await listedClutch(20);
		const owner = await guestCartWith(listingId, 7);
		const cart = await readCart(db, owner.guestCartId, 'two_day');
		// 7 units reach the 5-for-$26 tier: 7 × 520 = 3640 cents. Two-day fee: the demo's $28.00.
		expect(cart.lines[0]).toMatchObject({ quantity: 7, quantityToBuy: 7, lineTotalCents: 3640 });
		expect(cart.subtotalCents).toBe(3640);
		expect(cart.shippingCents).toBe(2800);
		expect(cart.totalCents).toBe(6440);
		expect(cart.hasLive).toBe(true);
	});

	it('refuses bad quantities and listings that cannot be sold, leaving the cart as it was', async () => {
		const { listingId, clutchId } = await listedClutch(4);
		const owner = await guestCartWith(listingId, 2);
		for (const quantity of [0, -1, 1.5, 5000]) {
			const outcome = await changeLine(db, owner, { listingId, quantity, mode: 'set' });
			expect(outcome.ok).toBe(false);
			if (!outcome.ok) expect(outcome.field).toBe('quantity');
		}
		const tooMany = await changeLine(db, owner, { listingId, quantity: 5, mode: 'set' });
		expect(tooMany).toMatchObject({
			ok: false,
			status: 409,
			problem: 'Only 4 on offer (you have 2 in your cart).'
		});
		const adding = await changeLine(db, owner, { listingId, quantity: 3, mode: 'add' });
		expect(adding.ok).toBe(false);
		const unknown = await changeLine(db, owner, { listingId: 999_999, quantity: 1, mode: 'add' });
		expect(unknown).toMatchObject({ ok: false, status: 404 });
		await db
			.updateTable('clutch')
			.set({ state: 'paused', paused_reason: 'molting' })
			.where('id', '=', clutchId)
			.execute();
		const paused = await changeLine(db, owner, { listingId, quantity: 1, mode: 'set' });
		expect(paused).toMatchObject({ ok: false, status: 409 });
		const cart = await readCart(db, owner.guestCartId);
		expect(cart.lines[0]).toMatchObject({ quantity: 2, quantityToBuy: 0, lineTotalCents: 0 });
		expect(cart.lines[0]!.problem?.kind).toBe('paused');
		expect(cart.totalCents).toBe(0);
	});

	it('says so when stock moved under a line, and sells what is left', async () => {
		const { listingId, clutchId } = await listedClutch(6);
		const owner = await guestCartWith(listingId, 5);
		// Another buyer's paid order takes 3 of the 6 after this cart was filled.
		const order = await db
			.insertInto('customer_order')
			.values({
				order_number: `HL-9${String(serial).padStart(4, '0')}`,
				email: 'someone@example.test',
				ship_name: 'Someone',
				ship_line1: '1 Test Way',
				ship_city: 'Astoria',
				ship_state: 'OR',
				ship_zip: '97103',
				service: 'overnight',
				state: 'paid',
				subtotal_cents: 1800,
				shipping_cents: 0,
				total_cents: 1800,
				paid_cents: 1800
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await db
			.insertInto('order_line')
			.values({
				order_id: order.id,
				listing_id: listingId,
				clutch_id: clutchId,
				species_id: speciesId,
				description: 'Test isopods',
				quantity: 3,
				line_total_cents: 1800,
				is_live: true
			})
			.execute();
		const cart = await readCart(db, owner.guestCartId);
		expect(cart.lines[0]).toMatchObject({
			quantity: 5,
			quantityToBuy: 3,
			available: 3,
			lineTotalCents: 1800
		});
		expect(cart.lines[0]!.problem).toMatchObject({ kind: 'short' });
		expect(cart.lines[0]!.problem!.text).toMatch(/Only 3 on offer now; you asked for 5/);
		// Withdrawn: the line stays so the buyer sees why, but costs nothing and cannot be held.
		await db
			.updateTable('listing')
			.set({ state: 'withdrawn' })
			.where('id', '=', listingId)
			.execute();
		const gone = await readCart(db, owner.guestCartId);
		expect(gone.lines[0]!.problem?.kind).toBe('gone');
		expect(gone.totalCents).toBe(0);
		const hold = await holdCart(db, owner, null);
		expect(hold.ok).toBe(false);
		const removed = await removeLine(db, owner, listingId);
		expect(removed.lines).toHaveLength(0);
	});

	it('holds exactly what is on offer when 20 buyers race for the last 3 animals', async () => {
		for (let round = 0; round < 5; round++) {
			const { listingId } = await listedClutch(3);
			const owners = await Promise.all(
				Array.from({ length: 20 }, () => guestCartWith(listingId, 1))
			);
			const outcomes = await Promise.all(owners.map((owner) => holdCart(db, owner, null)));
			expect(outcomes.filter((o) => o.ok)).toHaveLength(3);
			const held = await db
				.selectFrom('reservation')
				.select(sql<number>`sum(quantity)::integer`.as('n'))
				.where('listing_id', '=', listingId)
				.where('state', '=', 'held')
				.executeTakeFirstOrThrow();
			expect(held.n).toBe(3);
			expect(await onOfferOf(db, listingId)).toBe(0);
			const refused = outcomes.find((o) => !o.ok);
			if (refused && !refused.ok) expect(refused.lines[0]!.problem).toMatch(/sold out|Only 0/i);
		}
	});

	it('holds across two listings of one clutch without overselling its animals', async () => {
		// 10 animals: a pair listing and a single listing draw on the same clutch.
		const { clutchId, listingId: singles } = await listedClutch(10);
		const pairs = await db
			.insertInto('listing')
			.values({
				slug: `cart-test-pairs-${clutchId}`,
				kind: 'animal',
				species_id: speciesId,
				clutch_id: clutchId,
				title: 'Test pairs',
				unit_size: 2,
				sex: 'pair',
				state: 'live'
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await db
			.insertInto('price_tier')
			.values({ listing_id: pairs.id, min_quantity: 1, price_cents: 900 })
			.execute();
		const buyers = await Promise.all([
			...Array.from({ length: 6 }, () => guestCartWith(pairs.id, 1)),
			...Array.from({ length: 6 }, () => guestCartWith(singles, 1))
		]);
		await Promise.all(buyers.map((owner) => holdCart(db, owner, null)));
		const animals = await db
			.selectFrom('reservation')
			.innerJoin('listing', 'listing.id', 'reservation.listing_id')
			.select(sql<number>`sum(reservation.quantity * listing.unit_size)::integer`.as('n'))
			.where('listing.clutch_id', '=', clutchId)
			.where('reservation.state', '=', 'held')
			.executeTakeFirstOrThrow();
		expect(animals.n).toBeLessThanOrEqual(10);
		expect(animals.n).toBeGreaterThanOrEqual(9); // every buyer who could fit got in
	});

	it('lets a hold lapse: stock is free again at once, and the sweep tidies the rows', async () => {
		const { listingId } = await listedClutch(2);
		const first = await guestCartWith(listingId, 2);
		const second = await guestCartWith(listingId, 2);
		expect((await holdCart(db, first, null)).ok).toBe(true);
		expect((await holdCart(db, second, null)).ok).toBe(false);
		const heldCart = await readCart(db, first.guestCartId);
		expect(heldCart.heldUntil).not.toBeNull();
		// 15 minutes pass (the demo's reservation time).
		const minutes = Date.parse(heldCart.heldUntil!) - Date.now();
		expect(minutes).toBeGreaterThan(14 * 60_000);
		expect(minutes).toBeLessThanOrEqual(15 * 60_000);
		await db
			.updateTable('reservation')
			.set({ expires_at: sql`now() - interval '1 second'` })
			.where('listing_id', '=', listingId)
			.execute();
		expect(await onOfferOf(db, listingId)).toBe(2);
		expect((await readCart(db, first.guestCartId)).heldUntil).toBeNull();
		expect((await holdCart(db, second, null)).ok).toBe(true);
		const swept = await sweepExpiredHolds(db);
		expect(swept.released).toBeGreaterThanOrEqual(1);
		const states = await db
			.selectFrom('reservation')
			.select(['state', 'cart_id'])
			.where('listing_id', '=', listingId)
			.orderBy('id')
			.execute();
		expect(states.map((r) => r.state)).toEqual(['released', 'held']);
	});

	it('changing a held cart lets its holds go', async () => {
		const { listingId } = await listedClutch(5);
		const owner = await guestCartWith(listingId, 2);
		expect((await holdCart(db, owner, null)).ok).toBe(true);
		expect(await onOfferOf(db, listingId)).toBe(3);
		// Its own hold does not count against the buyer when they change the line.
		expect((await changeLine(db, owner, { listingId, quantity: 5, mode: 'set' })).ok).toBe(true);
		expect(await onOfferOf(db, listingId)).toBe(5);
	});

	it('pours a guest cart into the account cart on sign-in, adding quantities', async () => {
		const { listingId: a } = await listedClutch(30);
		const { listingId: b } = await listedClutch(30);
		const account: CartOwner = { userId: dagnyId, guestCartId: null };
		await changeLine(db, account, { listingId: a, quantity: 2, mode: 'set' });
		const visitor = await guestCartWith(a, 3);
		await changeLine(db, visitor, { listingId: b, quantity: 4, mode: 'set' });
		expect((await holdCart(db, visitor, null)).ok).toBe(true);
		expect(await mergeGuestCart(db, visitor.guestCartId!, dagnyId)).toEqual({ merged: 2 });
		// A second sign-in with the same stale cookie changes nothing.
		expect(await mergeGuestCart(db, visitor.guestCartId!, dagnyId)).toEqual({ merged: 0 });
		const cart = await readCart(db, await findCartId(db, account));
		const quantities = Object.fromEntries(cart.lines.map((l) => [l.listingId, l.quantity]));
		expect(quantities[a]).toBe(5);
		expect(quantities[b]).toBe(4);
		expect(await findCartId(db, visitor)).toBeNull();
		// The guest's holds went with the merge; nothing stays held for a cart that is gone.
		expect(await onOfferOf(db, b)).toBe(30);
		const audit = await db
			.selectFrom('audit_log')
			.select(['action', 'actor_user_id'])
			.where('action', '=', 'cart.merge')
			.execute();
		expect(audit.at(-1)).toEqual({ action: 'cart.merge', actor_user_id: dagnyId });
	});
});
