// Sales: animals sold, revenue, refunds and net, by month and by species. A sale counts
// in the month its card payment succeeded (payment.updated_at: nothing writes a
// succeeded payment again), a refund in the month it was issued, both in the shop's zone.
// Revenue is what the payments took, so the report's net over any range equals the
// payments less the succeeded refunds in that range, to the cent.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type { ReportColumn, ReportFilter, ReportRow, ReportSection } from '$lib/reports/report';
import {
	monthSeries,
	rangeEnd,
	rangeStart,
	rangeWords,
	speciesFilter,
	type ReportContext,
	type ReportRunner
} from './context';

/** The row key of a species' column in the month × species table. */
const speciesKey = (slug: string) => `species:${slug}`;

/** Payments that succeeded in the range, with the month they count in. */
function paidInRange(db: Db, context: ReportContext) {
	return db
		.selectFrom('payment as p')
		.where('p.status', '=', 'succeeded')
		.where('p.updated_at', '>=', rangeStart(context))
		.where('p.updated_at', '<', rangeEnd(context))
		.select([
			'p.order_id',
			'p.amount_cents',
			sql<string>`to_char(p.updated_at at time zone ${context.timeZone}, 'YYYY-MM')`.as('month')
		]);
}

/**
 * Succeeded refunds issued in the range, split over species: a refund for lines is
 * shared out by each line's price share (scaled down when the refund is smaller than
 * the lines' worth); what is not tied to a species line (shipping, a free amount, the
 * cents rounding leaves) has species_id null and is_live null.
 */
function refundSharesInRange(db: Db, context: ReportContext) {
	const lineShares = db
		.selectFrom('refund as r')
		.innerJoin('refund_line as rl', 'rl.refund_id', 'r.id')
		.innerJoin('order_line as ol', 'ol.id', 'rl.order_line_id')
		.where('r.status', '=', 'succeeded')
		.where('r.created_at', '>=', rangeStart(context))
		.where('r.created_at', '<', rangeEnd(context))
		.select([
			'r.id as refund_id',
			'r.amount_cents',
			'r.created_at',
			'ol.species_id',
			'ol.is_live',
			// Integer division: whole cents, rounded down.
			sql<number>`ol.line_total_cents * rl.quantity / ol.quantity`.as('share')
		]);
	const scaled = db
		.with('line_value', () => lineShares)
		.selectFrom('line_value')
		.select([
			'refund_id',
			'species_id',
			'is_live',
			'created_at',
			sql<number>`case when sum(share) over (partition by refund_id) > amount_cents
				then share * amount_cents / sum(share) over (partition by refund_id) else share end`.as(
				'attributed'
			)
		]);
	return { lineShares, scaled };
}

