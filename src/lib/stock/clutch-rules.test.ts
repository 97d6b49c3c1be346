import { describe, expect, it } from 'vitest';
import {
	foundDateProblem,
	generationLabel,
	offspringGeneration,
	projectedSaleReadyOn
} from './clutch-rules';

describe('offspringGeneration', () => {
	it('is the colony generation plus one (PRODUCT.md: "a tub yields the generation of its colony plus one")', () => {
		expect(offspringGeneration(0)).toBe(1);
		expect(offspringGeneration(1)).toBe(2);
		expect(offspringGeneration(4)).toBe(5);
	});
	it('refuses a negative or fractional generation', () => {
		expect(() => offspringGeneration(-1)).toThrow(RangeError);
		expect(() => offspringGeneration(1.5)).toThrow(RangeError);
	});
	it('names generations the way the trade writes them', () => {
		expect(generationLabel(0)).toBe('wild-caught');
		expect(generationLabel(2)).toBe('captive-bred F2');
	});
});

describe('projectedSaleReadyOn', () => {
	it('adds whole weeks across a month and a year end', () => {
		// 2026-12-01 + 10 weeks: counted on a paper calendar, Tue Feb 9, 2027.
		expect(projectedSaleReadyOn('2026-12-01', 10)).toBe('2027-02-09');
		expect(projectedSaleReadyOn('2026-02-20', 1)).toBe('2026-02-27');
	});
	it('refuses zero weeks', () => {
		expect(() => projectedSaleReadyOn('2026-12-01', 0)).toThrow(RangeError);
	});
});

describe('foundDateProblem', () => {
	it('refuses young found before their tub was made, or in the future', () => {
		expect(foundDateProblem('2026-11-01', '2026-11-02', '2026-12-01')).toMatch(/set aside/);
		expect(foundDateProblem('2026-12-02', '2026-11-02', '2026-12-01')).toMatch(/to come/);
		expect(foundDateProblem('2026-11-02', '2026-11-02', '2026-12-01')).toBeNull();
		expect(foundDateProblem('2026-11-20', null, '2026-12-01')).toBeNull();
	});
});
