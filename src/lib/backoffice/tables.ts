// The back-office tables (colonies, resting tubs, clutches, care log) as views: which
// columns sort, which filters apply, how a view is read from and written to a URL, and
// the keyset cursor that marks where the next page starts. Pure: the server queries
// and the browser table share it, so both read a shared link the same way.
import { z } from 'zod';
import type {
	CareEntryKind,
	ClutchStage,
	ClutchState,
	MoistureReading,
	SizeClass,
	TubState
} from '$lib/server/db/schema';
import { isCalendarDate, type IsoDate } from '$lib/format/dates';
import {
	careEntryKindLabels,
	moistureReadingLabels,
	sizeClassLabels,
	stageLabels,
	stateLabel,
	statesOf
} from '$lib/format/labels';
import { colonyStatusLabels, formatGeneration, pausedReasonLabels } from './table-labels';

export const TABLE_NAMES = ['colonies', 'tubs', 'clutches', 'care-log'] as const;
export type TableName = (typeof TABLE_NAMES)[number];

export const PAGE_SIZE = 25;
export const MAX_PAGE_SIZE = 100;
/** The most rows one CSV export holds; a larger view is cut there and says so. */
export const CSV_ROW_CAP = 10_000;
/** Longest cursor accepted: room for the longest sort text below, however it is spelled. */
const MAX_CURSOR_LENGTH = 8_192;
/** Longest sort text a cursor carries (codes and names are far shorter). */
const MAX_SORT_TEXT = 1_000;
const MAX_INT4 = 2_147_483_647;

export type SortDirection = 'asc' | 'desc';
export type SortValueType = 'text' | 'date' | 'integer';

export interface SortKeySpec {
	label: string;
	type: SortValueType;
	/** Rows without a value sort after all the others, in either direction. */
	nullable: boolean;
	/** The direction a first click on this column gives. */
	defaultDir: SortDirection;
}

// ---- Rows as the JSON routes hand them over

export interface ColonyRow {
	id: number;
	code: string;
	name: string;
	speciesName: string;
	speciesCommonName: string;
	generation: number;
	/** numeric text in inches, as PostgreSQL keeps it ("18.0"). */
	enclosureLengthIn: string;
	enclosureWidthIn: string;
	substrateDepthIn: string;
	startedOn: IsoDate;
	retiredOn: IsoDate | null;
}

export interface TubRow {
	id: number;
	code: string;
	colonyCode: string;
	colonyName: string;
	speciesName: string;
	startedOn: IsoDate;
	holdUntil: IsoDate;
	state: TubState;
	closedOn: IsoDate | null;
	checkCount: number;
	lastCheckedOn: IsoDate | null;
}

export interface ClutchRow {
	id: number;
	code: string;
	speciesName: string;
	tubCode: string | null;
	generation: number;
	foundOn: IsoDate;
	stage: ClutchStage;
	sizeClass: SizeClass;
	countFound: number;
	countAlive: number;
	countLost: number;
	state: ClutchState;
	pausedReason: 'molting' | 'unwell' | null;
	saleReadyOn: IsoDate;
}

export interface CareLogRow {
	id: number;
	colonyCode: string;
	colonyName: string;
	loggedOn: IsoDate;
	kind: CareEntryKind;
	moistureReading: MoistureReading | null;
	censusCount: number | null;
	note: string;
	loggedBy: string | null;
}

export interface RowOfTable {
	colonies: ColonyRow;
	tubs: TubRow;
	clutches: ClutchRow;
	'care-log': CareLogRow;
}
export type RowOf<N extends TableName> = RowOfTable[N];

// ---- Filters: each key is also the URL parameter's name

/** A GET form sends empty fields as ''; an empty field means "no filter". */
function optional<T extends z.ZodType>(schema: T) {
	return z.preprocess(
		(value) => (typeof value === 'string' && value.trim() === '' ? undefined : value),
		schema.optional()
	);
}

const searchText = z.string().trim().max(100, 'Search text is at most 100 characters.');
const speciesSlug = z
	.string()
	.trim()
	.max(120, 'That species is not one the shop keeps.')
	.regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Species must be given by its slug, like narceus-americanus.');
const colonyCode = z.string().trim().max(40, 'A colony code is at most 40 characters.');
const calendarDate = (what: string) =>
	z.string().trim().refine(isCalendarDate, `${what} must be a calendar date written YYYY-MM-DD.`);
