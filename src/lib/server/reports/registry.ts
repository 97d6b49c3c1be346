// Which module draws which report, and the one read-only snapshot each report runs in.
import { sql } from 'kysely';
import type { ReportName } from '$lib/reports/report';
import type { ReportBody, ReportContext, ReportRunner } from './context';
import { colonyHealthReport } from './colony-health';
import { salesReport } from './sales';
import { shippingReport } from './shipping';
import { stockDemandReport } from './stock-demand';
import { survivalReport } from './survival';
import { tubYieldReport } from './tub-yield';

const RUNNERS: Record<ReportName, ReportRunner> = {
	sales: salesReport,
	shipping: shippingReport,
	'colony-health': colonyHealthReport,
	'stock-demand': stockDemandReport,
	survival: survivalReport,
	'tub-yield': tubYieldReport
};

/**
 * Runs a report in one repeatable-read, read-only transaction, so its sections agree
 * with each other even while sales go on. JIT compilation is off for it: these are
 * short aggregates, and compiling them costs more than it saves (measured on the
 * shipping report over 100,000 orders: 1.1 s of a 1.5 s query was compiling), and
 * sorts get room (about 10% off the sales report over five years).
 */
export function runReport(name: ReportName, context: ReportContext): Promise<ReportBody> {
	const runner = RUNNERS[name];
	return context.db
		.transaction()
		.setIsolationLevel('repeatable read')
		.setAccessMode('read only')
		.execute(async (trx) => {
			await sql`set local jit = off`.execute(trx);
			// Five years of order lines sort and hash in memory rather than spilling to disk.
			await sql`set local work_mem = '64MB'`.execute(trx);
			return runner({ ...context, db: trx });
		});
}
