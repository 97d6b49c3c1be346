// The survival report on a scratch database: a hand-made set of clutches, their losses,
// a census, a split and a merge made through the clutch module itself, with every
// expected figure worked out by hand below.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Actor } from '../../src/lib/server/accounts/users';
import { insertClutches } from '../../src/lib/server/clutches/create';
import { merge, recordLoss, recount, split } from '../../src/lib/server/clutches/clutches';
import type { Db } from '../../src/lib/server/db/connect';
import type { ReportSection } from '../../src/lib/reports/report';
import type { ReportContext } from '../../src/lib/server/reports/context';
import { survivalReport } from '../../src/lib/server/reports/survival';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const TODAY = '2026-12-01';
const FROM = '2026-06-01';
const TO = '2026-09-30';
const ISOPOD = 'species:porcellio-laevis';
const MILLIPEDE = 'species:narceus-americanus';

/*
 * The data (range 2026-06-01 to 2026-09-30, today 2026-12-01):
 *
 * Dairy cow isopod, grow-out 10 weeks (sale-ready = found + 70 days)
 *   I0 found 05-31 (the day before the range: out), 30, lost 3.
 *   I1 found 09-01, 40. Sale-ready 11-10. Age today 91 days = 13 weeks.
 *      loss 4 on 09-05 (day 4: counts from week 1)
 *      census 36 → 30 on 09-15 (day 14: −6, counts from week 2, since 09-01 + 14 = 09-15)
 *      loss 2 on 11-20 (day 80: counts from week 12; after sale-ready)
 *      → found 40, lost 12, alive 28.
 *   I2 found 09-30 (the last day: in), 20. Sale-ready 12-09 (not yet). Age 62 days = 8 weeks.
 *      census 20 → 25 on 10-07 (5 missed at the first count: found becomes 25)
 *      loss 5 on 10-20 (day 20: counts from week 3)
 *      → found 25, lost 5, alive 20.
 *   I3 found 10-01 (the day after the range: out), 50, lost 10.
 *
 * American giant millipede, grow-out 20 weeks (sale-ready = found + 140 days)
 *   M4 found 05-01 (out), 6; merged whole into M3 on 08-15.
 *   M1 found 06-10, 30. Sale-ready 10-28. Age 174 days = 24 weeks.
 *      loss 3 on 06-10 (day 0: week 0)
 *      split 10 into M2 on 08-01 (a move, not a death)
 *      loss 1 on 11-01 (day 144: week 21, past the curve; after sale-ready)
 *      → found 30, lost 4, moved out 10, alive 16.
 *   M2 split from M1: found on 06-10, 10 (its own found is 0: they were M1's).
 *      loss 2 on 09-01 (day 83: counts from week 12; before sale-ready 10-28)
 *      → found 10, lost 2, alive 8.
 *   M3 found 07-01, 12. Sale-ready 11-18. Age 153 days = 21 weeks.
 *      took in M4's 6 on 08-15 (found becomes 18, own found stays 12)
 *      loss 3 on 09-09 (day 70: counts from week 10)
 *      → found 18, lost 3, alive 15.
 */