const oneOf = <const T extends readonly [string, ...string[]]>(values: T, what: string) =>
	z.enum(values, { error: `${what} must be one of: ${values.join(', ')}.` });

const tubStates = statesOf('tub') as [TubState, ...TubState[]];
const clutchStates = statesOf('clutch') as [ClutchState, ...ClutchState[]];
const clutchStages = Object.keys(stageLabels) as [ClutchStage, ...ClutchStage[]];
const sizeClasses = Object.keys(sizeClassLabels) as [SizeClass, ...SizeClass[]];
const careKinds = Object.keys(careEntryKindLabels) as [CareEntryKind, ...CareEntryKind[]];
const colonyStatuses = Object.keys(colonyStatusLabels) as ['active', 'retired'];

const colonyFilters = z.object({
	species: optional(speciesSlug),
	status: optional(oneOf(colonyStatuses, 'Status')),
	q: optional(searchText)
});
const tubFilters = z.object({
	state: optional(oneOf(tubStates, 'State')),
	colony: optional(colonyCode),
	holdBy: optional(calendarDate('“Hold ends by”')),
	q: optional(searchText)
});
const clutchFilters = z.object({
	species: optional(speciesSlug),
	state: optional(oneOf(clutchStates, 'State')),
	stage: optional(oneOf(clutchStages, 'Stage')),
	size: optional(oneOf(sizeClasses, 'Size class')),
	q: optional(searchText)
});
const careLogFilters = z
	.object({
		colony: optional(colonyCode),
		kind: optional(oneOf(careKinds, 'Kind')),
		from: optional(calendarDate('“From”')),
		to: optional(calendarDate('“To”'))
	})
	.refine((filters) => !filters.from || !filters.to || filters.from <= filters.to, {
		message: '“From” must be on or before “To”.'
	});

export type ColonyFilters = z.output<typeof colonyFilters>;
export type TubFilters = z.output<typeof tubFilters>;
export type ClutchFilters = z.output<typeof clutchFilters>;
export type CareLogFilters = z.output<typeof careLogFilters>;

interface FiltersOfTable {
	colonies: ColonyFilters;
	tubs: TubFilters;
	clutches: ClutchFilters;
	'care-log': CareLogFilters;
}
export type FiltersOf<N extends TableName> = FiltersOfTable[N];

// ---- Each table's sort keys, the row field each one reads, and its filters

const colonySortKeys = {
	code: { label: 'Code', type: 'text', nullable: false, defaultDir: 'asc' },
	name: { label: 'Name', type: 'text', nullable: false, defaultDir: 'asc' },
	species: { label: 'Species', type: 'text', nullable: false, defaultDir: 'asc' },
	generation: { label: 'Generation', type: 'integer', nullable: false, defaultDir: 'asc' },
	started: { label: 'Started', type: 'date', nullable: false, defaultDir: 'desc' },
	retired: { label: 'Retired', type: 'date', nullable: true, defaultDir: 'desc' }
} as const satisfies Record<string, SortKeySpec>;

const tubSortKeys = {
	code: { label: 'Code', type: 'text', nullable: false, defaultDir: 'asc' },
	colony: { label: 'Colony', type: 'text', nullable: false, defaultDir: 'asc' },
	started: { label: 'Started', type: 'date', nullable: false, defaultDir: 'desc' },
	hold: { label: 'Hold until', type: 'date', nullable: false, defaultDir: 'asc' },
	closed: { label: 'Closed', type: 'date', nullable: true, defaultDir: 'desc' }
} as const satisfies Record<string, SortKeySpec>;

const clutchSortKeys = {
	code: { label: 'Code', type: 'text', nullable: false, defaultDir: 'asc' },
	species: { label: 'Species', type: 'text', nullable: false, defaultDir: 'asc' },
	found: { label: 'Found', type: 'date', nullable: false, defaultDir: 'desc' },
	alive: { label: 'Alive', type: 'integer', nullable: false, defaultDir: 'desc' },
	ready: { label: 'Sale-ready', type: 'date', nullable: false, defaultDir: 'asc' }
} as const satisfies Record<string, SortKeySpec>;

const careLogSortKeys = {
	date: { label: 'Date', type: 'date', nullable: false, defaultDir: 'desc' },
	colony: { label: 'Colony', type: 'text', nullable: false, defaultDir: 'asc' }
} as const satisfies Record<string, SortKeySpec>;

