// Listings on a real PostgreSQL, over the demo data: quantity on offer derived from the
// clutch (alive less sold less held, in units of each listing), the pause rule, a clutch
// selling out after a loss, what publishing refuses, the audit entries, and an edit made
// from a stale page refused.
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import type { Actor } from '../../src/lib/server/accounts/users';
import { insertClutches } from '../../src/lib/server/clutches/create';
import {
	backToGrowing,
	markReady,
	pause,
	recordLoss,
	recount,
	unpause
} from '../../src/lib/server/clutches/clutches';
import { createDb, type Db } from '../../src/lib/server/db/connect';
import type { OrderState } from '../../src/lib/server/db/schema';
import {
	createListing,
	editListing,
	getListingPage,
	listListings,
	publishListing,
	withdrawListing,
	type ListingInput,
	type ListingSnapshot
} from '../../src/lib/server/listings/listings';
import { onOfferFor, onOfferOf } from '../../src/lib/server/listings/offer';
import type { PriceTier } from '../../src/lib/money/pricing';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const TODAY = '2026-12-01';

/** "1 for $14, 5 for $60, 10 for $110" in cents. */
const SINGLES: PriceTier[] = [
	{ minQuantity: 1, priceCents: 1400 },
	{ minQuantity: 5, priceCents: 6000 },
	{ minQuantity: 10, priceCents: 11000 }
];
const GROUPS: PriceTier[] = [
	{ minQuantity: 1, priceCents: 6000 },
	{ minQuantity: 3, priceCents: 16500 }
];

