import { expect, test, type Page } from '@playwright/test';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../seed/accounts';
import { followMailLink, openMail } from './mail';

const artifacts = 'tests/artifacts';

async function signInWithPassword(page: Page, email: string, password: string) {
	await page.goto('/signin?next=%2Faccount');
	const form = page.locator('form[action="?/password"]');
	await form.getByLabel('E-mail').fill(email);
	await form.getByLabel('Password').fill(password);
	await form.getByRole('button', { name: 'Sign in' }).click();
	// Wait for the answer, so the next navigation does not cut the sign-in short.
	await expect(
		page
			.getByText('do not match an account that can sign in')
			.or(page.getByRole('heading', { name: 'Your account' }))
	).toBeVisible({ timeout: 15_000 });
}

async function signOut(page: Page) {
	await page.getByRole('button', { name: 'Sign out' }).first().click();
	await expect(page.getByRole('link', { name: 'Sign in' })).toBeVisible();
}

test('a hobbyist signs up, confirms from the outbox, signs out, and signs in with a link', async ({
	page
}, info) => {
	// Two trips through the outbox and two password hashes: about 29 s on this 2-core
	// machine, too close to the default 30 s.
	test.setTimeout(60_000);
	const email = `fern.${info.project.name}.${Date.now()}@example.test`;
	await page.goto('/signup');
	await page.getByLabel('Your name').fill('Fern Okafor');
	await page.getByLabel('E-mail').fill(email);
	// A leaked password is refused beside the field, and the name and e-mail stay filled in.
	await page.getByLabel('Password').fill('password123');
	await page.getByRole('button', { name: 'Make my account' }).click();
	await expect(page.getByText(/leaked|easy to guess/)).toBeVisible();
	await expect(page.getByLabel('E-mail')).toHaveValue(email);
	await page.getByLabel('Password').fill('isopods under bark at dusk');
	await page.getByRole('button', { name: 'Make my account' }).click();
	await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();

	await openMail(page, email, /Confirm your e-mail address/);
	await page.screenshot({
		path: `${artifacts}/outbox-verify-${info.project.name}.png`,
		fullPage: true
	});
	await followMailLink(page, '/verify/');
	await expect(page.getByRole('heading', { name: 'Your account' })).toBeVisible();
	await expect(page.getByText('Your e-mail is confirmed')).toBeVisible();
	await signOut(page);

	await page.goto('/signin');
	const linkForm = page.locator('form[action="?/link"]');
	await linkForm.getByLabel('E-mail').fill(email);
	await linkForm.getByRole('button', { name: 'E-mail me a link' }).click();
	await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();
	await openMail(page, email, /sign-in link/);
	await followMailLink(page, '/auth/callback/nodemailer');
	await page.goto('/account');
	await expect(page.getByRole('heading', { name: 'Your account' })).toBeVisible();
	await expect(page.getByText(email).first()).toBeVisible();
	await page.screenshot({ path: `${artifacts}/account-${info.project.name}.png`, fullPage: true });
	await signOut(page);
});

test('a customer resets a forgotten password from start to end', async ({ page }, info) => {
	// Each browser project takes its own demo customer so the two runs do not race.
	const customers = DEMO_ACCOUNTS.filter((a) => a.role === 'customer');
	const who = customers[info.project.name === 'phone' ? 2 : 3]!;
	await page.goto('/reset');
	await page.getByLabel('E-mail').fill(who.email);
	await page.getByRole('button', { name: 'E-mail me a reset link' }).click();
	await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();
	await openMail(page, who.email, /Choose a new password/);
	await followMailLink(page, '/reset/');
	await page.getByLabel('New password').fill('springtails dance in the leaf litter');
	await page.getByLabel('The same again').fill('springtails dance in the leaf litter');
	await page.getByRole('button', { name: 'Save my new password' }).click();
	await expect(page.getByText('Your new password is saved')).toBeVisible();
	await signOut(page);

	await signInWithPassword(page, who.email, DEMO_PASSWORD);
	await expect(page.getByText('do not match an account that can sign in')).toBeVisible();
	await signInWithPassword(page, who.email, 'springtails dance in the leaf litter');
	await expect(page.getByRole('heading', { name: 'Your account' })).toBeVisible();
});

test('a customer promoted by the admin reaches the back office on the next request', async ({
	browser
}, info) => {
	test.setTimeout(60_000);
	test.skip(
		info.project.name !== 'desktop',
		'one promotion is enough; the role change is shared data'
	);
	const customer = DEMO_ACCOUNTS.filter((a) => a.role === 'customer')[0]!;
	const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!;

	const customerPage = await (await browser.newContext()).newPage();
	await signInWithPassword(customerPage, customer.email, DEMO_PASSWORD);
	await expect(customerPage.getByRole('heading', { name: 'Your account' })).toBeVisible();
	const refused = await customerPage.goto('/manage');
	expect(refused?.status()).toBe(403);

	const adminPage = await (await browser.newContext()).newPage();
	await signInWithPassword(adminPage, admin.email, DEMO_PASSWORD);
	await adminPage.goto('/admin/users');
	await adminPage.getByLabel('Name or e-mail').fill(customer.email);
	await adminPage.getByRole('button', { name: 'Find' }).click();
	await adminPage.getByRole('link', { name: new RegExp(customer.name) }).click();
	await adminPage.getByLabel('What they may do').selectOption('keeper');
	await adminPage.getByRole('button', { name: 'Save role' }).click();
	await expect(adminPage.getByText('Role saved')).toBeVisible();
	await adminPage.screenshot({ path: `${artifacts}/admin-person-desktop.png`, fullPage: true });

	const allowed = await customerPage.goto('/manage');
	expect(allowed?.status()).toBe(200);
	await expect(
		customerPage.getByRole('heading', { level: 1, name: 'Today at the rack' })
	).toBeVisible();
});
