// Signing in as a demo member of staff, landing on the page the test is about.
import { expect, type Page } from '@playwright/test';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../seed/accounts';

export async function signInAsDemo(page: Page, role: 'keeper' | 'admin', next: string) {
	const who = DEMO_ACCOUNTS.find((a) => a.role === role)!;
	await page.goto(`/signin?next=${encodeURIComponent(next)}`);
	const form = page.locator('form[action="?/password"]');
	await form.getByLabel('E-mail').fill(who.email);
	await form.getByLabel('Password').fill(DEMO_PASSWORD);
	await form.getByRole('button', { name: 'Sign in' }).click();
	// Every regular-expression special in the path (a query's "?" too) is taken literally.
	await expect(page).toHaveURL(new RegExp(`${next.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')}$`));
}