export const salesReport: ReportRunner = async (context) => {
	const { timeZone } = context;
	const { species: onlySpecies, filter: speciesChoice } = await speciesFilter(context, {
		allLabel: 'All species, supplies and shipping'
	});
	const filters: ReportFilter[] = [speciesChoice];

	const [byMonth, bySpecies, monthBySpecies] = await Promise.all([
		salesByMonth(context, onlySpecies?.id ?? null),
		salesBySpecies(context, onlySpecies?.id ?? null),
		animalsByMonthAndSpecies(context, onlySpecies?.id ?? null)
	]);
	const range = rangeWords(context);
	const what = onlySpecies ? onlySpecies.common_name : 'anything';

	const moneyColumns: ReportColumn[] = [
		{ key: 'revenue', label: 'Revenue', kind: 'cents', money: true },
		{ key: 'refunds', label: 'Refunds', kind: 'cents', money: true },
		{ key: 'net', label: 'Net', kind: 'cents', money: true }
	];
	const monthSection: ReportSection = {
		id: 'by-month',
		title: 'By month',
		lead: !context.money
			? 'Live animals sold on paid orders.'
			: onlySpecies
				? `${onlySpecies.common_name} only: revenue is the price of its lines, refunds their share.`
				: 'Revenue is what the card payments took, shipping included.',
		chart: context.money
			? {
					kind: 'bar',
					title: 'Revenue, refunds and net by month',
					summary: `One group of bars per month from ${range}: revenue, refunds and net in US dollars.`,
					labelKey: 'month',
					series: [
						{ key: 'revenue', label: 'Revenue' },
						{ key: 'refunds', label: 'Refunds' },
						{ key: 'net', label: 'Net' }
					],
					unit: 'cents'
				}
			: {
					kind: 'bar',
					title: 'Animals sold by month',
					summary: `One bar per month from ${range}: live animals sold.`,
					labelKey: 'month',
					series: [{ key: 'animals', label: 'Animals sold' }],
					unit: 'count'
				},
		table: {
			caption: 'Sales by month',
			columns: [
				{ key: 'month', label: 'Month', kind: 'month' },
				{ key: 'orders', label: 'Orders paid', kind: 'count' },
				{ key: 'animals', label: 'Animals sold', kind: 'count' },
				...moneyColumns
			],
			rows: byMonth.rows,
			totals: byMonth.totals
		},
		empty: `Nothing was paid for or refunded from ${range}.`
	};
	if (byMonth.rows.every((row) => row.orders === 0 && row.refunds === 0)) {
		monthSection.table.rows = [];
	}

	const speciesSection: ReportSection = {
		id: 'by-species',
		title: 'By species',
		lead:
			onlySpecies || !context.money
				? undefined
				: 'Supplies and shipping have rows of their own, so the rows add up to the payments.',
		chart: {
			kind: 'bar',
			horizontal: true,
			title: context.money ? 'Net revenue by species' : 'Animals sold by species',
			summary: context.money
				? `One bar per species (and supplies and shipping) from ${range}: revenue less refunds, in US dollars.`
				: `One bar per species from ${range}: live animals sold.`,
			labelKey: 'name',
			series: context.money
				? [{ key: 'net', label: 'Net' }]
				: [{ key: 'animals', label: 'Animals sold' }],
			unit: context.money ? 'cents' : 'count'
		},
		table: {
			caption: 'Sales by species',
			columns: [
				{ key: 'name', label: 'Species', kind: 'text' },
				{ key: 'orders', label: 'Orders', kind: 'count' },
				{ key: 'animals', label: 'Animals sold', kind: 'count' },
				...moneyColumns
			],
			rows: bySpecies.rows,
			totals: bySpecies.totals
		},
		empty: `No sale of ${what} from ${range}.`
	};

	const speciesInGrid = monthBySpecies.species;
	const gridSection: ReportSection = {
		id: 'animals-by-month-and-species',
		title: 'Animals sold by month and species',
		chart:
			speciesInGrid.length > 0
				? {
						kind: 'stacked',
						title: 'Animals sold by month, stacked by species',
						summary: `One bar per month from ${range}, split into the species sold.`,
						labelKey: 'month',
						series: speciesInGrid.map((s) => ({ key: speciesKey(s.slug), label: s.common_name })),
						unit: 'count'
					}
				: null,
		table: {
			caption: 'Animals sold by month and species',
			columns: [
				{ key: 'month', label: 'Month', kind: 'month' },
				...speciesInGrid.map((s): ReportColumn => ({
					key: speciesKey(s.slug),
					label: s.common_name,
					kind: 'count'
				}))
			],
			rows: speciesInGrid.length > 0 ? monthBySpecies.rows : []
		},
		empty: `No live animal was sold from ${range}.`
	};

	return {
		filters,
		sections: [monthSection, speciesSection, gridSection],
		notes: [
			`A sale counts in the month its card payment went through, in the shop's time zone (${timeZone}). A refund counts in the month it was issued.`,
			'Animals sold are live animals on paid orders, a group of 10 counted as 10, less any put back into stock by a refund.',
			'Net is revenue less refunds. Over the whole range it equals the card payments less the refunds that went through.',
			'A refund for particular lines is shared out over their species by price; shipping and amounts not tied to a line count under "Shipping and other". No-charge reships are not sales.'
		]
	};
};

