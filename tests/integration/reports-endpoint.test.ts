// The reports' JSON and CSV routes over the seeded demo, through the built app: who may
// ask, what a keeper is not sent, how a bad range is refused, and what the CSV holds.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { parse } from 'csv-parse/sync';
import { seedDemo } from '../../seed/demo';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { createSession } from '../../src/lib/server/auth/sessions';
import { REPORT_NAMES, type ReportResult } from '../../src/lib/reports/report';
import { startApp, type RunningApp } from './support/app';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

type Persona = 'customer' | 'keeper' | 'admin';
const RANGE = 'from=2026-01-01&to=2026-12-01';

describe('report routes', () => {
	let scratch: ScratchDatabase;
	let app: RunningApp;
	const cookies: Partial<Record<Persona, string>> = {};

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		for (const persona of ['customer', 'keeper', 'admin'] as const) {
			const account = DEMO_ACCOUNTS.find((a) => a.role === persona)!;
			const user = await scratch.db
				.selectFrom('User')
				.select('id')
				.where('email', '=', account.email)
				.executeTakeFirstOrThrow();
			cookies[persona] = `hatchlot.session=${await createSession(scratch.db, user.id)}`;
		}
		app = await startApp({ DATABASE_URL: scratch.url });
	});
	afterAll(async () => {
		await app?.stop();
		await scratch?.drop();
	});

	const ask = (persona: Persona | null, url: string) =>
		fetch(`${app.origin}${url}`, {
			headers: persona ? { cookie: cookies[persona]! } : {},
			redirect: 'manual'
		});

	it('answers every report for the owner, with the demo in it', async () => {
		for (const name of REPORT_NAMES) {
			const response = await ask('admin', `/api/manage/reports/${name}?${RANGE}`);
			expect(response.status, name).toBe(200);
			const report = (await response.json()) as ReportResult;
			expect(report.report).toBe(name);
			expect(report.sections.length, name).toBeGreaterThan(0);
			// The demo has sales, clutches, tubs, care logs, shipments and a waitlist:
			// every report has at least one table with rows in it.
			expect(
				report.sections.some((s) => s.table.rows.length > 0),
				name
			).toBe(true);
			for (const section of report.sections) {
				const keys = new Set(section.table.columns.map((c) => c.key));
				// A chart draws only columns of its own table.
				if (section.chart) {
					expect(keys.has(section.chart.labelKey), `${name}/${section.id}`).toBe(true);
					for (const series of section.chart.series)
						expect(keys.has(series.key), `${name}/${section.id}/${series.key}`).toBe(true);
				}
			}
		}
	});

	it('sends a keeper no money figure at all', async () => {
		const owner = (await (
			await ask('admin', `/api/manage/reports/sales?${RANGE}`)
		).json()) as ReportResult;
		const keeper = (await (
			await ask('keeper', `/api/manage/reports/sales?${RANGE}`)
		).json()) as ReportResult;
		expect(owner.money).toBe(true);
		expect(keeper.money).toBe(false);
		const ownerColumns = owner.sections.flatMap((s) => s.table.columns.map((c) => c.key));
		expect(ownerColumns).toContain('revenue');
		for (const name of REPORT_NAMES) {
			const body = (await (
				await ask('keeper', `/api/manage/reports/${name}?${RANGE}`)
			).json()) as ReportResult;
			for (const section of body.sections)
				expect(section.table.columns.filter((c) => c.money || c.kind === 'cents')).toEqual([]);
		}
		const csv = await (
			await ask('keeper', `/api/manage/reports/sales?${RANGE}&format=csv&section=by-month`)
		).text();
		expect(csv).not.toMatch(/USD/);
	});

	it('nets the demo to its payments less its succeeded refunds', async () => {
		const report = (await (
			await ask('admin', `/api/manage/reports/sales?${RANGE}`)
		).json()) as ReportResult;
		const zone = report.timeZone;
		const start = sql`('2026-01-01'::date)::timestamp at time zone ${zone}`;
		const end = sql`('2026-12-02'::date)::timestamp at time zone ${zone}`;
		const { rows } = await sql<{ paid: string; refunded: string }>`
			select
				(select coalesce(sum(amount_cents), 0) from payment
					where status = 'succeeded' and updated_at >= ${start} and updated_at < ${end}) as paid,
				(select coalesce(sum(amount_cents), 0) from refund
					where status = 'succeeded' and created_at >= ${start} and created_at < ${end}) as refunded
		`.execute(scratch.db);
		const ledgerNet = Number(rows[0]!.paid) - Number(rows[0]!.refunded);
		expect(Number(rows[0]!.refunded)).toBeGreaterThan(0);
		for (const id of ['by-month', 'by-species'])
			expect(report.sections.find((s) => s.id === id)?.table.totals?.net, id).toBe(ledgerNet);
	});

	it('refuses a range that ends before it starts, or spans ten years, with words', async () => {
		const backwards = await ask('admin', '/api/manage/reports/sales?from=2026-06-01&to=2026-01-01');
		expect(backwards.status).toBe(400);
		const body = (await backwards.json()) as { errors: { to?: string } };
		expect(body.errors.to).toMatch(/ends before it starts/);
		const ten = await ask('admin', '/api/manage/reports/sales?from=2016-01-01&to=2026-01-01');
		expect(ten.status).toBe(400);
		expect(((await ten.json()) as { message: string }).message).toMatch(/at most 5 years/);
		expect((await ask('admin', '/api/manage/reports/no-such-report')).status).toBe(404);
	});

	it('downloads a table as CSV whose totals match the JSON', async () => {
		const report = (await (
			await ask('admin', `/api/manage/reports/sales?${RANGE}`)
		).json()) as ReportResult;
		const byMonth = report.sections.find((s) => s.id === 'by-month')!;
		const response = await ask(
			'admin',
			`/api/manage/reports/sales?${RANGE}&format=csv&section=by-month`
		);
		expect(response.status).toBe(200);
		expect(response.headers.get('content-type')).toMatch(/^text\/csv/);
		expect(response.headers.get('content-disposition')).toBe(
			'attachment; filename="hatchlot-sales-by-month-2026-01-01-to-2026-12-01.csv"'
		);
		const text = await response.text();
		// RFC 4180: records end with CRLF; csv-parse (an outside parser) reads it back.
		expect(text).toContain('\r\n');
		const records = parse(text) as string[][];
		expect(records[0]).toEqual([
			'Month',
			'Orders paid',
			'Animals sold',
			'Revenue (USD)',
			'Refunds (USD)',
			'Net (USD)'
		]);
		expect(records).toHaveLength(1 + byMonth.table.rows.length + 1);
		const last = records.at(-1)!;
		expect(last[0]).toBe('All months');
		expect(Math.round(Number(last[5]) * 100)).toBe(byMonth.table.totals?.net);
	});

	it('keeps reports to the back office', async () => {
		expect((await ask(null, `/api/manage/reports/sales?${RANGE}`)).status).toBe(401);
		expect((await ask('customer', `/api/manage/reports/sales?${RANGE}`)).status).toBe(403);
		const page = await ask('keeper', `/manage/reports/sales?${RANGE}`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Sales by month');
		expect(html).not.toContain('Revenue');
	});
});