interface SortKeysOfTable {
	colonies: keyof typeof colonySortKeys;
	tubs: keyof typeof tubSortKeys;
	clutches: keyof typeof clutchSortKeys;
	'care-log': keyof typeof careLogSortKeys;
}
export type SortKeyOf<N extends TableName> = SortKeysOfTable[N];

interface TableSpec<N extends TableName> {
	/** What one row is called, for "Showing 25 clutches". */
	noun: { one: string; many: string };
	sortKeys: Record<SortKeyOf<N>, SortKeySpec>;
	defaultSort: SortKeyOf<N>;
	/** The row field each sort key orders by: the cursor carries its value. */
	sortField: Record<SortKeyOf<N>, keyof RowOf<N> & string>;
	filters: z.ZodType<FiltersOf<N>, unknown>;
	/** Filter parameters in the order they are written into a URL. */
	filterKeys: readonly (keyof FiltersOf<N> & string)[];
}

export const tableSpecs: { [N in TableName]: TableSpec<N> } = {
	colonies: {
		noun: { one: 'colony', many: 'colonies' },
		sortKeys: colonySortKeys,
		defaultSort: 'code',
		sortField: {
			code: 'code',
			name: 'name',
			species: 'speciesName',
			generation: 'generation',
			started: 'startedOn',
			retired: 'retiredOn'
		},
		filters: colonyFilters,
		filterKeys: ['species', 'status', 'q']
	},
	tubs: {
		noun: { one: 'tub', many: 'tubs' },
		sortKeys: tubSortKeys,
		defaultSort: 'started',
		sortField: {
			code: 'code',
			colony: 'colonyCode',
			started: 'startedOn',
			hold: 'holdUntil',
			closed: 'closedOn'
		},
		filters: tubFilters,
		filterKeys: ['state', 'colony', 'holdBy', 'q']
	},
	clutches: {
		noun: { one: 'clutch', many: 'clutches' },
		sortKeys: clutchSortKeys,
		defaultSort: 'found',
		sortField: {
			code: 'code',
			species: 'speciesName',
			found: 'foundOn',
			alive: 'countAlive',
			ready: 'saleReadyOn'
		},
		filters: clutchFilters,
		filterKeys: ['species', 'state', 'stage', 'size', 'q']
	},
	'care-log': {
		noun: { one: 'entry', many: 'entries' },
		sortKeys: careLogSortKeys,
		defaultSort: 'date',
		sortField: { date: 'loggedOn', colony: 'colonyCode' },
		filters: careLogFilters,
		filterKeys: ['colony', 'kind', 'from', 'to']
	}
};

export function isTableName(value: string): value is TableName {
	return (TABLE_NAMES as readonly string[]).includes(value);
}

export function sortKeysOf<N extends TableName>(table: N): SortKeyOf<N>[] {
	return Object.keys(tableSpecs[table].sortKeys) as SortKeyOf<N>[];
}

export function sortKeySpec<N extends TableName>(table: N, sort: SortKeyOf<N>): SortKeySpec {
	return tableSpecs[table].sortKeys[sort];
}

// ---- The view and its cursor

/** Where the previous page ended: the last row's sort value and its id. */
export interface CursorPosition {
	value: string | number | null;
	id: number;
}

export interface TableView<N extends TableName = TableName> {
	table: N;
	sort: SortKeyOf<N>;
	dir: SortDirection;
	limit: number;
	/** The cursor exactly as the URL carried it, or null on the first page. */
	after: string | null;
	position: CursorPosition | null;
	filters: FiltersOf<N>;
}

export interface TablePage<N extends TableName> {
	rows: RowOf<N>[];
	/** Pass as `after` for the next page; null when this page was the last. */
	nextCursor: string | null;
}

export type ParsedView<N extends TableName> =
	{ ok: true; view: TableView<N> } | { ok: false; message: string };

/** A cursor that was not made by encodeCursor for this table, sort and direction. */
export class CursorError extends Error {
	constructor() {
		super(
			'The page marker in this address is damaged or belongs to another sort. Start again from the first page.'
		);
		this.name = 'CursorError';
	}
}

