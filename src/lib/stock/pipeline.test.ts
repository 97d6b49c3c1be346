import { describe, expect, it } from 'vitest';
import type { ClutchState } from '$lib/server/db/schema';
import { pipelineBand, pipelineTotals, stockPipeline, type PipelineClutchRow } from './pipeline';

const TODAY = '2026-12-01';

const millipede = {
	speciesId: 1,
	speciesSlug: 'narceus-americanus',
	commonName: 'American giant millipede',
	scientificName: 'Narceus americanus'
};
const isopod = {
	speciesId: 2,
	speciesSlug: 'porcellio-laevis',
	commonName: 'Dairy cow isopod',
	scientificName: 'Porcellio laevis'
};
const beetle = {
	speciesId: 3,
	speciesSlug: 'zophobas-morio',
	commonName: 'Zophobas beetle',
	scientificName: 'Zophobas morio'
};

function clutch(
	species: typeof millipede,
	state: ClutchState,
	saleReadyOn: string,
	animals: number,
	clutches = 1
): PipelineClutchRow {
	return { ...species, state, saleReadyOn, animals, clutches };
}

// Day counts from 2026-12-01 by the calendar (December has 31 days, January 31):
// +28 = 2026-12-29, +29 = 12-30, +56 = 2027-01-26, +57 = 01-27, +84 = 02-23, +85 = 02-24.
const rows: PipelineClutchRow[] = [
	clutch(millipede, 'growing', '2026-11-20', 5), // projection passed, not marked ready: due now
	clutch(millipede, 'growing', '2026-12-01', 10), // due today
	clutch(millipede, 'growing', '2026-12-29', 7), // day 28: last day of the 4-week window
	clutch(millipede, 'growing', '2026-12-30', 3), // day 29
	clutch(millipede, 'growing', '2027-01-26', 4), // day 56
	clutch(millipede, 'growing', '2027-01-27', 6), // day 57
	clutch(millipede, 'growing', '2027-02-23', 2), // day 84
	clutch(millipede, 'growing', '2027-02-24', 9), // day 85: after the 12-week window
	clutch(millipede, 'ready', '2026-11-01', 12),
	clutch(millipede, 'paused', '2026-12-05', 8), // molting: never sold while paused
	clutch(millipede, 'listed', '2026-10-01', 20), // in the shop already
	clutch(millipede, 'sold_out', '2026-09-01', 0),
	clutch(isopod, 'ready', '2026-11-15', 30, 2),
	clutch(beetle, 'listed', '2026-11-15', 14)
];

describe('stock pipeline', () => {
	it('counts each species into ready now, the 4 / 8 / 12-week windows, later and paused', () => {
		const [first, second, third] = stockPipeline(rows, TODAY);
		expect(third).toBeUndefined(); // the beetle has only listed stock
		expect(first).toEqual({
			...millipede,
			readyNow: 12,
			bands: [5 + 10 + 7, 3 + 4, 6 + 2],
			within: [22, 29, 37],
			overdue: 5,
			later: 9,
			paused: 8,
			clutches: 10
		});
		expect(second).toEqual({
			...isopod,
			readyNow: 30,
			bands: [0, 0, 0],
			within: [0, 0, 0],
			overdue: 0,
			later: 0,
			paused: 0,
			clutches: 2
		});
	});

	it('puts the window edges on days 28, 56 and 84', () => {
		expect(pipelineBand(TODAY, '2026-12-29')).toBe(0);
		expect(pipelineBand(TODAY, '2026-12-30')).toBe(1);
		expect(pipelineBand(TODAY, '2027-01-26')).toBe(1);
		expect(pipelineBand(TODAY, '2027-01-27')).toBe(2);
		expect(pipelineBand(TODAY, '2027-02-23')).toBe(2);
		expect(pipelineBand(TODAY, '2027-02-24')).toBeNull();
		expect(pipelineBand(TODAY, '2026-01-01')).toBe(0);
	});

	it('moves clutches between windows as the days pass', () => {
		// Four weeks on, the day-29 and day-56 clutches are due within 4 weeks.
		const later = stockPipeline(rows, '2026-12-29')[0]!;
		expect(later.bands).toEqual([5 + 10 + 7 + 3 + 4, 6 + 2, 9]);
		expect(later.overdue).toBe(5 + 10);
	});

	it('is empty without clutches, and totals the columns', () => {
		expect(stockPipeline([], TODAY)).toEqual([]);
		const totals = pipelineTotals(stockPipeline(rows, TODAY));
		expect(totals).toEqual({
			readyNow: 42,
			bands: [22, 7, 8],
			within: [22, 29, 37],
			overdue: 5,
			later: 9,
			paused: 8,
			clutches: 12
		});
	});
});
