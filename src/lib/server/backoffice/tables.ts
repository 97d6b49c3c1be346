// The back-office tables read from PostgreSQL: one query per table with its joins and
// filters, paged by keyset (the last row's sort value and id), and the same query
// written out as CSV. Views come parsed from $lib/backoffice/tables.
import { sql, type RawBuilder, type SelectQueryBuilder, type SqlBool } from 'kysely';
import { stringify } from 'csv-stringify/sync';
import type { Db } from '$lib/server/db';
import {
	CSV_ROW_CAP,
	containsPattern,
	csvRecords,
	pageFrom,
	sortKeySpec,
	type CareLogFilters,
	type ClutchFilters,
	type ColonyFilters,
	type CursorPosition,
	type RowOf,
	type SortDirection,
	type SortKeyOf,
	type SortKeySpec,
	type TableName,
	type TablePage,
	type TableView,
	type TubFilters
} from '$lib/backoffice/tables';

// ---- Which column each sort key orders by (fixed strings; never from the request)

const colonySortColumns = {
	code: 'colony.code',
	name: 'colony.name',
	species: 'species.scientific_name',
	generation: 'colony.generation',
	started: 'colony.started_on',
	retired: 'colony.retired_on'
} as const satisfies Record<SortKeyOf<'colonies'>, string>;

const tubSortColumns = {
	code: 'resting_tub.code',
	colony: 'colony.code',
	started: 'resting_tub.started_on',
	hold: 'resting_tub.hold_until',
	closed: 'resting_tub.closed_on'
} as const satisfies Record<SortKeyOf<'tubs'>, string>;

const clutchSortColumns = {
	code: 'clutch.code',
	species: 'species.scientific_name',
	found: 'clutch.found_on',
	alive: 'clutch.count_alive',
	ready: 'clutch.sale_ready_on'
} as const satisfies Record<SortKeyOf<'clutches'>, string>;

const careLogSortColumns = {
	date: 'care_log_entry.logged_on',
	colony: 'colony.code'
} as const satisfies Record<SortKeyOf<'care-log'>, string>;

const pgTypes: Record<SortKeySpec['type'], string> = {
	text: 'text',
	date: 'date',
	integer: 'integer'
};

/**
 * Rows strictly after `position` in the order (sort column, id), both in `dir`, with
 * rows lacking a sort value last in either direction. The row comparison lets
 * PostgreSQL walk a (column, id) index; the null branch covers the rows it skips.
 */
function pastPosition(
	sortColumn: string,
	idColumn: string,
	dir: SortDirection,
	spec: SortKeySpec,
	position: CursorPosition
): RawBuilder<SqlBool> {
	const column = sql.ref(sortColumn);
	const id = sql.ref(idColumn);
	const beyond = sql.raw(dir === 'asc' ? '>' : '<');
	const lastId = sql`cast(${position.id} as integer)`;
	if (position.value === null) {
		return sql<SqlBool>`(${column} is null and ${id} ${beyond} ${lastId})`;
	}
	const lastValue = sql`cast(${position.value} as ${sql.raw(pgTypes[spec.type])})`;
	const past = sql<SqlBool>`(${column}, ${id}) ${beyond} (${lastValue}, ${lastId})`;
	return spec.nullable ? sql<SqlBool>`(${past} or ${column} is null)` : past;
}

/** The view's order and, past page one, its keyset condition. */
function inViewOrder<DB, TB extends keyof DB, O, N extends TableName>(
	query: SelectQueryBuilder<DB, TB, O>,
	view: TableView<N>,
	sortColumn: string,
	idColumn: string,
	fromStart = false
): SelectQueryBuilder<DB, TB, O> {
	const spec = sortKeySpec(view.table, view.sort);
	let ordered = query
		.orderBy(sql.ref(sortColumn), (order) =>
			view.dir === 'asc' ? order.asc().nullsLast() : order.desc().nullsLast()
		)
		.orderBy(sql.ref(idColumn), view.dir);
	if (view.position && !fromStart) {
		ordered = ordered.where(pastPosition(sortColumn, idColumn, view.dir, spec, view.position));
	}
	return ordered;
}

// ---- One query per table: joins, selected fields (named as the row types) and filters

