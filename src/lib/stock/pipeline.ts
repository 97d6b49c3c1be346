// Stock pipeline: per species, how many juveniles are sale-ready now and how many
// become sale-ready in the next 4, 8 and 12 weeks, from the clutches' projected
// sale-ready dates. Pure: today is passed in.
//
// What counts where (animals alive, `count_alive`):
// - ready: "ready now" (marked ready by a keeper, not yet listed).
// - growing: by days from today to its sale-ready date: 0–28 (a projection already
//   passed counts here too: it is due, just not confirmed yet), 29–56, 57–84; later
//   than that is "later". The windows are cumulative: the 8-week figure includes the
//   4-week one. `bands` holds the same counts per band, for stacked bars.
// - paused (molting or unwell): counted apart; never sold while paused.
// - listed and sold out: left out, they are in the shop already.
import type { ClutchState } from '$lib/server/db/schema';
import { daysBetween, type IsoDate } from '$lib/format/dates';

/** The windows' ends in days from today: 4, 8 and 12 weeks. */
export const PIPELINE_WINDOW_DAYS = [28, 56, 84] as const;
export const PIPELINE_WINDOW_WEEKS = [4, 8, 12] as const;

/** One clutch, or several of one species sharing a state and sale-ready date. */
export interface PipelineClutchRow {
	speciesId: number;
	speciesSlug: string;
	commonName: string;
	scientificName: string;
	state: ClutchState;
	saleReadyOn: IsoDate;
	/** Animals alive in the clutch(es). */
	animals: number;
	/** How many clutches the row stands for (1 for a single clutch). */
	clutches: number;
}

export type WindowCounts = [within4Weeks: number, within8Weeks: number, within12Weeks: number];

export interface PipelineRow {
	speciesId: number;
	speciesSlug: string;
	commonName: string;
	scientificName: string;
	readyNow: number;
	/** Growing animals per band: weeks 0–4, 5–8, 9–12. */
	bands: WindowCounts;
	/** Growing animals becoming sale-ready within 4, 8, 12 weeks (cumulative). */
	within: WindowCounts;
	/** Growing animals whose projection has passed (already inside the 4-week figure). */
	overdue: number;
	/** Growing animals due after 12 weeks. */
	later: number;
	/** Animals in paused clutches. */
	paused: number;
	/** Clutches counted in any column of the row. */
	clutches: number;
}

export type PipelineTotals = Omit<
	PipelineRow,
	'speciesId' | 'speciesSlug' | 'commonName' | 'scientificName'
>;

function emptyCounts(): PipelineTotals {
	return {
		readyNow: 0,
		bands: [0, 0, 0],
		within: [0, 0, 0],
		overdue: 0,
		later: 0,
		paused: 0,
		clutches: 0
	};
}

/** Which band a growing clutch falls in (0, 1, 2), or null after 12 weeks. */
export function pipelineBand(today: IsoDate, saleReadyOn: IsoDate): 0 | 1 | 2 | null {
	const days = daysBetween(today, saleReadyOn);
	if (days <= PIPELINE_WINDOW_DAYS[0]) return 0;
	if (days <= PIPELINE_WINDOW_DAYS[1]) return 1;
	if (days <= PIPELINE_WINDOW_DAYS[2]) return 2;
	return null;
}

/** The pipeline per species, by common name; species with nothing counted are left out. */
export function stockPipeline(rows: readonly PipelineClutchRow[], today: IsoDate): PipelineRow[] {
	const bySpecies = new Map<number, PipelineRow>();
	for (const row of rows) {
		if (row.state === 'listed' || row.state === 'sold_out') continue;
		let species = bySpecies.get(row.speciesId);
		if (!species) {
			species = {
				speciesId: row.speciesId,
				speciesSlug: row.speciesSlug,
				commonName: row.commonName,
				scientificName: row.scientificName,
				...emptyCounts()
			};
			bySpecies.set(row.speciesId, species);
		}
		species.clutches += row.clutches;
		if (row.state === 'ready') species.readyNow += row.animals;
		else if (row.state === 'paused') species.paused += row.animals;
		else {
			const band = pipelineBand(today, row.saleReadyOn);
			if (band === null) species.later += row.animals;
			else species.bands[band] += row.animals;
			if (daysBetween(today, row.saleReadyOn) < 0) species.overdue += row.animals;
		}
	}
	const result = [...bySpecies.values()];
	for (const species of result) {
		const [first, second, third] = species.bands;
		species.within = [first, first + second, first + second + third];
	}
	return result.sort(
		(a, b) => a.commonName.localeCompare(b.commonName, 'en') || a.speciesId - b.speciesId
	);
}

/** Column totals of the pipeline. */
export function pipelineTotals(rows: readonly PipelineRow[]): PipelineTotals {
	const totals = emptyCounts();
	for (const row of rows) {
		totals.readyNow += row.readyNow;
		totals.overdue += row.overdue;
		totals.later += row.later;
		totals.paused += row.paused;
		totals.clutches += row.clutches;
		for (const i of [0, 1, 2] as const) {
			totals.bands[i] += row.bands[i];
			totals.within[i] += row.within[i];
		}
	}
	return totals;
}