function toBase64Url(text: string): string {
	let binary = '';
	for (const byte of new TextEncoder().encode(text)) binary += String.fromCharCode(byte);
	return btoa(binary).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

function fromBase64Url(token: string): string {
	if (!/^[A-Za-z0-9_-]+$/.test(token)) throw new CursorError();
	const padded =
		token.replace(/-/g, '+').replace(/_/g, '/') + '='.repeat((4 - (token.length % 4)) % 4);
	let binary: string;
	try {
		binary = atob(padded);
	} catch {
		throw new CursorError();
	}
	const bytes = Uint8Array.from(binary, (char) => char.charCodeAt(0));
	try {
		return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
	} catch {
		throw new CursorError();
	}
}

interface CursorBody {
	/** sort key and direction the cursor was made for */
	s: string;
	d: SortDirection;
	v: string | number | null;
	i: number;
}

export function encodeCursor<N extends TableName>(
	table: N,
	sort: SortKeyOf<N>,
	dir: SortDirection,
	position: CursorPosition
): string {
	checkSortValue(sortKeySpec(table, sort), position.value);
	if (!Number.isSafeInteger(position.id) || position.id < 1 || position.id > MAX_INT4) {
		throw new RangeError(`a row id is a positive 32-bit integer, got ${position.id}`);
	}
	const body: CursorBody = { s: sort, d: dir, v: position.value, i: position.id };
	return toBase64Url(JSON.stringify(body));
}

function checkSortValue(
	spec: SortKeySpec,
	value: unknown
): asserts value is string | number | null {
	if (value === null) {
		if (!spec.nullable) throw new CursorError();
		return;
	}
	switch (spec.type) {
		case 'text':
			if (typeof value !== 'string' || value.length > MAX_SORT_TEXT) throw new CursorError();
			return;
		case 'date':
			if (typeof value !== 'string' || !isCalendarDate(value)) throw new CursorError();
			return;
		case 'integer':
			if (
				typeof value !== 'number' ||
				!Number.isSafeInteger(value) ||
				value < -MAX_INT4 - 1 ||
				value > MAX_INT4
			) {
				throw new CursorError();
			}
	}
}

/** The position a cursor marks; a CursorError for anything encodeCursor did not make. */
export function decodeCursor<N extends TableName>(
	table: N,
	sort: SortKeyOf<N>,
	dir: SortDirection,
	token: string
): CursorPosition {
	if (token.length > MAX_CURSOR_LENGTH) throw new CursorError();
	const text = fromBase64Url(token);
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
		throw new CursorError();
	}
	if (typeof body !== 'object' || body === null || Array.isArray(body)) throw new CursorError();
	const { s, d, v, i, ...rest } = body as Record<string, unknown>;
	if (Object.keys(rest).length > 0 || s !== sort || d !== dir) throw new CursorError();
	if (typeof i !== 'number' || !Number.isSafeInteger(i) || i < 1 || i > MAX_INT4) {
		throw new CursorError();
	}
	checkSortValue(sortKeySpec(table, sort), v);
	const position = { value: v, id: i };
	// Only the one spelling encodeCursor writes is accepted, so a cursor is its own checksum.
	if (encodeCursor(table, sort, dir, position) !== token) throw new CursorError();
	return position;
}

/** The view a table opens with when the URL says nothing. */
export function defaultView<N extends TableName>(table: N): TableView<N> {
	const spec = tableSpecs[table];
	return {
		table,
		sort: spec.defaultSort,
		dir: spec.sortKeys[spec.defaultSort].defaultDir,
		limit: PAGE_SIZE,
		after: null,
		position: null,
		filters: spec.filters.parse({})
	};
}

function firstIssue(error: z.ZodError): string {
	return error.issues[0]?.message ?? 'That address does not describe a view of this table.';
}