function colonyQuery(db: Db, filters: ColonyFilters) {
	let query = db
		.selectFrom('colony')
		.innerJoin('species', 'species.id', 'colony.species_id')
		.select([
			'colony.id',
			'colony.code',
			'colony.name',
			'species.scientific_name as speciesName',
			'species.common_name as speciesCommonName',
			'colony.generation',
			'colony.enclosure_length_in as enclosureLengthIn',
			'colony.enclosure_width_in as enclosureWidthIn',
			'colony.substrate_depth_in as substrateDepthIn',
			'colony.started_on as startedOn',
			'colony.retired_on as retiredOn'
		]);
	if (filters.species) query = query.where('species.slug', '=', filters.species);
	if (filters.status === 'active') query = query.where('colony.retired_on', 'is', null);
	if (filters.status === 'retired') query = query.where('colony.retired_on', 'is not', null);
	if (filters.q) {
		const pattern = containsPattern(filters.q);
		query = query.where((eb) =>
			eb.or([eb('colony.code', 'ilike', pattern), eb('colony.name', 'ilike', pattern)])
		);
	}
	return query;
}

function tubQuery(db: Db, filters: TubFilters) {
	let query = db
		.selectFrom('resting_tub')
		.innerJoin('colony', 'colony.id', 'resting_tub.colony_id')
		.innerJoin('species', 'species.id', 'colony.species_id')
		.select([
			'resting_tub.id',
			'resting_tub.code',
			'colony.code as colonyCode',
			'colony.name as colonyName',
			'species.scientific_name as speciesName',
			'resting_tub.started_on as startedOn',
			'resting_tub.hold_until as holdUntil',
			'resting_tub.state',
			'resting_tub.closed_on as closedOn',
			sql<number>`(select count(*)::integer from tub_check where tub_check.tub_id = resting_tub.id)`.as(
				'checkCount'
			),
			sql<
				string | null
			>`(select max(checked_on) from tub_check where tub_check.tub_id = resting_tub.id)`.as(
				'lastCheckedOn'
			)
		]);
	if (filters.state) query = query.where('resting_tub.state', '=', filters.state);
	if (filters.colony) query = query.where('colony.code', '=', filters.colony);
	if (filters.holdBy) query = query.where('resting_tub.hold_until', '<=', filters.holdBy);
	if (filters.q) query = query.where('resting_tub.code', 'ilike', containsPattern(filters.q));
	return query;
}

function clutchQuery(db: Db, filters: ClutchFilters) {
	let query = db
		.selectFrom('clutch')
		.innerJoin('species', 'species.id', 'clutch.species_id')
		.leftJoin('resting_tub', 'resting_tub.id', 'clutch.tub_id')
		.select([
			'clutch.id',
			'clutch.code',
			'species.scientific_name as speciesName',
			'resting_tub.code as tubCode',
			'clutch.generation',
			'clutch.found_on as foundOn',
			'clutch.stage',
			'clutch.size_class as sizeClass',
			'clutch.count_found as countFound',
			'clutch.count_alive as countAlive',
			'clutch.count_lost as countLost',
			'clutch.state',
			'clutch.paused_reason as pausedReason',
			'clutch.sale_ready_on as saleReadyOn'
		]);
	if (filters.species) query = query.where('species.slug', '=', filters.species);
	if (filters.state) query = query.where('clutch.state', '=', filters.state);
	if (filters.stage) query = query.where('clutch.stage', '=', filters.stage);
	if (filters.size) query = query.where('clutch.size_class', '=', filters.size);
	if (filters.q) query = query.where('clutch.code', 'ilike', containsPattern(filters.q));
	return query;
}

function careLogQuery(db: Db, filters: CareLogFilters) {
	let query = db
		.selectFrom('care_log_entry')
		.innerJoin('colony', 'colony.id', 'care_log_entry.colony_id')
		.leftJoin('User', 'User.id', 'care_log_entry.created_by')
		.select([
			'care_log_entry.id',
			'colony.code as colonyCode',
			'colony.name as colonyName',
			'care_log_entry.logged_on as loggedOn',
			'care_log_entry.kind',
			'care_log_entry.moisture_reading as moistureReading',
			'care_log_entry.census_count as censusCount',
			'care_log_entry.note',
			'User.name as loggedBy'
		]);
	if (filters.colony) query = query.where('colony.code', '=', filters.colony);
	if (filters.kind) query = query.where('care_log_entry.kind', '=', filters.kind);
	if (filters.from) query = query.where('care_log_entry.logged_on', '>=', filters.from);
	if (filters.to) query = query.where('care_log_entry.logged_on', '<=', filters.to);
	return query;
}

