import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	basePriceCents,
	cartTotals,
	lineTotalCents,
	nextTier,
	perAnimalCents,
	tierFor,
	tierTable,
	tiersProblem,
	type PriceTier
} from './pricing';

// The tiers the issue gives as its example: 1 for $14, 5 for $60, 10 for $110.
// Amounts in cents: USD has 2 minor-unit digits (ISO 4217).
const narceus: PriceTier[] = [
	{ minQuantity: 1, priceCents: 1400 },
	{ minQuantity: 5, priceCents: 6000 },
	{ minQuantity: 10, priceCents: 11000 }
];

describe('tier pricing', () => {
	it('prices each quantity at the rate of the largest tier it reaches', () => {
		expect(lineTotalCents(narceus, 1)).toBe(1400);
		expect(lineTotalCents(narceus, 4)).toBe(5600); // 4 × $14
		expect(lineTotalCents(narceus, 5)).toBe(6000); // the 5-tier itself
		expect(lineTotalCents(narceus, 7)).toBe(8400); // 7 × $12
		expect(lineTotalCents(narceus, 10)).toBe(11000);
		expect(lineTotalCents(narceus, 12)).toBe(13200); // 12 × $11
	});

	it('rounds a fractional rate half up, once per line', () => {
		// 3 for $10.00 is 333.33… cents each: 1 unit at that tier cannot happen, 4 units = 1333.33 → 1333.
		const thirds: PriceTier[] = [
			{ minQuantity: 1, priceCents: 400 },
			{ minQuantity: 3, priceCents: 1000 }
		];
		expect(lineTotalCents(thirds, 3)).toBe(1000);
		expect(lineTotalCents(thirds, 4)).toBe(1333);
		expect(lineTotalCents(thirds, 5)).toBe(1667); // 1666.67 rounds up
	});

	it('refuses quantities that are not whole and positive', () => {
		for (const bad of [0, -1, 1.5, Number.NaN, Number.POSITIVE_INFINITY])
			expect(() => lineTotalCents(narceus, bad)).toThrow(RangeError);
	});

	it('shows the price per animal of groups and pairs', () => {
		// A group of 5 at 1 for $32 is $6.40 an animal; 3 groups for $90 is $6.00.
		const groups: PriceTier[] = [
			{ minQuantity: 1, priceCents: 3200 },
			{ minQuantity: 3, priceCents: 9000 }
		];
		expect(perAnimalCents(groups[0]!, 5)).toBe(640);
		expect(perAnimalCents(groups[1]!, 5)).toBe(600);
		expect(basePriceCents(groups, 5)).toBe(600);
		expect(basePriceCents([], 5)).toBeNull();
		const table = tierTable(narceus, 1);
		expect(table.map((row) => row.perAnimalCents)).toEqual([1400, 1200, 1100]);
		// $12 against $14 saves 14.3 %; $11 against $14 saves 21.4 %.
		expect(table.map((row) => row.savingPercent)).toEqual([0, 14, 21]);
		expect(nextTier(narceus, 3)).toEqual(narceus[1]);
		expect(nextTier(narceus, 10)).toBeNull();
		expect(tierFor(narceus, 9)).toEqual(narceus[1]);
	});

	it('checks a set of tiers', () => {
		expect(tiersProblem(narceus)).toBeNull();
		expect(tiersProblem([])).toMatch(/at least one/);
		expect(tiersProblem([{ minQuantity: 5, priceCents: 6000 }])).toMatch(/single unit/);
		expect(tiersProblem([...narceus, { minQuantity: 5, priceCents: 5000 }])).toMatch(/Two tiers/);
		expect(tiersProblem([{ minQuantity: 1, priceCents: 14.5 }])).toMatch(/whole cents/);
	});
});

const tierSet = fc
	.uniqueArray(fc.integer({ min: 2, max: 50 }), { maxLength: 3 })
	.chain((extraMins) =>
		fc.tuple(
			...[1, ...extraMins].map((minQuantity) =>
				fc.integer({ min: 0, max: 500_000 }).map((priceCents) => ({ minQuantity, priceCents }))
			)
		)
	);

describe('cart totals', () => {
	it('adds the lines and the fee exactly, in whole cents, for random carts', () => {
		fc.assert(
			fc.property(
				fc.array(
					fc.record({
						tiers: tierSet,
						quantity: fc.integer({ min: 1, max: 1000 }),
						isLive: fc.boolean()
					}),
					{ maxLength: 12 }
				),
				fc.integer({ min: 0, max: 20_000 }),
				(lines, fee) => {
					const totals = cartTotals(
						lines.map((line, i) => ({ ...line, listingId: i + 1 })),
						fee
					);
					const sum = totals.lines.reduce((acc, line) => acc + line.lineTotalCents, 0);
					expect(totals.subtotalCents).toBe(sum);
					expect(totals.totalCents).toBe(sum + totals.shippingCents);
					expect(totals.shippingCents).toBe(lines.length ? fee : 0);
					expect(totals.hasLive).toBe(lines.some((line) => line.isLive));
					for (const line of totals.lines) {
						expect(Number.isSafeInteger(line.lineTotalCents)).toBe(true);
						expect(line.lineTotalCents).toBeGreaterThanOrEqual(0);
					}
				}
			),
			{ numRuns: 300 }
		);
	});

	it('never charges more for a line than buying it at the single-unit price', () => {
		// Holds when bigger tiers are not dearer per unit, as the shop's tiers are.
		fc.assert(
			fc.property(
				fc.integer({ min: 1, max: 100_000 }),
				fc.integer({ min: 2, max: 20 }),
				fc.integer({ min: 0, max: 100 }),
				fc.integer({ min: 1, max: 1000 }),
				(single, min, discountPercent, quantity) => {
					const bulk = Math.floor((single * min * (100 - discountPercent)) / 100);
					const tiers = [
						{ minQuantity: 1, priceCents: single },
						{ minQuantity: min, priceCents: bulk }
					];
					expect(lineTotalCents(tiers, quantity)).toBeLessThanOrEqual(single * quantity);
				}
			)
		);
	});

	it('refuses one listing on two lines and a fractional fee', () => {
		const line = { listingId: 1, quantity: 1, tiers: narceus, isLive: true };
		expect(() => cartTotals([line, line], 0)).toThrow(/twice/);
		expect(() => cartTotals([line], 12.5)).toThrow(/whole cents/);
	});
});
