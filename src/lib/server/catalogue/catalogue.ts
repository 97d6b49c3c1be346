// The public catalogue: listings a visitor may see and buy, filtered and searched,
// paged by keyset so page 500 costs what page 1 does. Views come parsed from
// $lib/catalogue/filters; quantity on offer comes only from offer.ts.
import { sql, type ExpressionBuilder, type RawBuilder, type SqlBool } from 'kysely';
import type { Db } from '$lib/server/db';
import type { AnimalGroup, ClutchStage, Database, ListingKind, Sex } from '$lib/server/db/schema';
import { onOfferSql } from '$lib/server/listings/offer';
import {
	CATALOGUE_PAGE_SIZE,
	type CatalogueFilters,
	type CatalogueQuery,
	type CatalogueSort,
	type KeysetPosition
} from '$lib/catalogue/filters';
import { photoAlt, unitLabel } from '$lib/catalogue/words';

/** The tables every shop query about listings has in scope. */
type ShopScope = ExpressionBuilder<Database, 'listing' | 'clutch'>;

/**
 * Who may see a listing in the shop: it is live and, for animals, its clutch is listed.
 * A paused clutch's listings leave the shop at once, since every public query asks this.
 * The query must left-join clutch on listing.clutch_id.
 */
export function shopVisible(eb: ShopScope) {
	return eb.and([
		eb('listing.state', '=', 'live'),
		eb.or([eb('listing.kind', '=', 'supply'), eb('clutch.state', '=', 'listed')])
	]);
}

export interface CardPhoto {
	hash: string;
	widths: number[];
	width: number;
	height: number;
	/** The keeper's description, or one built from the species and stage. */
	alt: string;
}

export interface CatalogueCard {
	id: number;
	slug: string;
	title: string;
	kind: ListingKind;
	/** Live animals (and live cultures) ship under the weather rules. */
	isLive: boolean;
	species: { slug: string; commonName: string; scientificName: string } | null;
	group: AnimalGroup | null;
	stage: ClutchStage | null;
	sex: Sex;
	unitSize: number;
	/** "each", "pair", "group of 5". */
	unitLabel: string;
	/** The clutch's captive-bred generation; null for supplies. */
	generation: number | null;
	/** The cheapest tier's price per animal. */
	fromPriceCents: number;
	onOffer: number;
	photo: CardPhoto | null;
	/** This row's place in the order, for the cursor of the page it ends or starts. */
	position: KeysetPosition;
}

export interface CataloguePage {
	cards: CatalogueCard[];
	/** Pass as `after` for the next page; null on the last page. */
	next: KeysetPosition | null;
	/** Pass as `before` for the previous page; null on the first page. */
	previous: KeysetPosition | null;
}

export interface CatalogueOptions {
	/** Rows per page; the catalogue's own is 24. */
	limit?: number;
	/** Narrow to animals or supplies (the home page's "ready now" is animals only). */
	kind?: ListingKind;
}

/** The publication instant to the microsecond, in UTC: the `new` sort's cursor value. */
const publishedMicros = sql<string>`to_char(listing.published_at at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')`;

/** Rows the filters leave in, before any paging. */
function filtered(db: Db, filters: CatalogueFilters, kind: ListingKind | undefined) {
	let query = db
		.selectFrom('listing')
		.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
		.leftJoin('species', 'species.id', 'listing.species_id')
		.where(shopVisible)
		// The listing writes set both when a listing goes live; a row without them has no
		// place in either order, and nothing without a price can be bought.
		.where('listing.published_at', 'is not', null)
		.where('listing.base_price_cents', 'is not', null);
	if (kind) query = query.where('listing.kind', '=', kind);
	if (filters.group) query = query.where('species.animal_group', '=', filters.group);
	if (filters.species) query = query.where('species.slug', '=', filters.species);
	if (filters.stage) query = query.where('clutch.stage', '=', filters.stage);
	if (filters.sex) query = query.where('listing.sex', '=', filters.sex);
	if (filters.minCents !== null)
		query = query.where('listing.base_price_cents', '>=', filters.minCents);
	if (filters.maxCents !== null)
		query = query.where('listing.base_price_cents', '<=', filters.maxCents);
	if (filters.inStock) query = query.where(onOfferSql(sql.ref('listing.id')), '>', 0);
	if (filters.q) {
		const words = filters.q;
		// Listing words are indexed in English. Species names mix English common names with
		// Latin ones indexed as-is ('simple'), which English stemming would miss ("laevis").
		// Each side is its own subquery so PostgreSQL can answer it from its GIN index; an OR
		// across the joined rows would test every visible listing instead.
		query = query.where((eb) =>
			eb.or([
				eb(
					'listing.id',
					'in',
					eb
						.selectFrom('listing as worded')
						.select('worded.id')
						.where(sql<SqlBool>`worded.search @@ websearch_to_tsquery('english', ${words})`)
				),
				eb(
					'listing.species_id',
					'in',
					eb
						.selectFrom('species as named')
						.select('named.id')
						.where(
							sql<SqlBool>`named.search @@ (websearch_to_tsquery('english', ${words}) || websearch_to_tsquery('simple', ${words}))`
						)
				)
			])
		);
	}
	return query;
}

