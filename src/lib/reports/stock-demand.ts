// Stock and demand per species: the stock pipeline's windows (src/lib/stock/pipeline.ts,
// the one place their rules live) beside the animals free in the shop and the people on
// the species' waitlist. Pure: the server hands in the pipeline and the demand counts.
import type { PipelineRow, PipelineTotals } from '$lib/stock/pipeline';
import type { ReportRow } from './report';

/** What PostgreSQL counts per species for the report, beside the pipeline. */
export interface SpeciesDemand {
	speciesId: number;
	commonName: string;
	/** Animals of listed clutches not sold and not held in a cart. */
	inShop: number;
	/** Waitlist entries confirmed and not yet told of a listing. */
	waiting: number;
	/** Guests' entries whose confirmation link still works but has not been followed. */
	unconfirmed: number;
}

export type DemandTotals = Pick<SpeciesDemand, 'inShop' | 'waiting' | 'unconfirmed'>;

/** Animals sale-ready now or within 12 weeks: what the waiting people can hope for soon. */
export function comingWithin12Weeks(counts: Pick<PipelineTotals, 'readyNow' | 'within'>): number {
	return counts.readyNow + counts.within[2];
}

function cells(pipeline: PipelineTotals | null, demand: DemandTotals): ReportRow {
	return {
		ready_now: pipeline?.readyNow ?? 0,
		within_4: pipeline?.within[0] ?? 0,
		within_8: pipeline?.within[1] ?? 0,
		within_12: pipeline?.within[2] ?? 0,
		later: pipeline?.later ?? 0,
		paused: pipeline?.paused ?? 0,
		coming: pipeline ? comingWithin12Weeks(pipeline) : 0,
		in_shop: demand.inShop,
		waiting: demand.waiting,
		unconfirmed: demand.unconfirmed
	};
}

/**
 * One row per species of `demand` (the species the filter lets through) that has
 * animals coming, paused or in the shop, or anyone waiting; by common name. Pipeline
 * rows of species not in `demand` are left out.
 */
export function stockDemandRows(
	pipeline: readonly PipelineRow[],
	demand: readonly SpeciesDemand[]
): ReportRow[] {
	const pipelineBySpecies = new Map(pipeline.map((row) => [row.speciesId, row]));
	return [...demand]
		.sort((a, b) => a.commonName.localeCompare(b.commonName, 'en') || a.speciesId - b.speciesId)
		.flatMap((species): ReportRow[] => {
			const row = pipelineBySpecies.get(species.speciesId) ?? null;
			// readyNow + within[2] + later + paused: every animal the pipeline counts.
			const inPipeline = row ? comingWithin12Weeks(row) + row.later + row.paused : 0;
			const anything = inPipeline + species.inShop + species.waiting + species.unconfirmed > 0;
			return anything ? [{ species: species.commonName, ...cells(row, species) }] : [];
		});
}

/** The closing row: the pipeline's own totals beside the demand totals. */
export function stockDemandTotals(pipeline: PipelineTotals, demand: DemandTotals): ReportRow {
	return { species: 'All species', ...cells(pipeline, demand) };
}
