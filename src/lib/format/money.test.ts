import { describe, expect, it } from 'vitest';
import { formatCents } from './money';

describe('formatCents', () => {
	it('shows two minor-unit digits for USD', () => {
		// ISO 4217 lists USD with minor unit 2 (from memory of the ISO 4217 table):
		// 100 cents to the dollar, so one cent is $0.01.
		expect(formatCents(1)).toBe('$0.01');
		expect(formatCents(1400)).toBe('$14.00');
		expect(formatCents(4500)).toBe('$45.00');
		expect(formatCents(0)).toBe('$0.00');
	});

	it('agrees with the CLDR en-US currency pattern for USD', () => {
		// Outside reference: the Unicode CLDR data shipped in Node's ICU, whose USD
		// entry also carries ISO 4217's two fraction digits.
		const cldr = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });
		expect(cldr.resolvedOptions().maximumFractionDigits).toBe(2);
		for (const cents of [5, 99, 1999, 2800, 123456, 100000000, -250]) {
			expect(formatCents(cents)).toBe(cldr.format(cents / 100));
		}
	});

	it('groups thousands and keeps the sign in front', () => {
		expect(formatCents(123456789)).toBe('$1,234,567.89');
		expect(formatCents(-250)).toBe('-$2.50');
	});

	it('refuses fractions of a cent and non-numbers', () => {
		expect(() => formatCents(14.5)).toThrow(RangeError);
		expect(() => formatCents(Number.NaN)).toThrow(RangeError);
		expect(() => formatCents(Number.POSITIVE_INFINITY)).toThrow(RangeError);
		expect(() => formatCents(2 ** 53)).toThrow(RangeError);
	});
});
