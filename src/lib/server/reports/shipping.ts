// Shipping: boxes out per week with their packs, the days orders sat on weather hold,
// claims and how they ended, and dead-on-arrival rates by service and by the climate
// the box went into. Weeks are ISO weeks (Monday first) in the shop's zone. Every figure
// is summed in PostgreSQL; the climate regions join as a VALUES list.
import { sql, type Expression, type SqlBool } from 'kysely';
import { claimStateLabels, serviceLabels } from '$lib/format/labels';
import type {
	ReportColumn,
	ReportFilter,
	ReportRow,
	ReportSection,
	ReportTable
} from '$lib/reports/report';
import type { ClaimState, Service } from '$lib/server/db/schema';
import { OUTSIDE_REGIONS, climateRegionRows, CLIMATE_REGIONS } from '$lib/shipping/climate-regions';
import {
	chosen,
	fraction,
	rangeEnd,
	rangeStart,
	type ReportContext,
	type ReportRunner
} from './context';

const SERVICES = Object.keys(serviceLabels) as Service[];
const OUTCOMES = Object.keys(claimStateLabels) as ClaimState[];

/**
 * The service filter as a condition on an order id column: a semi-join when one service
 * is chosen, nothing at all when all are, so the unfiltered report joins no orders.
 */
function ofService(orderIdColumn: string, service: Service | ''): Expression<SqlBool> {
	return service === ''
		? sql<SqlBool>`true`
		: sql<SqlBool>`${sql.ref(orderIdColumn)} in (select id from customer_order where service = ${service})`;
}

/** The Monday (a date) of the shop-zone ISO week a timestamptz column falls in. */
function mondayOf(column: string, timeZone: string) {
	return sql<string>`date_trunc('week', ${sql.ref(column)} at time zone ${timeZone})::date`;
}

interface WeekFigures {
	week: string | null;
	boxes: number;
	heat: number;
	cold: number;
	held_days: number;
	claims: number;
}

/**
 * One row per week of the range (Mondays, zero when quiet) and a closing rollup row
 * (week null). Boxes, holds and claims come as one stream of marks, one row each, summed
 * once: joining three grouped tables instead makes the planner expect millions of rows
 * and spend a second compiling the query. A hold starts when an order moves onto
 * weather_hold from another state and lasts until its next move off it; a note written
 * while held does not end it.
 */
