// The stock pipeline's SQL on a scratch database: hand-made clutches whose expected
// figures are written out below, so the grouping and the state filter are checked.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ClutchState, NewClutch } from '../../src/lib/server/db/schema';
import {
	clutchesDueSoon,
	loadStockPipeline,
	pipelineClutchRows
} from '../../src/lib/server/stock/pipeline';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const TODAY = '2026-12-01';

describe('stock pipeline from the ledger', () => {
	let scratch: ScratchDatabase;
	const speciesIds: Record<'millipede' | 'isopod' | 'beetle', number> = {
		millipede: 0,
		isopod: 0,
		beetle: 0
	};
	let codeNumber = 0;

	function clutch(
		species: keyof typeof speciesIds,
		state: ClutchState,
		saleReadyOn: string,
		countAlive: number
	): NewClutch {
		codeNumber++;
		return {
			code: `T-${String(codeNumber).padStart(3, '0')}`,
			species_id: speciesIds[species],
			origin: 'bought_in',
			tub_id: null,
			generation: 1,
			found_on: '2026-08-01',
			stage: 'juvenile',
			size_class: 'small',
			count_found: countAlive + 2,
			count_alive: countAlive,
			count_lost: 2,
			state,
			paused_reason: state === 'paused' ? 'molting' : null,
			sale_ready_on: saleReadyOn
		};
	}

	beforeAll(async () => {
		scratch = await scratchDatabase();
		const base = {
			temp_low_f: 62,
			temp_ideal_low_f: 70,
			temp_ideal_high_f: 78,
			temp_high_f: 86,
			moisture_level: 'moist' as const,
			adult_length_mm: 40,
			grow_out_weeks: 12
		};
		const inserted = await scratch.db
			.insertInto('species')
			.values([
				{
					...base,
					slug: 'narceus-americanus',
					scientific_name: 'Narceus americanus',
					common_name: 'American giant millipede',
					animal_group: 'millipede'
				},
				{
					...base,
					slug: 'porcellio-laevis',
					scientific_name: 'Porcellio laevis',
					common_name: 'Dairy cow isopod',
					animal_group: 'isopod'
				},
				{
					...base,
					slug: 'zophobas-morio',
					scientific_name: 'Zophobas morio',
					common_name: 'Zophobas beetle',
					animal_group: 'beetle'
				}
			])
			.returning(['id', 'animal_group'])
			.execute();
		for (const row of inserted) speciesIds[row.animal_group as keyof typeof speciesIds] = row.id;

		await scratch.db
			.insertInto('clutch')
			.values([
				// Two clutches on the same day: one row of the SQL aggregate, 15 animals.
				clutch('millipede', 'growing', '2026-12-05', 9),
				clutch('millipede', 'growing', '2026-12-05', 6),
				clutch('millipede', 'growing', '2026-11-28', 4), // passed, not marked ready
				clutch('millipede', 'growing', '2026-12-29', 3), // day 28
				clutch('millipede', 'growing', '2026-12-30', 8), // day 29
				clutch('millipede', 'growing', '2027-02-23', 5), // day 84
				clutch('millipede', 'growing', '2027-03-30', 11), // day 119: later
				clutch('millipede', 'ready', '2026-11-10', 12),
				clutch('millipede', 'paused', '2026-12-03', 7),
				clutch('millipede', 'listed', '2026-10-01', 40),
				clutch('millipede', 'sold_out', '2026-09-01', 0),
				clutch('isopod', 'ready', '2026-11-20', 25),
				clutch('isopod', 'ready', '2026-11-21', 5),
				clutch('isopod', 'growing', '2027-01-20', 60), // day 50
				clutch('beetle', 'listed', '2026-11-01', 10)
			])
			.execute();
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	it('sums animals per species, state and date, leaving listed and sold-out clutches out', async () => {
		const rows = await pipelineClutchRows(scratch.db);
		const sameDay = rows.filter((r) => r.saleReadyOn === '2026-12-05' && r.state === 'growing');
		expect(sameDay).toEqual([
			expect.objectContaining({ commonName: 'American giant millipede', animals: 15, clutches: 2 })
		]);
		expect(rows.some((r) => r.state === 'listed' || r.state === 'sold_out')).toBe(false);
		expect(rows.reduce((sum, r) => sum + r.clutches, 0)).toBe(12);
	});

	it('gives the figures per species for today', async () => {
		const pipeline = await loadStockPipeline(scratch.db, TODAY);
		expect(pipeline.map((r) => r.speciesSlug)).toEqual(['narceus-americanus', 'porcellio-laevis']);
		expect(pipeline[0]).toMatchObject({
			readyNow: 12,
			// 15 (Dec 5) + 4 (passed) + 3 (day 28) | 8 (day 29) | 5 (day 84)
			bands: [22, 8, 5],
			within: [22, 30, 35],
			overdue: 4,
			later: 11,
			paused: 7,
			clutches: 9
		});
		expect(pipeline[1]).toMatchObject({
			readyNow: 30,
			bands: [0, 60, 0],
			within: [0, 60, 60],
			later: 0,
			paused: 0,
			clutches: 3
		});
	});

	it('lists growing clutches due within a week, earliest first, passed ones included', async () => {
		const due = await clutchesDueSoon(scratch.db, TODAY);
		expect(due.map((d) => [d.saleReadyOn, d.countAlive, d.speciesCommonName, d.daysLeft])).toEqual([
			['2026-11-28', 4, 'American giant millipede', -3],
			['2026-12-05', 9, 'American giant millipede', 4],
			['2026-12-05', 6, 'American giant millipede', 4]
		]);
		// The paused clutch (T-009, due Dec 3) is not on it: it is not sold while paused.
		expect(due.map((d) => d.code)).toEqual(['T-003', 'T-001', 'T-002']);
		expect(await clutchesDueSoon(scratch.db, TODAY, 0)).toHaveLength(1);
	});
});