/** Reads a view from URL parameters; a plain sentence for the first thing wrong. */
export function parseTableView<N extends TableName>(
	table: N,
	params: URLSearchParams
): ParsedView<N> {
	const spec = tableSpecs[table];
	const sortKeys = sortKeysOf(table) as [SortKeyOf<N>, ...SortKeyOf<N>[]];
	const paging = z.object({
		sort: optional(oneOf(sortKeys, 'Sort')),
		dir: optional(oneOf(['asc', 'desc'], 'Order')),
		limit: optional(
			z
				.string()
				.trim()
				.regex(/^\d{1,4}$/, `Rows per page must be a whole number from 1 to ${MAX_PAGE_SIZE}.`)
				.transform(Number)
				.refine(
					(limit) => limit >= 1 && limit <= MAX_PAGE_SIZE,
					`Rows per page must be a whole number from 1 to ${MAX_PAGE_SIZE}.`
				)
		),
		after: optional(z.string().trim())
	});
	const raw = (keys: readonly string[]) =>
		Object.fromEntries(
			keys.flatMap((key) => {
				const value = params.get(key);
				return value === null ? [] : [[key, value]];
			})
		);

	const pagingResult = paging.safeParse(raw(['sort', 'dir', 'limit', 'after']));
	if (!pagingResult.success) return { ok: false, message: firstIssue(pagingResult.error) };
	const filtersResult = spec.filters.safeParse(raw(spec.filterKeys));
	if (!filtersResult.success) return { ok: false, message: firstIssue(filtersResult.error) };

	const sort = (pagingResult.data.sort as SortKeyOf<N> | undefined) ?? spec.defaultSort;
	const dir = pagingResult.data.dir ?? spec.sortKeys[sort].defaultDir;
	const after = pagingResult.data.after ?? null;
	let position: CursorPosition | null = null;
	if (after !== null) {
		try {
			position = decodeCursor(table, sort, dir, after);
		} catch (failure) {
			if (failure instanceof CursorError) return { ok: false, message: failure.message };
			throw failure;
		}
	}
	return {
		ok: true,
		view: {
			table,
			sort,
			dir,
			limit: pagingResult.data.limit ?? PAGE_SIZE,
			after,
			position,
			filters: filtersResult.data
		}
	};
}

/**
 * The URL query for a view, without the '?'. Defaults are left out, so the plain
 * view is the bare page address. `after: null` drops the cursor (back to page one).
 */
export function viewQuery<N extends TableName>(
	view: TableView<N>,
	extra: { after?: string | null; format?: 'csv' } = {}
): string {
	const spec = tableSpecs[view.table];
	const query = new URLSearchParams();
	const filters = view.filters as Record<string, unknown>;
	for (const key of spec.filterKeys) {
		const value = filters[key];
		if (value !== undefined && value !== null && value !== '') query.set(key, String(value));
	}
	if (view.sort !== spec.defaultSort) query.set('sort', view.sort);
	if (view.dir !== spec.sortKeys[view.sort].defaultDir) query.set('dir', view.dir);
	if (view.limit !== PAGE_SIZE) query.set('limit', String(view.limit));
	const after = extra.after === undefined ? view.after : extra.after;
	if (after && extra.format !== 'csv') query.set('after', after);
	if (extra.format) query.set('format', extra.format);
	return query.toString();
}

/** `path` with the view's query, e.g. "/manage/clutches?stage=juvenile". */
export function viewHref<N extends TableName>(
	path: string,
	view: TableView<N>,
	extra: { after?: string | null; format?: 'csv' } = {}
): string {
	const query = viewQuery(view, extra);
	return query ? `${path}?${query}` : path;
}

/** The same view sorted by `sort`: a second click on the sorted column flips it. */
export function sortedBy<N extends TableName>(
	view: TableView<N>,
	sort: SortKeyOf<N>
): TableView<N> {
	const dir =
		view.sort === sort
			? view.dir === 'asc'
				? 'desc'
				: 'asc'
			: tableSpecs[view.table].sortKeys[sort].defaultDir;
	return { ...view, sort, dir, after: null, position: null };
}

/** The cursor that continues after `row` in this view's order. */
export function cursorAfter<N extends TableName>(view: TableView<N>, row: RowOf<N>): string {
	const field = tableSpecs[view.table].sortField[view.sort];
	const value = (row as unknown as Record<string, string | number | null>)[field] ?? null;
	return encodeCursor(view.table, view.sort, view.dir, { value, id: row.id });
}

/**
 * A page from `limit + 1` fetched rows: the extra row only says that more follow,
 * so a last page that is exactly full needs no empty request to find out.
 */
export function pageFrom<N extends TableName>(
	view: TableView<N>,
	fetched: RowOf<N>[]
): TablePage<N> {
	const rows = fetched.slice(0, view.limit);
	const last = rows.at(-1);
	return {
		rows,
		nextCursor: fetched.length > view.limit && last ? cursorAfter(view, last) : null
	};
}

