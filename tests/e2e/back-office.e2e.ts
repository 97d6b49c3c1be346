// The keeper's day at the rack, at phone width: a half refresh from the due list sets
// the substrate aside as a resting tub, a check finds 14 young and makes a clutch,
// the clutch shows in the pipeline, and the due list moves on.
import { expect, test, type Page } from '@playwright/test';
import pg from 'pg';
import { addDays, formatShopDate } from '../../src/lib/format/dates';
import { signInAsDemo } from './session';

const artifacts = 'tests/artifacts';

async function speciesOfColony(code: string) {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		const { rows } = await client.query<{ tub_hold_days: number; common_name: string }>(
			`select s.tub_hold_days, s.common_name from colony c join species s on s.id = c.species_id
			 where c.code = $1`,
			[code]
		);
		return rows[0]!;
	} finally {
		await client.end();
	}
}

/** Animals of a species in the pipeline: ready now, within 12 weeks (cumulative) and later. */
async function pipelineTotal(page: Page, commonName: string): Promise<number> {
	await page.goto('/manage/pipeline');
	const row = page
		.getByRole('row')
		.filter({ has: page.getByRole('rowheader', { name: new RegExp(commonName) }) });
	const cells = row.getByRole('cell');
	const number = async (index: number) =>
		Number.parseInt((await cells.nth(index).textContent())!.replace(/[^0-9]/g, '') || '0', 10);
	// Cells: ready now, within 4, within 8, within 12 weeks, later, paused.
	return (await number(0)) + (await number(3)) + (await number(4));
}

test('a keeper logs a half refresh, checks the tub, and follows the young into a clutch', async ({
	page
}, info) => {
	// The journey changes the ledger, so it runs once, at the width keepers use at the rack.
	test.skip(info.project.name !== 'phone', 'runs once, at phone width');
	test.setTimeout(60_000);
	await signInAsDemo(page, 'keeper', '/manage');

	const refreshDue = page.locator('[data-due="refresh"] li').filter({
		has: page.getByRole('link', { name: 'Log refresh' })
	});
	await expect(refreshDue.first()).toBeVisible();
	const title = (await refreshDue.first().locator('p').first().textContent())!.trim();
	const colonyCode = title.split(' · ')[0]!;
	await page.screenshot({
		path: `${artifacts}/due-before-${info.project.name}.png`,
		fullPage: true
	});

	const { tub_hold_days: holdDays, common_name: commonName } = await speciesOfColony(colonyCode);
	const pipelineBefore = await pipelineTotal(page, commonName);
	await page.goto('/manage');
	await refreshDue.first().getByRole('link', { name: 'Log refresh' }).click();
	await expect(page).toHaveURL(
		new RegExp(`/manage/colonies/${colonyCode}\\?log=substrate_refresh_half`)
	);
	await expect(page.getByRole('heading', { name: 'Half substrate refresh' })).toBeVisible();
	// Saving the removed substrate is offered, and ticked already.
	await expect(page.getByLabel('Set the removed substrate aside as a resting tub')).toBeChecked();
	const loggedOn = await page.getByLabel('Date').inputValue();
	await page.getByRole('button', { name: 'Log half substrate refresh' }).click();
	const saved = page.getByRole('status').filter({ hasText: 'resting tub' });
	await expect(saved).toBeVisible();
	const holdUntil = addDays(loggedOn, holdDays);
	// A calendar date reads the same in any zone.
	await expect(saved).toContainText(`held until ${formatShopDate(holdUntil, 'UTC')}`);
	const tubCode = /resting tub (\S+),/.exec((await saved.textContent())!)![1]!;
	await page.screenshot({ path: `${artifacts}/refresh-logged-${info.project.name}.png` });

	// The refresh leaves the due list.
	await page.goto('/manage');
	await expect(page.locator('[data-due="refresh"]').getByText(`${colonyCode} ·`)).toHaveCount(0);

	// The tub: right hold-until, then a check that finds 14 young.
	await page.goto(`/manage/tubs/${tubCode}`);
	await expect(page.getByRole('heading', { level: 1, name: tubCode })).toBeVisible();
	await expect(page.getByTestId('hold-until')).toHaveText(formatShopDate(holdUntil, 'UTC'));
	await page.getByLabel('Young found').fill('14');
	await page.getByLabel('Eggs seen').check();
	await page.getByRole('button', { name: 'Record check and make clutches' }).click();
	const made = page.getByRole('status').filter({ hasText: 'new clutch' });
	await expect(made).toBeVisible();
	const clutchCode = /(\S+) \(14\) is a new clutch/.exec((await made.textContent())!)![1]!;
	await expect(page.getByText('Yielded').first()).toBeVisible();
	await page.screenshot({
		path: `${artifacts}/tub-yielded-${info.project.name}.png`,
		fullPage: true
	});

	// The clutch: 14 alive, one generation on from its colony, with its lineage.
	await page.getByRole('link', { name: clutchCode }).first().click();
	await expect(page).toHaveURL(new RegExp(`/manage/clutches/${clutchCode}$`));
	await expect(page.getByRole('heading', { level: 1 })).toContainText(clutchCode);
	await expect(page.getByRole('link', { name: new RegExp(tubCode) }).first()).toBeVisible();
	await page.screenshot({ path: `${artifacts}/clutch-${info.project.name}.png`, fullPage: true });

	// The pipeline counts the new clutch with its species.
	expect(await pipelineTotal(page, commonName)).toBe(pipelineBefore + 14);
	await page.screenshot({ path: `${artifacts}/pipeline-${info.project.name}.png`, fullPage: true });
});
