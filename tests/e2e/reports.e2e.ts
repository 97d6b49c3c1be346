// The owner reads the reports: opens them from the back office, changes the range of
// the sales report, sees the charts drawn with data, and downloads a table as CSV. A
// keeper reads the same reports without money; a backwards range is refused with words.
import { readFile } from 'node:fs/promises';
import { expect, test, type Page } from '@playwright/test';
import { REPORT_NAMES, REPORTS } from '../../src/lib/reports/report';
import { axeProblems } from './axe';
import { signInAsDemo } from './session';

const artifacts = 'tests/artifacts';

/** Every chart on the page has drawn on its canvas (chart.js marks it when done). */
async function chartsDrawn(page: Page): Promise<number> {
	const charts = page.locator('[data-report-chart] canvas');
	const count = await charts.count();
	for (let index = 0; index < count; index++)
		await expect(charts.nth(index)).toHaveAttribute('data-drawn', 'yes');
	return count;
}

test('the owner changes the range of the sales report and downloads its table', async ({
	page
}, info) => {
	test.setTimeout(120_000);
	await signInAsDemo(page, 'admin', '/manage');
	await page.getByRole('link', { name: 'Reports' }).first().click();
	await expect(page.getByRole('heading', { level: 1, name: 'Reports' })).toBeVisible();
	expect(await axeProblems(page)).toEqual([]);
	await page.getByRole('link', { name: /^Sales/ }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Sales' })).toBeVisible();

	// The demo's sales run from spring to November 2026.
	await page.getByLabel('First day').fill('2026-03-01');
	await page.getByLabel('Last day').fill('2026-11-30');
	await page.getByRole('button', { name: 'Show the report' }).click();
	await expect(page).toHaveURL(/from=2026-03-01&to=2026-11-30/);
	await expect(page.getByText('Sun, Mar 1, 2026 to Mon, Nov 30, 2026')).toBeVisible();

	const byMonth = page.locator('[data-report-section="by-month"]');
	const table = byMonth.getByRole('table', { name: 'Sales by month' });
	await expect(table.getByRole('rowheader', { name: 'Mar 2026' })).toBeVisible();
	await expect(table.getByRole('rowheader', { name: 'Nov 2026' })).toBeVisible();
	await expect(table.getByRole('columnheader', { name: 'Revenue' })).toBeVisible();
	// The chart is an image with a name, and the table is its words.
	await expect(
		byMonth.getByRole('img', { name: 'Revenue, refunds and net by month' })
	).toBeVisible();
	expect(await chartsDrawn(page)).toBeGreaterThanOrEqual(3);
	expect(await axeProblems(page)).toEqual([]);
	await page.screenshot({
		path: `${artifacts}/reports-sales-${info.project.name}.png`,
		fullPage: true
	});

	const [download] = await Promise.all([
		page.waitForEvent('download'),
		byMonth.getByRole('link', { name: 'Download the table (CSV)' }).click()
	]);
	expect(download.suggestedFilename()).toBe('hatchlot-sales-by-month-2026-03-01-to-2026-11-30.csv');
	const csv = await readFile((await download.path())!, 'utf8');
	const lines = csv.trim().split('\r\n');
	expect(lines[0]).toBe('Month,Orders paid,Animals sold,Revenue (USD),Refunds (USD),Net (USD)');
	// March to November, then the totals.
	expect(lines).toHaveLength(1 + 9 + 1);
	expect(lines.at(-1)).toMatch(/^All months,/);
});

// One test per report, so the browsers share them out rather than one running all six.
for (const name of REPORT_NAMES)
	test(`the ${name} report draws its charts with data, and axe finds nothing serious`, async ({
		page
	}, info) => {
		test.skip(info.project.name !== 'desktop', 'the sales test reads a report at phone width');
		test.setTimeout(60_000);
		await signInAsDemo(page, 'admin', `/manage/reports/${name}?from=2026-01-01&to=2026-12-01`);
		await expect(page.getByRole('heading', { level: 1, name: REPORTS[name].title })).toBeVisible();
		expect(await chartsDrawn(page), name).toBeGreaterThan(0);
		expect(await axeProblems(page), name).toEqual([]);
		await page.screenshot({
			path: `${artifacts}/reports-${name}-${info.project.name}.png`,
			fullPage: true
		});
	});

test('a keeper reads the sales report in animals, and a backwards range is refused', async ({
	page
}) => {
	await signInAsDemo(page, 'keeper', '/manage/reports/sales?from=2026-01-01&to=2026-12-01');
	const byMonth = page.locator('[data-report-section="by-month"]');
	await expect(byMonth.getByRole('img', { name: 'Animals sold by month' })).toBeVisible();
	await expect(page.getByRole('columnheader', { name: 'Revenue' })).toHaveCount(0);

	await page.getByLabel('First day').fill('2026-06-01');
	await page.getByLabel('Last day').fill('2026-01-01');
	await page.getByRole('button', { name: 'Show the report' }).click();
	await expect(page.getByText('The range ends before it starts.').first()).toBeVisible();
	await expect(page.getByLabel('Last day')).toHaveAttribute('aria-invalid', 'true');
	await expect(page.locator('[data-report-chart]')).toHaveCount(0);
});
