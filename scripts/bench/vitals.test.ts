import { describe, expect, it } from 'vitest';
import {
	CLS_GOOD,
	cumulativeLayoutShift,
	largestContentfulPaint,
	LCP_GOOD_MS,
	readVitalsSample,
	summariseVitals,
	VITALS_COLLECTOR,
	VITALS_READER,
	type LayoutShift,
	type VitalsSample
} from './vitals';

const shift = (startTime: number, value: number, hadRecentInput = false): LayoutShift => ({
	startTime,
	value,
	hadRecentInput,
	sources: ['main']
});

describe('thresholds', () => {
	it('are the published "good" limits', () => {
		// web.dev, "Web Vitals" (from memory): LCP good at or under 2.5 s, CLS at or under 0.1.
		expect(LCP_GOOD_MS).toBe(2500);
		expect(CLS_GOOD).toBe(0.1);
	});
});

// Session windows as web.dev's CLS definition and the web-vitals package's onCLS group
// shifts (from memory): a shift joins the open window if it comes under 1 s after the
// previous shift and under 5 s after the window's first; CLS is the largest window's sum.
describe('cumulativeLayoutShift', () => {
	it('sums shifts less than a second apart into one window', () => {
		// By hand: gaps of 500 ms and 900 ms, so one window: 0.1 + 0.2 + 0.05 = 0.35.
		expect(cumulativeLayoutShift([shift(0, 0.1), shift(500, 0.2), shift(1400, 0.05)])).toBeCloseTo(
			0.35,
			12
		);
	});

	it('starts a new window after a gap of a second and keeps the largest', () => {
		// By hand: 0.1 | 1.5 s gap | 0.3 → windows 0.1 and 0.3, CLS 0.3 (not the sum 0.4).
		expect(cumulativeLayoutShift([shift(0, 0.1), shift(1500, 0.3)])).toBeCloseTo(0.3, 12);
		// Exactly 1000 ms apart is not "under 1 s": two windows.
		expect(cumulativeLayoutShift([shift(0, 0.2), shift(1000, 0.2)])).toBeCloseTo(0.2, 12);
	});

	it('closes a window once it spans five seconds', () => {
		// By hand: shifts every 900 ms at 0 … 6300 of 0.1 each. 4500 − 0 < 5000 joins the
		// first window; 5400 − 0 ≥ 5000 opens a second (5400, 6300). Windows 0.6 and 0.2.
		const steady = Array.from({ length: 8 }, (_, i) => shift(i * 900, 0.1));
		expect(cumulativeLayoutShift(steady)).toBeCloseTo(0.6, 12);
	});

	it('leaves out shifts right after input, and reads entries in time order', () => {
		expect(cumulativeLayoutShift([shift(0, 0.5, true), shift(100, 0.02)])).toBeCloseTo(0.02, 12);
		// Given out of order: 1400, 0, 500 → one window 0.35 as above.
		expect(cumulativeLayoutShift([shift(1400, 0.05), shift(0, 0.1), shift(500, 0.2)])).toBeCloseTo(
			0.35,
			12
		);
		expect(cumulativeLayoutShift([])).toBe(0);
	});
});

describe('largestContentfulPaint', () => {
	it('is the last candidate the browser reported', () => {
		const first = { startTime: 300, size: 1200, element: 'p "Every animal"' };
		const last = { startTime: 820, size: 5400, element: 'h1 "Captive-bred"' };
		expect(largestContentfulPaint([first, last])).toBe(last);
		expect(largestContentfulPaint([])).toBeNull();
	});
});

