// The tub-yield report on a scratch database: hand-made colonies, resting tubs and tub
// checks, with every expected figure worked out by hand below.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '../../src/lib/server/db/connect';
import type { TubState } from '../../src/lib/server/db/schema';
import { addDays } from '../../src/lib/format/dates';
import type { ReportSection } from '../../src/lib/reports/report';
import type { ReportContext } from '../../src/lib/server/reports/context';
import { tubYieldReport } from '../../src/lib/server/reports/tub-yield';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const TODAY = '2026-12-01';
const FROM = '2026-01-15';
const TO = '2026-06-30';

/*
 * Tubs (range 2026-01-15 to 2026-06-30; young found at each check in brackets):
 *
 *   POR-02-T0  01-14  yielded [40]    the day before the range: out
 *   POR-01-T1  01-15  yielded [12, 3] the first day: in; Winter 2025–26
 *   NAR-01-T1  02-01  cleared [0, 0]  Winter 2025–26
 *   POR-01-T2  03-10  cleared [0]     Spring 2026
 *   POR-01-T3  04-02  yielded [9]     Spring 2026
 *   POR-02-T1  05-20  yielded [6]     Spring 2026
 *   NAR-01-T2  06-05  yielded [2, 2]  Summer 2026
 *   NAR-01-T3  06-20  resting []      Summer 2026
 *   POR-01-T4  06-30  resting [4]     the last day: in; Summer 2026 (kept resting after young)
 *   POR-02-T2  07-01  yielded [50]    the day after the range: out
 *
 * By colony:
 *   NAR-01 closed 2 (T1, T2), yielded 1, 1/2 = 0.5, young 0 + 4 = 4, 4/2 = 2, resting 1
 *   POR-01 closed 3 (T1–T3), yielded 2, 2/3 = 0.6667, young 15 + 0 + 9 = 24, 24/3 = 8,
 *          resting 1 (T4, whose 4 young wait until it closes)
 *   POR-02 closed 1 (T1), yielded 1, 1, young 6, 6, resting 0
 *   All    closed 6, yielded 4, 4/6 = 0.6667, young 34, 34/6 = 5.67, resting 2
 * By season:
 *   Winter 2025–26  closed 2, yielded 1, 0.5, young 15, 7.5, resting 0
 *   Spring 2026     closed 3, yielded 2, 0.6667, young 15, 5, resting 0
 *   Summer 2026     closed 1, yielded 1, 1, young 4, 4, resting 2
 */

