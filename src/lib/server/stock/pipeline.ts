// The stock pipeline from the ledger (read only): PostgreSQL sums the animals per
// species, state and sale-ready date; the pure stockPipeline() puts those sums into
// the 4 / 8 / 12-week windows, so the window rules live in one place.
import type { Db } from '$lib/server/db';
import { addDays, daysBetween, type IsoDate } from '$lib/format/dates';
import { stockPipeline, type PipelineClutchRow, type PipelineRow } from '$lib/stock/pipeline';

/** Clutches the pipeline looks at; listed and sold-out ones are in the shop already. */
const PIPELINE_STATES = ['growing', 'ready', 'paused'] as const;

export async function pipelineClutchRows(db: Db): Promise<PipelineClutchRow[]> {
	const rows = await db
		.selectFrom('clutch as c')
		.innerJoin('species as s', 's.id', 'c.species_id')
		.select((eb) => [
			's.id as species_id',
			's.slug',
			's.common_name',
			's.scientific_name',
			'c.state',
			'c.sale_ready_on',
			// sum() of integers is bigint; connect.ts parses it to a safe integer.
			eb.fn.sum<number>('c.count_alive').as('animals'),
			eb.fn.countAll<number>().as('clutches')
		])
		.where('c.state', 'in', PIPELINE_STATES)
		.groupBy(['s.id', 's.slug', 's.common_name', 's.scientific_name', 'c.state', 'c.sale_ready_on'])
		.execute();
	return rows.map((r) => ({
		speciesId: r.species_id,
		speciesSlug: r.slug,
		commonName: r.common_name,
		scientificName: r.scientific_name,
		state: r.state,
		saleReadyOn: r.sale_ready_on,
		animals: Number(r.animals),
		clutches: Number(r.clutches)
	}));
}

/** Per species: ready now, within 4 / 8 / 12 weeks of `today`, later, paused. */
export async function loadStockPipeline(db: Db, today: IsoDate): Promise<PipelineRow[]> {
	return stockPipeline(await pipelineClutchRows(db), today);
}

export interface ClutchDueSoon {
	id: number;
	code: string;
	speciesCommonName: string;
	speciesSlug: string;
	countAlive: number;
	saleReadyOn: IsoDate;
	/** Days from today to the projection; 0 or less means due now. */
	daysLeft: number;
}

/**
 * Growing clutches whose projected sale-ready date falls within `days` of today, for
 * the "due today" list: time to check them and mark them ready. Projections already
 * passed are included (still growing means nobody has checked yet); paused clutches
 * are not, they are not sold while paused. Earliest first.
 */
export async function clutchesDueSoon(db: Db, today: IsoDate, days = 7): Promise<ClutchDueSoon[]> {
	const rows = await db
		.selectFrom('clutch as c')
		.innerJoin('species as s', 's.id', 'c.species_id')
		.select(['c.id', 'c.code', 's.common_name', 's.slug', 'c.count_alive', 'c.sale_ready_on'])
		.where('c.state', '=', 'growing')
		.where('c.sale_ready_on', '<=', addDays(today, days))
		.orderBy('c.sale_ready_on')
		.orderBy('c.code')
		.execute();
	return rows.map((r) => ({
		id: r.id,
		code: r.code,
		speciesCommonName: r.common_name,
		speciesSlug: r.slug,
		countAlive: r.count_alive,
		saleReadyOn: r.sale_ready_on,
		daysLeft: daysBetween(today, r.sale_ready_on)
	}));
}
