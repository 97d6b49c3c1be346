import { describe, expect, it } from 'vitest';
import { arrivalSteps, roomTemperatureWords } from './arrival';

describe('arrivalSteps', () => {
	it('puts opening first and the photo before the claim', () => {
		const titles = arrivalSteps(2).map((step) => step.title);
		expect(titles[0]).toBe('Open it at once');
		expect(titles.indexOf('If one is dead, photo first')).toBeLessThan(
			titles.indexOf('Claim within 2 hours')
		);
	});

	it("names the shop's claim window in hours", () => {
		const text = arrivalSteps(1)
			.map((step) => `${step.title} ${step.text}`)
			.join(' ');
		expect(text).toContain('within 1 hour of delivery');
		expect(arrivalSteps(6).some((step) => step.text.includes('within 6 hours of delivery'))).toBe(
			true
		);
	});

	it('carries the guarantee terms and the handling caution (PRODUCT.md, common practice)', () => {
		const text = arrivalSteps(2)
			.map((step) => step.text)
			.join(' ');
		expect(text).toContain('first delivery attempt and not redirected');
		expect(text).toContain('shipping is not refunded');
		expect(text).toContain('wash your hands after every handling');
	});

	it('refuses a window that is not whole hours', () => {
		expect(() => arrivalSteps(0)).toThrow(RangeError);
		expect(() => arrivalSteps(1.5)).toThrow(RangeError);
	});
});

describe('roomTemperatureWords', () => {
	it('gives the low to high 70s °F with °C beside', () => {
		// °C = (°F − 32) × 5/9 (NIST SP 811): 70 °F = 21.1 °C, 79 °F = 26.1 °C.
		expect(roomTemperatureWords()).toBe('70–79 °F (21–26 °C)');
	});
});
