// What the shop's home page shows: every species, the animal listings on sale now,
// and the clutches growing toward sale size in the next 12 weeks.
import type { Db } from '$lib/server/db';
import type { AnimalGroup, ClutchStage, Sex } from '$lib/server/db/schema';
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

export interface PriceTierView {
	minQuantity: number;
	priceCents: number;
}

export interface ReadyListing {
	id: number;
	slug: string;
	title: string;
	description: string;
	unitSize: number;
	sex: Sex;
	stage: ClutchStage | null;
	commonName: string;
	scientificName: string;
	group: AnimalGroup;
	priceTiers: PriceTierView[];
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
	commonName: string;
	scientificName: string;
	group: AnimalGroup;
	batches: UpcomingBatch[];
}

export interface ShopHome {
	timeZone: string;
	today: IsoDate;
	species: SpeciesSummary[];
	readyStock: ReadyListing[];
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
	const [species, readyStock, comingSoon] = await Promise.all([
		listSpecies(db),
		listReadyStock(db),
		listComingSoon(db, today)
	]);
	return { timeZone, today, species, readyStock, comingSoon };
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

async function listReadyStock(db: Db): Promise<ReadyListing[]> {
	const listings = await db
		.selectFrom('listing')
		.innerJoin('species', 'species.id', 'listing.species_id')
		.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
		.select([
			'listing.id',
			'listing.slug',
			'listing.title',
			'listing.description',
			'listing.unit_size',
			'listing.sex',
			'clutch.stage',
			'species.common_name',
			'species.scientific_name',
			'species.animal_group'
		])
		.where('listing.state', '=', 'live')
		.where('listing.kind', '=', 'animal')
		.orderBy('listing.published_at', (order) => order.desc().nullsLast())
		.orderBy('listing.id', 'desc')
		.execute();
	if (listings.length === 0) return [];

	const tiers = await db
		.selectFrom('price_tier')
		.select(['listing_id', 'min_quantity', 'price_cents'])
		.where(
			'listing_id',
			'in',
			listings.map((listing) => listing.id)
		)
		.orderBy('listing_id')
		.orderBy('min_quantity')
		.execute();
	const tiersByListing = new Map<number, PriceTierView[]>();
	for (const tier of tiers) {
		const list = tiersByListing.get(tier.listing_id) ?? [];
		list.push({ minQuantity: tier.min_quantity, priceCents: tier.price_cents });
		tiersByListing.set(tier.listing_id, list);
	}

	return listings.map((listing) => ({
		id: listing.id,
		slug: listing.slug,
		title: listing.title,
		description: listing.description,
		unitSize: listing.unit_size,
		sex: listing.sex,
		stage: listing.stage,
		commonName: listing.common_name,
		scientificName: listing.scientific_name,
		group: listing.animal_group,
		priceTiers: tiersByListing.get(listing.id) ?? []
	}));
}

async function listComingSoon(db: Db, today: IsoDate): Promise<UpcomingSpecies[]> {
	const horizon = addDays(today, COMING_SOON_WEEKS * 7);
	// Growing clutches only: paused ones are molting or unwell and are not promised to anyone.
	const rows = await db
		.selectFrom('clutch')
		.innerJoin('species', 'species.id', 'clutch.species_id')
		.select((eb) => [
			'species.id as species_id',
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