describe('tub-yield report', () => {
	let scratch: ScratchDatabase;
	let db: Db;

	function context(overrides: Partial<ReportContext> = {}): ReportContext {
		return {
			db,
			from: FROM,
			to: TO,
			timeZone: 'America/New_York',
			today: TODAY,
			money: true,
			params: new URLSearchParams(),
			...overrides
		};
	}

	const section = (sections: ReportSection[], id: string) => {
		const found = sections.find((s) => s.id === id);
		if (!found) throw new Error(`no section ${id}`);
		return found;
	};

	beforeAll(async () => {
		scratch = await scratchDatabase();
		db = scratch.db;
		const species = async (
			slug: string,
			scientific: string,
			common: string,
			group: 'millipede' | 'isopod'
		) =>
			(
				await db
					.insertInto('species')
					.values({
						slug,
						scientific_name: scientific,
						common_name: common,
						animal_group: group,
						temp_low_f: 62,
						temp_ideal_low_f: 70,
						temp_ideal_high_f: 78,
						temp_high_f: 86,
						moisture_level: 'moist',
						adult_length_mm: 20,
						grow_out_weeks: 12
					})
					.returning('id')
					.executeTakeFirstOrThrow()
			).id;
		const isopodId = await species(
			'porcellio-laevis',
			'Porcellio laevis',
			'Dairy cow isopod',
			'isopod'
		);
		const millipedeId = await species(
			'narceus-americanus',
			'Narceus americanus',
			'American giant millipede',
			'millipede'
		);
		const colony = async (code: string, speciesId: number, name: string, retiredOn?: string) =>
			(
				await db
					.insertInto('colony')
					.values({
						code,
						species_id: speciesId,
						name,
						enclosure_length_in: '24',
						enclosure_width_in: '12',
						substrate_depth_in: '4',
						started_on: '2025-03-01',
						retired_on: retiredOn ?? null
					})
					.returning('id')
					.executeTakeFirstOrThrow()
			).id;
		const nar01 = await colony('NAR-01', millipedeId, 'Big tank');
		const por01 = await colony('POR-01', isopodId, 'Shelf bin');
		const por02 = await colony('POR-02', isopodId, 'Orange bin', '2026-11-01');

		const tub = async (
			code: string,
			colonyId: number,
			startedOn: string,
			state: TubState,
			young: number[]
		) => {
			const closedOn = state === 'resting' ? null : addDays(startedOn, 42);
			const { id } = await db
				.insertInto('resting_tub')
				.values({
					code,
					colony_id: colonyId,
					started_on: startedOn,
					hold_until: addDays(startedOn, 42),
					state,
					closed_on: closedOn
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			for (const [index, count] of young.entries())
				await db
					.insertInto('tub_check')
					.values({
						tub_id: id,
						checked_on: addDays(startedOn, 14 * (index + 1)),
						young_found: count
					})
					.execute();
		};
		await tub('POR-02-T0', por02, '2026-01-14', 'yielded', [40]);
		await tub('POR-01-T1', por01, '2026-01-15', 'yielded', [12, 3]);
		await tub('NAR-01-T1', nar01, '2026-02-01', 'cleared', [0, 0]);
		await tub('POR-01-T2', por01, '2026-03-10', 'cleared', [0]);
		await tub('POR-01-T3', por01, '2026-04-02', 'yielded', [9]);
		await tub('POR-02-T1', por02, '2026-05-20', 'yielded', [6]);
		await tub('NAR-01-T2', nar01, '2026-06-05', 'yielded', [2, 2]);
		await tub('NAR-01-T3', nar01, '2026-06-20', 'resting', []);
		await tub('POR-01-T4', por01, '2026-06-30', 'resting', [4]);
		await tub('POR-02-T2', por02, '2026-07-01', 'yielded', [50]);
	});

	afterAll(async () => {
		await scratch?.drop();
	});

	it('sums tubs by colony, the first and last day in, the days either side out', async () => {
		const report = await tubYieldReport(context());
		const byColony = section(report.sections, 'by-colony');
		expect(byColony.table.rows).toEqual([
			{
				colony: 'NAR-01 · Big tank',
				species: 'American giant millipede',
				closed: 2,
				yielded: 1,
				yielded_share: 0.5,
				young: 4,
				young_per_tub: 2,
				resting: 1
			},
			{
				colony: 'POR-01 · Shelf bin',
				species: 'Dairy cow isopod',
				closed: 3,
				yielded: 2,
				yielded_share: 0.6667,
				young: 24,
				young_per_tub: 8,
				resting: 1
			},
			{
				colony: 'POR-02 · Orange bin',
				species: 'Dairy cow isopod',
				closed: 1,
				yielded: 1,
				yielded_share: 1,
				young: 6,
				young_per_tub: 6,
				resting: 0
			}
		]);
		expect(byColony.table.totals).toEqual({
			colony: 'All colonies',
			species: null,
			closed: 6,
			yielded: 4,
			yielded_share: 0.6667,
			young: 34,
			young_per_tub: 5.67,
			resting: 2
		});
		expect(byColony.chart).toMatchObject({
			kind: 'bar',
			horizontal: true,
			labelKey: 'colony',
			unit: 'decimal',
			series: [{ key: 'young_per_tub', label: 'Young per closed tub' }]
		});
	});

	it('sums the same tubs by meteorological season, in order', async () => {
		const report = await tubYieldReport(context());
		const bySeason = section(report.sections, 'by-season');
		expect(bySeason.table.rows).toEqual([
			{
				season: 'Winter 2025–26',
				closed: 2,
				yielded: 1,
				yielded_share: 0.5,
				young: 15,
				young_per_tub: 7.5,
				resting: 0
			},
			{
				season: 'Spring 2026',
				closed: 3,
				yielded: 2,
				yielded_share: 0.6667,
				young: 15,
				young_per_tub: 5,
				resting: 0
			},
			{
				season: 'Summer 2026',
				closed: 1,
				yielded: 1,
				yielded_share: 1,
				young: 4,
				young_per_tub: 4,
				resting: 2
			}
		]);
		expect(bySeason.table.totals).toEqual({
			season: 'All seasons',
			closed: 6,
			yielded: 4,
			yielded_share: 0.6667,
			young: 34,
			young_per_tub: 5.67,
			resting: 2
		});
		expect(bySeason.chart).toMatchObject({ kind: 'bar', labelKey: 'season', unit: 'decimal' });
	});

	it('filters by species and by colony; a colony of another species means all', async () => {
		const isopods = await tubYieldReport(
			context({ params: new URLSearchParams({ species: 'porcellio-laevis' }) })
		);
		const colonyFilter = isopods.filters.find((f) => f.key === 'colony');
		expect(colonyFilter?.options).toEqual([
			{ value: '', label: 'All Dairy cow isopod colonies' },
			{ value: 'POR-01', label: 'POR-01 · Shelf bin' },
			{ value: 'POR-02', label: 'POR-02 · Orange bin (retired)' }
		]);
		expect(section(isopods.sections, 'by-colony').table.rows.map((r) => r.colony)).toEqual([
			'POR-01 · Shelf bin',
			'POR-02 · Orange bin'
		]);
		// POR-01 and POR-02: closed 3 + 1 = 4, yielded 3, 3/4 = 0.75, young 30, 30/4 = 7.5, resting 1.
		expect(section(isopods.sections, 'by-colony').table.totals).toMatchObject({
			closed: 4,
			yielded: 3,
			yielded_share: 0.75,
			young: 30,
			young_per_tub: 7.5,
			resting: 1
		});
		// Summer has only POR-01-T4, still resting: no closed tub, so no share and no per-tub figure.
		expect(section(isopods.sections, 'by-season').table.rows).toEqual([
			{
				season: 'Winter 2025–26',
				closed: 1,
				yielded: 1,
				yielded_share: 1,
				young: 15,
				young_per_tub: 15,
				resting: 0
			},
			{
				season: 'Spring 2026',
				closed: 3,
				yielded: 2,
				yielded_share: 0.6667,
				young: 15,
				young_per_tub: 5,
				resting: 0
			},
			{
				season: 'Summer 2026',
				closed: 0,
				yielded: 0,
				yielded_share: null,
				young: 0,
				young_per_tub: null,
				resting: 1
			}
		]);

		const oneColony = await tubYieldReport(
			context({ params: new URLSearchParams({ colony: 'POR-02' }) })
		);
		expect(oneColony.filters.map((f) => f.value)).toEqual(['', 'POR-02']);
		expect(section(oneColony.sections, 'by-colony').table.rows).toHaveLength(1);
		expect(section(oneColony.sections, 'by-colony').table.totals).toMatchObject({
			closed: 1,
			young: 6
		});

		const mismatched = await tubYieldReport(
			context({ params: new URLSearchParams({ species: 'porcellio-laevis', colony: 'NAR-01' }) })
		);
		expect(mismatched.filters.map((f) => f.value)).toEqual(['porcellio-laevis', '']);
		expect(section(mismatched.sections, 'by-colony').table.rows).toHaveLength(2);
	});

	it('shows a quiet season inside the range as zeros', async () => {
		// 2026-06-01 to 2026-12-01: summer holds NAR-01-T2, T3, POR-01-T4, POR-02-T2 (yielded 50);
		// autumn and the start of winter have none and read as zeros.
		const late = await tubYieldReport(context({ from: '2026-06-01', to: '2026-12-01' }));
		expect(section(late.sections, 'by-season').table.rows).toEqual([
			{
				season: 'Summer 2026',
				closed: 2,
				yielded: 2,
				yielded_share: 1,
				young: 54,
				young_per_tub: 27,
				resting: 2
			},
			{
				season: 'Autumn 2026',
				closed: 0,
				yielded: 0,
				yielded_share: null,
				young: 0,
				young_per_tub: null,
				resting: 0
			},
			{
				season: 'Winter 2026–27',
				closed: 0,
				yielded: 0,
				yielded_share: null,
				young: 0,
				young_per_tub: null,
				resting: 0
			}
		]);
	});

	it('says what is missing for an empty range', async () => {
		const quiet = await tubYieldReport(context({ from: '2025-01-01', to: '2025-06-30' }));
		for (const s of quiet.sections) {
			expect(s.table.rows).toEqual([]);
			expect(s.empty).toBe('No resting tub was set aside between Jan 1, 2025 and Jun 30, 2025.');
		}
		// The day after POR-02-T2 was set aside (07-01) to today: quiet seasons alone show nothing.
		const after = await tubYieldReport(context({ from: '2026-07-02', to: '2026-12-01' }));
		for (const s of after.sections) {
			expect(s.table.rows).toEqual([]);
			expect(s.table.totals).toBeUndefined();
		}
		const quietColony = await tubYieldReport(
			context({
				from: '2025-01-01',
				to: '2025-06-30',
				params: new URLSearchParams({ colony: 'NAR-01' })
			})
		);
		expect(quietColony.sections[0]!.empty).toBe(
			'No resting tub from NAR-01 · Big tank was set aside between Jan 1, 2025 and Jun 30, 2025.'
		);
	});

	it('has no money in it: a keeper gets the same figures', async () => {
		const admin = await tubYieldReport(context({ money: true }));
		const keeper = await tubYieldReport(context({ money: false }));
		expect(keeper).toEqual(admin);
		for (const s of keeper.sections) expect(s.table.columns.some((c) => c.money)).toBe(false);
	});
});
