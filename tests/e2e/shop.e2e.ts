// A hobbyist's way through the shop as a guest: filter the catalogue, open a species and
// its care sheet, add five of a listing and see the tier price, ask for the ship date to
// a hot ZIP and see the cold pack, sign in and find the cart kept. Axe finds no serious
// or critical problem on the pages on the way.
import { expect, test } from '@playwright/test';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../seed/accounts';
import { axeProblems } from './axe';

const artifacts = 'tests/artifacts';

test('a guest finds, reads about and reserves captive-bred stock, then signs in and keeps the cart', async ({
	page
}, info) => {
	test.setTimeout(90_000);
	const width = info.project.name;
	// Each width signs in as its own demo customer, so the two runs never share an account
	// cart, and neither is one whose password the account tests change.
	const customer = DEMO_ACCOUNTS.find(
		(a) =>
			a.email === (width === 'phone' ? 'ines.farrow@example.test' : 'dagny.halvorsen@example.com')
	)!;

	await page.goto('/');
	expect(await axeProblems(page)).toEqual([]);

	// The catalogue, filtered to millipedes: the filters land in the URL.
	await page.goto('/catalogue');
	expect(await axeProblems(page)).toEqual([]);
	const filters = page.getByRole('form', { name: 'Filter the catalogue' });
	if (!(await filters.isVisible())) await page.getByText('Filter and sort').click();
	await filters.getByLabel('Animal group').selectOption('millipede');
	await filters.getByRole('button', { name: 'Show listings' }).click();
	await expect(page).toHaveURL(/[?&]group=millipede/);
	const results = page.getByRole('region', { name: 'Listings' });
	await expect(
		results.getByText('American giant millipede (Narceus americanus)').first()
	).toBeVisible();
	await expect(results.getByText('Smooth slaters')).toHaveCount(0);
	await page.screenshot({ path: `${artifacts}/shop-catalogue-${width}.png`, fullPage: true });

	// The species page and its care sheet, with the handling caution.
	await page.goto('/species/narceus-americanus');
	await expect(
		page.getByRole('heading', { level: 1, name: 'American giant millipede' })
	).toBeVisible();
	const careSheet = page.getByRole('region', { name: 'Care sheet' });
	await expect(careSheet).toBeVisible();
	await expect(careSheet.getByText(/wash/i).first()).toBeVisible();
	expect(await axeProblems(page)).toEqual([]);
	await page.screenshot({ path: `${artifacts}/shop-species-${width}.png`, fullPage: true });

	// The listing: five at the 5-for-$60 tier (PRODUCT.md's example tiers, seeded).
	await page.goto('/listings/narceus-americanus-juveniles-nar-c1');
	await expect(page.getByText('$12.00 each').first()).toBeVisible();
	expect(await axeProblems(page)).toEqual([]);
	await page.getByLabel('How many').fill('5');
	await page.getByRole('button', { name: 'Add to cart' }).click();
	const drawer = page.getByRole('dialog', { name: 'Your cart' });
	await expect(drawer).toBeVisible();
	const line = drawer.locator('li').filter({ hasText: 'American giant millipede' });
	await expect(line.getByLabel(/Quantity of/)).toHaveValue('5');
	await expect(line.locator('data[value="6000"]')).toHaveText('$60.00');
	await expect(line.getByText('5-for-$60.00 rate')).toBeVisible();
	await page.screenshot({ path: `${artifacts}/shop-drawer-${width}.png` });
	await drawer.getByRole('link', { name: 'Go to the cart' }).click();

	// The cart: a hot ZIP (Tucson, AZ; the forecast fake's highs sit near 90 °F, over the
	// 85 °F cold-pack limit of PRODUCT.md) gets a cold pack and facility-pickup advice.
	await expect(page.getByRole('heading', { level: 1, name: 'Your cart' })).toBeVisible();
	await expect(page.getByRole('region', { name: 'Live animals' })).toBeVisible();
	await page.getByLabel('Your ZIP code').fill('85719');
	await page.getByRole('button', { name: 'Check the ship date' }).click();
	await expect(page.getByText(/The box gets a cold pack/)).toBeVisible();
	await expect(page.getByText(/First safe ship date/)).toBeVisible();
	await expect(
		page.getByText(/Consider collecting it from a staffed carrier facility/)
	).toBeVisible();
	// Totals from the server: $60.00 of animals plus the demo's $45.00 overnight fee.
	const total = page.getByRole('region', { name: 'Total' });
	await expect(total.getByText('$105.00')).toBeVisible();
	expect(await axeProblems(page)).toEqual([]);
	await page.screenshot({ path: `${artifacts}/shop-cart-${width}.png`, fullPage: true });

	// A ZIP outside the shipping area is refused in words, and the cart stays usable.
	await page.getByLabel('Your ZIP code').fill('99501');
	await page.getByRole('button', { name: 'Check the ship date' }).click();
	await expect(page.getByText(/outside our shipping area/)).toBeVisible();

	// Signing in keeps the cart: the guest cart joins the account's.
	await page.goto('/signin?next=%2Fcart');
	const form = page.locator('form[action="?/password"]');
	await form.getByLabel('E-mail').fill(customer.email);
	await form.getByLabel('Password').fill(DEMO_PASSWORD);
	await form.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).toHaveURL(/\/cart$/);
	const kept = page
		.getByRole('region', { name: 'Live animals' })
		.locator('li')
		.filter({ hasText: 'American giant millipede' });
	await expect(kept.getByLabel(/Quantity of/)).toHaveValue('5');
	await expect(page.getByRole('link', { name: /Cart 5 items/ })).toBeVisible();
});

