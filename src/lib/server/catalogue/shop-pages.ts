// What the public species and listing pages show, read in as few queries as the pages
// need. Visibility is the catalogue's own (shopVisible); units on offer come from offer.ts.
import { sql, type SqlBool } from 'kysely';
import type { Db } from '$lib/server/db';
import type {
	AnimalGroup,
	ClutchStage,
	ClutchState,
	ListingKind,
	ListingState,
	Sex,
	Species
} from '$lib/server/db/schema';
import { onOfferOf, onOfferSql } from '$lib/server/listings/offer';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { careSheet, type CareSheet } from '$lib/care/care-sheet';
import { defaultCatalogueQuery } from '$lib/catalogue/filters';
import { photoAlt, tierLines, unitLabel, type TierLine } from '$lib/catalogue/words';
import { addDays, todayInZone, type IsoDate } from '$lib/format/dates';
import type { PriceTier } from '$lib/money/pricing';
import { loadCataloguePage, shopVisible, type CardPhoto, type CatalogueCard } from './catalogue';
import { COMING_SOON_WEEKS, groupUpcoming, type UpcomingBatch } from './home';

/** How many photos a species or listing page shows at most. */
export const PAGE_PHOTO_LIMIT = 8;

export interface PhotoSubjectNames {
	title: string;
	commonName: string | null;
	scientificName: string | null;
	stage: ClutchStage | null;
}

async function photosOf(
	db: Db,
	owners: { listingId?: number; clutchId?: number | null; speciesId?: number | null },
	subject: PhotoSubjectNames
): Promise<CardPhoto[]> {
	const rows = await db
		.selectFrom('photo')
		.select([
			'content_hash',
			'widths',
			'width',
			'height',
			'alt_text',
			'listing_id',
			'clutch_id',
			'position',
			'id'
		])
		.where((eb) =>
			eb.or([
				...(owners.listingId !== undefined ? [eb('listing_id', '=', owners.listingId)] : []),
				...(owners.clutchId ? [eb('clutch_id', '=', owners.clutchId)] : []),
				...(owners.speciesId ? [eb('species_id', '=', owners.speciesId)] : [])
			])
		)
		.where(sql<SqlBool>`cardinality(widths) > 0`)
		.execute();
	// The listing's own photos first, then its clutch's, then its species'.
	const rank = (row: (typeof rows)[number]) =>
		row.listing_id !== null ? 0 : row.clutch_id !== null ? 1 : 2;
	return rows
		.sort((a, b) => rank(a) - rank(b) || a.position - b.position || a.id - b.id)
		.slice(0, PAGE_PHOTO_LIMIT)
		.map((row) => ({
			hash: row.content_hash,
			widths: [...row.widths].sort((a, b) => a - b),
			width: row.width,
			height: row.height,
			// A clutch or listing photo shows the stage; a species photo may show any animal.
			alt: photoAlt(row.alt_text, {
				...subject,
				stage: row.listing_id !== null || row.clutch_id !== null ? subject.stage : null
			})
		}));
}

// ---- The listing page

/** on_sale: buyable now · sold_out: live but nothing left · not_on_sale: withdrawn, or its clutch is resting. */
export type SaleStatus = 'on_sale' | 'sold_out' | 'not_on_sale';

export interface ShopListing {
	id: number;
	slug: string;
	title: string;
	description: string;
	kind: ListingKind;
	isLive: boolean;
	state: ListingState;
	species: {
		id: number;
		slug: string;
		commonName: string;
		scientificName: string;
		group: AnimalGroup;
	} | null;
	stage: ClutchStage | null;
	clutchState: ClutchState | null;
	sex: Sex;
	unitSize: number;
	unitLabel: string;
	generation: number | null;
	fromPriceCents: number | null;
	publishedAt: Date;
	updatedAt: Date;
	onOffer: number;
	status: SaleStatus;
	tiers: PriceTier[];
	tierLines: TierLine[];
	photos: CardPhoto[];
}

