import { describe, expect, it } from 'vitest';
import {
	benchRanges,
	interleavedRuns,
	median,
	summariseTiming,
	timingCells,
	type ReportTiming
} from './report-timing';

describe('benchRanges', () => {
	it('draws the page’s default twelve months and five years of months, both to today', () => {
		expect(benchRanges('2026-12-02')).toEqual([
			{ label: '12 months', from: '2026-01-01', to: '2026-12-02' },
			{ label: '5 years', from: '2022-01-01', to: '2026-12-02' }
		]);
		// 60 months back from February 2028 starts in March 2023, leap day or not.
		expect(benchRanges('2028-02-29')[1]).toEqual({
			label: '5 years',
			from: '2023-03-01',
			to: '2028-02-29'
		});
	});
});

describe('median', () => {
	it('takes the middle value, or the mean of the middle two', () => {
		// The textbook definition: median of 3, 1, 2 is 2; of 4, 1, 3, 2 is (2 + 3) / 2.
		expect(median([3, 1, 2])).toBe(2);
		expect(median([4, 1, 3, 2])).toBe(2.5);
		expect(() => median([])).toThrow(RangeError);
	});
});

describe('interleavedRuns', () => {
	it('runs each case right after its baseline, round after round, keeping rounds after warm-up', () => {
		const runs = interleavedRuns(2, 2, 1);
		expect(runs.map((r) => `${r.round}${r.caseIndex}${r.kind[0]}${r.kept ? '+' : '-'}`)).toEqual([
			'00b-',
			'00r-',
			'01b-',
			'01r-',
			'10b+',
			'10r+',
			'11b+',
			'11r+',
			'20b+',
			'20r+',
			'21b+',
			'21r+'
		]);
	});
});

describe('summariseTiming', () => {
	const timing: ReportTiming = {
		report: 'sales',
		range: '12 months',
		from: '2026-01-01',
		to: '2026-12-02',
		status: 'measured',
		problem: null,
		reportMs: [300, 320, 310, 900, 305, 315, 330],
		baselineMs: [5, 6, 4, 5, 5, 7, 5]
	};

	it('gives the median, the nearest-rank p95 and both ratios', () => {
		const row = summariseTiming(timing);
		// Sorted: 300 305 310 315 320 330 900; the 4th is the median; rank ceil(0.95·7) = 7 is p95.
		expect(row.medianMs).toBe(315);
		expect(row.p95Ms).toBe(900);
		expect(row.baselineMedianMs).toBe(5);
		expect(row.vsBaseline).toBe(63);
		expect(row.vsBudget).toBeCloseTo(0.315, 10);
		expect(timingCells(row)).toEqual(['sales', '12 months', '315.0', '900.0', '63.0', '0.315']);
	});

	it('says "not built" or the failure instead of figures', () => {
		const missing = summariseTiming({ ...timing, status: 'not built', reportMs: [] });
		expect(missing.medianMs).toBeNull();
		expect(timingCells(missing)).toEqual(['sales', '12 months', 'not built', '', '', '']);
		const failed = summariseTiming({
			...timing,
			status: 'failed',
			problem: 'relation "x" does not exist',
			reportMs: []
		});
		expect(timingCells(failed)[2]).toBe('failed: relation "x" does not exist');
	});
});
