// GET /api/manage/reports/<name>: the report as JSON, or one section's table as CSV
// (?format=csv&section=<id>). Keepers get every report without its money columns;
// the money is taken out here, on the server, never hidden by the page.
import { error, json, type RequestEvent } from '@sveltejs/kit';
import { stringify } from 'csv-stringify/sync';
import { env } from '$env/dynamic/private';
import { todayInZone } from '$lib/format/dates';
import { csvHeader, csvValue, withoutMoney } from '$lib/reports/cells';
import { parseReportRange } from '$lib/reports/range';
import { REPORTS, isReportName, type ReportResult, type ReportSection } from '$lib/reports/report';
import { requireRole } from '$lib/server/auth/guard';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { runReport } from './registry';
import { logger } from '../log';

function refuse(status: number, message: string, asCsv: boolean): Response {
	return asCsv
		? new Response(message, { status, headers: { 'content-type': 'text/plain; charset=utf-8' } })
		: json({ message }, { status });
}

/** One section's table as RFC 4180 CSV (CRLF records), with a totals row when it has one. */
export function sectionCsv(section: ReportSection): string {
	const { columns, rows, totals } = section.table;
	const records = [columns.map(csvHeader)];
	for (const row of rows) records.push(columns.map((c) => csvValue(c.kind, row[c.key] ?? null)));
	if (totals) records.push(columns.map((c) => csvValue(c.kind, totals[c.key] ?? null)));
	return stringify(records, { record_delimiter: 'windows' });
}

export async function reportEndpoint(
	event: Pick<RequestEvent, 'url' | 'locals' | 'params'>,
	name: string
): Promise<Response> {
	const user = requireRole(event, 'keeper');
	const format = event.url.searchParams.get('format') ?? 'json';
	const asCsv = format === 'csv';
	if (format !== 'json' && !asCsv) return refuse(400, 'Format must be json or csv.', false);
	if (!isReportName(name)) return refuse(404, 'There is no such report.', asCsv);

	const db = getDb();
	let timeZone: string;
	try {
		timeZone = await resolveShopTimeZone(db, env.SHOP_TIME_ZONE);
	} catch (cause) {
		logger.error({ err: cause }, '[reports] ledger unavailable');
		error(503, 'The ledger cannot be reached just now. Check that PostgreSQL is running.');
	}
	const today = todayInZone(timeZone);
	const range = parseReportRange(event.url.searchParams, today);
	if (!range.ok) {
		const message = Object.values(range.errors).join(' ');
		// The page puts each reason beside its field.
		return asCsv
			? refuse(400, message, true)
			: json({ message, errors: range.errors }, { status: 400 });
	}
	const money = user.role === 'admin';
	const body = await runReport(name, {
		db,
		from: range.from,
		to: range.to,
		timeZone,
		today,
		money,
		params: event.url.searchParams
	});
	const result: ReportResult = {
		report: name,
		title: REPORTS[name].title,
		from: range.from,
		to: range.to,
		timeZone,
		today,
		money,
		filters: body.filters,
		sections: money ? body.sections : body.sections.map(withoutMoney),
		notes: body.notes
	};
	if (!asCsv) return json(result, { headers: { 'cache-control': 'private, no-store' } });

	const sectionId = event.url.searchParams.get('section') ?? result.sections[0]?.id;
	const section = result.sections.find((s) => s.id === sectionId);
	if (!section) return refuse(404, 'This report has no such table.', true);
	const fileName = REPORTS[name].usesRange
		? `hatchlot-${name}-${section.id}-${range.from}-to-${range.to}.csv`
		: `hatchlot-${name}-${section.id}-${today}.csv`;
	return new Response(sectionCsv(section), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${fileName}"`,
			'cache-control': 'private, no-store'
		}
	});
}