async function weeklyFigures(
	context: ReportContext,
	service: Service | ''
): Promise<WeekFigures[]> {
	const { db, timeZone } = context;
	const start = rangeStart(context);
	const end = rangeEnd(context);
	const zero = sql<number>`0`;
	const weeks = db.selectNoFrom([
		sql<string>`generate_series(date_trunc('week', ${context.from}::date::timestamp), ${context.to}::date::timestamp, interval '1 week')::date`.as(
			'monday'
		),
		zero.as('boxes'),
		zero.as('heat'),
		zero.as('cold'),
		zero.as('held_days'),
		zero.as('claims')
	]);
	const shipped = db
		.selectFrom('shipment as s')
		.where('s.shipped_at', '>=', start)
		.where('s.shipped_at', '<', end)
		.where(ofService('s.order_id', service))
		.select([
			mondayOf('s.shipped_at', timeZone).as('monday'),
			sql<number>`1`.as('boxes'),
			sql<number>`('heat' = any(s.packs))::int`.as('heat'),
			sql<number>`('cold' = any(s.packs))::int`.as('cold'),
			zero.as('held_days'),
			zero.as('claims')
		]);
	const held = db
		.selectFrom('order_event as h')
		.leftJoinLateral(
			(eb) =>
				eb
					.selectFrom('order_event as e')
					.select('e.created_at')
					.whereRef('e.order_id', '=', 'h.order_id')
					.where('e.to_state', '<>', 'weather_hold')
					// Events of one transaction share created_at; the id keeps their order.
					.where(sql<SqlBool>`(e.created_at, e.id) > (h.created_at, h.id)`)
					.orderBy('e.created_at')
					.orderBy('e.id')
					.limit(1)
					.as('lifted'),
			(join) => join.onTrue()
		)
		.where('h.to_state', '=', 'weather_hold')
		.where('h.from_state', 'is distinct from', 'weather_hold')
		.where('h.created_at', '>=', start)
		.where('h.created_at', '<', end)
		.where(ofService('h.order_id', service))
		.select([
			mondayOf('h.created_at', timeZone).as('monday'),
			zero.as('boxes'),
			zero.as('heat'),
			zero.as('cold'),
			// Whole calendar days in the shop's zone; a hold still on runs to today.
			sql<number>`greatest(0, coalesce((lifted.created_at at time zone ${timeZone})::date, ${context.today}::date)
				- (h.created_at at time zone ${timeZone})::date)`.as('held_days'),
			zero.as('claims')
		]);
	const filed = db
		.selectFrom('claim as c')
		.where('c.filed_at', '>=', start)
		.where('c.filed_at', '<', end)
		.where(ofService('c.order_id', service))
		.select([
			mondayOf('c.filed_at', timeZone).as('monday'),
			zero.as('boxes'),
			zero.as('heat'),
			zero.as('cold'),
			zero.as('held_days'),
			sql<number>`1`.as('claims')
		]);
	return db
		.selectFrom(weeks.unionAll(shipped).unionAll(held).unionAll(filed).as('mark'))
		.select([
			sql<string | null>`to_char(mark.monday, 'YYYY-MM-DD')`.as('week'),
			sql<number>`sum(mark.boxes)::bigint`.as('boxes'),
			sql<number>`sum(mark.heat)::bigint`.as('heat'),
			sql<number>`sum(mark.cold)::bigint`.as('cold'),
			sql<number>`sum(mark.held_days)::bigint`.as('held_days'),
			sql<number>`sum(mark.claims)::bigint`.as('claims')
		])
		.groupBy(sql`rollup(mark.monday)`)
		.orderBy(sql`mark.monday nulls last`)
		.execute();
}

interface OutcomeFigures {
	state: ClaimState | null;
	claims: number;
	dead: number;
	refunded_cents: number;
}

/** Claims filed in the range by where they stand now: all four outcomes, then the total. */
async function claimFigures(
	context: ReportContext,
	service: Service | ''
): Promise<OutcomeFigures[]> {
	const { db } = context;
	const outcomes = sql<{ state: ClaimState; position: number }>`(values ${sql.join(
		OUTCOMES.map((state, position) => sql`(${state}::text, ${position}::int)`)
	)})`.as<'outcome'>(sql`outcome(state, position)`);
	const filed = db
		.selectFrom('claim as c')
		.leftJoin('refund as r', (join) =>
			join.onRef('r.id', '=', 'c.refund_id').on('r.status', '=', 'succeeded')
		)
		.where('c.filed_at', '>=', rangeStart(context))
		.where('c.filed_at', '<', rangeEnd(context))
		.where(ofService('c.order_id', service))
		.select([
			'c.id',
			'c.state',
			sql<number>`(select coalesce(sum(cl.dead_count), 0) from claim_line cl where cl.claim_id = c.id)`.as(
				'dead'
			),
			sql<number>`coalesce(r.amount_cents, 0)`.as('refunded_cents')
		])
		.as('filed');
	return db
		.selectFrom(outcomes)
		.leftJoin(filed, 'filed.state', 'outcome.state')
		.select([
			sql<ClaimState | null>`outcome.state`.as('state'),
			sql<number>`count(filed.id)`.as('claims'),
			sql<number>`coalesce(sum(filed.dead), 0)::bigint`.as('dead'),
			sql<number>`coalesce(sum(filed.refunded_cents), 0)::bigint`.as('refunded_cents')
		])
		.groupBy(sql`rollup((outcome.position, outcome.state))`)
		.orderBy(sql`outcome.position nulls last`)
		.execute();
}

