import { describe, expect, it } from 'vitest';
import type { ClutchState } from '$lib/server/db/schema';
import { pipelineTotals, stockPipeline, type PipelineClutchRow } from '$lib/stock/pipeline';
import {
	comingWithin12Weeks,
	stockDemandRows,
	stockDemandTotals,
	type SpeciesDemand
} from './stock-demand';

const TODAY = '2026-12-01';

const species = {
	millipede: { speciesId: 1, slug: 'narceus-americanus', name: 'American giant millipede' },
	isopod: { speciesId: 2, slug: 'porcellio-laevis', name: 'Dairy cow isopod' },
	springtail: { speciesId: 3, slug: 'folsomia-candida', name: 'White springtail' },
	beetle: { speciesId: 4, slug: 'zophobas-morio', name: 'Zophobas beetle' }
};
type Kind = keyof typeof species;

function clutch(kind: Kind, state: ClutchState, saleReadyOn: string, animals: number) {
	const s = species[kind];
	return {
		speciesId: s.speciesId,
		speciesSlug: s.slug,
		commonName: s.name,
		scientificName: s.slug,
		state,
		saleReadyOn,
		animals,
		clutches: 1
	} satisfies PipelineClutchRow;
}

function demand(kind: Kind, inShop: number, waiting: number, unconfirmed: number): SpeciesDemand {
	return {
		speciesId: species[kind].speciesId,
		commonName: species[kind].name,
		inShop,
		waiting,
		unconfirmed
	};
}

// Windows of 4 / 8 / 12 weeks = 28 / 56 / 84 days (PRODUCT.md, stock pipeline). Days from
// 2026-12-01 by the calendar: 12-20 is day 19, 2027-01-20 day 50, 02-23 day 84, 03-30 day 119.
const clutches = [
	clutch('millipede', 'ready', '2026-11-10', 12),
	clutch('millipede', 'growing', '2026-12-20', 9), // band 1
	clutch('millipede', 'growing', '2027-01-20', 5), // band 2
	clutch('millipede', 'growing', '2027-02-23', 3), // band 3, the window's last day
	clutch('millipede', 'growing', '2027-03-30', 11), // later
	clutch('millipede', 'paused', '2026-12-03', 7),
	clutch('isopod', 'growing', '2027-03-30', 40), // later only
	clutch('springtail', 'growing', '2026-12-10', 0) // counted clutch, no animals left
];

describe('stock and demand rows', () => {
	const pipeline = stockPipeline(clutches, TODAY);

	it('puts the pipeline beside the demand, one row per species with anything to show', () => {
		const rows = stockDemandRows(pipeline, [
			// Given out of name order: the rows come by common name.
			demand('isopod', 0, 0, 0),
			demand('millipede', 15, 4, 1),
			demand('springtail', 0, 0, 0), // nothing coming, nothing waiting: left out
			demand('beetle', 0, 2, 0) // nothing coming, but two people wait
		]);
		expect(rows).toEqual([
			{
				species: 'American giant millipede',
				ready_now: 12,
				within_4: 9,
				within_8: 14, // 9 + 5
				within_12: 17, // 9 + 5 + 3
				later: 11,
				paused: 7,
				coming: 29, // 12 ready now + 17 within 12 weeks
				in_shop: 15,
				waiting: 4,
				unconfirmed: 1
			},
			{
				species: 'Dairy cow isopod',
				ready_now: 0,
				within_4: 0,
				within_8: 0,
				within_12: 0,
				later: 40,
				paused: 0,
				coming: 0,
				in_shop: 0,
				waiting: 0,
				unconfirmed: 0
			},
			{
				species: 'Zophobas beetle',
				ready_now: 0,
				within_4: 0,
				within_8: 0,
				within_12: 0,
				later: 0,
				paused: 0,
				coming: 0,
				in_shop: 0,
				waiting: 2,
				unconfirmed: 0
			}
		]);
	});

	it('leaves out pipeline species the filter did not let through', () => {
		const rows = stockDemandRows(pipeline, [demand('isopod', 3, 0, 0)]);
		expect(rows.map((r) => [r.species, r.later, r.in_shop])).toEqual([['Dairy cow isopod', 40, 3]]);
		expect(stockDemandRows(pipeline, [])).toEqual([]);
	});

	it('a species with only unconfirmed guests or only shop stock still gets a row', () => {
		expect(stockDemandRows([], [demand('beetle', 0, 0, 1)])).toHaveLength(1);
		expect(stockDemandRows([], [demand('beetle', 6, 0, 0)])).toHaveLength(1);
		expect(stockDemandRows([], [demand('beetle', 0, 0, 0)])).toHaveLength(0);
	});

	it('closes with the pipeline totals beside the demand totals', () => {
		expect(
			stockDemandTotals(pipelineTotals(pipeline), { inShop: 15, waiting: 6, unconfirmed: 1 })
		).toEqual({
			species: 'All species',
			ready_now: 12,
			within_4: 9,
			within_8: 14,
			within_12: 17,
			later: 51, // 11 millipedes + 40 isopods
			paused: 7,
			coming: 29,
			in_shop: 15,
			waiting: 6,
			unconfirmed: 1
		});
	});

	it('coming within 12 weeks is ready now plus the 12-week window', () => {
		expect(comingWithin12Weeks({ readyNow: 5, within: [1, 2, 3] })).toBe(8);
	});
});
