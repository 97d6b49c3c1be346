// What the back-office table routes share: the JSON / CSV answer of /api/manage/<table>
// and the first page a /manage/<table> page renders on the server. Callers check the
// role first (requireRole(event, 'keeper')).
import { json, type RequestEvent } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { getDb } from '$lib/server/db';
import { todayInZone } from '$lib/format/dates';
import {
	CSV_ROW_CAP,
	csvFileName,
	defaultView,
	parseTableView,
	type TableName,
	type TablePage,
	type TableView
} from '$lib/backoffice/tables';
import { resolveShopTimeZone } from './settings';
import { listTablePage, tableCsv } from './tables';

function refuse(message: string, asCsv: boolean): Response {
	return asCsv
		? new Response(message, {
				status: 400,
				headers: { 'content-type': 'text/plain; charset=utf-8' }
			})
		: json({ message }, { status: 400 });
}

/** GET /api/manage/<table>: {rows, nextCursor}, or with ?format=csv the whole view as a file. */
export async function tableEndpoint(
	event: Pick<RequestEvent, 'url'>,
	table: TableName
): Promise<Response> {
	const format = event.url.searchParams.get('format') ?? '';
	const asCsv = format === 'csv';
	if (format !== '' && format !== 'json' && !asCsv) {
		return refuse('Format must be json or csv.', false);
	}
	const parsed = parseTableView(table, event.url.searchParams);
	if (!parsed.ok) return refuse(parsed.message, asCsv);

	const db = getDb();
	if (!asCsv) {
		return json(await listTablePage(db, parsed.view), {
			headers: { 'cache-control': 'private, no-store' }
		});
	}
	const [exported, timeZone] = await Promise.all([
		tableCsv(db, parsed.view),
		resolveShopTimeZone(db, env.SHOP_TIME_ZONE)
	]);
	return new Response(exported.csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${csvFileName(table, todayInZone(timeZone))}"`,
			'cache-control': 'private, no-store',
			'x-hatchlot-rows': String(exported.rowCount),
			// A cut export says so, so nobody mistakes it for the whole ledger.
			...(exported.capped ? { 'x-hatchlot-rows-capped-at': String(CSV_ROW_CAP) } : {})
		}
	});
}

export interface TablePageData<N extends TableName> {
	view: TableView<N>;
	page: TablePage<N>;
	/** Why the address could not be read as a view; the page shows it beside the filters. */
	problem: string | null;
}

/** The first page of a /manage table from the page's own URL, so it works without JavaScript. */
export async function tablePageData<N extends TableName>(
	event: Pick<RequestEvent, 'url'>,
	table: N
): Promise<TablePageData<N>> {
	const parsed = parseTableView(table, event.url.searchParams);
	if (!parsed.ok) {
		return {
			view: defaultView(table),
			page: { rows: [], nextCursor: null },
			problem: parsed.message
		};
	}
	return {
		view: parsed.view,
		page: await listTablePage(getDb(), parsed.view),
		problem: null
	};
}
