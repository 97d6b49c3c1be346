import { describe, expect, it } from 'vitest';
import { boughtInSchema, lossSchema, splitRows, splitSchema } from './clutch-forms';

describe('splitRows', () => {
	it('keeps the filled rows in order with their row numbers, and blank size as "same as now"', () => {
		const form = splitSchema.parse({ part1Count: 5, part3Count: 2, part3Size: 'medium' });
		expect(splitRows(form)).toEqual([
			{ row: 1, count: 5, sizeClass: null },
			{ row: 3, count: 2, sizeClass: 'medium' }
		]);
	});
	it('has no rows for an empty form', () => {
		expect(splitRows(splitSchema.parse({}))).toEqual([]);
	});
});

describe('clutch form fields', () => {
	it('refuses a loss of zero and a loss with no reason, with words for the field', () => {
		const result = lossSchema.safeParse({ count: 0, reason: ' ', happenedOn: '2026-12-01' });
		expect(result.success).toBe(false);
		const messages = result.error?.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
		expect(messages).toContain('count: At least 1.');
		expect(messages).toContain('reason: Say what happened, even "cause unknown".');
	});
	it('defaults a bought-in clutch to generation 1 and refuses a negative one', () => {
		const base = {
			speciesId: 1,
			foundOn: '2026-11-01',
			stage: 'juvenile',
			sizeClass: 'small',
			count: 4
		};
		expect(boughtInSchema.parse(base).generation).toBe(1);
		expect(boughtInSchema.safeParse({ ...base, generation: -1 }).success).toBe(false);
	});
});
