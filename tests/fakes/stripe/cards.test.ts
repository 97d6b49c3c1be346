import { describe, expect, it } from 'vitest';
import { escapeHtml, formatMinorUnits } from './pay-page';
import { TEST_CARDS, passesLuhn, stripeId } from './server';

describe('passesLuhn', () => {
	it("passes Stripe's published test cards and fails them with a changed digit", () => {
		// Every card number carries a Luhn check digit (ISO/IEC 7812-1); Stripe's test
		// numbers are well-formed card numbers, so each passes.
		for (const card of Object.values(TEST_CARDS)) {
			expect(passesLuhn(card), card).toBe(true);
			const changed = card.slice(0, -1) + String((Number(card.at(-1)) + 1) % 10);
			expect(passesLuhn(changed), changed).toBe(false);
		}
		// The worked example in the Luhn algorithm's common description: 79927398713.
		expect(passesLuhn('79927398713')).toBe(true);
		expect(passesLuhn('79927398710')).toBe(false);
	});
});

describe('formatMinorUnits', () => {
	it("shows smallest-unit amounts with each currency's ISO 4217 minor digits", () => {
		// ISO 4217 minor units: USD 2, JPY 0, KWD 3.
		expect(formatMinorUnits(9950, 'usd')).toBe('$99.50');
		expect(formatMinorUnits(1800, 'jpy')).toBe('¥1,800');
		expect(formatMinorUnits(1800, 'kwd')).toMatch(/1\.800/);
	});
});

describe('escapeHtml and stripeId', () => {
	it('escapes markup and makes prefixed alphanumeric ids', () => {
		expect(escapeHtml(`<a href="x">'&'</a>`)).toBe(
			'&lt;a href=&quot;x&quot;&gt;&#39;&amp;&#39;&lt;/a&gt;'
		);
		const id = stripeId('cs_test_');
		expect(id).toMatch(/^cs_test_[A-Za-z0-9]{24}$/);
		expect(stripeId('cs_test_')).not.toBe(id);
	});
});
