// The public catalogue's view as its URL carries it: filters, sort, and the keyset
// cursor that marks where a page starts. Pure: the server reads a request with it and
// the pages write their links with it, so a shared link always reads back the same.
// A value the shop cannot use is dropped with a plain note, never a failed page.
import { z } from 'zod';
import { animalGroupLabels, sexLabels, stageLabels } from '$lib/format/labels';
import type { AnimalGroup, ClutchStage, Sex } from '$lib/server/db/schema';

export const CATALOGUE_PAGE_SIZE = 24;
export const CATALOGUE_SORTS = ['new', 'price'] as const;
export type CatalogueSort = (typeof CATALOGUE_SORTS)[number];

export const catalogueSortLabels = {
	new: 'Newest first',
	price: 'Lowest price per animal first'
} as const satisfies Record<CatalogueSort, string>;

const animalGroups = Object.keys(animalGroupLabels) as [AnimalGroup, ...AnimalGroup[]];
const stages = Object.keys(stageLabels) as [ClutchStage, ...ClutchStage[]];
const sexes = Object.keys(sexLabels) as [Sex, ...Sex[]];

/** Longest search text taken; longer is almost always a pasted paragraph. */
export const MAX_SEARCH_LENGTH = 100;
/** The largest price a filter takes, in dollars: far above anything the shop sells. */
export const MAX_FILTER_DOLLARS = 100_000;
const MAX_INT4 = 2_147_483_647;
/** Longest cursor read: a sort word, a timestamp and an id fit in well under this. */
const MAX_CURSOR_LENGTH = 200;

export interface CatalogueFilters {
	/** Words to search for in listing titles and descriptions and species names. */
	q: string | null;
	group: AnimalGroup | null;
	/** A species' slug. */
	species: string | null;
	stage: ClutchStage | null;
	sex: Sex | null;
	/** Price per animal bounds (the cheapest tier's rate), in cents, both inclusive. */
	minCents: number | null;
	maxCents: number | null;
	/** Only listings with at least one unit on offer now. */
	inStock: boolean;
}

/**
 * Where a page starts or ends: the sort value of a row and its id. For `new` the
 * value is the publication instant in UTC to the microsecond (PostgreSQL's own
 * precision: a millisecond Date would skip or repeat rows); for `price` it is cents.
 */
export type KeysetPosition =
	{ sort: 'new'; value: string; id: number } | { sort: 'price'; value: number; id: number };

export interface CatalogueQuery {
	filters: CatalogueFilters;
	sort: CatalogueSort;
	/** The page holds the rows after this one (next pages)… */
	after: KeysetPosition | null;
	/** …or the rows before this one (previous pages). Never both. */
	before: KeysetPosition | null;
}

export interface ParsedCatalogueQuery {
	query: CatalogueQuery;
	/** One plain sentence per value in the address that was left out. */
	notes: string[];
}

export const emptyFilters: CatalogueFilters = {
	q: null,
	group: null,
	species: null,
	stage: null,
	sex: null,
	minCents: null,
	maxCents: null,
	inStock: false
};

export function defaultCatalogueQuery(): CatalogueQuery {
	return { filters: { ...emptyFilters }, sort: 'new', after: null, before: null };
}

// ---- Money in the address: dollars, as a buyer types them

const DOLLARS = /^\$?\s*(\d{1,6})(?:\.(\d{1,2}))?$/;

/**
 * "12", "12.5", "$12.50" → cents, exactly (USD has two minor digits, ISO 4217), with
 * no float on the way; null for anything else.
 */
export function dollarsToCents(text: string): number | null {
	const match = DOLLARS.exec(text.trim().replace(/,/g, ''));
	if (!match) return null;
	const dollars = Number(match[1]);
	const cents = Number((match[2] ?? '').padEnd(2, '0'));
	if (dollars > MAX_FILTER_DOLLARS) return null;
	return dollars * 100 + cents;
}

/** Cents as the address writes them back: "12" for whole dollars, else "12.50". */
export function centsToDollarText(cents: number): string {
	const whole = Math.floor(cents / 100);
	const rest = cents % 100;
	return rest === 0 ? String(whole) : `${whole}.${String(rest).padStart(2, '0')}`;
}

// ---- The schema of the address

/** A GET form sends empty fields as ''; an empty field means "no filter". */
function optional<T extends z.ZodType>(schema: T) {
	return z.preprocess(
		(value) => (typeof value === 'string' && value.trim() === '' ? undefined : value),
		schema.optional()
	);
}

const quoted = (input: unknown) => `“${String(input).slice(0, 40)}”`;

const priceField = (which: 'lowest' | 'highest') =>
	z.string().transform((text, context) => {
		const cents = dollarsToCents(text);
		if (cents === null) {
			context.addIssue({
				code: 'custom',
				message: `${quoted(text)} is not a price in dollars (like 12 or 12.50), so the ${which} price was left out.`
			});
			return z.NEVER;
		}
		return cents;
	});