interface DoaFigures {
	/** The service code, or null on region rows and the total. */
	service: Service | null;
	/** The climate region's name, or null on service rows and the total. */
	region: string | null;
	boxes: number;
	animals: number;
	dead: number;
}

/**
 * Boxes shipped in the range with the live animals packed in them and the dead reported
 * on claims that were not declined (whenever filed), summed per service, per climate
 * region of the ship-to state, and in all. Each of the three sums is grouped by service
 * and region on its own first, so no box counts once per line; grouping sets then give
 * the per-service rows, the per-region rows and the total from those few rows.
 */
async function doaFigures(context: ReportContext, service: Service | ''): Promise<DoaFigures[]> {
	const { db } = context;
	const regions = () =>
		sql<{ state: string; name: string; position: number }>`(values ${sql.join(
			climateRegionRows().map((r) => sql`(${r.state}::text, ${r.name}::text, ${r.position}::int)`)
		)})`.as<'region'>(sql`region(state, name, position)`);
	// The boxes of the range with the keys they are grouped by.
	const shipped = () =>
		db
			.selectFrom('shipment as s')
			.innerJoin('customer_order as o', 'o.id', 's.order_id')
			.leftJoin(regions(), (join) => join.on(sql<SqlBool>`region.state = o.ship_state::text`))
			.where('s.shipped_at', '>=', rangeStart(context))
			.where('s.shipped_at', '<', rangeEnd(context))
			.$if(service !== '', (qb) => qb.where('o.service', '=', service as Service));
	const keys = [
		sql<Service>`o.service`.as('service'),
		sql<string>`coalesce(region.name, ${OUTSIDE_REGIONS.name})`.as('region'),
		sql<number>`coalesce(region.position, ${CLIMATE_REGIONS.length}::int)`.as('position')
	] as const;
	return db
		.with('boxes', () =>
			shipped()
				.select([...keys, sql<number>`count(*)`.as('boxes')])
				.groupBy([sql`1`, sql`2`, sql`3`])
		)
		.with('packed', () =>
			shipped()
				.innerJoin('order_line as ol', 'ol.order_id', 's.order_id')
				.where('ol.is_live', '=', true)
				.select([
					...keys,
					sql<number>`sum((ol.quantity - ol.restocked_quantity) * ol.unit_size)`.as('animals')
				])
				.groupBy([sql`1`, sql`2`, sql`3`])
		)
		.with('reported', () =>
			shipped()
				.innerJoin('claim as c', 'c.order_id', 's.order_id')
				.innerJoin('claim_line as cl', 'cl.claim_id', 'c.id')
				.where('c.state', '<>', 'declined')
				.select([...keys, sql<number>`sum(cl.dead_count)`.as('dead')])
				.groupBy([sql`1`, sql`2`, sql`3`])
		)
		.selectFrom('boxes as b')
		.leftJoin('packed as p', (join) =>
			join.onRef('p.service', '=', 'b.service').onRef('p.region', '=', 'b.region')
		)
		.leftJoin('reported as d', (join) =>
			join.onRef('d.service', '=', 'b.service').onRef('d.region', '=', 'b.region')
		)
		.select([
			sql<Service | null>`b.service`.as('service'),
			sql<string | null>`b.region`.as('region'),
			sql<number>`coalesce(sum(b.boxes), 0)::bigint`.as('boxes'),
			sql<number>`coalesce(sum(p.animals), 0)::bigint`.as('animals'),
			sql<number>`coalesce(sum(d.dead), 0)::bigint`.as('dead')
		])
		.groupBy(sql`grouping sets ((b.service), (b.position, b.region), ())`)
		.orderBy(sql`b.service nulls last, b.position nulls last`)
		.execute();
}

/** A table's rows and its closing row; no closing row under a table with no rows. */
function rowsAndTotals(
	rows: ReportRow[],
	totals: ReportRow | undefined
): Pick<ReportTable, 'rows' | 'totals'> {
	return rows.length > 0 && totals ? { rows, totals } : { rows };
}