/** Runs the collector and the reader against stand-ins for the browser's globals. */
function runInFakePage(
	lcpEntries: unknown[],
	shiftEntries: unknown[],
	observeThrows = false
): unknown {
	const callbacks = new Map<string, (list: { getEntries: () => unknown[] }) => void>();
	class FakeObserver {
		constructor(private readonly callback: (list: { getEntries: () => unknown[] }) => void) {}
		observe(options: { type: string; buffered: boolean }) {
			if (observeThrows) throw new TypeError('unsupported entry type');
			expect(options.buffered).toBe(true);
			callbacks.set(options.type, this.callback);
		}
	}
	const window: Record<string, unknown> = {};
	const performance = {
		getEntriesByType: (type: string) => (type === 'navigation' ? [{ responseStart: 42.5 }] : []),
		getEntriesByName: (name: string) =>
			name === 'first-contentful-paint' ? [{ startTime: 310 }] : []
	};
	new Function('window', 'PerformanceObserver', VITALS_COLLECTOR)(window, FakeObserver);
	callbacks.get('largest-contentful-paint')?.({ getEntries: () => lcpEntries });
	callbacks.get('layout-shift')?.({ getEntries: () => shiftEntries });
	return new Function('window', 'performance', `return ${VITALS_READER}`)(window, performance);
}

describe('the collector and reader scripts', () => {
	it('record both entry types and hand back what readVitalsSample accepts', () => {
		const heading = {
			tagName: 'H1',
			textContent: '  Smooth slaters\n  (Porcellio laevis)  ',
			getAttribute: () => null
		};
		const raw = runInFakePage(
			[{ startTime: 640, size: 9000, element: heading }],
			[
				{
					startTime: 700,
					value: 0.07,
					hadRecentInput: false,
					sources: [{ node: { nodeType: 1, tagName: 'NAV' } }, { node: null }]
				}
			]
		);
		expect(readVitalsSample(raw)).toEqual({
			lcp: [{ startTime: 640, size: 9000, element: 'h1 "Smooth slaters (Porcellio laevis)"' }],
			shifts: [{ startTime: 700, value: 0.07, hadRecentInput: false, sources: ['nav', '?'] }],
			fcpMs: 310,
			ttfbMs: 42.5
		});
	});

	it('report a browser that cannot observe the entries', () => {
		expect(() => readVitalsSample(runInFakePage([], [], true))).toThrow(/collector failed/);
	});
});

describe('readVitalsSample', () => {
	it('refuses what is not the reader’s record', () => {
		expect(() => readVitalsSample(null)).toThrow(TypeError);
		expect(() => readVitalsSample({ lcp: [], shifts: null, error: null })).toThrow(TypeError);
		expect(() =>
			readVitalsSample({ lcp: [{ startTime: 'soon', size: 1 }], shifts: [], error: null })
		).toThrow(/entry 0/);
		expect(() =>
			readVitalsSample({ lcp: [], shifts: [{ startTime: 1, value: 0.1 }], error: null })
		).toThrow(/layout-shift entry 0/);
	});
});

describe('summariseVitals', () => {
	const load = (lcp: number, shifts: LayoutShift[]): VitalsSample => ({
		lcp: [
			{ startTime: lcp / 2, size: 100, element: 'p "first"' },
			{ startTime: lcp, size: 900, element: `h1 "at ${lcp}"` }
		],
		shifts,
		fcpMs: lcp / 2,
		ttfbMs: 40
	});

	it('gives medians over the loads, the worst CLS and the largest single shift', () => {
		// By hand: LCPs 900, 1500, 1100 → median 1100 (that load's element); CLS per load
		// 0.05, 0.2 (0.12 + 0.08 within a second) and 0 → median 0.05, worst 0.2.
		const summary = summariseVitals([
			load(900, [shift(800, 0.05)]),
			load(1500, [shift(1000, 0.12), shift(1600, 0.08)]),
			load(1100, [])
		]);
		expect(summary.samples).toBe(3);
		expect(summary.lcpMs).toBe(1100);
		expect(summary.lcpElement).toBe('h1 "at 1100"');
		expect(summary.lcpEachMs).toEqual([900, 1500, 1100]);
		expect(summary.cls).toBeCloseTo(0.05, 12);
		expect(summary.clsWorst).toBeCloseTo(0.2, 12);
		expect(summary.largestShift?.value).toBe(0.12);
		expect(summary.fcpMs).toBe(550);
		expect(summary.ttfbMs).toBe(40);
	});

	it('refuses a load that painted nothing, and an empty list', () => {
		expect(() => summariseVitals([{ lcp: [], shifts: [], fcpMs: null, ttfbMs: null }])).toThrow(
			/no largest contentful paint/
		);
		expect(() => summariseVitals([])).toThrow(RangeError);
	});
});
