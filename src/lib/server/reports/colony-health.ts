// Colony health: which colonies are overdue a substrate refresh, how their moisture
// checks read month by month, and the molts and pest notes logged. Care-log dates are
// calendar days in the shop's zone already, so they compare with the range directly.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type { CareEntryKind } from '$lib/server/db/schema';
import type { IsoDate } from '$lib/format/dates';
import { formatCell } from '$lib/reports/cells';
import type { ReportFilter, ReportRow, ReportSection } from '$lib/reports/report';
import {
	chosen,
	fraction,
	monthSeries,
	speciesFilter,
	type ReportContext,
	type ReportRunner
} from './context';

const REFRESH_KINDS: CareEntryKind[] = ['substrate_refresh_half', 'substrate_refresh_full'];

/** What the report is narrowed to; null for all. */
interface ColonyScope {
	speciesId: number | null;
	colonyId: number | null;
}

/** The day the refresh figures are counted to: the range's last day, never after today. */
function colonyHealthAsOf(to: IsoDate, today: IsoDate): IsoDate {
	return to < today ? to : today;
}

/**
 * Colonies that count for the range: started by the as-of day and not retired before
 * the range began (one retired on its first day still had that day).
 */
function activeColonies(db: Db, context: ReportContext, asOf: IsoDate, scope: ColonyScope) {
	return db
		.selectFrom('colony as c')
		.innerJoin('species as s', 's.id', 'c.species_id')
		.where('c.started_on', '<=', asOf)
		.where((eb) => eb.or([eb('c.retired_on', 'is', null), eb('c.retired_on', '>=', context.from)]))
		.$if(scope.speciesId !== null, (q) => q.where('c.species_id', '=', scope.speciesId))
		.$if(scope.colonyId !== null, (q) => q.where('c.id', '=', scope.colonyId));
}

/** "NAR-01 · Oak shelf": how a colony reads on a bar and in a table. */
function colonyLabel(code: string, name: string): string {
	return `${code} · ${name}`;
}

async function refreshRows(db: Db, context: ReportContext, asOf: IsoDate, scope: ColonyScope) {
	// A retired colony's clock stops at its retirement: least() skips the null of an active one.
	const colonyLastDay = sql<IsoDate>`least(${asOf}::date, c.retired_on)`;
	// Grouped per colony, so the outer select reads each figure without running it again.
	const perColony = activeColonies(db, context, asOf, scope)
		.leftJoin('care_log_entry as e', (join) =>
			join.onRef('e.colony_id', '=', 'c.id').on('e.kind', 'in', REFRESH_KINDS)
		)
		.select([
			'c.code',
			'c.name',
			'c.started_on',
			's.common_name',
			's.refresh_interval_days',
			colonyLastDay.as('last_day'),
			sql<IsoDate | null>`max(e.logged_on) filter (where e.logged_on <= ${colonyLastDay})`.as(
				'last_refresh'
			),
			sql<number>`count(e.logged_on) filter (where e.logged_on between ${context.from} and ${context.to})`.as(
				'refreshes'
			)
		])
		.groupBy(['c.id', 's.id']);
	const daysSince = sql<number>`(r.last_day - coalesce(r.last_refresh, r.started_on))`;
	const overdue = sql<number>`greatest(0, ${daysSince} - r.refresh_interval_days)`;
	return db
		.selectFrom(perColony.as('r'))
		.select([
			'r.code',
			'r.name',
			'r.common_name',
			'r.started_on',
			'r.last_refresh',
			'r.refresh_interval_days',
			daysSince.as('days_since'),
			overdue.as('days_overdue'),
			sql<number>`r.refreshes`.as('refreshes'),
			sql<number>`count(*) over ()`.as('colonies_total'),
			sql<number>`count(*) filter (where ${overdue} > 0) over ()`.as('overdue_total'),
			sql<number>`sum(r.refreshes) over ()`.as('refreshes_total')
		])
		.orderBy(sql`${overdue} desc`)
		.orderBy(sql`${daysSince} desc`)
		.orderBy('r.code')
		.execute();
}

