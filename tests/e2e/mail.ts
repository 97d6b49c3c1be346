// Reading a caught message the way a developer would: the /outbox page.
import { expect, type Page } from '@playwright/test';

/** Opens the newest caught message to `email` whose subject matches, waiting for the mail job to send it. */
export async function openMail(page: Page, email: string, subject: RegExp): Promise<void> {
	await expect(async () => {
		await page.goto('/outbox');
		const row = page
			.getByRole('row')
			.filter({ hasText: email })
			.filter({ hasText: subject })
			.first();
		await expect(row).toBeVisible({ timeout: 1_000 });
	}).toPass({ timeout: 30_000 });
	await page
		.getByRole('row')
		.filter({ hasText: email })
		.getByRole('link', { name: subject })
		.first()
		.click();
	await expect(page.getByRole('heading', { level: 1, name: subject })).toBeVisible();
}

/** Follows the link in the open message whose address contains `part`. */
export async function followMailLink(page: Page, part: string): Promise<void> {
	const link = page.locator(`a[data-mail-link][href*="${part}"]`).first();
	const href = await link.getAttribute('href');
	if (!href) throw new Error(`no link containing ${part} in this message`);
	await page.goto(href);
}
