// Pure parts of the bench's lab Core Web Vitals: the script the browser runs to record
// largest-contentful-paint and layout-shift entries, reading what it recorded, and working
// out LCP and CLS from those entries as the web-vitals definitions do. No I/O here.
import { median } from './report-timing';

/** The "good" thresholds of Core Web Vitals (web.dev, "Web Vitals"): LCP at most 2.5 s, CLS at most 0.1. */
export const LCP_GOOD_MS = 2500;
export const CLS_GOOD = 0.1;

/** Layout shifts more than 1 s apart, or a window longer than 5 s, start a new session window. */
export const SESSION_GAP_MS = 1000;
export const SESSION_MAX_MS = 5000;

/** The global the collector fills; the page never reads it. */
export const VITALS_GLOBAL = '__hatchlotVitals';

/**
 * Runs before any of the page's own scripts (Playwright's addInitScript). Plain JavaScript
 * in a string: a function would be serialised with whatever helpers the TypeScript loader
 * added to it. `buffered: true` also delivers entries recorded before the observer started.
 */
export const VITALS_COLLECTOR = `(() => {
	const store = { lcp: [], shifts: [], error: null };
	Object.defineProperty(window, ${JSON.stringify(VITALS_GLOBAL)}, { value: store });
	const describe = (element) => {
		if (!element) return '';
		const text = (element.textContent || element.getAttribute('alt') || '').replace(/\\s+/g, ' ').trim();
		return element.tagName.toLowerCase() + (text ? ' "' + text.slice(0, 48) + '"' : '');
	};
	const moved = (node) =>
		!node ? '?' : node.nodeType === 1 ? node.tagName.toLowerCase() : node.nodeName.toLowerCase();
	try {
		new PerformanceObserver((list) => {
			for (const entry of list.getEntries())
				store.lcp.push({ startTime: entry.startTime, size: entry.size, element: describe(entry.element) });
		}).observe({ type: 'largest-contentful-paint', buffered: true });
		new PerformanceObserver((list) => {
			for (const entry of list.getEntries())
				store.shifts.push({
					startTime: entry.startTime,
					value: entry.value,
					hadRecentInput: entry.hadRecentInput,
					sources: (entry.sources || []).map((source) => moved(source.node))
				});
		}).observe({ type: 'layout-shift', buffered: true });
	} catch (error) {
		store.error = String(error);
	}
})();`;

/** Evaluated in the page once it has settled: the collector's entries and two timings beside them. */
export const VITALS_READER = `(() => {
	const store = window[${JSON.stringify(VITALS_GLOBAL)}];
	const navigation = performance.getEntriesByType('navigation')[0];
	const fcp = performance.getEntriesByName('first-contentful-paint')[0];
	return {
		lcp: store ? store.lcp : null,
		shifts: store ? store.shifts : null,
		error: store ? store.error : 'the collector did not run',
		fcpMs: fcp ? fcp.startTime : null,
		ttfbMs: navigation ? navigation.responseStart : null
	};
})()`;

export interface PaintCandidate {
	startTime: number;
	size: number;
	/** The element's tag and the start of its text, to say what the largest paint was. */
	element: string;
}

export interface LayoutShift {
	startTime: number;
	value: number;
	hadRecentInput: boolean;
	/** What moved (up to five nodes, as the browser lists them), to say where a shift came from. */
	sources: string[];
}

export interface VitalsSample {
	lcp: PaintCandidate[];
	shifts: LayoutShift[];
	fcpMs: number | null;
	ttfbMs: number | null;
}

const isRecord = (value: unknown): value is Record<string, unknown> =>
	typeof value === 'object' && value !== null && !Array.isArray(value);
const finite = (value: unknown): value is number =>
	typeof value === 'number' && Number.isFinite(value);

