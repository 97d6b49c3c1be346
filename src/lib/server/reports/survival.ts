// Survival: of the young found, how many are still alive week by week, and how many
// reach their sale-ready date. Counted from the clutch ledger in PostgreSQL.
//
// How an animal is counted. A clutch's count_found already holds the young a census
// found beyond the first count (they were there from the start, only missed) and the
// animals a split or merge poured in. Animals that merely moved belong to the clutch they
// were found in, so a clutch's own found is count_found less what moved in
// (split_in / merge_in), and a split-off part (same species and found date as its
// parent, so always in the same cohort) adds its losses but no found animals. Losses are
// the negative count changes of 'loss' and 'count' (census) events, the same figures the
// clutch's count_lost adds up. Survivors = own found − losses, floored at 0.
import { sql, type QueryCreator } from 'kysely';
import { formatCell } from '$lib/reports/cells';
import type { ReportColumn, ReportFilter, ReportRow, ReportSection } from '$lib/reports/report';
import type { Database } from '$lib/server/db/schema';
import {
	fraction,
	speciesFilter,
	type ReportContext,
	type ReportRunner,
	type SpeciesChoice
} from './context';

/** The curve runs at least this many weeks, longer when a species grows out slower. */
const CURVE_WEEKS_AT_LEAST = 16;

// Survivors change by 'loss' and 'count' (census) events; splits and merges only move
// animals. Written as literals, not parameters, so the planner can match the partial
// indexes on clutch_event (migrations/…_report_indexes.ts) that serve these two lists.
const LOSS_EVENT = sql<boolean>`e.kind in ('loss', 'count') and e.count_delta < 0`;
const MOVED_IN_EVENT = sql<boolean>`moved.kind in ('split_in', 'merge_in')`;

/** The row key of a species' column in the curve's table. */
const speciesKey = (slug: string) => `species:${slug}`;

/**
 * Clutches found in the range (of one species, or all): their own found animals, and
 * their age today in whole weeks (negative for a found date still to come).
 */
function cohort(qc: QueryCreator<Database>, context: ReportContext, speciesId: number | null) {
	return qc
		.selectFrom('clutch as c')
		.where('c.found_on', '>=', context.from)
		.where('c.found_on', '<=', context.to)
		.$if(speciesId !== null, (q) => q.where('c.species_id', '=', speciesId as number))
		.select((eb) => [
			'c.id',
			'c.species_id',
			'c.found_on',
			'c.sale_ready_on',
			'c.origin',
			sql<number>`(c.count_found - coalesce(${eb
				.selectFrom('clutch_event as moved')
				.whereRef('moved.clutch_id', '=', 'c.id')
				.where(MOVED_IN_EVENT)
				.select(sql<number>`sum(moved.count_delta)`.as('moved_in'))}, 0))::int`.as('own_found'),
			sql<number>`floor((${context.today}::date - c.found_on) / 7.0)::int`.as('age_weeks')
		]);
}