test('a bad quantity is refused beside the field and the cart stays as it was', async ({
	page
}) => {
	await page.goto('/listings/little-sea-isopods-each-cub-c1');
	const quantity = page.getByLabel('How many');
	await quantity.fill('0');
	await page.getByRole('button', { name: 'Add to cart' }).click();
	await expect(page.getByText('Order at least 1.')).toBeVisible();
	await quantity.fill('2.5');
	await page.getByRole('button', { name: 'Add to cart' }).click();
	await expect(page.getByText('Order whole units.')).toBeVisible();
	await quantity.fill('5000');
	await page.getByRole('button', { name: 'Add to cart' }).click();
	await expect(page.getByText(/^Only \d+ on offer\.$/)).toBeVisible();
	await expect(page.getByRole('link', { name: /Cart 0 items/ })).toBeVisible();
	// The server says the same to a forged request that skips the page's checks.
	const refused = await page.request.post('/api/cart', {
		data: { listingId: 8, quantity: -3 }
	});
	expect(refused.status()).toBe(400);
	expect((await refused.json()).fields.quantity).toMatch(/at least 1/);
});

test('a change the server refuses is shown at once, then rolled back with the reason', async ({
	page
}) => {
	await page.goto('/listings/little-sea-isopods-each-cub-c1');
	await page.getByLabel('How many').fill('1');
	await page.getByRole('button', { name: 'Add to cart' }).click();
	const drawer = page.getByRole('dialog', { name: 'Your cart' });
	const line = drawer.locator('li').filter({ hasText: 'Little sea isopods' });
	const quantity = line.getByLabel(/Quantity of/);
	await expect(quantity).toHaveValue('1');
	// More than the 21 the demo has on offer: the server refuses, the line goes back to 1.
	await quantity.fill('900');
	await quantity.press('Enter');
	await expect(line.getByText(/Only \d+ on offer/)).toBeVisible();
	await expect(quantity).toHaveValue('1');
	await line.getByRole('button', { name: /One more of/ }).click();
	await expect(quantity).toHaveValue('2');
	await expect(line.getByText('$12.00')).toBeVisible();
	await line.getByRole('button', { name: /Remove/ }).click();
	await expect(drawer.getByText('Your cart is empty.')).toBeVisible();
});