/** What VITALS_READER returned, checked: a page without the collector's entries is refused. */
export function readVitalsSample(raw: unknown): VitalsSample {
	if (!isRecord(raw)) throw new TypeError('the page returned no vitals record');
	if (typeof raw.error === 'string') throw new TypeError(`the collector failed: ${raw.error}`);
	if (!Array.isArray(raw.lcp) || !Array.isArray(raw.shifts))
		throw new TypeError('the vitals record lacks its entry lists');
	const lcp = raw.lcp.map((entry, index): PaintCandidate => {
		if (!isRecord(entry) || !finite(entry.startTime) || !finite(entry.size))
			throw new TypeError(`largest-contentful-paint entry ${index} is malformed`);
		return {
			startTime: entry.startTime,
			size: entry.size,
			element: typeof entry.element === 'string' ? entry.element : ''
		};
	});
	const shifts = raw.shifts.map((entry, index): LayoutShift => {
		if (
			!isRecord(entry) ||
			!finite(entry.startTime) ||
			!finite(entry.value) ||
			typeof entry.hadRecentInput !== 'boolean'
		)
			throw new TypeError(`layout-shift entry ${index} is malformed`);
		const sources = Array.isArray(entry.sources)
			? entry.sources.filter((source): source is string => typeof source === 'string')
			: [];
		return {
			startTime: entry.startTime,
			value: entry.value,
			hadRecentInput: entry.hadRecentInput,
			sources
		};
	});
	return {
		lcp,
		shifts,
		fcpMs: finite(raw.fcpMs) ? raw.fcpMs : null,
		ttfbMs: finite(raw.ttfbMs) ? raw.ttfbMs : null
	};
}

/** LCP: the last candidate the browser reported (each later one is larger), or null if none. */
export function largestContentfulPaint(
	candidates: readonly PaintCandidate[]
): PaintCandidate | null {
	return candidates.length > 0 ? (candidates[candidates.length - 1] ?? null) : null;
}

/**
 * CLS: the largest sum of layout-shift scores in one session window. Shifts right after
 * user input do not count; a window closes after a 1 s gap or once it spans 5 s.
 */
export function cumulativeLayoutShift(shifts: readonly LayoutShift[]): number {
	let largest = 0;
	let windowSum = 0;
	let windowStart = 0;
	let previous = 0;
	let open = false;
	const ordered = shifts
		.filter((shift) => !shift.hadRecentInput)
		.sort((a, b) => a.startTime - b.startTime);
	for (const shift of ordered) {
		if (
			open &&
			shift.startTime - previous < SESSION_GAP_MS &&
			shift.startTime - windowStart < SESSION_MAX_MS
		) {
			windowSum += shift.value;
		} else {
			windowSum = shift.value;
			windowStart = shift.startTime;
			open = true;
		}
		previous = shift.startTime;
		largest = Math.max(largest, windowSum);
	}
	return largest;
}

export interface PageVitals {
	samples: number;
	/** Median over the samples of each load's LCP, in ms. */
	lcpMs: number;
	/** The largest paint of the median load, to say what it was. */
	lcpElement: string;
	/** Median and worst CLS over the samples. */
	cls: number;
	clsWorst: number;
	fcpMs: number | null;
	ttfbMs: number | null;
	lcpEachMs: number[];
	clsEach: number[];
	/** The largest single shift of any load, with what moved, or null when nothing shifted. */
	largestShift: LayoutShift | null;
}

/** Every load of one page at one viewport, summed up as medians; a load with no LCP is refused. */
export function summariseVitals(samples: readonly VitalsSample[]): PageVitals {
	if (samples.length === 0) throw new RangeError('no page loads to sum up');
	const loads = samples.map((sample, index) => {
		const lcp = largestContentfulPaint(sample.lcp);
		if (!lcp) throw new RangeError(`load ${index + 1} reported no largest contentful paint`);
		return { lcp, cls: cumulativeLayoutShift(sample.shifts), sample };
	});
	const lcpEachMs = loads.map((load) => load.lcp.startTime);
	const clsEach = loads.map((load) => load.cls);
	const lcpMs = median(lcpEachMs);
	const nearest = loads.reduce((a, b) =>
		Math.abs(b.lcp.startTime - lcpMs) < Math.abs(a.lcp.startTime - lcpMs) ? b : a
	);
	const known = (values: (number | null)[]) => values.filter((v): v is number => v !== null);
	const fcp = known(samples.map((s) => s.fcpMs));
	const ttfb = known(samples.map((s) => s.ttfbMs));
	const counted = samples.flatMap((s) => s.shifts.filter((shift) => !shift.hadRecentInput));
	const largestShift = counted.reduce<LayoutShift | null>(
		(worst, shift) => (worst === null || shift.value > worst.value ? shift : worst),
		null
	);
	return {
		samples: samples.length,
		lcpMs,
		lcpElement: nearest.lcp.element,
		cls: median(clsEach),
		clsWorst: Math.max(...clsEach),
		fcpMs: fcp.length > 0 ? median(fcp) : null,
		ttfbMs: ttfb.length > 0 ? median(ttfb) : null,
		lcpEachMs,
		clsEach,
		largestShift
	};
}