/** Every parameter the catalogue reads; each one is checked on its own. */
export const catalogueParamsSchema = z.object({
	q: optional(
		z
			.string()
			.trim()
			.max(
				MAX_SEARCH_LENGTH,
				`Search words are kept to ${MAX_SEARCH_LENGTH} characters, so the search was left out.`
			)
	),
	group: optional(
		z.enum(animalGroups, {
			error: (issue) => `${quoted(issue.input)} is not an animal group we keep, so it was left out.`
		})
	),
	species: optional(
		// The note names the value itself (see SPECIES_NOTE); a slug is lower-case words and hyphens.
		z
			.string()
			.trim()
			.max(120)
			.regex(/^[a-z0-9]+(-[a-z0-9]+)*$/)
	),
	stage: optional(
		z.enum(stages, {
			error: (issue) => `${quoted(issue.input)} is not a stage we list, so it was left out.`
		})
	),
	sex: optional(
		z.enum(sexes, {
			error: (issue) => `${quoted(issue.input)} is not a sex we list, so it was left out.`
		})
	),
	min: optional(priceField('lowest')),
	max: optional(priceField('highest')),
	stock: optional(
		z.enum(['1'], { error: () => 'The in-stock choice is 1 or nothing, so it was left out.' })
	),
	sort: optional(
		z.enum(CATALOGUE_SORTS, {
			error: (issue) =>
				`${quoted(issue.input)} is not an order the catalogue knows, so it shows newest first.`
		})
	),
	after: optional(z.string()),
	before: optional(z.string())
});

const PARAM_KEYS = Object.keys(catalogueParamsSchema.shape) as (keyof z.input<
	typeof catalogueParamsSchema
>)[];

const SPECIES_NOTE = (input: string) =>
	`${quoted(input)} is not the web name of a species, so the species filter was left out.`;
const CURSOR_NOTE = 'The page marker in this address could not be read, so this is the first page.';

/** Reads the catalogue's view from an address; anything unusable is dropped with a note. */
export function parseCatalogueQuery(params: URLSearchParams): ParsedCatalogueQuery {
	const raw: Record<string, string> = {};
	for (const key of PARAM_KEYS) {
		const value = params.get(key);
		if (value !== null) raw[key] = value;
	}
	const notes: string[] = [];

	// Each bad value is dropped on its own, and the rest parsed again: one typo never
	// costs the buyer the filters that were fine.
	let parsed = catalogueParamsSchema.safeParse(raw);
	for (let round = 0; !parsed.success && round < PARAM_KEYS.length; round++) {
		for (const issue of parsed.error.issues) {
			const key = String(issue.path[0] ?? '');
			if (!(key in raw)) continue;
			notes.push(key === 'species' ? SPECIES_NOTE(raw[key]!) : issue.message);
			delete raw[key];
		}
		parsed = catalogueParamsSchema.safeParse(raw);
	}
	const values = parsed.success ? parsed.data : {};

	const minCents = values.min ?? null;
	let maxCents = values.max ?? null;
	if (minCents !== null && maxCents !== null && minCents > maxCents) {
		notes.push(
			`The highest price ($${centsToDollarText(maxCents)}) was below the lowest ($${centsToDollarText(minCents)}), so the highest was left out.`
		);
		maxCents = null;
	}

	const sort = values.sort ?? 'new';
	let after: KeysetPosition | null = null;
	let before: KeysetPosition | null = null;
	if (values.after !== undefined) {
		after = decodeCursor(values.after, sort);
		if (!after) notes.push(CURSOR_NOTE);
	} else if (values.before !== undefined) {
		before = decodeCursor(values.before, sort);
		if (!before) notes.push(CURSOR_NOTE);
	}

	return {
		query: {
			filters: {
				q: values.q ?? null,
				group: values.group ?? null,
				species: values.species ?? null,
				stage: values.stage ?? null,
				sex: values.sex ?? null,
				minCents,
				maxCents,
				inStock: values.stock === '1'
			},
			sort,
			after,
			before
		},
		notes
	};
}

// ---- The keyset cursor

/** A publication instant written as `to_char(… at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')`. */
const MICRO_INSTANT = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})\.\d{6}Z$/;

export function isMicroInstant(value: string): boolean {
	const match = MICRO_INSTANT.exec(value);
	if (!match) return false;
	const [year, month, day, hour, minute, second] = match.slice(1, 7).map(Number) as [
		number,
		number,
		number,
		number,
		number,
		number
	];
	const date = new Date(Date.UTC(year, month - 1, day, hour, minute, second));
	return (
		year >= 1970 &&
		date.getUTCFullYear() === year &&
		date.getUTCMonth() === month - 1 &&
		date.getUTCDate() === day &&
		date.getUTCHours() === hour &&
		date.getUTCMinutes() === minute &&
		date.getUTCSeconds() === second
	);
}