export const survivalReport: ReportRunner = async (context) => {
	const { species: onlySpecies, filter: speciesChoice } = await speciesFilter(context);
	const filters: ReportFilter[] = [speciesChoice];

	const speciesId = onlySpecies?.id ?? null;
	const [curve, saleReady, clutches] = await Promise.all([
		survivalCurve(context, speciesId),
		reachingSaleReady(context, speciesId),
		clutchRows(context, speciesId)
	]);

	const range = `${formatCell('date', context.from)} and ${formatCell('date', context.to)}`;
	const whichClutch = onlySpecies ? `${onlySpecies.common_name} clutch` : 'clutch';
	const noneFound = `No ${whichClutch} was found between ${range}.`;

	const curveSection: ReportSection = {
		id: 'curve',
		title: 'Survival by weeks since found',
		lead: 'The share of the young found that are still alive so many weeks after they were found.',
		chart:
			curve.species.length > 0
				? {
						kind: 'line',
						title: 'Share of young still alive by weeks since found',
						summary: `One line per species, over clutches found between ${range}: week 0 is the day a clutch was found; each week counts only clutches at least that old today.`,
						labelKey: 'week',
						series: curve.species.map((s) => ({
							key: speciesKey(s.slug),
							label: s.common_name
						})),
						unit: 'percent'
					}
				: null,
		table: {
			caption: 'Share of young still alive, by weeks since found and species',
			columns: [
				{ key: 'week', label: 'Weeks since found', kind: 'count' },
				...curve.species.map((s): ReportColumn => ({
					key: speciesKey(s.slug),
					label: s.common_name,
					kind: 'percent'
				}))
			],
			rows: curve.rows
		},
		empty: noneFound
	};

	const saleReadySection: ReportSection = {
		id: 'sale-ready',
		title: 'Reaching sale-ready',
		lead: 'Clutches found in the range whose sale-ready date has come: how many of their young lived to it.',
		chart: {
			kind: 'bar',
			horizontal: true,
			title: 'Share of young reaching sale-ready by species',
			summary: `One bar per species, over clutches found between ${range} whose sale-ready date is today or earlier.`,
			labelKey: 'species',
			series: [{ key: 'reached', label: 'Reached sale-ready' }],
			unit: 'percent'
		},
		table: {
			caption: 'Young reaching sale-ready by species',
			columns: [
				{ key: 'species', label: 'Species', kind: 'text' },
				{ key: 'clutches', label: 'Clutches', kind: 'count' },
				{ key: 'found', label: 'Young found', kind: 'count' },
				{ key: 'lost', label: 'Lost before sale-ready', kind: 'count' },
				{ key: 'reached', label: 'Reached sale-ready', kind: 'percent' }
			],
			rows: saleReady.rows,
			...(saleReady.rows.length > 0 ? { totals: saleReady.totals } : {})
		},
		empty:
			clutches.length > 0
				? `No ${whichClutch} found between ${range} has reached its sale-ready date yet.`
				: noneFound
	};

	const clutchSection: ReportSection = {
		id: 'clutches',
		title: 'Clutches',
		lead: 'Every clutch found in the range, split-off parts included, with its counts today.',
		chart: null,
		table: {
			caption: 'Clutches found in the range',
			columns: [
				{ key: 'code', label: 'Clutch', kind: 'text' },
				{ key: 'species', label: 'Species', kind: 'text' },
				{ key: 'found_on', label: 'Found on', kind: 'date' },
				{ key: 'found', label: 'Found', kind: 'count' },
				{ key: 'lost', label: 'Lost', kind: 'count' },
				{ key: 'moved_out', label: 'Moved to other clutches', kind: 'count' },
				{ key: 'alive', label: 'Alive now', kind: 'count' },
				{ key: 'alive_share', label: 'Alive ÷ found', kind: 'percent' }
			],
			rows: clutches
		},
		empty: noneFound
	};

	return {
		filters,
		sections: [curveSection, saleReadySection, clutchSection],
		notes: [
			'A clutch counts in the range by the day it was found. Young found at a later census count as found from the start; losses are the animals recorded lost and the ones a census found missing.',
			'Splits and merges move animals, they are not deaths: moved animals stay with the clutch they were found in. Losses after a merge count against the clutch that took the animals in.',
			`The curve runs ${CURVE_WEEKS_AT_LEAST} weeks, or to the longest grow-out of the species shown, and stops at the age of the oldest clutch. Each week counts only clutches at least that many weeks old today, so young clutches do not flatter the later weeks.`,
			'Reached sale-ready counts clutches whose sale-ready date is today or earlier: young found less those lost on or before that date, as a share of the young found.',
			'In the clutch table, found is the clutch’s own count (animals poured in by a split or merge included), and moved to other clutches is what a split or merge took out of it.'
		]
	};
};

interface CurveResult {
	species: Pick<SpeciesChoice, 'slug' | 'common_name'>[];
	rows: ReportRow[];
}

