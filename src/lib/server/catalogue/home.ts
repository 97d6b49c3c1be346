// What the shop's home page shows: every species, the animal listings with units on offer,
// and the clutches growing toward sale size in the next 12 weeks.
import type { Db } from '$lib/server/db';
import type { AnimalGroup } from '$lib/server/db/schema';
import { defaultCatalogueQuery } from '$lib/catalogue/filters';
import { loadCataloguePage, type CatalogueCard } from './catalogue';
import { addDays, formatReadyIn, todayInZone, type IsoDate } from '$lib/format/dates';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';

/** The "coming soon" window: the stock pipeline's longest look-ahead. */
export const COMING_SOON_WEEKS = 12;

export interface SpeciesSummary {
	id: number;
	slug: string;
	commonName: string;
	scientificName: string;
	group: AnimalGroup;
	summary: string;
	idealLowF: number;
	idealHighF: number;
	adultLengthMm: number;
}

export interface UpcomingBatch {
	/** Earliest projected sale-ready date in this batch. */
	saleReadyOn: IsoDate;
	readyIn: string;
	countAlive: number;
	clutches: number;
}

export interface UpcomingSpecies {
	speciesId: number;
	slug: string;
	commonName: string;
	scientificName: string;
	group: AnimalGroup;
	batches: UpcomingBatch[];
}

export interface ShopHome {
	timeZone: string;
	today: IsoDate;
	species: SpeciesSummary[];
	/** Animal listings with units on offer now, newest first (the catalogue's own cards). */
	readyStock: CatalogueCard[];
	/** More are on offer than the home page shows. */
	moreReady: boolean;
	comingSoon: UpcomingSpecies[];
}

export interface ShopFace {
	shopName: string;
	claimWindowHours: number;
}

/** The shop's name and guarantee window for the public layout; null before settings exist. */
export async function loadShopFace(db: Db): Promise<ShopFace | null> {
	const row = await db
		.selectFrom('shop_setting')
		.select(['shop_name', 'claim_window_hours'])
		.where('id', '=', true)
		.executeTakeFirst();
	return row ? { shopName: row.shop_name, claimWindowHours: row.claim_window_hours } : null;
}

export async function loadShopHome(
	db: Db,
	options: { now?: Date; fallbackTimeZone?: string } = {}
): Promise<ShopHome> {
	const timeZone = await resolveShopTimeZone(db, options.fallbackTimeZone);
	const today = todayInZone(timeZone, options.now);
	const [species, ready, comingSoon] = await Promise.all([
		listSpecies(db),
		listReadyStock(db),
		listComingSoon(db, today)
	]);
	return { timeZone, today, species, readyStock: ready.cards, moreReady: ready.more, comingSoon };
}

async function listSpecies(db: Db): Promise<SpeciesSummary[]> {
	const rows = await db
		.selectFrom('species')
		.select([
			'id',
			'slug',
			'common_name',
			'scientific_name',
			'animal_group',
			'summary',
			'temp_ideal_low_f',
			'temp_ideal_high_f',
			'adult_length_mm'
		])
		.orderBy('animal_group')
		.orderBy('common_name')
		.execute();
	return rows.map((row) => ({
		id: row.id,
		slug: row.slug,
		commonName: row.common_name,
		scientificName: row.scientific_name,
		group: row.animal_group,
		summary: row.summary,
		idealLowF: row.temp_ideal_low_f,
		idealHighF: row.temp_ideal_high_f,
		adultLengthMm: row.adult_length_mm
	}));
}

/** How many ready listings the home page shows before it hands over to the catalogue. */
export const HOME_READY_LIMIT = 6;

async function listReadyStock(db: Db): Promise<{ cards: CatalogueCard[]; more: boolean }> {
	const query = defaultCatalogueQuery();
	const page = await loadCataloguePage(
		db,
		{ ...query, filters: { ...query.filters, inStock: true } },
		{ limit: HOME_READY_LIMIT, kind: 'animal' }
	);
	return { cards: page.cards, more: page.next !== null };
}

async function listComingSoon(db: Db, today: IsoDate): Promise<UpcomingSpecies[]> {
	const horizon = addDays(today, COMING_SOON_WEEKS * 7);
	// Growing clutches only: paused ones are molting or unwell and are not promised to anyone.
	const rows = await db
		.selectFrom('clutch')
		.innerJoin('species', 'species.id', 'clutch.species_id')
		.select((eb) => [
			'species.id as species_id',
			'species.slug',
			'species.common_name',
			'species.scientific_name',
			'species.animal_group',
			'clutch.sale_ready_on',
			eb.fn.sum<number>('clutch.count_alive').as('count_alive'),
			eb.fn.countAll<number>().as('clutches')
		])
		.where('clutch.state', '=', 'growing')
		.where('clutch.count_alive', '>', 0)
		.where('clutch.sale_ready_on', '<=', horizon)
		.groupBy([
			'species.id',
			'species.slug',
			'species.common_name',
			'species.scientific_name',
			'species.animal_group',
			'clutch.sale_ready_on'
		])
		.orderBy('species.common_name')
		.orderBy('clutch.sale_ready_on')
		.execute();
	return groupUpcoming(
		rows.map((row) => ({
			speciesId: row.species_id,
			slug: row.slug,
			commonName: row.common_name,
			scientificName: row.scientific_name,
			group: row.animal_group,
			saleReadyOn: row.sale_ready_on,
			countAlive: Number(row.count_alive),
			clutches: Number(row.clutches)
		})),
		today
	);
}

interface UpcomingRow {
	speciesId: number;
	slug: string;
	commonName: string;
	scientificName: string;
	group: AnimalGroup;
	saleReadyOn: IsoDate;
	countAlive: number;
	clutches: number;
}

/**
 * One entry per species, its clutches merged into batches that read the same
 * ("ready in about 3 weeks"), so a buyer sees a few plain lines, not dates per clutch.
 * Rows must come sorted by species, then sale-ready date.
 */
export function groupUpcoming(rows: readonly UpcomingRow[], today: IsoDate): UpcomingSpecies[] {
	const bySpecies = new Map<number, UpcomingSpecies>();
	for (const row of rows) {
		let entry = bySpecies.get(row.speciesId);
		if (!entry) {
			entry = {
				speciesId: row.speciesId,
				slug: row.slug,
				commonName: row.commonName,
				scientificName: row.scientificName,
				group: row.group,
				batches: []
			};
			bySpecies.set(row.speciesId, entry);
		}
		const readyIn = formatReadyIn(today, row.saleReadyOn);
		const last = entry.batches.at(-1);
		if (last && last.readyIn === readyIn) {
			last.countAlive += row.countAlive;
			last.clutches += row.clutches;
		} else {
			entry.batches.push({
				saleReadyOn: row.saleReadyOn,
				readyIn,
				countAlive: row.countAlive,
				clutches: row.clutches
			});
		}
	}
	return [...bySpecies.values()];
}
