import { describe, expect, it } from 'vitest';
import { checkoutSchema } from './schema';

const filled = {
	email: 'ada@example.com',
	ship_name: 'Ada Buyer',
	ship_line1: '100 Example Ave',
	ship_city: 'Duluth',
	ship_state: 'MN',
	ship_zip: '55805',
	service: 'two_day',
	terms: true
};

describe('checkoutSchema', () => {
	it('takes a whole address with the terms ticked', () => {
		const parsed = checkoutSchema.safeParse(filled);
		expect(parsed.success).toBe(true);
		expect(parsed.data?.ship_line2).toBe('');
	});

	it('is never ticked for the buyer: a missing or false tick is refused beside the box', () => {
		for (const terms of [undefined, false]) {
			const parsed = checkoutSchema.safeParse({ ...filled, terms });
			expect(parsed.success).toBe(false);
			expect(parsed.error?.issues[0]?.path).toEqual(['terms']);
		}
	});

	it('refuses a ZIP that is not five digits and a state that is not a USPS code', () => {
		const parsed = checkoutSchema.safeParse({ ...filled, ship_zip: '5580', ship_state: 'XX' });
		expect(parsed.error?.issues.map((issue) => issue.path[0]).sort()).toEqual([
			'ship_state',
			'ship_zip'
		]);
	});
});