/** Rows strictly past `position` in the direction the page is read. */
function pastPosition(sort: CatalogueSort, position: KeysetPosition, forward: boolean) {
	const id = sql`cast(${position.id} as integer)`;
	if (sort === 'new') {
		// Newest first: forward is toward older rows.
		const beyond = sql.raw(forward ? '<' : '>');
		return sql<SqlBool>`(listing.published_at, listing.id) ${beyond} (cast(${position.value} as timestamptz), ${id})`;
	}
	const beyond = sql.raw(forward ? '>' : '<');
	return sql<SqlBool>`(listing.base_price_cents, listing.id) ${beyond} (cast(${position.value} as integer), ${id})`;
}

/** The keys of one sort, in the catalogue's order (forward) or the reverse. */
function orderKeys(sort: CatalogueSort, forward: boolean): RawBuilder<unknown> {
	if (sort === 'new')
		return forward
			? sql`listing.published_at desc, listing.id desc`
			: sql`listing.published_at asc, listing.id asc`;
	return forward
		? sql`listing.base_price_cents asc, listing.id asc`
		: sql`listing.base_price_cents desc, listing.id desc`;
}

/**
 * One page of the catalogue. A `before` page is read backwards from its cursor and
 * turned round; when fewer than a page lie before it, the first page is read instead,
 * so "previous" never shows a short page.
 */
export async function loadCataloguePage(
	db: Db,
	query: CatalogueQuery,
	options: CatalogueOptions = {}
): Promise<CataloguePage> {
	const limit = options.limit ?? CATALOGUE_PAGE_SIZE;
	const { sort } = query;
	const cursor = query.after ?? query.before;
	const forward = query.before === null || query.after !== null;

	const read = async (from: KeysetPosition | null, readForward: boolean) => {
		let keys = filtered(db, query.filters, options.kind).select([
			'listing.id',
			publishedMicros.as('published_micros'),
			'listing.base_price_cents'
		]);
		if (from) keys = keys.where(pastPosition(sort, from, readForward));
		const rows = await keys
			.orderBy(orderKeys(sort, readForward))
			.limit(limit + 1)
			.execute();
		const positions = rows.map((row): KeysetPosition =>
			sort === 'new'
				? { sort, value: row.published_micros, id: row.id }
				: { sort, value: row.base_price_cents ?? 0, id: row.id }
		);
		return cardsAt(db, positions);
	};

	let rows = await read(cursor, forward);
	if (forward) {
		const cards = rows.slice(0, limit);
		return {
			cards,
			next: rows.length > limit ? (cards.at(-1)?.position ?? null) : null,
			previous: cursor && cards.length > 0 ? cards[0]!.position : null
		};
	}
	if (rows.length <= limit) {
		// Fewer than a page before the cursor: this is the start, so show the first page.
		rows = await read(null, true);
		const cards = rows.slice(0, limit);
		return {
			cards,
			next: rows.length > limit ? (cards.at(-1)?.position ?? null) : null,
			previous: null
		};
	}
	const cards = rows.slice(0, limit).reverse();
	return {
		cards,
		// The row the buyer came back from follows this page.
		next: cards.at(-1)?.position ?? null,
		previous: cards[0]?.position ?? null
	};
}

/** The first photo that shows a listing: its own, else its clutch's, else its species'. */
function firstPhoto(eb: ExpressionBuilder<Database, 'listing'>) {
	const first = (
		column: 'listing_id' | 'clutch_id' | 'species_id',
		owner: 'id' | 'clutch_id' | 'species_id'
	) =>
		eb
			.selectFrom('photo')
			.select('photo.id')
			.whereRef(`photo.${column}`, '=', `listing.${owner}`)
			.where(sql<SqlBool>`cardinality(photo.widths) > 0`)
			.orderBy('photo.position')
			.orderBy('photo.id')
			.limit(1);
	return eb.fn.coalesce(
		first('listing_id', 'id'),
		first('clutch_id', 'clutch_id'),
		first('species_id', 'species_id')
	);
}

