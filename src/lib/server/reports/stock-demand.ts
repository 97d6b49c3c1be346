// Stock and demand, as of today: per species the animals coming up (the stock pipeline,
// reused so its 4 / 8 / 12-week rules stay in one place), the animals free in the shop,
// and the people waiting for the species. The range does not apply.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type { AnimalGroup, OrderState } from '$lib/server/db/schema';
import { animalGroupPluralLabels } from '$lib/format/labels';
import { formatCell } from '$lib/reports/cells';
import type { ReportFilter, ReportSection } from '$lib/reports/report';
import {
	stockDemandRows,
	stockDemandTotals,
	type DemandTotals,
	type SpeciesDemand
} from '$lib/reports/stock-demand';
import { pipelineTotals } from '$lib/stock/pipeline';
import { CONFIRM_LINK_DAYS } from '$lib/waitlist/rules';
import { loadStockPipeline } from '$lib/server/stock/pipeline';
import { chosen, type ReportRunner } from './context';

const GROUP_ORDER = Object.keys(animalGroupPluralLabels) as AnimalGroup[];

function groupLabel(group: AnimalGroup): string {
	const plural = animalGroupPluralLabels[group];
	return plural.charAt(0).toUpperCase() + plural.slice(1);
}

/** Orders whose lines take animals from a clutch: the states clutch_free_animals() counts. */
const ORDER_STATES_NOT_TAKING: OrderState[] = ['cancelled', 'awaiting_payment'];

/**
 * Per species of the group (all species when null): shop stock and waitlist counts.
 * "Free in the shop" is clutch_free_animals() (migration 2026-12-02T0500) summed over the
 * listed clutches, written set-based here: calling the function once per clutch costs a
 * plan per call, seconds over a catalogue of thousands of listed clutches. The
 * integration test holds the two to the same figures.
 */
async function speciesDemand(
	db: Db,
	group: AnimalGroup | null
): Promise<{ species: SpeciesDemand[]; totals: DemandTotals }> {
	const rows = await db
		.with('listed', (qb) =>
			qb
				.selectFrom('clutch as c')
				.where('c.state', '=', 'listed')
				.$if(group !== null, (q) =>
					q.where('c.species_id', 'in', (eb) =>
						eb
							.selectFrom('species as gs')
							.select('gs.id')
							.where('gs.animal_group', '=', group as AnimalGroup)
					)
				)
				.select(['c.id', 'c.species_id', 'c.count_alive'])
		)
		.with('sold', (qb) =>
			qb
				.selectFrom('order_line as ol')
				.innerJoin('listed', 'listed.id', 'ol.clutch_id')
				.innerJoin('customer_order as o', 'o.id', 'ol.order_id')
				.where('o.state', 'not in', ORDER_STATES_NOT_TAKING)
				.select([
					'ol.clutch_id',
					sql<number>`sum((ol.quantity - ol.restocked_quantity) * ol.unit_size)`.as('animals')
				])
				.groupBy('ol.clutch_id')
		)
		.with('held', (qb) =>
			qb
				.selectFrom('reservation as r')
				.innerJoin('listing as l', 'l.id', 'r.listing_id')
				.innerJoin('listed', 'listed.id', 'l.clutch_id')
				.where('r.state', '=', 'held')
				.where('r.expires_at', '>', sql<Date>`now()`)
				.select(['l.clutch_id', sql<number>`sum(r.quantity * l.unit_size)`.as('animals')])
				.groupBy('l.clutch_id')
		)
		.with('shop', (qb) =>
			qb
				.selectFrom('listed')
				.leftJoin('sold', 'sold.clutch_id', 'listed.id')
				.leftJoin('held', 'held.clutch_id', 'listed.id')
				.select([
					'listed.species_id',
					// An oversold clutch (a loss after a sale) offers nothing; it takes nothing away.
					sql<number>`sum(greatest(0, listed.count_alive - coalesce(sold.animals, 0) - coalesce(held.animals, 0)))`.as(
						'animals'
					)
				])
				.groupBy('listed.species_id')
		)
		.with('wait', (qb) =>
			qb
				.selectFrom('waitlist_entry as w')
				.where('w.notified_at', 'is', null)
				.select([
					'w.species_id',
					sql<number>`count(*) filter (where w.confirmed_at is not null)`.as('waiting'),
					// A guest's link lapses CONFIRM_LINK_DAYS after it was sent (created_at).
					sql<number>`count(*) filter (where w.confirmed_at is null and w.created_at > now() - make_interval(days => ${CONFIRM_LINK_DAYS}))`.as(
						'unconfirmed'
					)
				])
				.groupBy('w.species_id')
		)
		.selectFrom('species as s')
		.leftJoin('shop', 'shop.species_id', 's.id')
		.leftJoin('wait', 'wait.species_id', 's.id')
		.$if(group !== null, (q) => q.where('s.animal_group', '=', group as AnimalGroup))
		.select([
			's.id',
			's.common_name',
			sql<number>`coalesce(shop.animals, 0)`.as('in_shop'),
			sql<number>`coalesce(wait.waiting, 0)`.as('waiting'),
			sql<number>`coalesce(wait.unconfirmed, 0)`.as('unconfirmed'),
			sql<number>`coalesce(sum(shop.animals) over (), 0)`.as('in_shop_total'),
			sql<number>`coalesce(sum(wait.waiting) over (), 0)`.as('waiting_total'),
			sql<number>`coalesce(sum(wait.unconfirmed) over (), 0)`.as('unconfirmed_total')
		])
		.execute();
	const first = rows[0];
	return {
		species: rows.map((r) => ({
			speciesId: r.id,
			commonName: r.common_name,
			inShop: Number(r.in_shop),
			waiting: Number(r.waiting),
			unconfirmed: Number(r.unconfirmed)
		})),
		totals: {
			inShop: Number(first?.in_shop_total ?? 0),
			waiting: Number(first?.waiting_total ?? 0),
			unconfirmed: Number(first?.unconfirmed_total ?? 0)
		}
	};
}

