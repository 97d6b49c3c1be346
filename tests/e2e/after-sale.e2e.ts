// Standing behind a sale: the owner refunds one animal of a delivered order through the
// Stripe stand-in, and a buyer whose animals arrived dead files a claim with a photo
// that the owner then decides. Both change money and stock, so they run once, at
// desktop width.
import { expect, test } from '@playwright/test';
import pg from 'pg';
import sharp from 'sharp';
import { DEMO_PASSWORD } from '../../seed/accounts';
import { axeProblems } from './axe';
import { openMail } from './mail';
import { signInAsDemo } from './session';

const artifacts = 'tests/artifacts';

test('the admin refunds one animal of a delivered order and the buyer is e-mailed', async ({
	page
}, info) => {
	test.skip(info.project.name !== 'desktop', 'changes money: runs once, at desktop width');
	test.setTimeout(60_000);
	// HL-10008 is the demo's delivered order of five Narceus juveniles at $12.00 each.
	await signInAsDemo(page, 'admin', '/manage/orders/HL-10008');
	const refund = page
		.locator('section')
		.filter({ has: page.getByRole('heading', { name: 'Refund', exact: true }) });
	await expect(refund.getByText('Can still be refunded: $105.00')).toBeVisible();
	await refund.getByLabel(/American giant millipede/).fill('1');
	// One of five animals of a $60.00 line is $12.00 (the line's share, rounded half up).
	await expect(refund.getByText('Leave blank to refund $12.00, the lines’ share')).toBeVisible();
	await refund
		.getByLabel('Reason (the buyer reads it)')
		.fill('One juvenile was missing from the cup.');
	await refund.getByRole('button', { name: 'Refund through Stripe' }).click();
	await expect(refund.getByText('Refunded $12.00; the buyer is e-mailed.')).toBeVisible({
		timeout: 20_000
	});
	await expect(refund.getByText('Can still be refunded: $93.00')).toBeVisible();
	await expect(page.getByText('Part refunded').first()).toBeVisible();
	await page.screenshot({
		path: `${artifacts}/admin-refund-${info.project.name}.png`,
		fullPage: true
	});

	await openMail(page, 'marisol.ocampo@example.com', /sent back \$12\.00 for order HL-10008/);
	await expect(
		page.getByText('What it is for: One juvenile was missing from the cup.')
	).toBeVisible();
});

test('a buyer reports two dead animals with a photo, and the admin refunds them', async ({
	page,
	browser,
	baseURL
}, info) => {
	test.skip(info.project.name !== 'desktop', 'changes money: runs once, at desktop width');
	test.setTimeout(90_000);
	// HL-10003 is Marisol's delivered order of three groups of five bumblebee millipedes
	// ($90.00). Marisol is the demo customer no other browser test signs in as or changes.
	// Marking delivery is the fulfilment screens' job; here the carrier "delivered" it a
	// quarter of an hour ago, inside the demo's 2-hour window (PRODUCT.md's default).
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		await client.query(
			`update customer_order set delivered_at = now() - interval '15 minutes' where order_number = 'HL-10003'`
		);
	} finally {
		await client.end();
	}
	const photo = await sharp({
		create: { width: 900, height: 600, channels: 3, background: '#6b4f2a' }
	})
		.jpeg()
		.toBuffer();

	await page.goto('/signin?next=%2Faccount%2Forders%2FHL-10003');
	const signIn = page.locator('form[action="?/password"]');
	await signIn.getByLabel('E-mail').fill('marisol.ocampo@example.com');
	await signIn.getByLabel('Password').fill(DEMO_PASSWORD);
	await signIn.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).toHaveURL(/\/account\/orders\/HL-10003$/);
	await page.getByRole('link', { name: 'Report a loss' }).click();
	await expect(
		page.getByRole('heading', { level: 1, name: 'Report animals dead on arrival' })
	).toBeVisible();
	expect(await axeProblems(page)).toEqual([]);

	// Sent with no count and no photo: both are asked for beside their fields, nothing filed.
	await page.getByRole('button', { name: 'Send the claim' }).click();
	await expect(page.getByText('Say how many arrived dead on at least one line.')).toBeVisible();
	await expect(
		page.getByText('Add at least one photo of the animals as they arrived.')
	).toBeVisible();

	await page.getByLabel(/Bumblebee millipede/).fill('2');
	await page
		.getByLabel('Photos of the animals as they arrived')
		.setInputFiles({ name: 'box.jpg', mimeType: 'image/jpeg', buffer: photo });
	await page
		.getByLabel('What you saw (optional)')
		.fill('Two were curled and still when the cup was opened.');
	await page.getByRole('button', { name: 'Send the claim' }).click();
	await expect(page).toHaveURL(/\/account\/orders\/HL-10003\?claim=filed$/, { timeout: 20_000 });
	await expect(page.getByText('The shop has your claim and photos')).toBeVisible();
	await expect(page.getByRole('img', { name: 'Animals as they arrived' })).toBeVisible();
	await page.screenshot({
		path: `${artifacts}/claim-filed-${info.project.name}.png`,
		fullPage: true
	});
	await openMail(page, 'marisol.ocampo@example.com', /has your claim on order HL-10003/);

	// The owner, in a browser of their own.
	const ownerBrowser = await browser.newContext({ baseURL, viewport: page.viewportSize() });
	const owner = await ownerBrowser.newPage();
	await signInAsDemo(owner, 'admin', '/admin/claims');
	await owner.getByRole('link', { name: 'Claim on HL-10003' }).click();
	await expect(owner.getByRole('heading', { level: 1, name: 'Claim on HL-10003' })).toBeVisible();
	await expect(owner.getByText(/Filed \d+ min after delivery/)).toBeVisible();
	await expect(owner.getByText('Weather on the delivery day')).toBeVisible();
	expect(await axeProblems(owner)).toEqual([]);
	// 2 of the 15 animals a $90.00 line sent: $12.00, shipping not included.
	const refund = owner.getByLabel('Amount, in dollars');
	await expect(refund).toHaveValue('12.00');
	await owner.getByRole('button', { name: 'Refund through Stripe' }).click();
	await expect(
		owner.getByText('Refunded $12.00 through Stripe; the customer is e-mailed.')
	).toBeVisible({
		timeout: 20_000
	});
	await owner.screenshot({
		path: `${artifacts}/claim-decided-${info.project.name}.png`,
		fullPage: true
	});
	await ownerBrowser.close();

	await openMail(page, 'marisol.ocampo@example.com', /sent back \$12\.00 for order HL-10003/);
	await expect(page.getByText('We have looked at your claim on order HL-10003')).toBeVisible();
	await page.goto('/account/orders/HL-10003');
	await expect(page.getByText(/^Refunded\s+\$12\.00 to the card you paid with/)).toBeVisible();
});
