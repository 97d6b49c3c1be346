// The bench's reports phase: every owner's report drawn in-process on the bench database,
// for the default range and for five years, each run timed beside a baseline query in
// the same round. Reports the registry does not have yet are listed as not built.
import { performance } from 'node:perf_hooks';
import { sql } from 'kysely';
import { REPORT_NAMES, REPORTS, type ReportName } from '../../src/lib/reports/report';
import type { Db } from '../../src/lib/server/db/connect';
import type { ReportContext } from '../../src/lib/server/reports/context';
import {
	benchRanges,
	interleavedRuns,
	summariseTiming,
	type ReportTiming,
	type ReportTimingRow
} from './report-timing';

/** The baseline: one cheap aggregate over the generated orders, a floor for any report. */
export const BASELINE_SQL = 'select count(*) from customer_order';

export interface ReportsPhaseOptions {
	today: string;
	timeZone: string;
	rounds: number;
	warmup: number;
	/** Measured rounds stop after the one that passes this; at least one is always kept. */
	maxSeconds: number;
	say: (message: string) => void;
}

export interface ReportsPhaseResult {
	rows: ReportTimingRow[];
	rounds: number;
	baselineSql: string;
}

type RunReport = (name: ReportName, context: ReportContext) => Promise<unknown>;

interface Case {
	timing: ReportTiming;
	name: ReportName;
	context: ReportContext;
}

/** How one run of a report went: a runner missing from the registry throws before it starts. */
async function attempt(
	runReport: RunReport,
	item: Case
): Promise<{ ok: true } | { ok: false; built: boolean; problem: string }> {
	let pending: Promise<unknown>;
	try {
		pending = runReport(item.name, item.context);
	} catch (error) {
		// The registry refuses a name it has no runner for before any query runs.
		return {
			ok: false,
			built: false,
			problem: error instanceof Error ? error.message : String(error)
		};
	}
	try {
		await pending;
		return { ok: true };
	} catch (error) {
		const problem = error instanceof Error ? error.message : String(error);
		// A registry that looks its runner up inside the transaction fails there instead.
		const built = !/\bno runner\b|\brunner is not a function\b/i.test(problem);
		return { ok: false, built, problem };
	}
}

export async function measureReports(
	db: Db,
	opts: ReportsPhaseOptions
): Promise<ReportsPhaseResult> {
	// Loaded here, not at the top: a report module that does not load yet costs this phase
	// only, never the catalogue figures before it.
	const { runReport } = (await import('../../src/lib/server/reports/registry')) as {
		runReport: RunReport;
	};
	const cases: Case[] = [];
	for (const name of REPORT_NAMES) {
		// A report of "now" has no range: drawn once, for today.
		const ranges = REPORTS[name].usesRange
			? benchRanges(opts.today)
			: [{ label: 'as of today', from: opts.today, to: opts.today }];
		for (const range of ranges)
			cases.push({
				name,
				timing: {
					report: name,
					range: range.label,
					from: range.from,
					to: range.to,
					status: 'measured',
					problem: null,
					reportMs: [],
					baselineMs: []
				},
				context: {
					db,
					from: range.from,
					to: range.to,
					timeZone: opts.timeZone,
					today: opts.today,
					money: true,
					params: new URLSearchParams()
				}
			});
	}

	const started = performance.now();
	let keptRounds = 0;
	let stopAfter = opts.warmup + opts.rounds;
	for (const run of interleavedRuns(cases.length, opts.rounds, opts.warmup)) {
		if (run.round >= stopAfter) break;
		const item = cases[run.caseIndex] as Case;
		if (item.timing.status !== 'measured') continue;
		const t0 = performance.now();
		if (run.kind === 'baseline') {
			await sql.raw(BASELINE_SQL).execute(db);
			if (run.kept) item.timing.baselineMs.push(performance.now() - t0);
		} else {
			const outcome = await attempt(runReport, item);
			const elapsed = performance.now() - t0;
			if (!outcome.ok) {
				item.timing.status = outcome.built ? 'failed' : 'not built';
				item.timing.problem = outcome.problem;
				item.timing.reportMs = [];
				item.timing.baselineMs = [];
			} else if (run.kept) item.timing.reportMs.push(elapsed);
		}
		const lastOfRound = run.caseIndex === cases.length - 1 && run.kind === 'report';
		if (lastOfRound) {
			if (run.kept) keptRounds++;
			else
				opts.say(
					`  … warm-up round done in ${((performance.now() - started) / 1000).toFixed(1)} s`
				);
			if (run.kept && performance.now() - started > opts.maxSeconds * 1000) {
				opts.say(`  … stopping after ${keptRounds} rounds: over ${opts.maxSeconds} s`);
				stopAfter = run.round + 1;
			}
		}
	}
	return {
		rows: cases.map((c) => summariseTiming(c.timing)),
		rounds: keptRounds,
		baselineSql: BASELINE_SQL
	};
}
