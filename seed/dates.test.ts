import { describe, expect, it } from 'vitest';
import {
	addDays,
	assertIsoDate,
	dateInTimeZone,
	daysBetween,
	instantOn,
	isoWeekday,
	weekdayOnOrAfter,
	weekdayOnOrBefore
} from './dates';

describe('addDays / daysBetween', () => {
	it('crosses month, year and leap-day boundaries', () => {
		expect(addDays('2028-02-28', 1)).toBe('2028-02-29');
		expect(addDays('2027-02-28', 1)).toBe('2027-03-01');
		expect(addDays('2026-12-31', 1)).toBe('2027-01-01');
		expect(addDays('2026-03-01', -1)).toBe('2026-02-28');
	});
	it('is not moved by a daylight-saving change', () => {
		// US clocks go forward on 2026-03-08 and back on 2026-11-01.
		expect(addDays('2026-03-07', 2)).toBe('2026-03-09');
		expect(daysBetween('2026-10-31', '2026-11-02')).toBe(2);
	});
	it('round-trips', () => {
		expect(daysBetween('2026-12-01', addDays('2026-12-01', -365))).toBe(-365);
	});
	it('refuses fractional days', () => {
		expect(() => addDays('2026-12-01', 0.5)).toThrow(RangeError);
	});
});

describe('assertIsoDate', () => {
	it('accepts a real day and refuses impossible or malformed ones', () => {
		expect(assertIsoDate('2028-02-29')).toBe('2028-02-29');
		expect(() => assertIsoDate('2027-02-29')).toThrow(RangeError);
		expect(() => assertIsoDate('2026-13-01')).toThrow(RangeError);
		expect(() => assertIsoDate('12/01/2026')).toThrow(RangeError);
		expect(() => assertIsoDate('')).toThrow(RangeError);
	});
});

describe('weekdays', () => {
	it('numbers Monday 1 to Sunday 7', () => {
		expect(isoWeekday('2026-11-30')).toBe(1);
		expect(isoWeekday('2026-12-06')).toBe(7);
	});
	it('finds the next and previous ship day', () => {
		const overnight = [1, 2, 3];
		expect(weekdayOnOrAfter('2026-12-03', overnight)).toBe('2026-12-07'); // Thu → Mon
		expect(weekdayOnOrAfter('2026-12-01', overnight)).toBe('2026-12-01'); // Tue stays
		expect(weekdayOnOrBefore('2026-12-06', overnight)).toBe('2026-12-02'); // Sun → Wed
	});
	it('refuses a weekday set with no real day in it', () => {
		expect(() => weekdayOnOrAfter('2026-12-01', [])).toThrow(RangeError);
		expect(() => weekdayOnOrAfter('2026-12-01', [0, 8])).toThrow(RangeError);
	});
});

describe('instantOn', () => {
	it('writes a UTC instant and checks its parts', () => {
		expect(instantOn('2026-12-01', '15:00')).toBe('2026-12-01T15:00:00Z');
		expect(() => instantOn('2026-12-01', '24:00')).toThrow(RangeError);
		expect(() => instantOn('2026-02-30', '10:00')).toThrow(RangeError);
	});
});

describe('dateInTimeZone', () => {
	it("gives the shop's calendar day, not UTC's", () => {
		// 03:30 UTC on 1 December is still 30 November in New York.
		const instant = new Date('2026-12-01T03:30:00Z');
		expect(dateInTimeZone(instant, 'America/New_York')).toBe('2026-11-30');
		expect(dateInTimeZone(instant, 'UTC')).toBe('2026-12-01');
	});
});
