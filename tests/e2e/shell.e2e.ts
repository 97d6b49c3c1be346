import { expect, test } from '@playwright/test';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../seed/accounts';
import { seededSpecies } from './demo-facts';

const artifacts = 'tests/artifacts';

test('the home page shows every seeded species', async ({ page }, testInfo) => {
	const species = await seededSpecies();
	expect(species.length).toBeGreaterThanOrEqual(7);
	await page.goto('/');
	await expect(page).toHaveTitle(/Mossback Hollow/);
	for (const { scientific, common } of species) {
		await expect(page.getByText(scientific, { exact: false }).first()).toBeVisible();
		await expect(page.getByText(common, { exact: false }).first()).toBeVisible();
	}
	await page.screenshot({ path: `${artifacts}/home-${testInfo.project.name}.png`, fullPage: true });
});

test('the style page lists the components', async ({ page }, testInfo) => {
	const keeper = DEMO_ACCOUNTS.find((a) => a.role === 'keeper')!;
	await page.goto('/manage/style');
	// The back office asks who is there first.
	await expect(page).toHaveURL(/\/signin\?next=%2Fmanage%2Fstyle/);
	const form = page.locator('form[action="?/password"]');
	await form.getByLabel('E-mail').fill(keeper.email);
	await form.getByLabel('Password').fill(DEMO_PASSWORD);
	await form.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).toHaveURL(/\/manage\/style$/);
	await expect(page.getByRole('heading', { level: 1, name: 'Hatchlot style' })).toBeVisible();
	// Every state badge carries its word, never colour alone.
	for (const word of ['resting', 'yielded', 'cleared', 'weather hold', 'paused']) {
		await expect(page.getByText(new RegExp(`^${word}$`, 'i')).first()).toBeVisible();
	}
	// Nothing may force sideways scrolling of the whole page at phone width.
	const overflow = await page.evaluate(
		() => document.documentElement.scrollWidth - window.innerWidth
	);
	expect(overflow).toBeLessThanOrEqual(1);
	await page.screenshot({
		path: `${artifacts}/style-${testInfo.project.name}.png`,
		fullPage: true
	});
});

test('the health route reports the migrated database', async ({ request }) => {
	const response = await request.get('/api/health');
	expect(response.status()).toBe(200);
	expect(await response.json()).toMatchObject({ status: 'ok', database: 'reachable' });
});

test('an unknown page gets our own error page with a way home', async ({ page }) => {
	const response = await page.goto('/no-such-page');
	expect(response?.status()).toBe(404);
	await expect(page.getByRole('link', { name: /home|shop/i }).first()).toBeVisible();
});