/**
 * A listing as the shop shows it, or null when it was never published (a draft): a
 * listing that was once live keeps its page, saying it is sold out or not on sale.
 */
export async function loadShopListing(db: Db, slug: string): Promise<ShopListing | null> {
	const row = await db
		.selectFrom('listing')
		.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
		.leftJoin('species', 'species.id', 'listing.species_id')
		.select((eb) => [
			'listing.id',
			'listing.slug',
			'listing.title',
			'listing.description',
			'listing.kind',
			'listing.is_live',
			'listing.state',
			'listing.sex',
			'listing.unit_size',
			'listing.base_price_cents',
			'listing.published_at',
			'listing.updated_at',
			'listing.clutch_id',
			'clutch.stage',
			'clutch.state as clutch_state',
			'clutch.generation',
			'species.id as species_id',
			'species.slug as species_slug',
			'species.common_name',
			'species.scientific_name',
			'species.animal_group',
			shopVisible(eb).as('visible')
		])
		.where('listing.slug', '=', slug)
		.executeTakeFirst();
	if (!row || row.state === 'draft' || row.published_at === null) return null;

	const [onOffer, tiers] = await Promise.all([
		onOfferOf(db, row.id),
		db
			.selectFrom('price_tier')
			.select(['min_quantity', 'price_cents'])
			.where('listing_id', '=', row.id)
			.orderBy('min_quantity')
			.execute()
	]);
	const priceTiers = tiers.map((tier) => ({
		minQuantity: tier.min_quantity,
		priceCents: tier.price_cents
	}));
	const species =
		row.species_id !== null && row.species_slug && row.common_name && row.scientific_name
			? {
					id: row.species_id,
					slug: row.species_slug,
					commonName: row.common_name,
					scientificName: row.scientific_name,
					group: row.animal_group ?? 'millipede'
				}
			: null;
	const photos = await photosOf(
		db,
		{ listingId: row.id, clutchId: row.clutch_id, speciesId: row.species_id },
		{
			title: row.title,
			commonName: row.common_name,
			scientificName: row.scientific_name,
			stage: row.stage
		}
	);
	const visible = Boolean(row.visible);
	return {
		id: row.id,
		slug: row.slug,
		title: row.title,
		description: row.description,
		kind: row.kind,
		isLive: row.is_live,
		state: row.state,
		species,
		stage: row.stage,
		clutchState: row.clutch_state,
		sex: row.sex,
		unitSize: row.unit_size,
		unitLabel: unitLabel(row.unit_size, row.sex),
		generation: row.generation,
		fromPriceCents: row.base_price_cents,
		publishedAt: row.published_at,
		updatedAt: row.updated_at,
		onOffer,
		status:
			visible && priceTiers.length > 0 && onOffer > 0
				? 'on_sale'
				: visible || row.state === 'sold_out'
					? 'sold_out'
					: 'not_on_sale',
		tiers: priceTiers,
		tierLines: priceTiers.length > 0 ? tierLines(priceTiers, row.unit_size, row.sex) : [],
		photos
	};
}

/** Other listings of the same species on offer now, for "more like this". */
export async function moreOfSpecies(
	db: Db,
	speciesSlug: string,
	exceptListingId: number,
	limit = 3
): Promise<CatalogueCard[]> {
	const query = defaultCatalogueQuery();
	const page = await loadCataloguePage(
		db,
		{ ...query, filters: { ...query.filters, species: speciesSlug, inStock: true } },
		{ limit: limit + 1 }
	);
	return page.cards.filter((card) => card.id !== exceptListingId).slice(0, limit);
}

// ---- The species page

export interface ShopSpecies {
	species: Omit<Species, 'search'>;
	sheet: CareSheet;
	photos: CardPhoto[];
	/** Listings of the species in the shop now (sold-out ones too), newest first. */
	listings: CatalogueCard[];
	/** More listings than the page shows: link to the catalogue for the rest. */
	moreListings: boolean;
	/** Generations among listings with units on offer, e.g. [2, 3]. */
	generationsOnOffer: number[];
	/** Anything of the species can be bought now; when not, the page offers the waitlist. */
	anyOnOffer: boolean;
	/** Clutches growing toward sale size, merged into batches that read the same. */
	comingSoon: UpcomingBatch[];
	today: IsoDate;
	timeZone: string;
}