async function moistureRows(db: Db, context: ReportContext, asOf: IsoDate, scope: ColonyScope) {
	const readings = activeColonies(db, context, asOf, scope)
		.innerJoin('care_log_entry as e', 'e.colony_id', 'c.id')
		.where('e.kind', '=', 'moisture_check')
		.where('e.logged_on', '>=', context.from)
		.where('e.logged_on', '<=', context.to)
		.select([
			sql<string>`to_char(e.logged_on, 'YYYY-MM')`.as('month'),
			sql<number>`count(*) filter (where e.moisture_reading = 'dry')`.as('dry'),
			sql<number>`count(*) filter (where e.moisture_reading = 'right')`.as('right'),
			sql<number>`count(*) filter (where e.moisture_reading = 'wet')`.as('wet')
		])
		.groupBy(sql`1`);
	return db
		.with('months', (qb) => qb.selectNoFrom(monthSeries(context).as('month')))
		.with('readings', () => readings)
		.selectFrom('months as m')
		.leftJoin('readings as r', 'r.month', 'm.month')
		.select([
			'm.month',
			sql<number>`coalesce(r.dry, 0)`.as('dry'),
			sql<number>`coalesce(r.right, 0)`.as('right'),
			sql<number>`coalesce(r.wet, 0)`.as('wet'),
			sql<number>`coalesce(r.dry + r.right + r.wet, 0)`.as('readings'),
			sql<number>`coalesce(sum(r.dry) over (), 0)`.as('dry_total'),
			sql<number>`coalesce(sum(r.right) over (), 0)`.as('right_total'),
			sql<number>`coalesce(sum(r.wet) over (), 0)`.as('wet_total')
		])
		.orderBy('m.month')
		.execute();
}

async function moltPestRows(db: Db, context: ReportContext, asOf: IsoDate, scope: ColonyScope) {
	return activeColonies(db, context, asOf, scope)
		.innerJoin('care_log_entry as e', 'e.colony_id', 'c.id')
		.where('e.kind', 'in', ['molt_seen', 'pest_note'])
		.where('e.logged_on', '>=', context.from)
		.where('e.logged_on', '<=', context.to)
		.select([
			'c.code',
			'c.name',
			's.common_name',
			sql<number>`count(*) filter (where e.kind = 'molt_seen')`.as('molts'),
			sql<number>`count(*) filter (where e.kind = 'pest_note')`.as('pests'),
			sql<IsoDate | null>`max(e.logged_on) filter (where e.kind = 'pest_note')`.as('last_pest_on'),
			sql<
				string | null
			>`(array_agg(e.note order by e.logged_on desc, e.id desc) filter (where e.kind = 'pest_note'))[1]`.as(
				'last_pest_note'
			),
			sql<number>`sum(count(*) filter (where e.kind = 'molt_seen')) over ()`.as('molts_total'),
			sql<number>`sum(count(*) filter (where e.kind = 'pest_note')) over ()`.as('pests_total')
		])
		.groupBy(['c.id', 's.id'])
		.orderBy('c.code')
		.execute();
}