describe('listings', () => {
	let scratch: ScratchDatabase;
	let db: Db;
	let teo: Actor;
	let wren: Actor;
	let narceusId: number;
	let orderNumber = 70000;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		db = scratch.db;
		await seedDemo(db, { today: TODAY });
		const idOf = async (role: 'keeper' | 'admin') => {
			const account = DEMO_ACCOUNTS.find((a) => a.role === role)!;
			return (
				await db
					.selectFrom('User')
					.select('id')
					.where('email', '=', account.email)
					.executeTakeFirstOrThrow()
			).id;
		};
		teo = { userId: await idOf('keeper'), ip: '127.0.0.2' };
		wren = { userId: await idOf('admin'), ip: '127.0.0.1' };
		narceusId = (
			await db
				.selectFrom('species')
				.select('id')
				.where('slug', '=', 'narceus-americanus')
				.executeTakeFirstOrThrow()
		).id;
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	// ---- fixtures of our own, so every number below is worked out by hand

	/** A bought-in Narceus clutch of `count`, marked ready. */
	async function readyClutch(count: number): Promise<{ id: number; code: string }> {
		const [made] = await insertClutches(
			db,
			{
				speciesId: narceusId,
				growOutWeeks: 40,
				generation: 2,
				foundOn: '2026-01-05',
				origin: 'bought_in',
				tubId: null,
				tubCheckId: null,
				parts: [{ count, stage: 'juvenile', sizeClass: 'small' }]
			},
			wren.userId
		);
		const ready = await markReady(db, wren, made!.code, { note: '' }, TODAY);
		expect(ready.ok).toBe(true);
		return { id: made!.id, code: made!.code };
	}

	const input = (overrides: Partial<ListingInput> = {}): ListingInput => ({
		title: 'American giant millipedes, juvenile, each',
		description: 'Captive-bred F2.',
		unitSize: 1,
		sex: 'unsexed',
		isLive: true,
		speciesId: null,
		supplyStock: null,
		tiers: SINGLES,
		...overrides
	});

	async function draft(
		clutchCode: string,
		overrides: Partial<ListingInput> = {}
	): Promise<ListingSnapshot> {
		const made = await createListing(db, teo, {
			...input(overrides),
			kind: 'animal',
			clutchCode
		});
		if (!made.ok) throw new Error(made.problem);
		return made.listing;
	}

	async function stampOf(id: number): Promise<string> {
		const row = await sql<{
			stamp: string;
		}>`select (floor(extract(epoch from updated_at) * 1000000))::bigint::text as stamp
			from listing where id = ${id}`.execute(db);
		return row.rows[0]!.stamp;
	}

	async function live(listing: ListingSnapshot): Promise<ListingSnapshot> {
		const published = await publishListing(db, teo, listing.slug, {
			stamp: await stampOf(listing.id)
		});
		if (!published.ok) throw new Error(published.problem);
		return published.listing;
	}

	/** An order of lines (listing, units, units restocked) in `state`. */
	async function order(
		state: OrderState,
		lines: { listing: ListingSnapshot; clutchId: number; quantity: number; restocked?: number }[]
	) {
		const made = await db
			.insertInto('customer_order')
			.values({
				order_number: `HL-${++orderNumber}`,
				email: 'jory.whitfield@example.test',
				ship_name: 'Jory Whitfield',
				ship_line1: '1 Pier St',
				ship_city: 'Astoria',
				ship_state: 'OR',
				ship_zip: '97103',
				service: 'overnight',
				state,
				subtotal_cents: 0,
				shipping_cents: 0,
				total_cents: 0
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await db
			.insertInto('order_line')
			.values(
				lines.map((line) => ({
					order_id: made.id,
					listing_id: line.listing.id,
					clutch_id: line.clutchId,
					species_id: narceusId,
					description: line.listing.title,
					stage: 'juvenile' as const,
					unit_size: line.listing.unitSize,
					quantity: line.quantity,
					restocked_quantity: line.restocked ?? 0,
					line_total_cents: 0,
					is_live: true
				}))
			)
			.execute();
		return made.id;
	}

	/** A cart hold of `quantity` units, expiring `minutes` from now (negative: already expired). */
	async function hold(
		listing: ListingSnapshot,
		quantity: number,
		minutes = 15,
		state: 'held' | 'released' = 'held'
	) {
		const cart = await db
			.insertInto('cart')
			.values({ user_id: null })
			.returning('id')
			.executeTakeFirstOrThrow();
		return (
			await db
				.insertInto('reservation')
				.values({
					cart_id: cart.id,
					listing_id: listing.id,
					quantity,
					state,
					expires_at: new Date(Date.now() + minutes * 60_000)
				})
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
	}

	const offer = async (...listings: ListingSnapshot[]) => {
		const found = await onOfferFor(
			db,
			listings.map((l) => l.id)
		);
		return listings.map((l) => found.get(l.id));
	};
	const clutchRow = (id: number) =>
		db.selectFrom('clutch').selectAll().where('id', '=', id).executeTakeFirstOrThrow();
	const listingRow = (id: number) =>
		db.selectFrom('listing').selectAll().where('id', '=', id).executeTakeFirstOrThrow();
	const auditOf = (entity: 'listing' | 'clutch', id: number) =>
		db
			.selectFrom('audit_log')
			.selectAll()
			.where('entity', '=', entity)
			.where('entity_id', '=', String(id))
			.orderBy('id')
			.execute();

	describe('quantity on offer', () => {
		it('is alive − sold − held, in units of each listing, shared by two listings of one clutch', async () => {
			const clutch = await readyClutch(40);
			const singles = await live(await draft(clutch.code));
			const groups = await live(
				await draft(clutch.code, { title: 'Narceus, group of 5', unitSize: 5, tiers: GROUPS })
			);
			// 40 alive, nothing sold or held: 40 singles, or 40 / 5 = 8 groups of 5.
			expect(await offer(singles, groups)).toEqual([40, 8]);

			// Paid: 3 singles and 2 groups = 3 + 10 = 13 animals. Free 27: 27 singles, 5 groups.
			const paid = await order('paid', [
				{ listing: singles, clutchId: clutch.id, quantity: 3 },
				{ listing: groups, clutchId: clutch.id, quantity: 2 }
			]);
			expect(await offer(singles, groups)).toEqual([27, 5]);

			// Cancelled and awaiting-payment orders take nothing.
			await order('cancelled', [{ listing: singles, clutchId: clutch.id, quantity: 4 }]);
			await order('awaiting_payment', [{ listing: groups, clutchId: clutch.id, quantity: 2 }]);
			expect(await offer(singles, groups)).toEqual([27, 5]);

			// A live hold of 2 groups keeps 10 animals: free 17, so 17 singles and 3 groups.
			await hold(groups, 2);
			expect(await offer(singles, groups)).toEqual([17, 3]);
			// An expired hold and a released one count for nothing.
			await hold(singles, 5, -1);
			await hold(singles, 6, 15, 'released');
			expect(await offer(singles, groups)).toEqual([17, 3]);

			// One group of the paid order comes back to stock: 5 animals, free 22: 22 and 4.
			await db
				.updateTable('order_line')
				.set({ restocked_quantity: 1 })
				.where('order_id', '=', paid)
				.where('listing_id', '=', groups.id)
				.execute();
			expect(await offer(singles, groups)).toEqual([22, 4]);

			// The page's breakdown: sold 3 + (2 − 1) × 5 = 8, held 2 × 5 = 10, free 40 − 8 − 10 = 22.
			const page = await getListingPage(db, groups.slug);
			expect(page!.breakdown).toEqual({
				kind: 'animal',
				alive: 40,
				sold: 8,
				heldNow: 10,
				free: 22,
				unitSize: 5,
				unitsOnOffer: 4,
				unitsIfLive: 4
			});
			expect(page!.siblings).toMatchObject([{ slug: singles.slug, onOffer: 22 }]);
			const table = await listListings(db, { q: clutch.code });
			expect(table.rows.map((r) => [r.slug, r.onOffer]).sort()).toEqual(
				[
					[singles.slug, 22],
					[groups.slug, 4]
				].sort()
			);
		});

		it('is nothing while the clutch is paused, and comes back when it is unpaused', async () => {
			const clutch = await readyClutch(12);
			const singles = await live(await draft(clutch.code));
			expect(await onOfferOf(db, singles.id)).toBe(12);

			const paused = await pause(
				db,
				teo,
				clutch.code,
				{ pausedReason: 'molting', note: 'Three in molt chambers.' },
				TODAY
			);
			expect(paused.ok).toBe(true);
			// The listing itself stays live; the clutch's state takes it out of the shop.
			expect((await listingRow(singles.id)).state).toBe('live');
			expect(await onOfferOf(db, singles.id)).toBe(0);
			const page = await getListingPage(db, singles.slug);
			expect(page!.inShop).toBe(false);
			expect(page!.pause).toEqual({
				reason: 'molting',
				note: 'Three in molt chambers.',
				since: TODAY
			});
			expect(page!.breakdown).toMatchObject({ unitsOnOffer: 0, unitsIfLive: 12 });

			expect((await unpause(db, teo, clutch.code, { note: '' }, TODAY)).ok).toBe(true);
			expect((await clutchRow(clutch.id)).state).toBe('listed');
			expect(await onOfferOf(db, singles.id)).toBe(12);
			expect((await getListingPage(db, singles.slug))!.inShop).toBe(true);
		});

		it('gives a supply its shelf count less what carts hold', async () => {
			const made = await createListing(db, teo, {
				...input({
					title: 'House substrate mix, 8 quarts',
					isLive: false,
					supplyStock: 10,
					tiers: [{ minQuantity: 1, priceCents: 2400 }]
				}),
				kind: 'supply'
			});
			if (!made.ok) throw new Error(made.problem);
			const supply = await live(made.listing);
			await hold(supply, 3);
			// 10 on the shelf − 3 held = 7.
			expect(await onOfferOf(db, supply.id)).toBe(7);
			// The shelf count cannot drop below what carts hold.
			const lower = await editListing(db, teo, supply.slug, {
				...input({ title: supply.title, isLive: false, supplyStock: 2, tiers: supply.tiers }),
				stamp: await stampOf(supply.id)
			});
			expect(lower).toMatchObject({ ok: false, field: 'supplyStock' });
			expect((await listingRow(supply.id)).supply_stock).toBe(10);
		});
	});

	describe('selling out', () => {
		it('closes the clutch and its live listings when a loss leaves nothing free', async () => {
			const clutch = await readyClutch(6);
			const singles = await live(await draft(clutch.code));
			await order('paid', [{ listing: singles, clutchId: clutch.id, quantity: 2 }]);
			// 6 alive, 2 sold: 4 free. Losing 4 leaves 2 alive, both sold: nothing free.
			const loss = await recordLoss(
				db,
				teo,
				clutch.code,
				{ count: 4, reason: 'Dried out.', happenedOn: TODAY },
				TODAY
			);
			expect(loss.ok && loss.clutch.state).toBe('sold_out');
			expect(await clutchRow(clutch.id)).toMatchObject({
				state: 'sold_out',
				count_alive: 2,
				paused_reason: null
			});
			expect((await listingRow(singles.id)).state).toBe('sold_out');
			const events = await db
				.selectFrom('clutch_event')
				.select(['kind', 'from_value', 'to_value'])
				.where('clutch_id', '=', clutch.id)
				.orderBy('id')
				.execute();
			expect(events.at(-1)).toEqual({ kind: 'state', from_value: 'listed', to_value: 'sold_out' });
			expect((await auditOf('clutch', clutch.id)).map((a) => a.action)).toContain(
				'clutch.sold_out'
			);
			expect((await auditOf('listing', singles.id)).at(-1)).toMatchObject({
				action: 'listing.sold_out',
				actor_user_id: teo.userId
			});
		});

		it('waits while a cart still holds some, and closes on a recount once it lapses', async () => {
			const clutch = await readyClutch(5);
			const singles = await live(await draft(clutch.code));
			const held = await hold(singles, 2);
			// 5 alive, 2 held: losing 3 leaves 0 free but a live hold that may still sell.
			await recordLoss(
				db,
				teo,
				clutch.code,
				{ count: 3, reason: 'Mites.', happenedOn: TODAY },
				TODAY
			);
			expect((await clutchRow(clutch.id)).state).toBe('listed');
			expect((await listingRow(singles.id)).state).toBe('live');
			// The hold lapses, and a census finds none of the 2 alive: nothing left, sold out.
			await db
				.updateTable('reservation')
				.set({ expires_at: new Date(Date.now() - 60_000) })
				.where('id', '=', held)
				.execute();
			const before = await clutchRow(clutch.id);
			const counted = await recount(
				db,
				teo,
				clutch.code,
				{ countAlive: 0, reason: 'None left.', happenedOn: TODAY, version: before.version },
				TODAY
			);
			expect(counted.ok).toBe(true);
			expect((await clutchRow(clutch.id)).state).toBe('sold_out');
			expect((await listingRow(singles.id)).state).toBe('sold_out');
		});
	});

	describe('publishing', () => {
		it('lists a ready clutch when its first listing goes live, and unlists it when the last is withdrawn', async () => {
			const clutch = await readyClutch(10);
			const first = await draft(clutch.code);
			expect((await listingRow(first.id)).published_at).toBeNull();
			const published = await live(first);
			expect(published.publishedAt).not.toBeNull();
			expect((await clutchRow(clutch.id)).state).toBe('listed');
			const second = await live(
				await draft(clutch.code, { title: 'Narceus, female', sex: 'female' })
			);

			// Withdrawing one leaves the other live: the clutch stays listed.
			const out = await withdrawListing(db, teo, first.slug, { stamp: await stampOf(first.id) });
			expect(out.ok && out.clutchState).toBe('listed');
			const last = await withdrawListing(db, teo, second.slug, {
				stamp: await stampOf(second.id)
			});
			expect(last.ok && last.clutchState).toBe('ready');
			const states = await db
				.selectFrom('clutch_event')
				.select(['from_value', 'to_value'])
				.where('clutch_id', '=', clutch.id)
				.where('kind', '=', 'state')
				.orderBy('id')
				.execute();
			expect(states).toEqual([
				{ from_value: 'growing', to_value: 'ready' },
				{ from_value: 'ready', to_value: 'listed' },
				{ from_value: 'listed', to_value: 'ready' }
			]);

			// Back on sale: published_at stays the first time's.
			const again = await live({ ...first, stamp: await stampOf(first.id) });
			expect(again.publishedAt?.getTime()).toBe(published.publishedAt?.getTime());
			expect((await clutchRow(clutch.id)).state).toBe('listed');
		});

		it('queues the waitlist notice of the species with the publish, and none for a refused one', async () => {
			const clutch = await readyClutch(8);
			const listing = await live(await draft(clutch.code));
			const jobs = async (id: number) =>
				(
					await sql<{ data: { listingId: number; speciesId: number } }>`
						select data from pgboss.job
						where name = 'waitlist-notify' and data->>'listingId' = ${String(id)}`.execute(db)
				).rows.map((r) => r.data);
			expect(await jobs(listing.id)).toEqual([{ listingId: listing.id, speciesId: narceusId }]);

			const refusedDraft = await draft(clutch.code, { title: 'Narceus, group of 8', unitSize: 8 });
			await order('paid', [{ listing, clutchId: clutch.id, quantity: 1 }]);
			const refused = await publishListing(db, teo, refusedDraft.slug, {
				stamp: await stampOf(refusedDraft.id)
			});
			expect(refused.ok).toBe(false);
			expect(await jobs(refusedDraft.id)).toEqual([]);
		});

		it('refuses a paused or growing clutch, and anything that would offer nothing, changing nothing', async () => {
			const clutch = await readyClutch(8);
			const groups = await draft(clutch.code, {
				title: 'Narceus, group of 5',
				unitSize: 5,
				tiers: GROUPS
			});
			const singles = await live(await draft(clutch.code));

			// Paid for 4 singles: 4 free, less than one group of 5.
			await order('paid', [{ listing: singles, clutchId: clutch.id, quantity: 4 }]);
			const auditsBefore = (await auditOf('listing', groups.id)).length;
			const short = await publishListing(db, teo, groups.slug, { stamp: await stampOf(groups.id) });
			expect(short).toMatchObject({
				ok: false,
				field: '',
				problem: 'Nothing to offer: only 4 animals are free, fewer than one unit (a group of 5).'
			});
			// Rolled back whole: still a draft, never published, no audit entry, clutch as it was.
			expect(await listingRow(groups.id)).toMatchObject({ state: 'draft', published_at: null });
			expect((await auditOf('listing', groups.id)).length).toBe(auditsBefore);
			expect((await clutchRow(clutch.id)).state).toBe('listed');

			// A paused clutch is never sold.
			await pause(db, teo, clutch.code, { pausedReason: 'unwell', note: '' }, TODAY);
			const whilePaused = await publishListing(db, teo, groups.slug, {
				stamp: await stampOf(groups.id)
			});
			expect(whilePaused.ok === false && whilePaused.problem).toMatch(
				new RegExp(`^Its clutch ${clutch.code} is paused \\(unwell\\)`)
			);

			// A clutch sent back to growing is not offered either.
			const other = await readyClutch(6);
			const early = await draft(other.code);
			expect((await backToGrowing(db, teo, other.code, { note: 'Still small.' }, TODAY)).ok).toBe(
				true
			);
			const growing = await publishListing(db, teo, early.slug, { stamp: await stampOf(early.id) });
			expect(growing.ok === false && growing.problem).toMatch(/still growing/);
			expect((await listingRow(early.id)).state).toBe('draft');
		});

		it('refuses a unit larger than the clutch, and a draft of a growing clutch', async () => {
			const clutch = await readyClutch(4);
			const big = await createListing(db, teo, {
				...input({ unitSize: 5, tiers: GROUPS }),
				kind: 'animal',
				clutchCode: clutch.code
			});
			expect(big).toMatchObject({
				ok: false,
				field: 'unitSize',
				problem: `A unit of 5 is more than the 4 alive in ${clutch.code}.`
			});
			const growing = await db
				.selectFrom('clutch')
				.select('code')
				.where('state', '=', 'growing')
				.limit(1)
				.executeTakeFirstOrThrow();
			const early = await createListing(db, teo, {
				...input(),
				kind: 'animal',
				clutchCode: growing.code
			});
			expect(early.ok === false && early.problem).toMatch(/still growing/);
		});
	});

	describe('records', () => {
		it('keeps base price in step with the tiers and writes what changed to the audit log', async () => {
			const clutch = await readyClutch(20);
			const listing = await draft(clutch.code);
			// Cheapest per animal of 1 for $14, 5 for $60, 10 for $110: $110 / 10 = $11.00.
			expect((await listingRow(listing.id)).base_price_cents).toBe(1100);
			const created = await auditOf('listing', listing.id);
			expect(created).toMatchObject([
				{ action: 'listing.create', actor_user_id: teo.userId, actor_ip: '127.0.0.2' }
			]);
			expect(created[0]!.detail).toMatchObject({
				kind: 'animal',
				clutch: clutch.code,
				unitSize: 1,
				tiers: SINGLES
			});

			const edited = await editListing(db, wren, listing.slug, {
				...input({ tiers: [{ minQuantity: 1, priceCents: 1500 }] }),
				stamp: await stampOf(listing.id)
			});
			expect(edited.ok).toBe(true);
			// One tier left: $15.00 for one.
			expect((await listingRow(listing.id)).base_price_cents).toBe(1500);
			const entry = (await auditOf('listing', listing.id)).at(-1)!;
			expect(entry).toMatchObject({ action: 'listing.edit', actor_user_id: wren.userId });
			// Only the prices changed, and the entry says from what to what.
			expect(entry.detail).toEqual({
				slug: listing.slug,
				changes: { tiers: { from: SINGLES, to: [{ minQuantity: 1, priceCents: 1500 }] } }
			});

			await live({ ...listing, stamp: await stampOf(listing.id) });
			await withdrawListing(db, teo, listing.slug, { stamp: await stampOf(listing.id) });
			expect((await auditOf('listing', listing.id)).map((a) => a.action)).toEqual([
				'listing.create',
				'listing.edit',
				'listing.publish',
				'listing.withdraw'
			]);
			expect((await auditOf('clutch', clutch.id)).map((a) => a.action)).toEqual([
				'clutch.ready',
				'clutch.listed',
				'clutch.unlisted'
			]);
		});

		it('refuses an edit made from a stale page, with the listing as it is now, changing nothing', async () => {
			const clutch = await readyClutch(10);
			const listing = await draft(clutch.code);
			const opened = await stampOf(listing.id);
			const first = await editListing(db, teo, listing.slug, {
				...input({ title: 'Narceus juveniles, each' }),
				stamp: opened
			});
			expect(first.ok).toBe(true);
			const audits = (await auditOf('listing', listing.id)).length;
			const second = await editListing(db, wren, first.ok ? first.listing.slug : listing.slug, {
				...input({ title: 'Something else entirely' }),
				stamp: opened
			});
			expect(second).toMatchObject({ ok: false, field: '' });
			if (!second.ok) {
				expect(second.problem).toMatch(/Someone else saved this listing since you opened it/);
				expect(second.current?.title).toBe('Narceus juveniles, each');
			}
			expect((await listingRow(listing.id)).title).toBe('Narceus juveniles, each');
			expect((await auditOf('listing', listing.id)).length).toBe(audits);
		});

		it('lets one of two edits made from the same page through', async () => {
			const wide = createDb(scratch.url, 10);
			try {
				const clutch = await readyClutch(10);
				const listing = await draft(clutch.code);
				const opened = await stampOf(listing.id);
				const outcomes = await Promise.all(
					['Narceus, first keeper', 'Narceus, second keeper'].map((title, i) =>
						editListing(wide, i ? wren : teo, listing.slug, { ...input({ title }), stamp: opened })
					)
				);
				expect(outcomes.filter((o) => o.ok)).toHaveLength(1);
			} finally {
				await wide.destroy();
			}
		});

		it('makes unique slugs from the title and clutch code; a published listing keeps its address', async () => {
			const clutch = await readyClutch(10);
			const one = await draft(clutch.code, { title: 'Narceus juveniles' });
			const two = await draft(clutch.code, { title: 'Narceus juveniles' });
			const code = clutch.code.toLowerCase();
			expect(one.slug).toBe(`narceus-juveniles-${code}`);
			expect(two.slug).toBe(`narceus-juveniles-${code}-2`);
			// A draft follows its title.
			const renamed = await editListing(db, teo, two.slug, {
				...input({ title: 'Narceus juvenile singles' }),
				stamp: await stampOf(two.id)
			});
			expect(renamed.ok && renamed.listing.slug).toBe(`narceus-juvenile-singles-${code}`);
			// Once in the shop, it keeps the address buyers have.
			await live(one);
			const kept = await editListing(db, teo, one.slug, {
				...input({ title: 'Narceus, now with a new title' }),
				stamp: await stampOf(one.id)
			});
			expect(kept.ok && kept.listing.slug).toBe(one.slug);
			// The unit of a live listing waits until it is withdrawn.
			const unit = await editListing(db, teo, one.slug, {
				...input({ title: 'Narceus, now with a new title', unitSize: 2 }),
				stamp: await stampOf(one.id)
			});
			expect(unit).toMatchObject({ ok: false, field: 'unitSize' });
		});
	});
});