/** A LIKE pattern matching `text` anywhere, with LIKE's own wildcards taken literally. */
export function containsPattern(text: string): string {
	return `%${text.replace(/[\\%_]/g, (char) => `\\${char}`)}%`;
}

// ---- CSV: the columns of each export, and the guard against spreadsheet formulas

export interface CsvColumn<Row> {
	header: string;
	value: (row: Row) => string | number | null;
}

/**
 * A spreadsheet runs a cell that starts with = + - @ (or a tab or carriage return) as a
 * formula; a leading apostrophe makes it text. The rule is OWASP's "CSV Injection" advice.
 */
export function csvSafe(value: string | number | null): string | number {
	if (value === null) return '';
	if (typeof value === 'number') return value;
	return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

export const csvColumns: { [N in TableName]: CsvColumn<RowOf<N>>[] } = {
	colonies: [
		{ header: 'Code', value: (row) => row.code },
		{ header: 'Name', value: (row) => row.name },
		{ header: 'Species', value: (row) => row.speciesName },
		{ header: 'Common name', value: (row) => row.speciesCommonName },
		{ header: 'Generation', value: (row) => formatGeneration(row.generation) },
		{ header: 'Length (in)', value: (row) => row.enclosureLengthIn },
		{ header: 'Width (in)', value: (row) => row.enclosureWidthIn },
		{ header: 'Substrate depth (in)', value: (row) => row.substrateDepthIn },
		{ header: 'Started', value: (row) => row.startedOn },
		{ header: 'Retired', value: (row) => row.retiredOn }
	],
	tubs: [
		{ header: 'Code', value: (row) => row.code },
		{ header: 'Colony', value: (row) => row.colonyCode },
		{ header: 'Species', value: (row) => row.speciesName },
		{ header: 'State', value: (row) => stateLabel('tub', row.state) },
		{ header: 'Started', value: (row) => row.startedOn },
		{ header: 'Hold until', value: (row) => row.holdUntil },
		{ header: 'Closed', value: (row) => row.closedOn },
		{ header: 'Checks', value: (row) => row.checkCount },
		{ header: 'Last checked', value: (row) => row.lastCheckedOn }
	],
	clutches: [
		{ header: 'Code', value: (row) => row.code },
		{ header: 'Species', value: (row) => row.speciesName },
		{ header: 'Tub', value: (row) => row.tubCode },
		{ header: 'Generation', value: (row) => formatGeneration(row.generation) },
		{ header: 'Found', value: (row) => row.foundOn },
		{ header: 'Stage', value: (row) => stageLabels[row.stage] },
		{ header: 'Size class', value: (row) => sizeClassLabels[row.sizeClass] },
		{ header: 'Found count', value: (row) => row.countFound },
		{ header: 'Alive', value: (row) => row.countAlive },
		{ header: 'Lost', value: (row) => row.countLost },
		{ header: 'State', value: (row) => stateLabel('clutch', row.state) },
		{
			header: 'Paused for',
			value: (row) => (row.pausedReason ? pausedReasonLabels[row.pausedReason] : null)
		},
		{ header: 'Sale-ready', value: (row) => row.saleReadyOn }
	],
	'care-log': [
		{ header: 'Date', value: (row) => row.loggedOn },
		{ header: 'Colony', value: (row) => row.colonyCode },
		{ header: 'Colony name', value: (row) => row.colonyName },
		{ header: 'Kind', value: (row) => careEntryKindLabels[row.kind] },
		{
			header: 'Moisture',
			value: (row) => (row.moistureReading ? moistureReadingLabels[row.moistureReading] : null)
		},
		{ header: 'Census count', value: (row) => row.censusCount },
		{ header: 'Note', value: (row) => row.note },
		{ header: 'Logged by', value: (row) => row.loggedBy }
	]
};

/** Header row and data rows as plain cells, each made safe for a spreadsheet. */
export function csvRecords<N extends TableName>(
	table: N,
	rows: readonly RowOf<N>[]
): { header: string[]; records: (string | number)[][] } {
	const columns = csvColumns[table] as CsvColumn<RowOf<N>>[];
	return {
		header: columns.map((column) => column.header),
		records: rows.map((row) => columns.map((column) => csvSafe(column.value(row))))
	};
}

/** "hatchlot-clutches-2026-12-02.csv" */
export function csvFileName(table: TableName, today: IsoDate): string {
	return `hatchlot-${table}-${today}.csv`;
}
