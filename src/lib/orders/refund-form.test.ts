import { describe, expect, it } from 'vitest';
import { refundFormSchema, refundRequestOf } from './refund-form';

const base = { lineId: [11, 12], lineQuantity: ['', ''], restock: [], amount: '', reason: 'DOA' };
const problems = (input: object) => {
	const result = refundFormSchema.safeParse({ ...base, ...input });
	return result.success ? [] : result.error.issues.map((i) => i.path.join('.'));
};

describe('refundFormSchema', () => {
	it('needs a reason and either an amount or a line', () => {
		expect(problems({ reason: '  ' })).toContain('reason');
		expect(problems({})).toEqual(['amount']);
		expect(problems({ lineQuantity: ['1', ''] })).toEqual([]);
		expect(problems({ amount: '12.50' })).toEqual([]);
	});

	it('refuses 0, negative, fractional cents and counts that are not whole', () => {
		expect(problems({ amount: '0.00' })).toEqual(['amount']);
		expect(problems({ amount: '-5' })).toEqual(['amount']);
		expect(problems({ amount: '$-5' })).toEqual(['amount']);
		expect(problems({ amount: '1.005' })).toEqual(['amount']);
		expect(problems({ lineQuantity: ['1.5', ''] })).toEqual(['lineQuantity.0', 'amount']);
	});
});

describe('refundRequestOf', () => {
	it('turns typed dollars into exact cents and keeps only the lines picked', () => {
		const form = refundFormSchema.parse({
			...base,
			lineQuantity: ['', '2'],
			restock: [12],
			// 0.29 is not exact in binary floating point; the cents must still be 29.
			amount: '0.29'
		});
		expect(refundRequestOf(form)).toEqual({
			amountCents: 29,
			lines: [{ orderLineId: 12, quantity: 2, restock: true }]
		});
	});

	it('leaves the amount to the lines when none is typed', () => {
		const form = refundFormSchema.parse({ ...base, lineQuantity: ['1', ''] });
		expect(refundRequestOf(form)).toEqual({
			lines: [{ orderLineId: 11, quantity: 1, restock: false }]
		});
	});
});