/** Month rows (every month of the range, zero when quiet) and their totals. */
async function salesByMonth(
	context: ReportContext,
	speciesId: number | null
): Promise<{ rows: ReportRow[]; totals: ReportRow }> {
	const { db } = context;
	const { scaled } = refundSharesInRange(db, context);
	const refundsAll = db
		.selectFrom('refund as r')
		.where('r.status', '=', 'succeeded')
		.where('r.created_at', '>=', rangeStart(context))
		.where('r.created_at', '<', rangeEnd(context))
		.select([
			sql<string>`to_char(r.created_at at time zone ${context.timeZone}, 'YYYY-MM')`.as('month'),
			sql<number>`sum(r.amount_cents)`.as('refunds')
		])
		.groupBy(sql`1`);

	const rows = await db
		.with('months', (qb) => qb.selectNoFrom(monthSeries(context).as('month')))
		.with('paid', () => paidInRange(db, context))
		.with('sold', (qb) =>
			qb
				.selectFrom('paid')
				.innerJoin('order_line as ol', 'ol.order_id', 'paid.order_id')
				.$if(speciesId !== null, (q) => q.where('ol.species_id', '=', speciesId))
				.select([
					'paid.month',
					sql<number>`count(distinct paid.order_id)`.as('orders'),
					sql<number>`coalesce(sum((ol.quantity - ol.restocked_quantity) * ol.unit_size) filter (where ol.is_live), 0)`.as(
						'animals'
					),
					sql<number>`sum(ol.line_total_cents)`.as('line_revenue')
				])
				.groupBy('paid.month')
		)
		.with('takings', (qb) =>
			qb
				.selectFrom('paid')
				.select([
					'paid.month',
					sql<number>`count(*)`.as('orders'),
					sql<number>`sum(paid.amount_cents)`.as('revenue')
				])
				.groupBy('paid.month')
		)
		.with('refunded', (qb) =>
			speciesId === null
				? qb.selectFrom(refundsAll.as('all_refunds')).selectAll()
				: qb
						.selectFrom(
							scaled
								.select(
									sql<string>`to_char(created_at at time zone ${context.timeZone}, 'YYYY-MM')`.as(
										'month'
									)
								)
								.as('species_share')
						)
						.where('species_share.species_id', '=', speciesId)
						.select([
							'species_share.month',
							sql<number>`sum(species_share.attributed)`.as('refunds')
						])
						.groupBy('species_share.month')
		)
		.selectFrom('months')
		.leftJoin('sold', 'sold.month', 'months.month')
		.leftJoin('takings', 'takings.month', 'months.month')
		.leftJoin('refunded', 'refunded.month', 'months.month')
		.select([
			'months.month',
			sql<number>`coalesce(${speciesId === null ? sql`takings.orders` : sql`sold.orders`}, 0)`.as(
				'orders'
			),
			sql<number>`coalesce(sold.animals, 0)`.as('animals'),
			sql<number>`coalesce(${speciesId === null ? sql`takings.revenue` : sql`sold.line_revenue`}, 0)`.as(
				'revenue'
			),
			sql<number>`coalesce(refunded.refunds, 0)`.as('refunds')
		])
		.orderBy('months.month')
		.execute();

	const shaped = rows.map((row) => ({
		month: row.month,
		orders: Number(row.orders),
		animals: Number(row.animals),
		revenue: Number(row.revenue),
		refunds: Number(row.refunds),
		net: Number(row.revenue) - Number(row.refunds)
	}));
	return { rows: shaped, totals: totalsOf(shaped, 'All months', 'month') };
}

