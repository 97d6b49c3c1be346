import { describe, expect, it } from 'vitest';
import { shippingCautions } from './cautions';

// The cautions PRODUCT.md says the product shows beside every ship decision.
describe('shippingCautions', () => {
	const text = shippingCautions.map((caution) => `${caution.title} ${caution.text}`).join('\n');

	it('warns that a heat pack can overheat a sealed box, and says to vent it', () => {
		expect(text).toMatch(/heat pack can overheat a sealed box/i);
		expect(text).toMatch(/vented/);
		expect(text).toMatch(/one pack per box size/);
	});

	it("states the guarantee's weather conditions and same-day pickup", () => {
		expect(text).toMatch(
			/live-arrival guarantee holds when the box ships on the date the shop chose/
		);
		expect(text).toMatch(/collected the same day/);
	});

	it("leaves the buyer's state rules to the buyer and names the US permit rules", () => {
		expect(text).toMatch(/USDA APHIS/);
		expect(text).toMatch(/shop holds the permits/);
		expect(text).toMatch(/your own state's rules/);
	});

	it('gives every caution a title and a text, and cannot be changed at run time', () => {
		expect(shippingCautions).toHaveLength(3);
		for (const caution of shippingCautions) {
			expect(caution.title.length).toBeGreaterThan(3);
			expect(caution.text.length).toBeGreaterThan(40);
		}
		expect(Object.isFrozen(shippingCautions)).toBe(true);
		expect(Object.isFrozen(shippingCautions[0])).toBe(true);
	});
});
