// Tub yield: how many young the resting tubs give, by colony and by season. A tub counts
// in the range by the day it was set aside (started_on). Only closed tubs are decided:
// yielded (young found) or cleared (nothing); a tub still resting is counted apart, and
// its checks so far wait until it closes, so young per tub compares like with like.
import { sql, type QueryCreator } from 'kysely';
import { formatCell } from '$lib/reports/cells';
import type { ReportColumn, ReportFilter, ReportRow, ReportSection } from '$lib/reports/report';
import { seasonsBetween } from '$lib/reports/seasons';
import type { Database } from '$lib/server/db/schema';
import { chosen, fraction, speciesFilter, type ReportContext, type ReportRunner } from './context';

interface TubScope {
	speciesId: number | null;
	colonyId: number | null;
}

/** Tubs set aside in the range, with the young found at all their checks. */
function tubsInRange(qc: QueryCreator<Database>, context: ReportContext, scope: TubScope) {
	return qc
		.selectFrom('resting_tub as t')
		.innerJoin('colony as c', 'c.id', 't.colony_id')
		.where('t.started_on', '>=', context.from)
		.where('t.started_on', '<=', context.to)
		.$if(scope.speciesId !== null, (q) => q.where('c.species_id', '=', scope.speciesId as number))
		.$if(scope.colonyId !== null, (q) => q.where('t.colony_id', '=', scope.colonyId as number))
		.select((eb) => [
			't.id',
			't.colony_id',
			't.started_on',
			't.state',
			sql<number>`coalesce(${eb
				.selectFrom('tub_check as k')
				.whereRef('k.tub_id', '=', 't.id')
				.select(sql<number>`sum(k.young_found)`.as('young'))}, 0)::bigint`.as('young')
		]);
}

/** The figures both tables share, summed over whatever the query groups by. */
const tallies = [
	sql<number>`count(tub.id) filter (where tub.state in ('yielded', 'cleared'))`.as('closed'),
	sql<number>`count(tub.id) filter (where tub.state = 'yielded')`.as('yielded'),
	sql<number>`coalesce(sum(tub.young) filter (where tub.state in ('yielded', 'cleared')), 0)::bigint`.as(
		'young'
	),
	sql<number>`count(tub.id) filter (where tub.state = 'resting')`.as('resting')
];

interface Tally {
	closed: number;
	yielded: number;
	young: number;
	resting: number;
}

function tallyCells(row: Tally): ReportRow {
	const closed = Number(row.closed);
	const young = Number(row.young);
	return {
		closed,
		yielded: Number(row.yielded),
		yielded_share: fraction(Number(row.yielded), closed),
		young,
		// Young per closed tub, to two decimals; no closed tub, no figure.
		young_per_tub: closed > 0 ? Math.round((young / closed) * 100) / 100 : null,
		resting: Number(row.resting)
	};
}

const TALLY_COLUMNS: ReportColumn[] = [
	{ key: 'closed', label: 'Tubs closed', kind: 'count' },
	{ key: 'yielded', label: 'Tubs yielded', kind: 'count' },
	{ key: 'yielded_share', label: 'Share yielded', kind: 'percent' },
	{ key: 'young', label: 'Young found', kind: 'count' },
	{ key: 'young_per_tub', label: 'Young per closed tub', kind: 'decimal' },
	{ key: 'resting', label: 'Still resting', kind: 'count' }
];

