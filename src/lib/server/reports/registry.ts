// Which module draws which report.
import type { ReportName } from '$lib/reports/report';
import type { ReportBody, ReportContext, ReportRunner } from './context';
import { colonyHealthReport } from './colony-health';
import { salesReport } from './sales';
import { shippingReport } from './shipping';
import { stockDemandReport } from './stock-demand';
import { survivalReport } from './survival';
import { tubYieldReport } from './tub-yield';

// Partial while the reports are being added; runReport refuses a name not here.
const RUNNERS: Partial<Record<ReportName, ReportRunner>> = {
	sales: salesReport,
	shipping: shippingReport,
	'colony-health': colonyHealthReport,
	'stock-demand': stockDemandReport,
	survival: survivalReport,
	'tub-yield': tubYieldReport
};

export function runReport(name: ReportName, context: ReportContext): Promise<ReportBody> {
	const runner = RUNNERS[name];
	if (!runner) throw new Error(`no runner for the ${name} report`);
	return runner(context);
}
