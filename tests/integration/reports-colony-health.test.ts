// The colony-health report on a scratch database: a hand-made care log whose expected
// figures are worked out in the comments. Every care-log column is a calendar date (the
// day the keeper logged it), so the range's edges are whole days: the last day is in,
// the day after is out; no time-zone edge applies here.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CareEntryKind, MoistureReading } from '../../src/lib/server/db/schema';
import type { ReportBody, ReportContext } from '../../src/lib/server/reports/context';
import { colonyHealthReport } from '../../src/lib/server/reports/colony-health';
import type { ReportFilter, ReportSection } from '../../src/lib/reports/report';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const TODAY = '2026-12-01';

function found<T>(items: readonly T[], match: (item: T) => boolean): T {
	const item = items.find(match);
	if (item === undefined) throw new Error('a row the test set up is missing');
	return item;
}

describe('colony-health report', () => {
	let scratch: ScratchDatabase;

	function run(
		params: Record<string, string> = {},
		range = { from: '2026-09-01', to: '2026-11-30' }
	) {
		const context: ReportContext = {
			db: scratch.db,
			from: range.from,
			to: range.to,
			timeZone: 'America/New_York',
			today: TODAY,
			money: true,
			params: new URLSearchParams(params)
		};
		return colonyHealthReport(context);
	}

	function section(body: ReportBody, id: string): ReportSection {
		return found(body.sections, (s) => s.id === id);
	}

	function filter(body: ReportBody, key: string): ReportFilter {
		return found(body.filters, (f) => f.key === key);
	}

	beforeAll(async () => {
		scratch = await scratchDatabase();
		const { db } = scratch;
		const base = {
			temp_low_f: 62,
			temp_ideal_low_f: 70,
			temp_ideal_high_f: 78,
			temp_high_f: 86,
			moisture_level: 'moist' as const,
			adult_length_mm: 40,
			grow_out_weeks: 12
		};
		const species = await db
			.insertInto('species')
			.values([
				{
					...base,
					slug: 'narceus-americanus',
					scientific_name: 'Narceus americanus',
					common_name: 'American giant millipede',
					animal_group: 'millipede',
					refresh_interval_days: 120
				},
				{
					...base,
					slug: 'porcellio-laevis',
					scientific_name: 'Porcellio laevis',
					common_name: 'Dairy cow isopod',
					animal_group: 'isopod',
					refresh_interval_days: 90
				}
			])
			.returning(['id', 'slug'])
			.execute();
		const speciesId = (slug: string) => found(species, (s) => s.slug === slug).id;
		const enclosure = {
			enclosure_length_in: '24',
			enclosure_width_in: '12',
			substrate_depth_in: '6'
		};
		const colonies = await db
			.insertInto('colony')
			.values([
				{
					...enclosure,
					code: 'NAR-01',
					name: 'Oak shelf',
					species_id: speciesId('narceus-americanus'),
					started_on: '2025-01-10'
				},
				{
					...enclosure,
					code: 'NAR-02',
					name: 'Cork stack',
					species_id: speciesId('narceus-americanus'),
					started_on: '2026-08-15'
				},
				// Starts after the as-of day: not a colony of the range yet.
				{
					...enclosure,
					code: 'NAR-03',
					name: 'New bin',
					species_id: speciesId('narceus-americanus'),
					started_on: '2026-12-05'
				},
				{
					...enclosure,
					code: 'POR-01',
					name: 'Dairy cow bin',
					species_id: speciesId('porcellio-laevis'),
					started_on: '2025-06-01'
				},
				// Retired inside the range: counted up to its retirement day.
				{
					...enclosure,
					code: 'POR-02',
					name: 'Old tote',
					species_id: speciesId('porcellio-laevis'),
					started_on: '2025-03-01',
					retired_on: '2026-10-10'
				},
				// Retired the day before the range: left out.
				{
					...enclosure,
					code: 'POR-03',
					name: 'Spare tote',
					species_id: speciesId('porcellio-laevis'),
					started_on: '2025-03-01',
					retired_on: '2026-08-31'
				}
			])
			.returning(['id', 'code'])
			.execute();
		const colonyId = (code: string) => found(colonies, (c) => c.code === code).id;

		const entries: {
			code: string;
			kind: CareEntryKind;
			on: string;
			reading?: MoistureReading;
			note?: string;
		}[] = [
			// Refreshes.
			{ code: 'NAR-01', kind: 'substrate_refresh_half', on: '2026-05-20' },
			{ code: 'NAR-01', kind: 'substrate_refresh_full', on: '2026-07-01' },
			{ code: 'NAR-01', kind: 'substrate_refresh_half', on: '2026-12-01' }, // the day after
			{ code: 'POR-01', kind: 'substrate_refresh_half', on: '2026-08-31' }, // the day before
			{ code: 'POR-01', kind: 'substrate_refresh_half', on: '2026-09-01' }, // first day
			{ code: 'POR-01', kind: 'substrate_refresh_full', on: '2026-11-30' }, // last day
			{ code: 'POR-02', kind: 'substrate_refresh_full', on: '2026-05-01' },
			{ code: 'POR-03', kind: 'substrate_refresh_full', on: '2026-03-01' },
			// Moisture checks.
			{ code: 'NAR-01', kind: 'moisture_check', on: '2026-09-03', reading: 'right' },
			{ code: 'NAR-01', kind: 'moisture_check', on: '2026-09-10', reading: 'dry' },
			{ code: 'NAR-01', kind: 'moisture_check', on: '2026-10-01', reading: 'right' },
			{ code: 'NAR-01', kind: 'moisture_check', on: '2026-11-30', reading: 'wet' },
			{ code: 'NAR-01', kind: 'moisture_check', on: '2026-12-01', reading: 'dry' }, // out
			{ code: 'POR-01', kind: 'moisture_check', on: '2026-08-31', reading: 'wet' }, // out
			{ code: 'POR-01', kind: 'moisture_check', on: '2026-09-01', reading: 'right' },
			{ code: 'POR-01', kind: 'moisture_check', on: '2026-11-15', reading: 'right' },
			{ code: 'POR-02', kind: 'moisture_check', on: '2026-10-05', reading: 'wet' },
			// Molts and pest notes.
			{ code: 'NAR-01', kind: 'pest_note', on: '2026-08-31', note: 'Before the range.' },
			{ code: 'NAR-01', kind: 'molt_seen', on: '2026-09-15' },
			{
				code: 'NAR-01',
				kind: 'pest_note',
				on: '2026-10-02',
				note: 'Fungus gnats at the wet end; let the top dry.'
			},
			{
				code: 'NAR-01',
				kind: 'pest_note',
				on: '2026-11-20',
				note: 'A few grain mites on old fruit, removed.'
			},
			{ code: 'NAR-01', kind: 'molt_seen', on: '2026-11-30' },
			{ code: 'NAR-01', kind: 'molt_seen', on: '2026-12-01' }, // out
			{
				code: 'POR-01',
				kind: 'pest_note',
				on: '2026-09-01',
				note: 'Mites on the cork bark; bark replaced.'
			},
			{ code: 'POR-02', kind: 'molt_seen', on: '2026-10-08' },
			// Other kinds count nowhere.
			{ code: 'NAR-02', kind: 'leaf_top_up', on: '2026-10-01' },
			{ code: 'NAR-02', kind: 'protein', on: '2026-10-02' }
		];
		await db
			.insertInto('care_log_entry')
			.values(
				entries.map((e) => ({
					colony_id: colonyId(e.code),
					kind: e.kind,
					logged_on: e.on,
					moisture_reading: e.reading ?? null,
					note: e.note ?? ''
				}))
			)
			.execute();
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	it('refresh: days since the last refresh as of the last day, beside the interval, overdue first', async () => {
		const refresh = section(await run(), 'refresh');
		// As of 2026-11-30 (the range ends before today):
		// NAR-01: last 07-01, 152 days (31 + 31 + 30 + 31 + 29), interval 120, overdue 32.
		// POR-02: retired 10-10, last 05-01, 162 days (31+30+31+31+30+9), interval 90, overdue 72.
		// NAR-02: never refreshed, from its start 08-15: 107 days (17 + 30 + 31 + 29), not due.
		// POR-01: refreshed on 11-30: 0 days; 09-01 and 11-30 are in the range, 08-31 is not.
		// NAR-03 (starts 12-05) and POR-03 (retired 08-31) are not colonies of the range.
		expect(refresh.table.rows).toEqual([
			{
				colony: 'POR-02 · Old tote',
				species: 'Dairy cow isopod',
				last_refresh: '2026-05-01',
				counted_from: 'Last refresh',
				days_since: 162,
				interval: 90,
				days_overdue: 72,
				refreshes: 0
			},
			{
				colony: 'NAR-01 · Oak shelf',
				species: 'American giant millipede',
				last_refresh: '2026-07-01',
				counted_from: 'Last refresh',
				days_since: 152,
				interval: 120,
				days_overdue: 32,
				refreshes: 0
			},
			{
				colony: 'NAR-02 · Cork stack',
				species: 'American giant millipede',
				last_refresh: null,
				counted_from: 'Start on Aug 15, 2026 (never refreshed)',
				days_since: 107,
				interval: 120,
				days_overdue: 0,
				refreshes: 0
			},
			{
				colony: 'POR-01 · Dairy cow bin',
				species: 'Dairy cow isopod',
				last_refresh: '2026-11-30',
				counted_from: 'Last refresh',
				days_since: 0,
				interval: 90,
				days_overdue: 0,
				refreshes: 2
			}
		]);
		expect(refresh.table.totals).toEqual({ colony: '4 colonies, 2 overdue', refreshes: 2 });
		expect(refresh.chart?.series.map((s) => s.key)).toEqual(['days_since', 'interval']);
		expect(refresh.chart?.horizontal).toBe(true);
	});

	it('refresh: a range running past today is counted as of today', async () => {
		const refresh = section(await run({}, { from: '2026-11-01', to: '2026-12-31' }), 'refresh');
		// As of 2026-12-01: NAR-01's refresh that day counts (0 days, 1 in the range);
		// NAR-02 is 108 days from its start; POR-02 retired before the range: left out.
		expect(
			refresh.table.rows.map((r) => [
				r.colony,
				r.last_refresh,
				r.days_since,
				r.days_overdue,
				r.refreshes
			])
		).toEqual([
			['NAR-02 · Cork stack', null, 108, 0, 0],
			['POR-01 · Dairy cow bin', '2026-11-30', 1, 0, 1],
			['NAR-01 · Oak shelf', '2026-12-01', 0, 0, 1]
		]);
	});

	it('moisture: readings per month of the range, the last day in and the day after out', async () => {
		const moisture = section(await run(), 'moisture');
		// Sep: NAR-01 right (09-03), dry (09-10); POR-01 right (09-01) — POR-01's 08-31 is out.
		// Oct: NAR-01 right (10-01); POR-02 wet (10-05).
		// Nov: POR-01 right (11-15); NAR-01 wet (11-30) — its 12-01 reading is out.
		expect(moisture.table.rows).toEqual([
			{ month: '2026-09', dry: 1, right: 2, wet: 0, readings: 3, share_right: 0.6667 },
			{ month: '2026-10', dry: 0, right: 1, wet: 1, readings: 2, share_right: 0.5 },
			{ month: '2026-11', dry: 0, right: 1, wet: 1, readings: 2, share_right: 0.5 }
		]);
		// 4 right of 7: 0.571428… kept to four decimals.
		expect(moisture.table.totals).toEqual({
			month: 'All months',
			dry: 1,
			right: 4,
			wet: 2,
			readings: 7,
			share_right: 0.5714
		});
		expect(moisture.chart?.kind).toBe('stacked');
	});

	it('molts and pests: counts per colony in the range and the latest pest note', async () => {
		const molts = section(await run(), 'molts-pests');
		// NAR-01: molts 09-15, 11-30 (12-01 out); pests 10-02, 11-20 (08-31 out): latest 11-20.
		// NAR-02 logged only a leaf top-up and protein: no row.
		expect(molts.table.rows).toEqual([
			{
				colony: 'NAR-01 · Oak shelf',
				species: 'American giant millipede',
				molts: 2,
				pests: 2,
				last_pest_on: '2026-11-20',
				last_pest_note: 'A few grain mites on old fruit, removed.'
			},
			{
				colony: 'POR-01 · Dairy cow bin',
				species: 'Dairy cow isopod',
				molts: 0,
				pests: 1,
				last_pest_on: '2026-09-01',
				last_pest_note: 'Mites on the cork bark; bark replaced.'
			},
			{
				colony: 'POR-02 · Old tote',
				species: 'Dairy cow isopod',
				molts: 1,
				pests: 0,
				last_pest_on: null,
				last_pest_note: null
			}
		]);
		expect(molts.table.totals).toEqual({ colony: 'All colonies', molts: 3, pests: 3 });
	});

	it('filters by species, then by a colony of that species', async () => {
		const body = await run({ species: 'porcellio-laevis' });
		expect(body.filters.map((f) => [f.key, f.value])).toEqual([
			['species', 'porcellio-laevis'],
			['colony', '']
		]);
		// The colony list follows the species; POR-03 was retired before the range.
		expect(filter(body, 'colony').options.map((o) => o.value)).toEqual(['', 'POR-01', 'POR-02']);
		expect(section(body, 'refresh').table.rows.map((r) => r.colony)).toEqual([
			'POR-02 · Old tote',
			'POR-01 · Dairy cow bin'
		]);
		// Sep: POR-01 right; Oct: POR-02 wet; Nov: POR-01 right.
		expect(
			section(body, 'moisture').table.rows.map((r) => [r.month, r.dry, r.right, r.wet])
		).toEqual([
			['2026-09', 0, 1, 0],
			['2026-10', 0, 0, 1],
			['2026-11', 0, 1, 0]
		]);

		const oneColony = await run({ colony: 'NAR-01' });
		expect(section(oneColony, 'refresh').table.rows.map((r) => r.colony)).toEqual([
			'NAR-01 · Oak shelf'
		]);
		expect(section(oneColony, 'moisture').table.totals).toMatchObject({
			dry: 1,
			right: 2,
			wet: 1,
			readings: 4
		});
		expect(section(oneColony, 'molts-pests').table.rows).toHaveLength(1);

		// A colony of another species, or a made-up value, reads as all.
		const mismatched = await run({ species: 'porcellio-laevis', colony: 'NAR-01' });
		expect(filter(mismatched, 'colony').value).toBe('');
		expect(section(mismatched, 'refresh').table.rows).toHaveLength(2);
		const unknown = await run({ species: 'no-such-species' });
		expect(filter(unknown, 'species').value).toBe('');
		expect(section(unknown, 'refresh').table.rows).toHaveLength(4);
	});

	it('an empty range says what is missing instead of drawing zeros', async () => {
		const quiet = await run({}, { from: '2026-01-01', to: '2026-01-31' });
		// The colonies existed (refresh rows), but nothing was logged in January.
		expect(section(quiet, 'refresh').table.rows.length).toBeGreaterThan(0);
		expect(section(quiet, 'moisture').table.rows).toEqual([]);
		expect(section(quiet, 'moisture').table.totals).toBeUndefined();
		expect(section(quiet, 'moisture').empty).toBe(
			'No moisture check was logged for the colonies from 2026-01-01 to 2026-01-31.'
		);
		expect(section(quiet, 'molts-pests').table.rows).toEqual([]);

		const beforeAny = await run({}, { from: '2024-01-01', to: '2024-12-31' });
		expect(section(beforeAny, 'refresh').table.rows).toEqual([]);
		expect(section(beforeAny, 'refresh').table.totals).toBeUndefined();
		expect(section(beforeAny, 'refresh').empty).toBe(
			'No colony was kept from 2024-01-01 to 2024-12-31.'
		);
	});

	it('has no money: a keeper gets the same report', async () => {
		const admin = await run();
		const keeper = await colonyHealthReport({
			db: scratch.db,
			from: '2026-09-01',
			to: '2026-11-30',
			timeZone: 'America/New_York',
			today: TODAY,
			money: false,
			params: new URLSearchParams()
		});
		expect(keeper).toEqual(admin);
		expect(admin.sections.flatMap((s) => s.table.columns).some((c) => c.money)).toBe(false);
	});
});