export const tubYieldReport: ReportRunner = async (context) => {
	const { db } = context;
	const { species: onlySpecies, filter: speciesChoice } = await speciesFilter(context);
	const speciesId = onlySpecies?.id ?? null;
	// With a species chosen, only its colonies are offered; another species' colony means all.
	const colonyRows = await db
		.selectFrom('colony')
		.select(['id', 'code', 'name', 'retired_on'])
		.$if(speciesId !== null, (q) => q.where('species_id', '=', speciesId as number))
		.orderBy('code')
		.execute();
	const colonyCode = chosen(
		context.params,
		'colony',
		colonyRows.map((c) => c.code)
	);
	const onlyColony = colonyRows.find((c) => c.code === colonyCode) ?? null;
	const filters: ReportFilter[] = [
		speciesChoice,
		{
			key: 'colony',
			label: 'Colony',
			value: colonyCode,
			options: [
				{
					value: '',
					label: onlySpecies ? `All ${onlySpecies.common_name} colonies` : 'All colonies'
				},
				...colonyRows.map((c) => ({
					value: c.code,
					label: `${c.code} · ${c.name}${c.retired_on ? ' (retired)' : ''}`
				}))
			]
		}
	];

	const scope: TubScope = { speciesId, colonyId: onlyColony?.id ?? null };
	const [byColony, bySeason] = await Promise.all([
		yieldByColony(context, scope),
		yieldBySeason(context, scope)
	]);

	const range = `${formatCell('date', context.from)} and ${formatCell('date', context.to)}`;
	const whose = onlyColony
		? ` from ${onlyColony.code} · ${onlyColony.name}`
		: onlySpecies
			? ` from a ${onlySpecies.common_name} colony`
			: '';
	const empty = `No resting tub${whose} was set aside between ${range}.`;

	const colonySection: ReportSection = {
		id: 'by-colony',
		title: 'By colony',
		lead: 'Tubs set aside in the range, by the colony their substrate came from.',
		chart: {
			kind: 'bar',
			horizontal: true,
			title: 'Young per closed tub by colony',
			summary: `One bar per colony: the young found per closed tub, over tubs set aside between ${range}.`,
			labelKey: 'colony',
			series: [{ key: 'young_per_tub', label: 'Young per closed tub' }],
			unit: 'decimal'
		},
		table: {
			caption: 'Resting tub yield by colony',
			columns: [
				{ key: 'colony', label: 'Colony', kind: 'text' },
				{ key: 'species', label: 'Species', kind: 'text' },
				...TALLY_COLUMNS
			],
			rows: byColony.rows,
			...(byColony.rows.length > 0 ? { totals: byColony.totals } : {})
		},
		empty
	};

	const seasonSection: ReportSection = {
		id: 'by-season',
		title: 'By season',
		lead: 'The same tubs by the season they were set aside in.',
		chart: {
			kind: 'bar',
			title: 'Young per closed tub by season',
			summary: `One bar per season from ${range}: the young found per closed tub set aside in it.`,
			labelKey: 'season',
			series: [{ key: 'young_per_tub', label: 'Young per closed tub' }],
			unit: 'decimal'
		},
		table: {
			caption: 'Resting tub yield by season',
			columns: [{ key: 'season', label: 'Season', kind: 'text' }, ...TALLY_COLUMNS],
			// Quiet seasons show as zero rows, but a range with no tub at all has nothing to show.
			rows: byColony.rows.length > 0 ? bySeason.rows : [],
			...(byColony.rows.length > 0 ? { totals: bySeason.totals } : {})
		},
		empty
	};

	return {
		filters,
		sections: [colonySection, seasonSection],
		notes: [
			'A tub counts in the range by the day it was set aside, whatever has happened to it since.',
			'Closed tubs are the decided ones: yielded (young found) or cleared (nothing found). Tubs still resting are counted apart and left out of the other figures until they close.',
			'Young found adds up the young found at every check of the closed tubs. Young per closed tub divides it by all closed tubs, the cleared ones included.',
			'Seasons are meteorological, northern hemisphere: winter is December to February, spring March to May, summer June to August, autumn September to November. A season cut by the range counts only its days inside the range.'
		]
	};
};

/** One row per colony with tubs set aside in the range, then the totals. */
async function yieldByColony(
	context: ReportContext,
	scope: TubScope
): Promise<{ rows: ReportRow[]; totals: ReportRow }> {
	const grouped = await context.db
		.with('tub', (qc) => tubsInRange(qc, context, scope))
		.selectFrom('tub')
		.innerJoin('colony as c', 'c.id', 'tub.colony_id')
		.innerJoin('species as s', 's.id', 'c.species_id')
		.select([
			sql<number>`grouping(c.id)`.as('is_total'),
			'c.code',
			'c.name',
			's.common_name',
			...tallies
		])
		.groupBy(sql`grouping sets ((c.id, c.code, c.name, s.common_name), ())`)
		.orderBy(sql`grouping(c.id)`)
		.orderBy('c.code')
		.execute();
	const rows = grouped
		.filter((row) => Number(row.is_total) === 0)
		.map((row) => ({
			colony: `${row.code} · ${row.name}`,
			species: row.common_name,
			...tallyCells(row)
		}));
	const total = grouped.find((row) => Number(row.is_total) === 1);
	return {
		rows,
		totals: { colony: 'All colonies', species: null, ...(total ? tallyCells(total) : {}) }
	};
}

/** One row per season the range touches, quiet ones as zeros, then the totals. */
async function yieldBySeason(
	context: ReportContext,
	scope: TubScope
): Promise<{ rows: ReportRow[]; totals: ReportRow }> {
	const seasons = seasonsBetween(context.from, context.to);
	const grouped = await context.db
		.with('tub', (qc) => tubsInRange(qc, context, scope))
		.with('season', (qc) =>
			qc.selectNoFrom([
				sql<string>`unnest(${seasons.map((s) => s.start)}::date[])`.as('start_on'),
				sql<string>`unnest(${seasons.map((s) => s.next)}::date[])`.as('next_on')
			])
		)
		.selectFrom('season')
		.leftJoin('tub', (join) =>
			join.on(sql<boolean>`tub.started_on >= season.start_on and tub.started_on < season.next_on`)
		)
		.select([
			sql<number>`grouping(season.start_on)`.as('is_total'),
			sql<string | null>`to_char(season.start_on, 'YYYY-MM-DD')`.as('start'),
			...tallies
		])
		.groupBy(sql`grouping sets ((season.start_on), ())`)
		.orderBy(sql`grouping(season.start_on)`)
		.orderBy('season.start_on')
		.execute();
	const labels = new Map(seasons.map((s) => [s.start, s.label]));
	const rows = grouped
		.filter((row) => Number(row.is_total) === 0)
		.map((row) => ({ season: labels.get(row.start ?? '') ?? row.start, ...tallyCells(row) }));
	const total = grouped.find((row) => Number(row.is_total) === 1);
	return { rows, totals: { season: 'All seasons', ...(total ? tallyCells(total) : {}) } };
}
