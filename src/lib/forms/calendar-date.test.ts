import { describe, expect, it } from 'vitest';
import { calendarDate } from './calendar-date';

describe('calendarDate', () => {
	const field = calendarDate('Pick a date.');

	it('takes a real day, trimmed', () => {
		expect(field.parse(' 2026-12-01 ')).toBe('2026-12-01');
		// 2028 is a leap year: divisible by 4 and not by 100 (Gregorian rule).
		expect(field.parse('2028-02-29')).toBe('2028-02-29');
	});

	it('refuses days the calendar does not have, with the field’s words', () => {
		// 2026 is not a leap year; no month has a 13th; April has 30 days.
		for (const text of ['2026-02-29', '2026-02-30', '2026-13-01', '2026-04-31', '2026-00-10'])
			expect(field.safeParse(text).error?.issues[0]?.message, text).toBe('Pick a date.');
	});

	it('refuses other shapes', () => {
		for (const text of ['', '12/01/2026', '2026-1-5', '2026-12-01T00:00:00Z', '20261201'])
			expect(field.safeParse(text).success, text).toBe(false);
	});
});
