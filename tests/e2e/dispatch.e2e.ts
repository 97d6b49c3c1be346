// The dispatch board against the local forecast fake (fixed weather per region):
// a Duluth order is held for cold with its reason in words, a Tucson order ships
// with a cold pack and facility-pickup advice.
import { expect, test } from '@playwright/test';
import { signInAsDemo } from './session';

const artifacts = 'tests/artifacts';

test('the dispatch board holds the cold order and packs the hot one', async ({ page }, info) => {
	// The re-checks write ship checks, so this runs once, at desktop width.
	test.skip(info.project.name !== 'desktop', 'runs once, at desktop width');
	await signInAsDemo(page, 'keeper', '/manage/dispatch');
	await expect(page.getByRole('heading', { level: 1, name: 'Dispatch board' })).toBeVisible();

	// Duluth, MN: the fake's lows sit near 10 °F, under the 25 °F hold limit (PRODUCT.md default).
	const duluth = page.locator('article').filter({ hasText: 'MN 55805' }).first();
	await duluth.getByRole('button', { name: 'Check again now' }).click();
	const held = page.locator('[data-section="held"] article').filter({ hasText: 'MN 55805' });
	await expect(held.getByText(/below the 25 °F \(−4 °C\) hold limit/).first()).toBeVisible();

	// Tucson, AZ: highs near 90 °F, over the 85 °F cold-pack limit and under the 95 °F hold.
	const tucson = page.locator('article').filter({ hasText: 'AZ 85719' }).first();
	await tucson.getByRole('button', { name: 'Check again now' }).click();
	const packed = page.locator('[data-section="scheduled"] article').filter({ hasText: 'AZ 85719' });
	await expect(packed.locator('[data-pack="cold"]').first()).toBeVisible();
	await expect(packed.getByText('Suggest facility pickup').first()).toBeVisible();
	await page.screenshot({ path: `${artifacts}/dispatch-${info.project.name}.png`, fullPage: true });
});
