import { describe, expect, it } from 'vitest';
import { shipDayFromQuery, substituteSchema } from './ship-day-forms';

describe('the ship day asked for', () => {
	it('is today when none is given', () => {
		expect(shipDayFromQuery(null, '2026-12-02')).toEqual({ date: '2026-12-02', note: null });
		expect(shipDayFromQuery('', '2026-12-02')).toEqual({ date: '2026-12-02', note: null });
	});

	it('takes a real calendar date and refuses one that does not exist', () => {
		expect(shipDayFromQuery('2026-12-03', '2026-12-02').date).toBe('2026-12-03');
		// 2027 is not a leap year (Gregorian rule: divisible by 4, not a century): no 29 Feb.
		expect(shipDayFromQuery('2027-02-29', '2026-12-02')).toEqual({
			date: '2026-12-02',
			note: '“2027-02-29” is not a date; showing today.'
		});
		expect(shipDayFromQuery('2028-02-29', '2027-12-01').date).toBe('2028-02-29');
		expect(shipDayFromQuery('tomorrow', '2026-12-02').note).toContain('is not a date');
	});

	it('keeps to a year either side of today', () => {
		expect(shipDayFromQuery('2030-01-01', '2026-12-02').note).toMatch(
			/^Ship days open up to a year/
		);
		expect(shipDayFromQuery('2025-11-30', '2026-12-02').date).toBe('2026-12-02');
		expect(shipDayFromQuery('2025-12-01', '2026-12-02').date).toBe('2025-12-01');
	});
});

describe('the substitute form', () => {
	it('needs a clutch picked', () => {
		const parsed = substituteSchema.safeParse({ orderLineId: 4 });
		expect(parsed.success).toBe(false);
		expect(parsed.error?.issues[0]?.message).toBe('Pick the clutch that takes this line.');
	});
});