/** Rows in the view's order: one page past its cursor, or (for CSV) from the start. */
async function fetchRows<N extends TableName>(
	db: Db,
	view: TableView<N>,
	options: { limit: number; fromStart: boolean }
): Promise<RowOf<N>[]> {
	const { limit, fromStart } = options;
	// Each branch returns its own table's rows; TypeScript cannot tie N to the switch.
	switch (view.table) {
		case 'colonies': {
			const colonies = view as TableView<'colonies'>;
			const query = colonyQuery(db, colonies.filters);
			const rows: RowOf<'colonies'>[] = await inViewOrder(
				query,
				colonies,
				colonySortColumns[colonies.sort],
				'colony.id',
				fromStart
			)
				.limit(limit)
				.execute();
			return rows as RowOf<N>[];
		}
		case 'tubs': {
			const tubs = view as TableView<'tubs'>;
			const query = tubQuery(db, tubs.filters);
			const rows: RowOf<'tubs'>[] = await inViewOrder(
				query,
				tubs,
				tubSortColumns[tubs.sort],
				'resting_tub.id',
				fromStart
			)
				.limit(limit)
				.execute();
			return rows as RowOf<N>[];
		}
		case 'clutches': {
			const clutches = view as TableView<'clutches'>;
			const query = clutchQuery(db, clutches.filters);
			const rows: RowOf<'clutches'>[] = await inViewOrder(
				query,
				clutches,
				clutchSortColumns[clutches.sort],
				'clutch.id',
				fromStart
			)
				.limit(limit)
				.execute();
			return rows as RowOf<N>[];
		}
		case 'care-log': {
			const careLog = view as TableView<'care-log'>;
			const query = careLogQuery(db, careLog.filters);
			const rows: RowOf<'care-log'>[] = await inViewOrder(
				query,
				careLog,
				careLogSortColumns[careLog.sort],
				'care_log_entry.id',
				fromStart
			)
				.limit(limit)
				.execute();
			return rows as RowOf<N>[];
		}
		default:
			throw new Error(`no such back-office table: ${String(view.table)}`);
	}
}

/** One page of the view, and the cursor for the next (null on the last page). */
export async function listTablePage<N extends TableName>(
	db: Db,
	view: TableView<N>
): Promise<TablePage<N>> {
	// One row more than the page shows tells whether another page follows.
	return pageFrom(view, await fetchRows(db, view, { limit: view.limit + 1, fromStart: false }));
}

export interface TableCsv {
	/** UTF-8 with a byte-order mark, so spreadsheets read "×" and curly quotes right. */
	csv: string;
	rowCount: number;
	/** True when more rows matched than one export holds (CSV_ROW_CAP). */
	capped: boolean;
}

/** Every row of the view (from the first, whatever page it is on), as CSV with a header. */
export async function tableCsv<N extends TableName>(
	db: Db,
	view: TableView<N>,
	cap = CSV_ROW_CAP
): Promise<TableCsv> {
	const fetched = await fetchRows(db, view, { limit: cap + 1, fromStart: true });
	const rows = fetched.slice(0, cap);
	const { header, records } = csvRecords(view.table, rows);
	return {
		// RFC 4180 ends records with CRLF; csv-stringify quotes cells with commas, quotes or breaks.
		csv: stringify([header, ...records], { bom: true, record_delimiter: 'windows' }),
		rowCount: rows.length,
		capped: fetched.length > cap
	};
}

export interface TableFilterOptions {
	species: { slug: string; scientificName: string; commonName: string }[];
	colonies: { code: string; name: string; retired: boolean }[];
}

/** The choices the filter bars offer: every species, every colony (active first). */
export async function tableFilterOptions(db: Db): Promise<TableFilterOptions> {
	const [species, colonies] = await Promise.all([
		db
			.selectFrom('species')
			.select(['slug', 'scientific_name as scientificName', 'common_name as commonName'])
			.orderBy('scientific_name')
			.execute(),
		db
			.selectFrom('colony')
			.select(['code', 'name', 'retired_on'])
			.orderBy(sql`retired_on is not null`)
			.orderBy('code')
			.execute()
	]);
	return {
		species,
		colonies: colonies.map((colony) => ({
			code: colony.code,
			name: colony.name,
			retired: colony.retired_on !== null
		}))
	};
}