/** One row per week since found, a share per species: survivors over own found. */
async function survivalCurve(
	context: ReportContext,
	speciesId: number | null
): Promise<CurveResult> {
	const { db, today } = context;
	const span = await db
		.with('cohort', (qc) => cohort(qc, context, speciesId))
		.selectFrom('cohort')
		.innerJoin('species as s', 's.id', 'cohort.species_id')
		.select([
			sql<number | null>`max(s.grow_out_weeks)`.as('longest_grow_out'),
			sql<number | null>`max(${today}::date - cohort.found_on)`.as('oldest_days')
		])
		.executeTakeFirstOrThrow();
	if (span.longest_grow_out === null || span.oldest_days === null || span.oldest_days < 0)
		return { species: [], rows: [] };
	const lastWeek = Math.min(
		Math.max(CURVE_WEEKS_AT_LEAST, span.longest_grow_out),
		Math.floor(span.oldest_days / 7)
	);

	// A clutch counts at week w while it is at least w weeks old; a loss counts from the
	// first week whose day (found_on + 7w) is on or after it. Clutches and losses are first
	// summed by age and by that first week, so the weeks join a few hundred rows, not every
	// clutch.
	const cells = await db
		.with('cohort', (qc) => cohort(qc, context, speciesId))
		.with('week', (qc) =>
			qc.selectNoFrom(sql<number>`generate_series(0, ${lastWeek}::int)`.as('weeks_since'))
		)
		.with('found_by_age', (qc) =>
			qc
				.selectFrom('cohort')
				.where('cohort.age_weeks', '>=', 0)
				.select([
					'cohort.species_id',
					sql<number>`least(cohort.age_weeks, ${lastWeek}::int)`.as('age_weeks'),
					sql<number>`sum(cohort.own_found)::bigint`.as('found')
				])
				.groupBy([sql`1`, sql`2`])
		)
		.with('lost_by_age', (qc) =>
			qc
				.selectFrom('cohort')
				.innerJoin('clutch_event as e', 'e.clutch_id', 'cohort.id')
				.where(LOSS_EVENT)
				.where('cohort.age_weeks', '>=', 0)
				.select([
					'cohort.species_id',
					sql<number>`least(cohort.age_weeks, ${lastWeek}::int)`.as('age_weeks'),
					sql<number>`greatest(ceil((e.happened_on - cohort.found_on) / 7.0), 0)::int`.as(
						'from_week'
					),
					sql<number>`sum(-e.count_delta)::bigint`.as('lost')
				])
				.groupBy([sql`1`, sql`2`, sql`3`])
		)
		.with('found_by_week', (qc) =>
			qc
				.selectFrom('found_by_age as f')
				.innerJoin('week', (join) => join.onRef('week.weeks_since', '<=', 'f.age_weeks'))
				.select(['f.species_id', 'week.weeks_since', sql<number>`sum(f.found)::bigint`.as('found')])
				.groupBy(['f.species_id', 'week.weeks_since'])
		)
		.with('lost_by_week', (qc) =>
			qc
				.selectFrom('lost_by_age as l')
				.innerJoin('week', (join) =>
					join
						.onRef('week.weeks_since', '<=', 'l.age_weeks')
						.onRef('week.weeks_since', '>=', 'l.from_week')
				)
				.select(['l.species_id', 'week.weeks_since', sql<number>`sum(l.lost)::bigint`.as('lost')])
				.groupBy(['l.species_id', 'week.weeks_since'])
		)
		.selectFrom('found_by_week as f')
		.innerJoin('species as s', 's.id', 'f.species_id')
		.leftJoin('lost_by_week as l', (join) =>
			join.onRef('l.species_id', '=', 'f.species_id').onRef('l.weeks_since', '=', 'f.weeks_since')
		)
		.select([
			's.slug',
			's.common_name',
			'f.weeks_since',
			'f.found',
			sql<number>`greatest(f.found - coalesce(l.lost, 0), 0)::bigint`.as('alive')
		])
		.orderBy('s.common_name')
		.orderBy('f.weeks_since')
		.execute();

	const species = new Map<string, Pick<SpeciesChoice, 'slug' | 'common_name'>>();
	const rows: ReportRow[] = Array.from({ length: lastWeek + 1 }, (_, week) => ({ week }));
	for (const cell of cells) {
		if (!species.has(cell.slug))
			species.set(cell.slug, { slug: cell.slug, common_name: cell.common_name });
		rows[cell.weeks_since]![speciesKey(cell.slug)] = fraction(cell.alive, cell.found);
	}
	const shown = [...species.values()];
	// A week no clutch of a species has reached yet reads as no value, not as zero.
	for (const row of rows) for (const s of shown) row[speciesKey(s.slug)] ??= null;
	return { species: shown, rows };
}