export const colonyHealthReport: ReportRunner = async (context) => {
	const { db } = context;
	const asOf = colonyHealthAsOf(context.to, context.today);

	const { species, filter: speciesChoice } = await speciesFilter(context, {
		onlyWithColonies: true
	});
	// The colony list follows the species chosen, so a colony of another species reads as "all".
	const colonyRows = await activeColonies(db, context, asOf, {
		speciesId: species?.id ?? null,
		colonyId: null
	})
		.select(['c.id', 'c.code', 'c.name'])
		.orderBy('c.code')
		.execute();
	const colonyCode = chosen(
		context.params,
		'colony',
		colonyRows.map((c) => c.code)
	);
	const colony = colonyRows.find((c) => c.code === colonyCode) ?? null;
	const scope: ColonyScope = { speciesId: species?.id ?? null, colonyId: colony?.id ?? null };

	const filters: ReportFilter[] = [
		speciesChoice,
		{
			key: 'colony',
			label: 'Colony',
			value: colonyCode,
			options: [
				{ value: '', label: species ? `All ${species.common_name} colonies` : 'All colonies' },
				...colonyRows.map((c) => ({ value: c.code, label: colonyLabel(c.code, c.name) }))
			]
		}
	];

	const [refresh, moisture, moltsPests] = await Promise.all([
		refreshRows(db, context, asOf, scope),
		moistureRows(db, context, asOf, scope),
		moltPestRows(db, context, asOf, scope)
	]);
	const range = `${context.from} to ${context.to}`;
	const which = colony
		? `colony ${colony.code}`
		: species
			? `${species.common_name} colonies`
			: 'the colonies';
	const asOfWords = formatCell('date', asOf);

	const refreshSection: ReportSection = {
		id: 'refresh',
		title: 'Substrate refresh',
		lead: `As of ${asOfWords}: days since each colony's last half or full refresh beside its species' interval.`,
		chart: {
			kind: 'bar',
			horizontal: true,
			title: 'Days since the last substrate refresh, beside the refresh interval',
			summary: `Two bars per colony as of ${asOfWords}: days since its last refresh and the days its species goes between refreshes. A first bar longer than the second is overdue.`,
			labelKey: 'colony',
			series: [
				{ key: 'days_since', label: 'Days since refresh' },
				{ key: 'interval', label: 'Refresh interval' }
			],
			unit: 'days'
		},
		table: {
			caption: `Substrate refresh per colony as of ${asOfWords}`,
			columns: [
				{ key: 'colony', label: 'Colony', kind: 'text' },
				{ key: 'species', label: 'Species', kind: 'text' },
				{ key: 'last_refresh', label: 'Last refresh', kind: 'date' },
				{ key: 'counted_from', label: 'Counted from', kind: 'text' },
				{ key: 'days_since', label: 'Days since', kind: 'days' },
				{ key: 'interval', label: 'Interval', kind: 'days' },
				{ key: 'days_overdue', label: 'Overdue', kind: 'days' },
				{ key: 'refreshes', label: 'Refreshes in range', kind: 'count' }
			],
			rows: refresh.map((r): ReportRow => ({
				colony: colonyLabel(r.code, r.name),
				species: r.common_name,
				last_refresh: r.last_refresh,
				counted_from: r.last_refresh
					? 'Last refresh'
					: `Start on ${formatCell('date', r.started_on)} (never refreshed)`,
				days_since: Number(r.days_since),
				interval: r.refresh_interval_days,
				days_overdue: Number(r.days_overdue),
				refreshes: Number(r.refreshes)
			})),
			...(refresh[0]
				? {
						totals: {
							colony: `${refresh[0].colonies_total} ${refresh[0].colonies_total === 1 ? 'colony' : 'colonies'}, ${refresh[0].overdue_total} overdue`,
							refreshes: Number(refresh[0].refreshes_total)
						}
					}
				: {})
		},
		empty: `No ${colony ? `colony ${colony.code}` : species ? `${species.common_name} colony` : 'colony'} was kept from ${range}.`
	};

	const moistureTotals = moisture[0];
	const readingsTotal = moistureTotals
		? Number(moistureTotals.dry_total) +
			Number(moistureTotals.right_total) +
			Number(moistureTotals.wet_total)
		: 0;
	const moistureSection: ReportSection = {
		id: 'moisture',
		title: 'Moisture checks',
		lead: 'Squeeze-test readings from the care log, month by month. Common practice: at least half the enclosure should read right.',
		chart: {
			kind: 'stacked',
			title: 'Moisture readings by month',
			summary: `One bar per month from ${range}, split into readings too dry, right and too wet for ${which}.`,
			labelKey: 'month',
			series: [
				{ key: 'dry', label: 'Too dry' },
				{ key: 'right', label: 'Right' },
				{ key: 'wet', label: 'Too wet' }
			],
			unit: 'count'
		},
		table: {
			caption: 'Moisture readings by month',
			columns: [
				{ key: 'month', label: 'Month', kind: 'month' },
				{ key: 'dry', label: 'Too dry', kind: 'count' },
				{ key: 'right', label: 'Right', kind: 'count' },
				{ key: 'wet', label: 'Too wet', kind: 'count' },
				{ key: 'readings', label: 'Checks', kind: 'count' },
				{ key: 'share_right', label: 'Read right', kind: 'percent' }
			],
			// Months of zeros alone would draw an empty chart: say so in words instead.
			rows:
				readingsTotal === 0
					? []
					: moisture.map((m): ReportRow => ({
							month: m.month,
							dry: Number(m.dry),
							right: Number(m.right),
							wet: Number(m.wet),
							readings: Number(m.readings),
							share_right: fraction(Number(m.right), Number(m.readings))
						})),
			...(moistureTotals && readingsTotal > 0
				? {
						totals: {
							month: 'All months',
							dry: Number(moistureTotals.dry_total),
							right: Number(moistureTotals.right_total),
							wet: Number(moistureTotals.wet_total),
							readings: readingsTotal,
							share_right: fraction(Number(moistureTotals.right_total), readingsTotal)
						}
					}
				: {})
		},
		empty: `No moisture check was logged for ${which} from ${range}.`
	};

	const moltsPestsSection: ReportSection = {
		id: 'molts-pests',
		title: 'Molts and pest notes',
		lead: 'Colonies with a molt seen or a pest noted in the range, with the latest pest note.',
		chart: {
			kind: 'bar',
			horizontal: true,
			title: 'Molts seen and pest notes per colony',
			summary: `Two bars per colony from ${range}: molts seen and pest notes logged.`,
			labelKey: 'colony',
			series: [
				{ key: 'molts', label: 'Molts seen' },
				{ key: 'pests', label: 'Pest notes' }
			],
			unit: 'count'
		},
		table: {
			caption: 'Molts seen and pest notes per colony',
			columns: [
				{ key: 'colony', label: 'Colony', kind: 'text' },
				{ key: 'species', label: 'Species', kind: 'text' },
				{ key: 'molts', label: 'Molts seen', kind: 'count' },
				{ key: 'pests', label: 'Pest notes', kind: 'count' },
				{ key: 'last_pest_on', label: 'Latest pest note', kind: 'date' },
				{ key: 'last_pest_note', label: 'It said', kind: 'text' }
			],
			rows: moltsPests.map((r): ReportRow => ({
				colony: colonyLabel(r.code, r.name),
				species: r.common_name,
				molts: Number(r.molts),
				pests: Number(r.pests),
				last_pest_on: r.last_pest_on,
				last_pest_note: r.last_pest_note
			})),
			...(moltsPests[0]
				? {
						totals: {
							colony: 'All colonies',
							molts: Number(moltsPests[0].molts_total),
							pests: Number(moltsPests[0].pests_total)
						}
					}
				: {})
		},
		empty: `No molt seen or pest note was logged for ${which} from ${range}.`
	};

	return {
		filters,
		sections: [refreshSection, moistureSection, moltsPestsSection],
		notes: [
			`Refresh figures are as of ${asOfWords}: the range's last day, or today when the range runs past it.`,
			'A refresh is a half or full substrate refresh in the care log. Days since count from the last one on or before that day; a colony never refreshed counts from the day it was started, and the table says so.',
			"Overdue is the days since less the species' refresh interval, 0 while not yet due. A colony retired in the range is counted up to its retirement day.",
			'A colony counts when it was started by that day and not retired before the range began.',
			'Moisture checks, molts seen and pest notes count on the day they were logged, from the first day of the range to the last, both included.'
		]
	};
};
