// Pure helpers of the bench's reports phase: which ranges each report is drawn for, the
// order the timed runs go in, and the summary of the timings. No I/O, so each is tested.
import { defaultRange, monthStartBefore, parseReportRange } from '../../src/lib/reports/range';
import { percentile } from './measure';

/** What a report may take on the demo plus the generated orders (issue 9). */
export const REPORT_BUDGET_MS = 1000;

export interface BenchRange {
	label: string;
	from: string;
	to: string;
}

/**
 * The default range (this month and the eleven before it) and the longest the page
 * allows, five years of months: this month and the 59 before it, up to today.
 */
export function benchRanges(today: string): BenchRange[] {
	const longest = { from: monthStartBefore(today, 59), to: today };
	const checked = parseReportRange(new URLSearchParams(longest), today);
	if (!checked.ok)
		throw new RangeError(`the five-year range ${longest.from}…${longest.to} is refused`);
	return [
		{ label: '12 months', ...defaultRange(today) },
		{ label: '5 years', ...longest }
	];
}

/** The statistical median: the middle value, or the mean of the middle two. */
export function median(values: readonly number[]): number {
	if (values.length === 0) throw new RangeError('median of an empty list');
	const sorted = [...values].sort((a, b) => a - b);
	const mid = sorted.length >> 1;
	return sorted.length % 2 === 1
		? (sorted[mid] as number)
		: ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

/**
 * The order of the timed runs: each round takes every case in turn, and each case right
 * after its own baseline query, so a case and its baseline see the same moment of the
 * machine (A B A B …). Rounds before `warmup` are run but not kept.
 */
export function interleavedRuns(
	cases: number,
	rounds: number,
	warmup: number
): { round: number; caseIndex: number; kind: 'baseline' | 'report'; kept: boolean }[] {
	const runs: { round: number; caseIndex: number; kind: 'baseline' | 'report'; kept: boolean }[] =
		[];
	for (let round = 0; round < warmup + rounds; round++)
		for (let caseIndex = 0; caseIndex < cases; caseIndex++)
			for (const kind of ['baseline', 'report'] as const)
				runs.push({ round, caseIndex, kind, kept: round >= warmup });
	return runs;
}

export type ReportTimingStatus = 'measured' | 'not built' | 'failed';

export interface ReportTiming {
	report: string;
	range: string;
	from: string;
	to: string;
	status: ReportTimingStatus;
	/** Why it failed, in the runner's words. */
	problem: string | null;
	reportMs: number[];
	baselineMs: number[];
}

export interface ReportTimingRow {
	report: string;
	range: string;
	from: string;
	to: string;
	status: ReportTimingStatus;
	problem: string | null;
	rounds: number;
	medianMs: number | null;
	p95Ms: number | null;
	baselineMedianMs: number | null;
	/** Median ÷ the median of the baseline runs taken beside it. */
	vsBaseline: number | null;
	/** Median ÷ the one-second budget: under 1 is within it. */
	vsBudget: number | null;
}

export function summariseTiming(timing: ReportTiming): ReportTimingRow {
	const measured = timing.status === 'measured' && timing.reportMs.length > 0;
	const medianMs = measured ? median(timing.reportMs) : null;
	const baselineMedianMs =
		measured && timing.baselineMs.length > 0 ? median(timing.baselineMs) : null;
	return {
		report: timing.report,
		range: timing.range,
		from: timing.from,
		to: timing.to,
		status: timing.status,
		problem: timing.problem,
		rounds: timing.reportMs.length,
		medianMs,
		p95Ms: measured ? percentile(timing.reportMs, 95) : null,
		baselineMedianMs,
		vsBaseline: medianMs !== null && baselineMedianMs ? medianMs / baselineMedianMs : null,
		vsBudget: medianMs !== null ? medianMs / REPORT_BUDGET_MS : null
	};
}

/** The printed table's cells: a missing report says so in the median column. */
export function timingCells(row: ReportTimingRow): string[] {
	const ms = (value: number | null) => (value === null ? '' : value.toFixed(1));
	const ratio = (value: number | null, digits: number) =>
		value === null ? '' : value.toFixed(digits);
	if (row.status !== 'measured') {
		const said = row.status === 'failed' ? `failed: ${row.problem ?? 'unknown'}` : 'not built';
		return [row.report, row.range, said, '', '', ''];
	}
	return [
		row.report,
		row.range,
		ms(row.medianMs),
		ms(row.p95Ms),
		ratio(row.vsBaseline, 1),
		ratio(row.vsBudget, 3)
	];
}

export const TIMING_HEADER = [
	'report',
	'range',
	'median ms',
	'p95 ms',
	'÷ baseline',
	'÷ 1 s budget'
] as const;