/** Per species (and all together): clutches past their sale-ready date and the young that reached it. */
async function reachingSaleReady(
	context: ReportContext,
	speciesId: number | null
): Promise<{ rows: ReportRow[]; totals: ReportRow }> {
	const { db, today } = context;
	const grouped = await db
		.with('cohort', (qc) => cohort(qc, context, speciesId))
		.with('ready_found', (qc) =>
			qc
				.selectFrom('cohort')
				.where('cohort.sale_ready_on', '<=', today)
				.select([
					'cohort.species_id',
					// A split-off part is the same clutch found once: it is not counted again.
					sql<number>`count(*) filter (where cohort.origin <> 'split')`.as('clutches'),
					sql<number>`sum(cohort.own_found)::bigint`.as('found')
				])
				.groupBy('cohort.species_id')
		)
		.with('ready_lost', (qc) =>
			qc
				.selectFrom('cohort')
				.innerJoin('clutch_event as e', 'e.clutch_id', 'cohort.id')
				.where('cohort.sale_ready_on', '<=', today)
				.where(LOSS_EVENT)
				.whereRef('e.happened_on', '<=', 'cohort.sale_ready_on')
				.select(['cohort.species_id', sql<number>`sum(-e.count_delta)::bigint`.as('lost')])
				.groupBy('cohort.species_id')
		)
		.selectFrom('ready_found as f')
		.innerJoin('species as s', 's.id', 'f.species_id')
		.leftJoin('ready_lost as l', 'l.species_id', 'f.species_id')
		.select([
			sql<number>`grouping(s.id)`.as('is_total'),
			's.common_name',
			sql<number>`coalesce(sum(f.clutches), 0)::bigint`.as('clutches'),
			sql<number>`coalesce(sum(f.found), 0)::bigint`.as('found'),
			sql<number>`coalesce(sum(l.lost), 0)::bigint`.as('lost')
		])
		.groupBy(sql`grouping sets ((s.id, s.common_name), ())`)
		.orderBy(sql`grouping(s.id)`)
		.orderBy('s.common_name')
		.execute();

	const shape = (row: (typeof grouped)[number], name: string): ReportRow => ({
		species: name,
		clutches: Number(row.clutches),
		found: Number(row.found),
		lost: Number(row.lost),
		reached: fraction(Math.max(Number(row.found) - Number(row.lost), 0), Number(row.found))
	});
	const rows = grouped
		.filter((row) => Number(row.is_total) === 0)
		.map((row) => shape(row, row.common_name ?? 'Unknown species'));
	const total = grouped.find((row) => Number(row.is_total) === 1);
	return {
		rows,
		totals: total ? shape(total, 'All species') : { species: 'All species' }
	};
}

/** Every clutch found in the range with its counts as the ledger holds them today. */
async function clutchRows(context: ReportContext, speciesId: number | null): Promise<ReportRow[]> {
	const rows = await context.db
		.selectFrom('clutch as c')
		.innerJoin('species as s', 's.id', 'c.species_id')
		.where('c.found_on', '>=', context.from)
		.where('c.found_on', '<=', context.to)
		.$if(speciesId !== null, (q) => q.where('c.species_id', '=', speciesId as number))
		.select([
			'c.code',
			's.common_name',
			'c.found_on',
			'c.count_found',
			'c.count_lost',
			'c.count_alive'
		])
		.orderBy('c.found_on')
		.orderBy('c.id')
		.execute();
	return rows.map((row) => ({
		code: row.code,
		species: row.common_name,
		found_on: row.found_on,
		found: row.count_found,
		lost: row.count_lost,
		// The rest of found is what a split or merge moved out (alive + lost ≤ found).
		moved_out: row.count_found - row.count_alive - row.count_lost,
		alive: row.count_alive,
		alive_share: fraction(row.count_alive, row.count_found)
	}));
}