/** Species rows (then supplies, then shipping and other), largest revenue first. */
async function salesBySpecies(
	context: ReportContext,
	speciesId: number | null
): Promise<{ rows: ReportRow[]; totals: ReportRow }> {
	const { db } = context;
	const { scaled } = refundSharesInRange(db, context);
	// Every refund in the range, by what it is tied to; the part of a refund its lines
	// do not account for goes to "shipping and other".
	const rows = await db
		.with('paid', () => paidInRange(db, context))
		.with('line_share', () => scaled)
		.with('sold', (qb) =>
			qb
				.selectFrom('paid')
				.innerJoin('order_line as ol', 'ol.order_id', 'paid.order_id')
				.select([
					sql<string>`case when ol.species_id is not null then 'species' else 'supplies' end`.as(
						'bucket'
					),
					'ol.species_id',
					sql<number>`count(distinct paid.order_id)`.as('orders'),
					sql<number>`coalesce(sum((ol.quantity - ol.restocked_quantity) * ol.unit_size) filter (where ol.is_live), 0)`.as(
						'animals'
					),
					sql<number>`sum(ol.line_total_cents)`.as('revenue')
				])
				.groupBy([sql`1`, 'ol.species_id'])
		)
		.with('shipping', (qb) =>
			qb.selectFrom('paid').select([
				sql<string>`'shipping'`.as('bucket'),
				sql<number | null>`null::integer`.as('species_id'),
				sql<number>`count(*)`.as('orders'),
				sql<number>`0`.as('animals'),
				// What the payments took beyond their lines (shipping, in practice): all that
				// was paid less the line revenue 'sold' already summed.
				sql<number>`coalesce(sum(paid.amount_cents), 0) - coalesce((select sum(revenue) from sold), 0)`.as(
					'revenue'
				)
			])
		)
		.with('refund_by_bucket', (qb) =>
			qb
				.selectFrom('line_share')
				.select([
					sql<string>`case when species_id is not null then 'species' else 'supplies' end`.as(
						'bucket'
					),
					'species_id',
					sql<number>`sum(attributed)`.as('refunds')
				])
				.groupBy([sql`1`, 'species_id'])
		)
		.with('refund_rest', (qb) =>
			qb
				.selectFrom('refund as r')
				.where('r.status', '=', 'succeeded')
				.where('r.created_at', '>=', rangeStart(context))
				.where('r.created_at', '<', rangeEnd(context))
				.select(
					sql<number>`coalesce(sum(r.amount_cents), 0) - coalesce((select sum(attributed) from line_share), 0)`.as(
						'refunds'
					)
				)
		)
		.with('buckets', (qb) =>
			qb
				.selectFrom('sold')
				.select(['bucket', 'species_id'])
				.union(qb.selectFrom('refund_by_bucket').select(['bucket', 'species_id']))
				.union(
					qb.selectNoFrom([
						sql<string>`'shipping'`.as('bucket'),
						sql<number | null>`null::integer`.as('species_id')
					])
				)
		)
		.selectFrom('buckets as b')
		.leftJoin('species as s', 's.id', 'b.species_id')
		.select([
			'b.bucket',
			's.common_name',
			sql<number>`coalesce(case when b.bucket = 'shipping' then (select orders from shipping)
				else (select orders from sold where sold.bucket = b.bucket and sold.species_id is not distinct from b.species_id) end, 0)`.as(
				'orders'
			),
			sql<number>`coalesce((select animals from sold where sold.bucket = b.bucket and sold.species_id is not distinct from b.species_id), 0)`.as(
				'animals'
			),
			sql<number>`coalesce(case when b.bucket = 'shipping' then (select revenue from shipping)
				else (select revenue from sold where sold.bucket = b.bucket and sold.species_id is not distinct from b.species_id) end, 0)`.as(
				'revenue'
			),
			sql<number>`coalesce(case when b.bucket = 'shipping' then (select refunds from refund_rest)
				else (select refunds from refund_by_bucket rb where rb.bucket = b.bucket and rb.species_id is not distinct from b.species_id) end, 0)`.as(
				'refunds'
			)
		])
		.$if(speciesId !== null, (q) => q.where('b.species_id', '=', speciesId))
		.execute();

	const order: Record<string, number> = { species: 0, supplies: 1, shipping: 2 };
	const shaped = rows
		.map((row) => ({
			bucket: row.bucket,
			name:
				row.bucket === 'species'
					? (row.common_name ?? 'Unknown species')
					: row.bucket === 'supplies'
						? 'Supplies'
						: 'Shipping and other',
			orders: Number(row.orders),
			animals: Number(row.animals),
			revenue: Number(row.revenue),
			refunds: Number(row.refunds),
			net: Number(row.revenue) - Number(row.refunds)
		}))
		// A quiet range has a shipping row of zeros only: no sale, so no rows.
		.filter((row) => row.orders > 0 || row.refunds !== 0 || row.revenue !== 0)
		.sort((a, b) => (order[a.bucket] ?? 0) - (order[b.bucket] ?? 0) || b.revenue - a.revenue)
		.map(({ bucket: _bucket, ...row }) => row);
	return { rows: shaped, totals: totalsOf(shaped, 'All', 'name', ['orders']) };
}

