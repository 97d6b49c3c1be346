import { describe, expect, it } from 'vitest';
import { cartLineSchema, fieldProblems } from './schemas';

function problemsOf(input: unknown) {
	const parsed = cartLineSchema.safeParse(input);
	return parsed.success ? null : fieldProblems(parsed.error);
}

describe('cart line input', () => {
	it('accepts whole quantities from forms and from fetch', () => {
		expect(cartLineSchema.parse({ listingId: '7', quantity: '5' })).toEqual({
			listingId: 7,
			quantity: 5
		});
		expect(cartLineSchema.parse({ listingId: 7, quantity: 1000 })).toEqual({
			listingId: 7,
			quantity: 1000
		});
	});

	it('refuses zero, negative, fractional, huge and non-numbers with a sentence', () => {
		expect(problemsOf({ listingId: 7, quantity: 0 })?.quantity).toMatch(/at least 1/);
		expect(problemsOf({ listingId: 7, quantity: -3 })?.quantity).toMatch(/at least 1/);
		expect(problemsOf({ listingId: 7, quantity: '2.5' })?.quantity).toMatch(/whole units/);
		expect(problemsOf({ listingId: 7, quantity: '1e9' })?.quantity).toMatch(/At most 1000/);
		expect(problemsOf({ listingId: 7, quantity: 'lots' })?.quantity).toMatch(/number/);
		expect(problemsOf({ listingId: 'x', quantity: 1 })?.listingId).toMatch(/listing/);
		expect(problemsOf({ listingId: 0, quantity: 1 })?.listingId).toMatch(/listing/);
	});
});
