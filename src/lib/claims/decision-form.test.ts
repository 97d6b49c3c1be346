import { describe, expect, it } from 'vitest';
import {
	claimDeclineSchema,
	claimRefundSchema,
	claimReshipSchema,
	CLAIM_NOTE_MAX,
	refundCentsOf
} from './decision-form';

const issues = (result: { success: boolean; error?: { issues: { path: PropertyKey[] }[] } }) =>
	result.success ? [] : result.error!.issues.map((issue) => issue.path.join('.'));

describe('claimRefundSchema', () => {
	const note = 'Refund for the two that arrived dead.';

	it('takes a blank amount (the dead lines’ share) or dollars and cents, and needs a note', () => {
		expect(issues(claimRefundSchema.safeParse({ amount: '', note }))).toEqual([]);
		expect(issues(claimRefundSchema.safeParse({ amount: '12.50', note }))).toEqual([]);
		expect(issues(claimRefundSchema.safeParse({ amount: '$8', note }))).toEqual([]);
		expect(issues(claimRefundSchema.safeParse({ amount: '', note: '   ' }))).toEqual(['note']);
		expect(
			issues(claimRefundSchema.safeParse({ amount: '', note: 'x'.repeat(CLAIM_NOTE_MAX + 1) }))
		).toEqual(['note']);
	});

	it('refuses nothing, a negative amount, fractions of a cent and words', () => {
		for (const amount of ['0', '0.00', '-5', '$-5', '1.005', 'twelve'])
			expect(issues(claimRefundSchema.safeParse({ amount, note })), amount).toEqual(['amount']);
	});

	it('turns typed dollars into exact cents (USD has two minor units, ISO 4217)', () => {
		// 0.29 has no exact binary form; the cents must still be 29, not 28.999….
		expect(refundCentsOf(claimRefundSchema.parse({ amount: '0.29', note }))).toBe(29);
		expect(refundCentsOf(claimRefundSchema.parse({ amount: '$1,020.5', note }))).toBe(102050);
		expect(refundCentsOf(claimRefundSchema.parse({ amount: ' ', note }))).toBeUndefined();
	});
});

describe('claimReshipSchema', () => {
	it('takes an empty note or one up to the limit', () => {
		expect(claimReshipSchema.parse({})).toEqual({ note: '' });
		expect(claimReshipSchema.parse({ note: '  Replacements on the next safe day.  ' })).toEqual({
			note: 'Replacements on the next safe day.'
		});
		expect(issues(claimReshipSchema.safeParse({ note: 'x'.repeat(CLAIM_NOTE_MAX + 1) }))).toEqual([
			'note'
		]);
	});
});

describe('claimDeclineSchema', () => {
	it('needs a reason of ten characters or more once trimmed', () => {
		expect(issues(claimDeclineSchema.safeParse({ reason: 'No photo.' }))).toEqual(['reason']);
		expect(issues(claimDeclineSchema.safeParse({ reason: '   Late claim   ' }))).toEqual([]);
		expect(issues(claimDeclineSchema.safeParse({ reason: '         x' }))).toEqual(['reason']);
	});
});