/**
 * The cards at these positions, in their order. Units on offer and the first photo
 * are worked out for these few rows only, never for every row a filter passes.
 */
export async function cardsAt(
	db: Db,
	positions: readonly KeysetPosition[]
): Promise<CatalogueCard[]> {
	if (positions.length === 0) return [];
	const rows = await db
		.selectFrom('listing')
		.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
		.leftJoin('species', 'species.id', 'listing.species_id')
		.select((eb) => [
			'listing.id',
			'listing.slug',
			'listing.title',
			'listing.kind',
			'listing.is_live',
			'listing.sex',
			'listing.unit_size',
			'listing.base_price_cents',
			'clutch.stage',
			'clutch.generation',
			'species.slug as species_slug',
			'species.common_name',
			'species.scientific_name',
			'species.animal_group',
			onOfferSql(eb.ref('listing.id')).as('on_offer'),
			firstPhoto(eb).as('photo_id')
		])
		.where(
			'listing.id',
			'in',
			positions.map((position) => position.id)
		)
		.execute();

	const photoIds = rows.flatMap((row) => (row.photo_id === null ? [] : [row.photo_id]));
	const photos = new Map(
		photoIds.length === 0
			? []
			: (
					await db
						.selectFrom('photo')
						.select(['id', 'content_hash', 'widths', 'width', 'height', 'alt_text'])
						.where('id', 'in', photoIds)
						.execute()
				).map((photo) => [photo.id, photo])
	);

	const byId = new Map(rows.map((row) => [row.id, row]));
	return positions.flatMap((position) => {
		const row = byId.get(position.id);
		if (!row) return [];
		const photo = row.photo_id === null ? undefined : photos.get(row.photo_id);
		const species =
			row.species_slug && row.common_name && row.scientific_name
				? {
						slug: row.species_slug,
						commonName: row.common_name,
						scientificName: row.scientific_name
					}
				: null;
		return [
			{
				id: row.id,
				slug: row.slug,
				title: row.title,
				kind: row.kind,
				isLive: row.is_live,
				species,
				group: row.animal_group,
				stage: row.stage,
				sex: row.sex,
				unitSize: row.unit_size,
				unitLabel: unitLabel(row.unit_size, row.sex),
				generation: row.generation,
				fromPriceCents: row.base_price_cents ?? 0,
				onOffer: Number(row.on_offer),
				photo:
					photo && photo.widths.length > 0
						? {
								hash: photo.content_hash,
								widths: [...photo.widths].sort((a, b) => a - b),
								width: photo.width,
								height: photo.height,
								alt: photoAlt(photo.alt_text, {
									title: row.title,
									commonName: row.common_name,
									scientificName: row.scientific_name,
									stage: row.stage
								})
							}
						: null,
				position
			}
		];
	});
}

export interface ShopSpeciesOption {
	slug: string;
	commonName: string;
	scientificName: string;
	group: AnimalGroup;
}

/** Every species, for the catalogue's species filter: by group, then common name. */
export async function listShopSpecies(db: Db): Promise<ShopSpeciesOption[]> {
	const rows = await db
		.selectFrom('species')
		.select(['slug', 'common_name', 'scientific_name', 'animal_group'])
		.orderBy('animal_group')
		.orderBy('common_name')
		.execute();
	return rows.map((row) => ({
		slug: row.slug,
		commonName: row.common_name,
		scientificName: row.scientific_name,
		group: row.animal_group
	}));
}

/** What the sitemap lists: every species page and every listing a visitor can see. */
export async function crawlablePages(db: Db): Promise<{
	species: { slug: string; updatedAt: Date }[];
	listings: { slug: string; updatedAt: Date }[];
}> {
	const [species, listings] = await Promise.all([
		db.selectFrom('species').select(['slug', 'updated_at']).orderBy('slug').execute(),
		db
			.selectFrom('listing')
			.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
			.select(['listing.slug', 'listing.updated_at'])
			.where(shopVisible)
			.where('listing.published_at', 'is not', null)
			.orderBy('listing.published_at', 'desc')
			.orderBy('listing.id', 'desc')
			.execute()
	]);
	return {
		species: species.map((row) => ({ slug: row.slug, updatedAt: row.updated_at })),
		listings: listings.map((row) => ({ slug: row.slug, updatedAt: row.updated_at }))
	};
}
