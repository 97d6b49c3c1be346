// Standing behind a sale: the owner refunds one animal of a delivered order through the
// Stripe stand-in, and a buyer whose animals arrived dead files a claim with a photo
// that the owner then decides. Both change money and stock, so they run once, at
// desktop width.
import { expect, test } from '@playwright/test';
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
