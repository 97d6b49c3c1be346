import { describe, expect, it } from 'vitest';
import { overrideSchema } from './dispatch-forms';

describe('overrideSchema', () => {
	it('needs a written reason of a sentence', () => {
		const short = overrideSchema.safeParse({ orderId: 1, decision: 'hold', reason: 'cold' });
		expect(short.success).toBe(false);
		expect(short.error?.issues[0]?.path).toEqual(['reason']);
	});
	it('needs a date to ship on', () => {
		const parsed = overrideSchema.safeParse({
			orderId: 1,
			decision: 'ship',
			reason: 'Customer collects at the depot.'
		});
		expect(parsed.error?.issues[0]?.path).toEqual(['shipDate']);
	});
	it('takes a hold with a reason', () => {
		expect(
			overrideSchema.parse({
				orderId: 1,
				decision: 'hold',
				reason: 'Customer is away until Monday.'
			})
		).toMatchObject({ decision: 'hold', shipDate: '' });
	});
});
