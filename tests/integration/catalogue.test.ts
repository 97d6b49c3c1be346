// The public catalogue on PostgreSQL: every filter, text search over listing words and
// species names, keyset pages that add up to exactly the visible listings in order, and
// listings that must never be shown (paused clutch, draft, withdrawn).
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
	defaultCatalogueQuery,
	parseCatalogueQuery,
	type CatalogueQuery
} from '../../src/lib/catalogue/filters';
import { loadCataloguePage, type CatalogueCard } from '../../src/lib/server/catalogue/catalogue';
import { loadShopListing, loadShopSpecies } from '../../src/lib/server/catalogue/shop-pages';
import type { Db } from '../../src/lib/server/db';
import type { ClutchStage, ClutchState, ListingState, Sex } from '../../src/lib/server/db/schema';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const HASH = (n: number) => n.toString(16).padStart(64, '0');

type ListingKey =
	| 'narceusJuveniles'
	| 'narceusPair'
	| 'porcellioGroup'
	| 'cubarisFemales'
	| 'springtailCulture'
	| 'emptyShelf'
	| 'soldOut'
	| 'paused'
	| 'draft'
	| 'withdrawn';

interface Fixture {
	species: Record<'narceus' | 'porcellio' | 'cubaris', number>;
	listings: Record<ListingKey, number>;
}