export const stockDemandReport: ReportRunner = async (context) => {
	const { db, today } = context;
	const present = await db.selectFrom('species').select('animal_group').distinct().execute();
	const groups = GROUP_ORDER.filter((g) => present.some((p) => p.animal_group === g));
	const groupValue = chosen(context.params, 'group', groups);
	const group = (groupValue || null) as AnimalGroup | null;
	const filters: ReportFilter[] = [
		{
			key: 'group',
			label: 'Animal group',
			value: groupValue,
			options: [
				{ value: '', label: 'All animals' },
				...groups.map((g) => ({ value: g, label: groupLabel(g) }))
			]
		}
	];

	const [pipeline, demand] = await Promise.all([
		loadStockPipeline(db, today),
		speciesDemand(db, group)
	]);
	const inGroup = new Set(demand.species.map((s) => s.speciesId));
	// The pipeline comes grouped by species, state and sale-ready date from PostgreSQL;
	// its windows and totals are the stock page's own pure functions.
	const pipelineInGroup = pipeline.filter((row) => inGroup.has(row.speciesId));
	const rows = stockDemandRows(pipelineInGroup, demand.species);
	const asOf = formatCell('date', today);
	const what = group ? animalGroupPluralLabels[group] : 'animals';

	const section: ReportSection = {
		id: 'pipeline-demand',
		title: 'Coming up and waited for',
		lead: `As of ${asOf}: the animals each species has coming, beside the people on its waitlist.`,
		chart: {
			kind: 'bar',
			horizontal: true,
			title: 'Animals coming within 12 weeks beside people waiting',
			summary: `Two bars per species as of ${asOf}: animals ready now or sale-ready within 12 weeks, and confirmed waitlist entries not yet told of a listing.`,
			labelKey: 'species',
			series: [
				{ key: 'coming', label: 'Coming within 12 weeks' },
				{ key: 'waiting', label: 'People waiting' }
			],
			unit: 'count'
		},
		table: {
			caption: `Stock coming up and people waiting, per species, as of ${asOf}`,
			columns: [
				{ key: 'species', label: 'Species', kind: 'text' },
				{ key: 'ready_now', label: 'Ready now', kind: 'count' },
				{ key: 'within_4', label: 'Within 4 weeks', kind: 'count' },
				{ key: 'within_8', label: 'Within 8 weeks', kind: 'count' },
				{ key: 'within_12', label: 'Within 12 weeks', kind: 'count' },
				{ key: 'later', label: 'Later', kind: 'count' },
				{ key: 'paused', label: 'Paused', kind: 'count' },
				{ key: 'coming', label: 'Coming within 12 weeks', kind: 'count' },
				{ key: 'in_shop', label: 'Free in the shop', kind: 'count' },
				{ key: 'waiting', label: 'People waiting', kind: 'count' },
				{ key: 'unconfirmed', label: 'Guests not yet confirmed', kind: 'count' }
			],
			rows,
			...(rows.length > 0
				? { totals: stockDemandTotals(pipelineTotals(pipelineInGroup), demand.totals) }
				: {})
		},
		empty: `No ${what} are coming up or in the shop, and nobody is waiting for any.`
	};

	return {
		filters,
		sections: [section],
		notes: [
			`Counted as of today, ${asOf}; the date range does not apply to this report.`,
			'Ready now: clutches a keeper has marked ready and not listed yet. Within 4, 8 and 12 weeks: growing clutches by their projected sale-ready date, each figure including the shorter windows; a projection already passed counts within 4 weeks. Later: further off than 12 weeks.',
			'Paused clutches (molting or unwell) are counted apart: they are not sold while paused. Coming within 12 weeks is ready now plus within 12 weeks.',
			'Free in the shop: animals of listed clutches not yet sold and not held in a cart.',
			`People waiting: waitlist entries confirmed and not yet told of a listing. Guests who joined but have not followed their confirmation link are counted apart while the link works (${CONFIRM_LINK_DAYS} days).`
		]
	};
};