describe('survival report', () => {
	let scratch: ScratchDatabase;
	let db: Db;
	let wren: Actor;
	const code: Record<string, string> = {};

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
		const user = await db
			.insertInto('User')
			.values({ name: 'Wren Calloway', email: 'wren@example.com' })
			.returning('id')
			.executeTakeFirstOrThrow();
		wren = { userId: user.id, ip: '127.0.0.1' };
		const species = async (
			slug: string,
			scientific: string,
			common: string,
			group: 'millipede' | 'isopod' | 'springtail',
			growOutWeeks: number
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
						grow_out_weeks: growOutWeeks
					})
					.returning('id')
					.executeTakeFirstOrThrow()
			).id;
		const isopodId = await species(
			'porcellio-laevis',
			'Porcellio laevis',
			'Dairy cow isopod',
			'isopod',
			10
		);
		const millipedeId = await species(
			'narceus-americanus',
			'Narceus americanus',
			'American giant millipede',
			'millipede',
			20
		);
		// A species with no clutch at all: offered in the filter, never a column.
		await species('folsomia-candida', 'Folsomia candida', 'Springtail culture', 'springtail', 4);

		const bought = async (
			name: string,
			speciesId: number,
			growOutWeeks: number,
			foundOn: string,
			count: number
		) => {
			const [made] = await insertClutches(
				db,
				{
					speciesId,
					growOutWeeks,
					generation: 2,
					foundOn,
					origin: 'bought_in',
					tubId: null,
					tubCheckId: null,
					parts: [{ count, stage: 'hatchling', sizeClass: 'tiny' }]
				},
				wren.userId
			);
			code[name] = made!.code;
		};
		await bought('M4', millipedeId, 20, '2026-05-01', 6);
		await bought('M1', millipedeId, 20, '2026-06-10', 30);
		await bought('M3', millipedeId, 20, '2026-07-01', 12);
		await bought('I0', isopodId, 10, '2026-05-31', 30);
		await bought('I1', isopodId, 10, '2026-09-01', 40);
		await bought('I2', isopodId, 10, '2026-09-30', 20);
		await bought('I3', isopodId, 10, '2026-10-01', 50);

		const ok = (outcome: { ok: boolean }) => expect(outcome.ok).toBe(true);
		const loss = async (name: string, count: number, happenedOn: string) =>
			ok(
				await recordLoss(db, wren, code[name]!, { count, reason: 'found dead', happenedOn }, TODAY)
			);
		const census = async (name: string, countAlive: number, happenedOn: string) => {
			const { version } = await db
				.selectFrom('clutch')
				.select('version')
				.where('code', '=', code[name]!)
				.executeTakeFirstOrThrow();
			ok(
				await recount(
					db,
					wren,
					code[name]!,
					{ countAlive, reason: 'census', happenedOn, version },
					TODAY
				)
			);
		};

		await loss('I0', 3, '2026-06-02');
		await loss('I1', 4, '2026-09-05');
		await census('I1', 30, '2026-09-15');
		await loss('I1', 2, '2026-11-20');
		await census('I2', 25, '2026-10-07');
		await loss('I2', 5, '2026-10-20');
		await loss('I3', 10, '2026-10-02');

		await loss('M1', 3, '2026-06-10');
		// A split and a merge write their events on the day they are given as today.
		const parted = await split(
			db,
			wren,
			code.M1!,
			{ parts: [{ count: 10, sizeClass: null }], note: '' },
			'2026-08-01'
		);
		if (!parted.ok) throw new Error(parted.problem);
		code.M2 = parted.children[0]!.code;
		ok(await merge(db, wren, { intoCode: code.M3!, fromCode: code.M4! }, '2026-08-15'));
		await loss('M2', 2, '2026-09-01');
		await loss('M3', 3, '2026-09-09');
		await loss('M1', 1, '2026-11-01');
	});

	afterAll(async () => {
		await scratch?.drop();
	});

	it('draws the survival curve per species, each week over the clutches old enough', async () => {
		const report = await survivalReport(context());
		const curve = section(report.sections, 'curve');
		// Longest grow-out 20 weeks (more than 16); the oldest clutch (M1) is 24 weeks old: weeks 0–20.
		expect(curve.table.rows.map((row) => row.week)).toEqual(
			Array.from({ length: 21 }, (_, week) => week)
		);
		// Columns by common name: American giant millipede before Dairy cow isopod.
		expect(curve.table.columns.map((c) => c.key)).toEqual(['week', MILLIPEDE, ISOPOD]);
		expect(curve.chart?.kind).toBe('line');
		expect(curve.chart?.series.map((s) => s.key)).toEqual([MILLIPEDE, ISOPOD]);
		expect(curve.chart?.unit).toBe('percent');

		// Isopods: own found I1 40 + I2 25 = 65 while both count (weeks 0–8), then I1's 40.
		//   w0: 65/65 = 1; w1: (65−4)/65 = 0.9385; w2: (65−10)/65 = 0.8462;
		//   w3–8: (65−15)/65 = 0.7692; w9–11: (40−10)/40 = 0.75; w12–13: (40−12)/40 = 0.7;
		//   w14 on: no isopod clutch is 14 weeks old yet.
		const isopods = curve.table.rows.map((row) => row[ISOPOD]);
		expect(isopods).toEqual([
			1,
			0.9385,
			0.8462,
			0.7692,
			0.7692,
			0.7692,
			0.7692,
			0.7692,
			0.7692,
			0.75,
			0.75,
			0.75,
			0.7,
			0.7,
			null,
			null,
			null,
			null,
			null,
			null,
			null
		]);
		// Millipedes: own found M1 30 + M2 0 (split off M1) + M3 12 (not M4's 6) = 42.
		//   w0–9: (42−3)/42 = 0.9286; w10–11: (42−6)/42 = 0.8571; w12–20: (42−8)/42 = 0.8095.
		//   The split (08-01) and merge (08-15) change nothing; M1's loss at day 144 is week 21.
		const millipedes = curve.table.rows.map((row) => row[MILLIPEDE]);
		expect(millipedes).toEqual([
			...Array(10).fill(0.9286),
			...Array(2).fill(0.8571),
			...Array(9).fill(0.8095)
		]);
	});

	it('counts the young that reached sale-ready, per species and in all', async () => {
		const report = await survivalReport(context());
		const saleReady = section(report.sections, 'sale-ready');
		// Millipedes: M1 (10-28), M2 (10-28) and M3 (11-18) are past sale-ready; M2 is M1's
		//   split-off part, so 2 clutches; found 30 + 0 + 12 = 42; lost by sale-ready
		//   3 (M1, not its 11-01 loss) + 2 (M2) + 3 (M3) = 8; reached 34/42 = 0.8095.
		// Isopods: only I1 (11-10; I2's is 12-09): found 40, lost by then 4 + 6 = 10
		//   (not the 11-20 loss); reached 30/40 = 0.75.
		// All: 3 clutches, 82 found, 18 lost, 64/82 = 0.7805.
		expect(saleReady.table.rows).toEqual([
			{
				species: 'American giant millipede',
				clutches: 2,
				found: 42,
				lost: 8,
				reached: 0.8095
			},
			{ species: 'Dairy cow isopod', clutches: 1, found: 40, lost: 10, reached: 0.75 }
		]);
		expect(saleReady.table.totals).toEqual({
			species: 'All species',
			clutches: 3,
			found: 82,
			lost: 18,
			reached: 0.7805
		});
		expect(saleReady.chart).toMatchObject({ horizontal: true, labelKey: 'species' });
		expect(saleReady.chart?.series).toEqual([{ key: 'reached', label: 'Reached sale-ready' }]);
	});

	it('lists each clutch found in the range, the last day in and the days either side out', async () => {
		const report = await survivalReport(context());
		const clutches = section(report.sections, 'clutches');
		expect(clutches.chart).toBeNull();
		// Alive ÷ found: 16/30 = 0.5333, 8/10 = 0.8, 15/18 = 0.8333, 28/40 = 0.7, 20/25 = 0.8.
		expect(clutches.table.rows).toEqual([
			{
				code: code.M1,
				species: 'American giant millipede',
				found_on: '2026-06-10',
				found: 30,
				lost: 4,
				moved_out: 10,
				alive: 16,
				alive_share: 0.5333
			},
			{
				code: code.M2,
				species: 'American giant millipede',
				found_on: '2026-06-10',
				found: 10,
				lost: 2,
				moved_out: 0,
				alive: 8,
				alive_share: 0.8
			},
			{
				code: code.M3,
				species: 'American giant millipede',
				found_on: '2026-07-01',
				found: 18,
				lost: 3,
				moved_out: 0,
				alive: 15,
				alive_share: 0.8333
			},
			{
				code: code.I1,
				species: 'Dairy cow isopod',
				found_on: '2026-09-01',
				found: 40,
				lost: 12,
				moved_out: 0,
				alive: 28,
				alive_share: 0.7
			},
			{
				code: code.I2,
				species: 'Dairy cow isopod',
				found_on: '2026-09-30',
				found: 25,
				lost: 5,
				moved_out: 0,
				alive: 20,
				alive_share: 0.8
			}
		]);
	});

	it('narrows to one species by the filter, and a value not offered means all', async () => {
		const report = await survivalReport(
			context({ params: new URLSearchParams({ species: 'porcellio-laevis' }) })
		);
		expect(report.filters).toEqual([
			{
				key: 'species',
				label: 'Species',
				value: 'porcellio-laevis',
				options: [
					{ value: '', label: 'All species' },
					{ value: 'narceus-americanus', label: 'American giant millipede' },
					{ value: 'porcellio-laevis', label: 'Dairy cow isopod' },
					{ value: 'folsomia-candida', label: 'Springtail culture' }
				]
			}
		]);
		const curve = section(report.sections, 'curve');
		expect(curve.table.columns.map((c) => c.key)).toEqual(['week', ISOPOD]);
		// Isopods alone: longest grow-out 10, so 16 weeks; I1 is 13 weeks old: weeks 0–13.
		expect(curve.table.rows.map((row) => row[ISOPOD])).toEqual([
			1, 0.9385, 0.8462, 0.7692, 0.7692, 0.7692, 0.7692, 0.7692, 0.7692, 0.75, 0.75, 0.75, 0.7, 0.7
		]);
		const saleReady = section(report.sections, 'sale-ready');
		expect(saleReady.table.rows.map((row) => row.species)).toEqual(['Dairy cow isopod']);
		expect(saleReady.table.totals).toMatchObject({ clutches: 1, found: 40, lost: 10 });
		expect(section(report.sections, 'clutches').table.rows.map((row) => row.code)).toEqual([
			code.I1,
			code.I2
		]);

		const unknown = await survivalReport(
			context({ params: new URLSearchParams({ species: 'no-such-species' }) })
		);
		expect(unknown.filters[0]!.value).toBe('');
		expect(section(unknown.sections, 'clutches').table.rows).toHaveLength(5);
	});

	it('says what is missing for a range with no clutch, and for clutches not yet sale-ready', async () => {
		const quiet = await survivalReport(context({ from: '2026-01-01', to: '2026-03-31' }));
		for (const s of quiet.sections) {
			expect(s.table.rows).toEqual([]);
			expect(s.empty).toBe('No clutch was found between Jan 1, 2026 and Mar 31, 2026.');
		}
		expect(section(quiet.sections, 'curve').chart).toBeNull();

		// Only I2 (found 09-30, sale-ready 12-09) in this range: a curve, nothing sale-ready.
		const young = await survivalReport(context({ from: '2026-09-15', to: '2026-09-30' }));
		expect(section(young.sections, 'curve').table.rows.map((row) => row[ISOPOD])).toEqual([
			// 25 found; the 5 lost on day 20 count from week 3 (20/25 = 0.8); 8 weeks old.
			1, 1, 1, 0.8, 0.8, 0.8, 0.8, 0.8, 0.8
		]);
		const saleReady = section(young.sections, 'sale-ready');
		expect(saleReady.table.rows).toEqual([]);
		expect(saleReady.table.totals).toBeUndefined();
		expect(saleReady.empty).toBe(
			'No clutch found between Sep 15, 2026 and Sep 30, 2026 has reached its sale-ready date yet.'
		);
	});

	it('has no money in it: a keeper gets the same figures', async () => {
		const admin = await survivalReport(context({ money: true }));
		const keeper = await survivalReport(context({ money: false }));
		expect(keeper).toEqual(admin);
		for (const s of keeper.sections) expect(s.table.columns.some((c) => c.money)).toBe(false);
	});
});