async function insertSpecies(
	db: Db,
	values: {
		slug: string;
		scientific: string;
		common: string;
		group: 'millipede' | 'isopod';
		summary: string;
	}
): Promise<number> {
	const row = await db
		.insertInto('species')
		.values({
			slug: values.slug,
			scientific_name: values.scientific,
			common_name: values.common,
			animal_group: values.group,
			summary: values.summary,
			temp_low_f: 62,
			temp_ideal_low_f: 70,
			temp_ideal_high_f: 77,
			temp_high_f: 86,
			moisture_level: 'moist',
			adult_length_mm: 100,
			grow_out_weeks: 30
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	return row.id;
}

let clutchCounter = 0;
async function insertClutch(
	db: Db,
	speciesId: number,
	options: { stage?: ClutchStage; state?: ClutchState; alive?: number; generation?: number } = {}
): Promise<number> {
	clutchCounter += 1;
	const state = options.state ?? 'listed';
	const alive = options.alive ?? 40;
	const row = await db
		.insertInto('clutch')
		.values({
			code: `TST-C${clutchCounter}`,
			species_id: speciesId,
			origin: 'bought_in',
			generation: options.generation ?? 2,
			found_on: '2026-06-01',
			stage: options.stage ?? 'juvenile',
			size_class: 'small',
			count_found: alive,
			count_alive: alive,
			state,
			paused_reason: state === 'paused' ? 'molting' : null,
			sale_ready_on: '2026-10-01'
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	return row.id;
}

let listingCounter = 0;
async function insertListing(
	db: Db,
	values: {
		title: string;
		description?: string;
		speciesId: number | null;
		clutchId?: number | null;
		sex?: Sex;
		unitSize?: number;
		state?: ListingState;
		publishedAt: string | null;
		/** Price of one unit, in cents; the base price is per animal. */
		unitPriceCents: number;
		supplyStock?: number;
	}
): Promise<number> {
	listingCounter += 1;
	const unitSize = values.unitSize ?? 1;
	const kind = values.clutchId ? 'animal' : 'supply';
	const row = await db
		.insertInto('listing')
		.values({
			slug: `test-listing-${listingCounter}`,
			kind,
			species_id: values.speciesId,
			clutch_id: values.clutchId ?? null,
			title: values.title,
			description: values.description ?? '',
			unit_size: unitSize,
			sex: values.sex ?? 'unsexed',
			state: values.state ?? 'live',
			supply_stock: kind === 'supply' ? (values.supplyStock ?? 10) : null,
			published_at: values.publishedAt,
			base_price_cents: Math.round(values.unitPriceCents / unitSize)
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	await db
		.insertInto('price_tier')
		.values({ listing_id: row.id, min_quantity: 1, price_cents: values.unitPriceCents })
		.execute();
	return row.id;
}

/** Every card of a view, page by page through the `after` cursors. */
async function walkForward(
	db: Db,
	query: CatalogueQuery,
	limit?: number
): Promise<CatalogueCard[][]> {
	const pages: CatalogueCard[][] = [];
	let current: CatalogueQuery = query;
	for (let guard = 0; guard < 1000; guard++) {
		const page = await loadCataloguePage(db, current, { limit });
		pages.push(page.cards);
		if (!page.next) return pages;
		current = { ...current, after: page.next, before: null };
	}
	throw new Error('the walk did not end');
}

const view = (search: string) => {
	const parsed = parseCatalogueQuery(new URLSearchParams(search));
	expect(parsed.notes).toEqual([]);
	return parsed.query;
};

async function titles(db: Db, search: string): Promise<string[]> {
	return (await walkForward(db, view(search))).flat().map((card) => card.title);
}

describe('catalogue', () => {
	let scratch: ScratchDatabase;
	let db: Db;
	const fx: Fixture = {
		species: { narceus: 0, porcellio: 0, cubaris: 0 },
		listings: {} as Record<ListingKey, number>
	};

	beforeAll(async () => {
		scratch = await scratchDatabase();
		db = scratch.db;
		fx.species.narceus = await insertSpecies(db, {
			slug: 'narceus-americanus',
			scientific: 'Narceus americanus',
			common: 'American giant millipede',
			group: 'millipede',
			summary: 'The big olive-brown millipede of eastern woodlands.'
		});
		fx.species.porcellio = await insertSpecies(db, {
			slug: 'porcellio-laevis',
			scientific: 'Porcellio laevis',
			common: 'Smooth slater',
			group: 'isopod',
			summary: 'A fast-breeding isopod with a smooth back.'
		});
		fx.species.cubaris = await insertSpecies(db, {
			slug: 'cubaris-murina',
			scientific: 'Cubaris murina',
			common: 'Little sea isopod',
			group: 'isopod',
			summary: 'A small rolling isopod from warm, humid forests.'
		});

		const narceusJuveniles = await insertClutch(db, fx.species.narceus, { stage: 'juvenile' });
		const narceusAdults = await insertClutch(db, fx.species.narceus, { stage: 'adult', alive: 6 });
		const porcellioClutch = await insertClutch(db, fx.species.porcellio, {
			stage: 'sub_adult',
			alive: 100
		});
		const cubarisClutch = await insertClutch(db, fx.species.cubaris, {
			stage: 'juvenile',
			alive: 30
		});
		const pausedClutch = await insertClutch(db, fx.species.cubaris, { state: 'paused' });
		const soldClutch = await insertClutch(db, fx.species.porcellio, { alive: 10 });

		fx.listings.narceusJuveniles = await insertListing(db, {
			title: 'Narceus juveniles',
			description: 'Raised on oak leaf litter and rotten hardwood.',
			speciesId: fx.species.narceus,
			clutchId: narceusJuveniles,
			publishedAt: '2026-11-20T10:00:00.000002Z',
			unitPriceCents: 1400
		});
		fx.listings.narceusPair = await insertListing(db, {
			title: 'Narceus breeding pair',
			speciesId: fx.species.narceus,
			clutchId: narceusAdults,
			sex: 'pair',
			unitSize: 2,
			publishedAt: '2026-11-20T10:00:00.000001Z',
			unitPriceCents: 4000
		});
		fx.listings.porcellioGroup = await insertListing(db, {
			title: 'Smooth slater colony starter',
			description: 'Ten sub-adults, ready to breed.',
			speciesId: fx.species.porcellio,
			clutchId: porcellioClutch,
			unitSize: 10,
			publishedAt: '2026-11-18T09:00:00Z',
			unitPriceCents: 2000
		});
		fx.listings.cubarisFemales = await insertListing(db, {
			title: 'Little sea isopod females',
			speciesId: fx.species.cubaris,
			clutchId: cubarisClutch,
			sex: 'female',
			publishedAt: '2026-11-15T09:00:00Z',
			unitPriceCents: 900
		});
		fx.listings.springtailCulture = await insertListing(db, {
			title: 'Springtail culture tub',
			description: 'Charcoal substrate, ready to seed a bioactive enclosure.',
			speciesId: null,
			publishedAt: '2026-11-10T09:00:00Z',
			unitPriceCents: 1200,
			supplyStock: 5
		});
		fx.listings.emptyShelf = await insertListing(db, {
			title: 'Leaf litter bag',
			speciesId: null,
			publishedAt: '2026-11-09T09:00:00Z',
			unitPriceCents: 800,
			supplyStock: 0
		});
		fx.listings.soldOut = await insertListing(db, {
			title: 'Smooth slater each',
			speciesId: fx.species.porcellio,
			clutchId: soldClutch,
			publishedAt: '2026-11-08T09:00:00Z',
			unitPriceCents: 300
		});
		// Hidden: a paused clutch, a draft, a withdrawn listing, a listing gone sold_out.
		fx.listings.paused = await insertListing(db, {
			title: 'Cubaris paused juveniles',
			speciesId: fx.species.cubaris,
			clutchId: pausedClutch,
			publishedAt: '2026-11-19T09:00:00Z',
			unitPriceCents: 900
		});
		fx.listings.draft = await insertListing(db, {
			title: 'Narceus draft',
			speciesId: fx.species.narceus,
			clutchId: narceusJuveniles,
			state: 'draft',
			publishedAt: null,
			unitPriceCents: 1400
		});
		fx.listings.withdrawn = await insertListing(db, {
			title: 'Narceus withdrawn',
			speciesId: fx.species.narceus,
			clutchId: narceusJuveniles,
			state: 'withdrawn',
			publishedAt: '2026-11-01T09:00:00Z',
			unitPriceCents: 1400
		});

		// All ten animals of the sold clutch are in a paid order: nothing left on offer.
		const order = await db
			.insertInto('customer_order')
			.values({
				order_number: 'HL-10001',
				email: 'buyer@example.com',
				ship_name: 'Test Buyer',
				ship_line1: '1 Leaf Lane',
				ship_city: 'Duluth',
				ship_state: 'MN',
				ship_zip: '55805',
				service: 'overnight',
				state: 'paid',
				subtotal_cents: 3000,
				shipping_cents: 0,
				total_cents: 3000
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await db
			.insertInto('order_line')
			.values({
				order_id: order.id,
				listing_id: fx.listings.soldOut,
				clutch_id: soldClutch,
				species_id: fx.species.porcellio,
				description: 'Smooth slater each',
				quantity: 10,
				line_total_cents: 3000,
				is_live: true
			})
			.execute();
	});

	afterAll(async () => {
		await scratch?.drop();
	});

	const visibleTitles = [
		'Narceus juveniles',
		'Narceus breeding pair',
		'Smooth slater colony starter',
		'Little sea isopod females',
		'Springtail culture tub',
		'Leaf litter bag',
		'Smooth slater each'
	];

	it('shows live listings newest first and never a paused clutch’s, a draft or a withdrawn one', async () => {
		expect(await titles(db, '')).toEqual(visibleTitles);
	});

	it('orders by price per animal with the id breaking ties', async () => {
		// Per animal: pair $40/2 = $20, group $20/10 = $2, each $3, $8, $9, $12, $14.
		expect(await titles(db, 'sort=price')).toEqual([
			'Smooth slater colony starter',
			'Smooth slater each',
			'Leaf litter bag',
			'Little sea isopod females',
			'Springtail culture tub',
			'Narceus juveniles',
			'Narceus breeding pair'
		]);
	});

	it('describes each card from its listing, clutch and species', async () => {
		const cards = (await walkForward(db, defaultCatalogueQuery())).flat();
		const pair = cards.find((card) => card.title === 'Narceus breeding pair')!;
		expect(pair).toMatchObject({
			species: {
				slug: 'narceus-americanus',
				commonName: 'American giant millipede',
				scientificName: 'Narceus americanus'
			},
			group: 'millipede',
			stage: 'adult',
			sex: 'pair',
			unitLabel: 'pair',
			generation: 2,
			fromPriceCents: 2000,
			// 6 alive in pairs.
			onOffer: 3,
			photo: null
		});
		const culture = cards.find((card) => card.title === 'Springtail culture tub')!;
		expect(culture).toMatchObject({ kind: 'supply', species: null, stage: null, onOffer: 5 });
		expect(cards.find((card) => card.title === 'Smooth slater each')!.onOffer).toBe(0);
	});

	it('filters by group, species, stage, sex and price per animal', async () => {
		expect(await titles(db, 'group=isopod')).toEqual([
			'Smooth slater colony starter',
			'Little sea isopod females',
			'Smooth slater each'
		]);
		expect(await titles(db, 'species=narceus-americanus')).toEqual([
			'Narceus juveniles',
			'Narceus breeding pair'
		]);
		expect(await titles(db, 'stage=adult')).toEqual(['Narceus breeding pair']);
		expect(await titles(db, 'stage=juvenile')).toEqual([
			'Narceus juveniles',
			'Little sea isopod females',
			'Smooth slater each'
		]);
		expect(await titles(db, 'sex=female')).toEqual(['Little sea isopod females']);
		expect(await titles(db, 'sex=pair')).toEqual(['Narceus breeding pair']);
		// Bounds are inclusive, in dollars per animal.
		expect(await titles(db, 'min=9&max=14&sort=price')).toEqual([
			'Little sea isopod females',
			'Springtail culture tub',
			'Narceus juveniles'
		]);
		expect(await titles(db, 'max=2')).toEqual(['Smooth slater colony starter']);
		expect(await titles(db, 'min=20.01')).toEqual([]);
		expect(await titles(db, 'group=isopod&max=5&sort=price')).toEqual([
			'Smooth slater colony starter',
			'Smooth slater each'
		]);
	});

	it('leaves sold-out listings out when only stock on offer is asked for', async () => {
		expect(await titles(db, 'stock=1')).toEqual([
			'Narceus juveniles',
			'Narceus breeding pair',
			'Smooth slater colony starter',
			'Little sea isopod females',
			'Springtail culture tub'
		]);
	});

	it('finds listings by common name, scientific name and description words', async () => {
		expect(await titles(db, 'q=giant millipede')).toEqual([
			'Narceus juveniles',
			'Narceus breeding pair'
		]);
		// Latin names are not English: "laevis" must not be stemmed away.
		expect(await titles(db, 'q=Porcellio laevis')).toEqual([
			'Smooth slater colony starter',
			'Smooth slater each'
		]);
		expect(await titles(db, 'q=cubaris')).toEqual(['Little sea isopod females']);
		// Description words, stemmed: "rotten hardwood" finds "rotten hardwood.".
		expect(await titles(db, 'q=hardwood')).toEqual(['Narceus juveniles']);
		expect(await titles(db, 'q=bioactive')).toEqual(['Springtail culture tub']);
		// websearch syntax: a quoted phrase, "or", and a minus word (within the listing's words).
		expect(await titles(db, 'q="oak leaf"')).toEqual(['Narceus juveniles']);
		expect(await titles(db, 'q="leaf oak"')).toEqual([]);
		expect(await titles(db, 'q=charcoal or pair')).toEqual([
			'Narceus breeding pair',
			'Springtail culture tub'
		]);
		expect(await titles(db, 'q=juveniles -narceus')).toEqual([]);
		// A paused clutch's listing is not found by its words either.
		expect(await titles(db, 'q=paused')).toEqual([]);
		expect(await titles(db, 'q=zzyzx')).toEqual([]);
		// Search joins the other filters.
		expect(await titles(db, 'q=isopod&sex=female')).toEqual(['Little sea isopod females']);
	});

	it('hides a listing the moment its clutch is paused, and shows it again when listed', async () => {
		const clutch = await db
			.selectFrom('listing')
			.select('clutch_id')
			.where('id', '=', fx.listings.cubarisFemales)
			.executeTakeFirstOrThrow();
		await db
			.updateTable('clutch')
			.set({ state: 'paused', paused_reason: 'unwell' })
			.where('id', '=', clutch.clutch_id!)
			.execute();
		try {
			expect(await titles(db, 'species=cubaris-murina')).toEqual([]);
		} finally {
			await db
				.updateTable('clutch')
				.set({ state: 'listed', paused_reason: null })
				.where('id', '=', clutch.clutch_id!)
				.execute();
		}
		expect(await titles(db, 'species=cubaris-murina')).toEqual(['Little sea isopod females']);
	});

	it('takes the listing’s photo first, else the clutch’s, else the species’', async () => {
		const photo = (n: number, target: Record<string, number>, alt = '') =>
			db
				.insertInto('photo')
				.values({
					content_hash: HASH(n),
					width: 1600,
					height: 1200,
					byte_size: 1000,
					alt_text: alt,
					widths: [320, 640, 1280],
					...target
				})
				.execute();
		const listingOf = (id: number) =>
			db
				.selectFrom('listing')
				.select(['clutch_id', 'species_id'])
				.where('id', '=', id)
				.executeTakeFirstOrThrow();
		const juveniles = await listingOf(fx.listings.narceusJuveniles);
		await photo(1, { species_id: fx.species.narceus }, 'Adult Narceus on bark');
		await photo(2, { clutch_id: juveniles.clutch_id! });
		await photo(
			3,
			{ listing_id: fx.listings.narceusJuveniles, position: 2 },
			'Second listing photo'
		);
		await photo(
			4,
			{ listing_id: fx.listings.narceusJuveniles, position: 1 },
			'Juveniles in a deli cup'
		);

		const cards = (await walkForward(db, view('species=narceus-americanus'))).flat();
		const byTitle = new Map(cards.map((card) => [card.title, card]));
		expect(byTitle.get('Narceus juveniles')!.photo).toEqual({
			hash: HASH(4),
			widths: [320, 640, 1280],
			width: 1600,
			height: 1200,
			alt: 'Juveniles in a deli cup'
		});
		// The pair's clutch has no photo: the species photo stands in, with its own words.
		expect(byTitle.get('Narceus breeding pair')!.photo?.hash).toBe(HASH(1));
		expect(byTitle.get('Narceus breeding pair')!.photo?.alt).toBe('Adult Narceus on bark');

		await db.deleteFrom('photo').where('listing_id', '=', fx.listings.narceusJuveniles).execute();
		const again = (await walkForward(db, view('species=narceus-americanus'))).flat();
		// The clutch photo has no description: one is built from the species and stage.
		expect(again[0]!.photo).toMatchObject({
			hash: HASH(2),
			alt: 'American giant millipede (Narceus americanus), juvenile'
		});
		await db.deleteFrom('photo').execute();
	});

	describe('the listing page', () => {
		it('shows a listing on sale with its tiers, unit and lineage', async () => {
			const listing = (await loadShopListing(db, 'test-listing-1'))!;
			expect(listing).toMatchObject({
				id: fx.listings.narceusJuveniles,
				title: 'Narceus juveniles',
				status: 'on_sale',
				onOffer: 40,
				unitLabel: 'each',
				generation: 2,
				stage: 'juvenile',
				species: { slug: 'narceus-americanus', commonName: 'American giant millipede' }
			});
			expect(listing.tierLines.map((line) => line.text)).toEqual(['1 for $14.00 — $14.00 each']);
		});

		it('keeps the page of a listing that was published, saying why it cannot be bought', async () => {
			const bySlug = async (id: number) => {
				const row = await db
					.selectFrom('listing')
					.select('slug')
					.where('id', '=', id)
					.executeTakeFirstOrThrow();
				return loadShopListing(db, row.slug);
			};
			expect(await bySlug(fx.listings.soldOut)).toMatchObject({ status: 'sold_out', onOffer: 0 });
			expect(await bySlug(fx.listings.emptyShelf)).toMatchObject({
				status: 'sold_out',
				kind: 'supply'
			});
			expect(await bySlug(fx.listings.paused)).toMatchObject({
				status: 'not_on_sale',
				clutchState: 'paused',
				onOffer: 0
			});
			expect(await bySlug(fx.listings.withdrawn)).toMatchObject({
				status: 'not_on_sale',
				state: 'withdrawn'
			});
			// A draft was never public: no page at all.
			expect(await bySlug(fx.listings.draft)).toBeNull();
			expect(await loadShopListing(db, 'no-such-listing')).toBeNull();
		});
	});

	describe('the species page', () => {
		const now = new Date('2026-12-01T17:00:00Z');

		it('names the captive-bred generations on offer and lists the species’ listings', async () => {
			const page = (await loadShopSpecies(db, 'narceus-americanus', {
				now,
				fallbackTimeZone: 'America/New_York'
			}))!;
			expect(page.species.common_name).toBe('American giant millipede');
			expect(page.sheet.title).toBe('American giant millipede');
			expect(page.anyOnOffer).toBe(true);
			expect(page.generationsOnOffer).toEqual([2]);
			expect(page.listings.map((card) => card.title)).toEqual([
				'Narceus juveniles',
				'Narceus breeding pair'
			]);
			expect(await loadShopSpecies(db, 'no-such-species', { now })).toBeNull();
		});

		it('offers the waitlist when nothing is on offer, and says what is coming', async () => {
			const desert = await insertSpecies(db, {
				slug: 'orthoporus-ornatus',
				scientific: 'Orthoporus ornatus',
				common: 'Desert millipede',
				group: 'millipede',
				summary: 'A banded desert millipede.'
			});
			const growing = (saleReadyOn: string, alive: number, state: ClutchState = 'growing') =>
				db
					.insertInto('clutch')
					.values({
						code: `TST-D${saleReadyOn}-${alive}`,
						species_id: desert,
						origin: 'bought_in',
						generation: 3,
						found_on: '2026-06-01',
						stage: 'hatchling',
						size_class: 'tiny',
						count_found: alive,
						count_alive: alive,
						state,
						paused_reason: state === 'paused' ? 'molting' : null,
						sale_ready_on: saleReadyOn
					})
					.execute();
			// 21 and 22 days out read the same; a paused clutch is promised to no one.
			await growing('2026-12-22', 12);
			await growing('2026-12-23', 8);
			await growing('2027-01-26', 30);
			await growing('2026-12-20', 50, 'paused');
			const page = (await loadShopSpecies(db, 'orthoporus-ornatus', {
				now,
				fallbackTimeZone: 'America/New_York'
			}))!;
			expect(page.anyOnOffer).toBe(false);
			expect(page.generationsOnOffer).toEqual([]);
			expect(page.listings).toEqual([]);
			expect(page.today).toBe('2026-12-01');
			expect(page.comingSoon).toEqual([
				{
					saleReadyOn: '2026-12-22',
					readyIn: 'ready in about 3 weeks',
					countAlive: 20,
					clutches: 2
				},
				{
					saleReadyOn: '2027-01-26',
					readyIn: 'ready in about 8 weeks',
					countAlive: 30,
					clutches: 1
				}
			]);
		});
	});

	describe('keyset pages over a few hundred listings', () => {
		beforeAll(async () => {
			const species = [fx.species.narceus, fx.species.porcellio, fx.species.cubaris];
			const clutches = [];
			for (let i = 0; i < 12; i++) {
				clutches.push(
					await insertClutch(db, species[i % 3]!, {
						// Every fourth clutch is paused: its listings must never appear.
						state: i % 4 === 3 ? 'paused' : 'listed',
						alive: 500
					})
				);
			}
			const rows = [];
			for (let i = 0; i < 330; i++) {
				listingCounter += 1;
				const clutchId = clutches[i % 12]!;
				// Publication instants repeat (and differ by single microseconds), and so do
				// prices, so the id must break ties exactly in both orders.
				const micros = String(i % 7).padStart(6, '0');
				rows.push({
					slug: `walk-${listingCounter}`,
					kind: 'animal' as const,
					species_id: species[(i % 12) % 3]!,
					clutch_id: clutchId,
					title: `Walk listing ${i}`,
					state: (i % 11 === 5 ? 'withdrawn' : i % 13 === 6 ? 'draft' : 'live') as ListingState,
					published_at:
						i % 13 === 6
							? null
							: `2026-10-${String(1 + (i % 28)).padStart(2, '0')}T08:00:00.${micros}Z`,
					base_price_cents: 100 * (1 + (i % 9))
				});
			}
			const inserted = await db.insertInto('listing').values(rows).returning('id').execute();
			await db
				.insertInto('price_tier')
				.values(inserted.map((row) => ({ listing_id: row.id, min_quantity: 1, price_cents: 500 })))
				.execute();
		});

		/** The visible listings in one order, by a plain query written apart from the catalogue's. */
		async function plainOrder(orderBy: 'new' | 'price'): Promise<number[]> {
			const order =
				orderBy === 'new'
					? sql`l.published_at desc, l.id desc`
					: sql`l.base_price_cents asc, l.id asc`;
			const result = await sql<{ id: number }>`
				select l.id from listing l left join clutch c on c.id = l.clutch_id
				where l.state = 'live' and (l.kind = 'supply' or c.state = 'listed')
				order by ${order}`.execute(db);
			return result.rows.map((row) => row.id);
		}

		it.each(['new', 'price'] as const)(
			'returns each visible listing exactly once, in order (%s)',
			async (sort) => {
				const expected = await plainOrder(sort);
				expect(expected.length).toBeGreaterThan(200);
				const pages = await walkForward(db, { ...defaultCatalogueQuery(), sort });
				const ids = pages.flat().map((card) => card.id);
				expect(ids).toEqual(expected);
				expect(new Set(ids).size).toBe(ids.length);
				// Full pages of 24, then the rest.
				expect(pages.slice(0, -1).every((page) => page.length === 24)).toBe(true);
				expect(pages.length).toBe(Math.ceil(expected.length / 24));
			}
		);

		it.each(['new', 'price'] as const)(
			'walks back with "previous" through the same pages (%s)',
			async (sort) => {
				const forward = await walkForward(db, { ...defaultCatalogueQuery(), sort });
				// Reach the last page by "next", then follow "previous" back to the first.
				let current: CatalogueQuery = { ...defaultCatalogueQuery(), sort };
				let page = await loadCataloguePage(db, current);
				while (page.next) {
					current = { ...current, after: page.next, before: null };
					page = await loadCataloguePage(db, current);
				}
				expect(page.cards.map((c) => c.id)).toEqual(forward.at(-1)!.map((c) => c.id));
				const backward: number[][] = [page.cards.map((c) => c.id)];
				while (page.previous) {
					page = await loadCataloguePage(db, { ...current, after: null, before: page.previous });
					backward.unshift(page.cards.map((c) => c.id));
				}
				expect(backward).toEqual(forward.map((cards) => cards.map((c) => c.id)));
			}
		);

		it('pages a filtered view by the same rules', async () => {
			const query = view('species=porcellio-laevis&sort=price&max=5');
			const ids = (await walkForward(db, query, 10)).flat().map((card) => card.id);
			const expected = await sql<{ id: number }>`
				select l.id from listing l left join clutch c on c.id = l.clutch_id
				join species s on s.id = l.species_id
				where l.state = 'live' and (l.kind = 'supply' or c.state = 'listed')
					and s.slug = 'porcellio-laevis' and l.base_price_cents <= 500
				order by l.base_price_cents, l.id`.execute(db);
			expect(ids).toEqual(expected.rows.map((row) => row.id));
			expect(ids.length).toBeGreaterThan(20);
		});
	});
});