function doaRow(row: DoaFigures, labelKey: string, label: string): ReportRow {
	return {
		[labelKey]: label,
		boxes: row.boxes,
		animals: row.animals,
		dead: row.dead,
		rate: fraction(row.dead, row.animals)
	};
}

const doaColumns = (labelKey: string, label: string): ReportColumn[] => [
	{ key: labelKey, label, kind: 'text' },
	{ key: 'boxes', label: 'Boxes shipped', kind: 'count' },
	{ key: 'animals', label: 'Live animals shipped', kind: 'count' },
	{ key: 'dead', label: 'Dead reported', kind: 'count' },
	{ key: 'rate', label: 'DOA rate', kind: 'percent' }
];

export const shippingReport: ReportRunner = async (context) => {
	const service = chosen(context.params, 'service', SERVICES) as Service | '';
	const filters: ReportFilter[] = [
		{
			key: 'service',
			label: 'Service',
			value: service,
			options: [
				{ value: '', label: 'Overnight and two-day' },
				...SERVICES.map((s) => ({ value: s, label: serviceLabels[s] }))
			]
		}
	];

	const [weeks, outcomes, doa] = await Promise.all([
		weeklyFigures(context, service),
		claimFigures(context, service),
		doaFigures(context, service)
	]);
	const range = `${context.from} to ${context.to}`;
	// "No box", "No overnight box", "No two-day box": the filter said in the empty sentences.
	const box = service === '' ? 'box' : `${serviceLabels[service].toLowerCase()} box`;

	const weekRows = weeks.filter((w) => w.week !== null);
	const weekTotals = weeks.find((w) => w.week === null);
	const quiet =
		!weekTotals ||
		(weekTotals.boxes === 0 && weekTotals.held_days === 0 && weekTotals.claims === 0);
	const weekly: ReportSection = {
		id: 'weekly',
		title: 'Week by week',
		lead: 'Boxes handed to the carrier, the packs they took, days orders waited on weather hold, and claims filed.',
		chart: {
			kind: 'bar',
			title: 'Boxes shipped and days on weather hold, by week',
			summary: `Two bars per week from ${range}: boxes shipped, and days orders spent on weather hold (counted in the week the hold began).`,
			labelKey: 'week',
			series: [
				{ key: 'boxes', label: 'Boxes shipped' },
				{ key: 'held_days', label: 'Days on weather hold' }
			],
			unit: 'count'
		},
		table: {
			caption: 'Shipping by week',
			columns: [
				{ key: 'week', label: 'Week', kind: 'week' },
				{ key: 'boxes', label: 'Boxes shipped', kind: 'count' },
				{ key: 'heat', label: 'With heat pack', kind: 'count' },
				{ key: 'cold', label: 'With cold pack', kind: 'count' },
				{ key: 'held_days', label: 'Days on weather hold', kind: 'days' },
				{ key: 'claims', label: 'Claims filed', kind: 'count' }
			],
			...rowsAndTotals(
				quiet ? [] : weekRows.map((w) => ({ ...w })),
				weekTotals && { ...weekTotals, week: 'All weeks' }
			)
		},
		empty: `No ${box} was shipped, held for weather or claimed from ${range}.`
	};

	const outcomeRows = outcomes.filter((o) => o.state !== null);
	const outcomeTotals = outcomes.find((o) => o.state === null);
	const claimRow = (o: OutcomeFigures, outcome: string): ReportRow => ({
		outcome,
		claims: o.claims,
		dead: o.dead,
		...(context.money ? { refunded_cents: o.refunded_cents } : {})
	});
	const claims: ReportSection = {
		id: 'claims',
		title: 'Claims and their outcome',
		lead: 'Claims filed in the range, by where each stands now.',
		chart: {
			kind: 'bar',
			title: 'Claims by outcome',
			summary: `One bar per outcome (open, refunded, reshipped, declined) for claims filed from ${range}.`,
			labelKey: 'outcome',
			series: [{ key: 'claims', label: 'Claims' }],
			unit: 'count'
		},
		table: {
			caption: 'Claims by outcome',
			columns: [
				{ key: 'outcome', label: 'Outcome', kind: 'text' },
				{ key: 'claims', label: 'Claims', kind: 'count' },
				{ key: 'dead', label: 'Dead animals', kind: 'count' },
				...(context.money
					? [{ key: 'refunded_cents', label: 'Refunded', kind: 'cents', money: true } as const]
					: [])
			],
			...rowsAndTotals(
				outcomeTotals && outcomeTotals.claims > 0
					? outcomeRows.map((o) => claimRow(o, claimStateLabels[o.state!]))
					: [],
				outcomeTotals && claimRow(outcomeTotals, 'All claims')
			)
		},
		empty: `No claim was filed on any ${box} from ${range}.`
	};

	const serviceRows = doa.filter((r) => r.service !== null);
	const doaTotals = doa.find((r) => r.service === null && r.region === null);
	const doaService: ReportSection = {
		id: 'doa-service',
		title: 'Dead on arrival by service',
		lead: 'Boxes shipped in the range, and the animals reported dead in them.',
		chart: {
			kind: 'bar',
			title: 'DOA rate by service',
			summary: `One bar per service for boxes shipped from ${range}: the share of live animals reported dead on arrival.`,
			labelKey: 'service',
			series: [{ key: 'rate', label: 'DOA rate' }],
			unit: 'percent'
		},
		table: {
			caption: 'Dead on arrival by service',
			columns: doaColumns('service', 'Service'),
			...rowsAndTotals(
				serviceRows.map((r) => doaRow(r, 'service', serviceLabels[r.service!])),
				doaTotals && doaRow(doaTotals, 'service', 'All services')
			)
		},
		empty: `No ${box} was shipped from ${range}.`
	};

	const climateRows = doa.filter((r) => r.region !== null);
	const doaClimate: ReportSection = {
		id: 'doa-climate',
		title: 'Dead on arrival by climate region',
		lead: "Where the boxes went, by NOAA NCEI's nine climate regions of the contiguous US.",
		chart: {
			kind: 'bar',
			horizontal: true,
			title: 'DOA rate by climate region',
			summary: `One bar per climate region that boxes went to from ${range}: the share of live animals reported dead on arrival.`,
			labelKey: 'region',
			series: [{ key: 'rate', label: 'DOA rate' }],
			unit: 'percent'
		},
		table: {
			caption: 'Dead on arrival by climate region',
			columns: doaColumns('region', 'Climate region'),
			...rowsAndTotals(
				climateRows.map((r) => doaRow(r, 'region', r.region!)),
				doaTotals && doaRow(doaTotals, 'region', 'All regions')
			)
		},
		empty: `No ${box} was shipped from ${range}.`
	};

	return {
		filters,
		sections: [weekly, claims, doaService, doaClimate],
		notes: [
			`Weeks run Monday to Sunday in the shop's time zone (${context.timeZone}). A box counts in the week it was marked shipped, a claim in the week it was filed.`,
			'Heat and cold packs count the boxes that went out with one.',
			'Days on weather hold run from the day an order was put on hold to the day it next changed state, in whole calendar days; a hold still on counts to today. They count in the week the hold began, even when the hold ran past the range.',
			'Claims are grouped by where they stand now. Dead animals are what the customer reported; refunded is the claim’s refund that went through.',
			'DOA rate: animals reported dead on claims that were not declined, over the live animals packed in the boxes shipped in the range (a group of 10 counted as 10, less any put back into stock). A claim filed after the range still counts against its box.',
			"Climate regions are NOAA NCEI's nine regions of the contiguous US, by the ship-to state. DC counts with the Northeast; Alaska and Hawaii count as outside the contiguous US."
		]
	};
};
