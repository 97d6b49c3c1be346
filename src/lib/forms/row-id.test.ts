import { describe, expect, it } from 'vitest';
import { deleteEntrySchema } from '$lib/care/forms';
import { substituteSchema } from '$lib/fulfilment/ship-day-forms';
import { recheckSchema } from '$lib/shipping/dispatch-forms';
import { leaveEntrySchema } from '$lib/waitlist/schemas';
import { MAX_INTEGER_COLUMN } from './row-id';

describe('row ids in forms', () => {
	it('stop where PostgreSQL’s integer does', () => {
		// PostgreSQL documentation, "Numeric Types": integer is -2147483648 to +2147483647.
		expect(MAX_INTEGER_COLUMN).toBe(2 ** 31 - 1);
	});

	it('take the largest id a row can have and refuse the next one up', () => {
		const cases = [
			(id: number) => recheckSchema.safeParse({ orderId: id }),
			(id: number) => deleteEntrySchema.safeParse({ entryId: id }),
			(id: number) => leaveEntrySchema.safeParse({ entryId: id }),
			(id: number) => substituteSchema.safeParse({ orderLineId: id, clutchId: 1 })
		];
		for (const parse of cases) {
			expect(parse(2_147_483_647).success).toBe(true);
			expect(parse(2_147_483_648).success).toBe(false);
		}
	});
});