function toBase64Url(text: string): string {
	let binary = '';
	for (const byte of new TextEncoder().encode(text)) binary += String.fromCharCode(byte);
	return btoa(binary).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

function fromBase64Url(token: string): string | null {
	if (!/^[A-Za-z0-9_-]+$/.test(token)) return null;
	const padded =
		token.replace(/-/g, '+').replace(/_/g, '/') + '='.repeat((4 - (token.length % 4)) % 4);
	try {
		const bytes = Uint8Array.from(atob(padded), (char) => char.charCodeAt(0));
		return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
	} catch {
		return null;
	}
}

function validPosition(position: KeysetPosition): boolean {
	if (!Number.isSafeInteger(position.id) || position.id < 1 || position.id > MAX_INT4) return false;
	return position.sort === 'new'
		? typeof position.value === 'string' && isMicroInstant(position.value)
		: Number.isSafeInteger(position.value) && position.value >= 0 && position.value <= MAX_INT4;
}

/** The opaque token a next or previous link carries. */
export function encodeCursor(position: KeysetPosition): string {
	if (!validPosition(position)) throw new RangeError('not a catalogue position');
	return toBase64Url(JSON.stringify({ s: position.sort, v: position.value, i: position.id }));
}

/**
 * The position a token marks, or null for anything encodeCursor did not write for
 * this sort: a forged or damaged cursor is ignored, never trusted into a query.
 */
export function decodeCursor(token: string, sort: CatalogueSort): KeysetPosition | null {
	if (token.length > MAX_CURSOR_LENGTH) return null;
	const text = fromBase64Url(token);
	if (text === null) return null;
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
		return null;
	}
	if (typeof body !== 'object' || body === null || Array.isArray(body)) return null;
	const { s, v, i, ...rest } = body as Record<string, unknown>;
	if (Object.keys(rest).length > 0 || s !== sort || typeof i !== 'number') return null;
	let position: KeysetPosition;
	if (sort === 'new') {
		if (typeof v !== 'string') return null;
		position = { sort, value: v, id: i };
	} else {
		if (typeof v !== 'number') return null;
		position = { sort, value: v, id: i };
	}
	if (!validPosition(position)) return null;
	// Only the one spelling encodeCursor writes is read, so a token is its own checksum.
	return encodeCursor(position) === token ? position : null;
}

// ---- Writing the view back into an address

/**
 * The query string for a view, without the '?': filters in a fixed order, defaults
 * left out, so the plain catalogue is the bare path. `page` replaces the cursor.
 */
export function catalogueSearch(
	query: Pick<CatalogueQuery, 'filters' | 'sort'> &
		Partial<Pick<CatalogueQuery, 'after' | 'before'>>,
	page: { after?: KeysetPosition | null; before?: KeysetPosition | null } = {}
): string {
	const { filters } = query;
	const search = new URLSearchParams();
	if (filters.q) search.set('q', filters.q);
	if (filters.group) search.set('group', filters.group);
	if (filters.species) search.set('species', filters.species);
	if (filters.stage) search.set('stage', filters.stage);
	if (filters.sex) search.set('sex', filters.sex);
	if (filters.minCents !== null) search.set('min', centsToDollarText(filters.minCents));
	if (filters.maxCents !== null) search.set('max', centsToDollarText(filters.maxCents));
	if (filters.inStock) search.set('stock', '1');
	if (query.sort !== 'new') search.set('sort', query.sort);
	const paged = 'after' in page || 'before' in page;
	const after = paged ? (page.after ?? null) : (query.after ?? null);
	const before = paged ? (page.before ?? null) : (query.before ?? null);
	if (after) search.set('after', encodeCursor(after));
	else if (before) search.set('before', encodeCursor(before));
	return search.toString();
}

/** `path` with the view's query, e.g. "/catalogue?group=isopod&stock=1". */
export function catalogueHref(
	path: string,
	query: Pick<CatalogueQuery, 'filters' | 'sort'> &
		Partial<Pick<CatalogueQuery, 'after' | 'before'>>,
	page: { after?: KeysetPosition | null; before?: KeysetPosition | null } = {}
): string {
	const search = catalogueSearch(query, page);
	return search ? `${path}?${search}` : path;
}

/** True when any filter narrows the catalogue (the sort and page do not count). */
export function hasFilters(filters: CatalogueFilters): boolean {
	return (
		filters.q !== null ||
		filters.group !== null ||
		filters.species !== null ||
		filters.stage !== null ||
		filters.sex !== null ||
		filters.minCents !== null ||
		filters.maxCents !== null ||
		filters.inStock
	);
}