/** Animals sold per month and species, as one row per month with a column per species. */
async function animalsByMonthAndSpecies(
	context: ReportContext,
	speciesId: number | null
): Promise<{ rows: ReportRow[]; species: { slug: string; common_name: string }[] }> {
	const { db } = context;
	const cells = await db
		.with('months', (qb) => qb.selectNoFrom(monthSeries(context).as('month')))
		.with('paid', () => paidInRange(db, context))
		.with('sold', (qb) =>
			qb
				.selectFrom('paid')
				.innerJoin('order_line as ol', 'ol.order_id', 'paid.order_id')
				.where('ol.is_live', '=', true)
				.where('ol.species_id', 'is not', null)
				.$if(speciesId !== null, (q) => q.where('ol.species_id', '=', speciesId))
				.select([
					'paid.month',
					'ol.species_id',
					sql<number>`sum((ol.quantity - ol.restocked_quantity) * ol.unit_size)`.as('animals')
				])
				.groupBy(['paid.month', 'ol.species_id'])
		)
		.selectFrom('months')
		.leftJoin('sold', 'sold.month', 'months.month')
		.leftJoin('species as s', 's.id', 'sold.species_id')
		.select(['months.month', 's.slug', 's.common_name', 'sold.animals'])
		.orderBy('months.month')
		.orderBy('s.common_name')
		.execute();

	const species = new Map<string, string>();
	const byMonth = new Map<string, ReportRow>();
	for (const cell of cells) {
		const row = byMonth.get(cell.month) ?? { month: cell.month };
		byMonth.set(cell.month, row);
		if (cell.slug && cell.common_name) {
			species.set(cell.slug, cell.common_name);
			row[speciesKey(cell.slug)] = Number(cell.animals);
		}
	}
	const speciesList = [...species.entries()]
		.map(([slug, common_name]) => ({ slug, common_name }))
		.sort((a, b) => a.common_name.localeCompare(b.common_name));
	const rows = [...byMonth.values()].map((row) => {
		for (const s of speciesList) row[speciesKey(s.slug)] ??= 0;
		return row;
	});
	return { rows, species: speciesList };
}

/**
 * The closing row of a table of already-summed rows (a dozen months, a few species):
 * each number column added up, in integer cents where it is money.
 */
function totalsOf(
	rows: Record<string, string | number>[],
	label: string,
	labelKey: string,
	skip: string[] = []
): ReportRow {
	const totals: ReportRow = { [labelKey]: label };
	for (const key of ['orders', 'animals', 'revenue', 'refunds', 'net']) {
		if (skip.includes(key)) {
			totals[key] = null;
			continue;
		}
		totals[key] = rows.reduce((sum, row) => sum + Number(row[key] ?? 0), 0);
	}
	return totals;
}