/** How many listings the species page shows before it hands over to the catalogue. */
export const SPECIES_PAGE_LISTINGS = 12;

export async function loadShopSpecies(
	db: Db,
	slug: string,
	options: { now?: Date; fallbackTimeZone?: string } = {}
): Promise<ShopSpecies | null> {
	const species = await db
		.selectFrom('species')
		.selectAll()
		.where('slug', '=', slug)
		.executeTakeFirst();
	if (!species) return null;
	const { search: _search, ...profile } = species;

	const timeZone = await resolveShopTimeZone(db, options.fallbackTimeZone);
	const today = todayInZone(timeZone, options.now);
	const query = defaultCatalogueQuery();
	const [page, photos, upcoming] = await Promise.all([
		loadCataloguePage(
			db,
			{ ...query, filters: { ...query.filters, species: slug } },
			{ limit: SPECIES_PAGE_LISTINGS }
		),
		photosOf(
			db,
			{ speciesId: species.id },
			{
				title: species.common_name,
				commonName: species.common_name,
				scientificName: species.scientific_name,
				stage: null
			}
		),
		db
			.selectFrom('clutch')
			.select((eb) => [
				'clutch.sale_ready_on',
				eb.fn.sum<number>('clutch.count_alive').as('count_alive'),
				eb.fn.countAll<number>().as('clutches')
			])
			// Growing clutches only: paused ones are molting or unwell and promised to no one.
			.where('clutch.species_id', '=', species.id)
			.where('clutch.state', '=', 'growing')
			.where('clutch.count_alive', '>', 0)
			.where('clutch.sale_ready_on', '<=', addDays(today, COMING_SOON_WEEKS * 7))
			.groupBy('clutch.sale_ready_on')
			.orderBy('clutch.sale_ready_on')
			.execute()
	]);
	// Whether anything is on offer, and its generations, come from every listing of the
	// species (supplies such as cultures too), not only from the ones on this page. Each
	// kind (a generation, or supplies) stops at its first listing on offer, so a species
	// with a thousand listings costs a handful of offer checks, not a thousand.
	const kinds = await db
		.selectFrom('listing')
		.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
		.select('clutch.generation')
		.distinct()
		.where(shopVisible)
		.where('listing.species_id', '=', species.id)
		.execute();
	const offered = await Promise.all(
		kinds.map(async ({ generation }) => {
			let anyListing = db
				.selectFrom('listing')
				.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
				.select('listing.id')
				.where(shopVisible)
				.where('listing.species_id', '=', species.id)
				.where(onOfferSql(sql.ref('listing.id')), '>', 0);
			anyListing =
				generation === null
					? anyListing.where('listing.kind', '=', 'supply')
					: anyListing.where('clutch.generation', '=', generation);
			return (await anyListing.limit(1).executeTakeFirst()) ? { generation } : null;
		})
	);
	const onOffer = offered.filter((kind): kind is { generation: number | null } => kind !== null);

	const grouped = groupUpcoming(
		upcoming.map((row) => ({
			speciesId: species.id,
			slug: species.slug,
			commonName: species.common_name,
			scientificName: species.scientific_name,
			group: species.animal_group,
			saleReadyOn: row.sale_ready_on,
			countAlive: Number(row.count_alive),
			clutches: Number(row.clutches)
		})),
		today
	);

	return {
		species: profile,
		sheet: careSheet(species),
		photos,
		listings: page.cards,
		moreListings: page.next !== null,
		generationsOnOffer: [
			...new Set(onOffer.flatMap((row) => (row.generation === null ? [] : [row.generation])))
		].sort((a, b) => a - b),
		anyOnOffer: onOffer.length > 0,
		comingSoon: grouped[0]?.batches ?? [],
		today,
		timeZone
	};
}
