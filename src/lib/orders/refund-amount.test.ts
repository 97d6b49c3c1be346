import { describe, expect, it } from 'vitest';
import { lineRefundCents, suggestedRefundCents } from './refund-amount';

describe('lineRefundCents', () => {
	it('gives back a whole line exactly', () => {
		expect(lineRefundCents({ quantity: 3, lineTotalCents: 5400 }, 3)).toBe(5400);
		// A total that does not split evenly still comes back to the cent.
		expect(lineRefundCents({ quantity: 3, lineTotalCents: 1000 }, 3)).toBe(1000);
	});

	it('shares a line by units, rounded to a whole cent', () => {
		expect(lineRefundCents({ quantity: 3, lineTotalCents: 5400 }, 1)).toBe(1800);
		// 1000 / 3 = 333.33…; 2000 / 3 = 666.67… (rounded to the nearest cent).
		expect(lineRefundCents({ quantity: 3, lineTotalCents: 1000 }, 1)).toBe(333);
		expect(lineRefundCents({ quantity: 3, lineTotalCents: 1000 }, 2)).toBe(667);
	});

	it('gives nothing for no units or a bad count', () => {
		expect(lineRefundCents({ quantity: 3, lineTotalCents: 5400 }, 0)).toBe(0);
		expect(lineRefundCents({ quantity: 3, lineTotalCents: 5400 }, -1)).toBe(0);
		expect(lineRefundCents({ quantity: 3, lineTotalCents: 5400 }, 1.5)).toBe(0);
	});

	it('never gives more than the line cost', () => {
		expect(lineRefundCents({ quantity: 2, lineTotalCents: 900 }, 5)).toBe(900);
	});
});

describe('suggestedRefundCents', () => {
	it('adds the lines up', () => {
		expect(
			suggestedRefundCents([
				{ line: { quantity: 3, lineTotalCents: 5400 }, quantity: 1 },
				{ line: { quantity: 1, lineTotalCents: 1299 }, quantity: 1 }
			])
		).toBe(3099);
		expect(suggestedRefundCents([])).toBe(0);
	});
});
