// The accessibility check the browser tests share: axe-core's WCAG 2.1 AA rules,
// reporting only serious and critical violations.
import AxeBuilder from '@axe-core/playwright';
import type { Page } from '@playwright/test';

export async function axeProblems(page: Page): Promise<string[]> {
	const result = await new AxeBuilder({ page })
		.withTags(['wcag2a', 'wcag2aa', 'wcag21aa'])
		.analyze();
	return result.violations
		.filter((v) => v.impact === 'serious' || v.impact === 'critical')
		.map((v) => `${v.id} (${v.impact}): ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`);
}
