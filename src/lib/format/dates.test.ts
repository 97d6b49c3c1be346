import { describe, expect, it } from 'vitest';
import {
	addDays,
	daysBetween,
	formatReadyIn,
	formatShopDate,
	formatShopDateTime,
	parseIsoDate,
	todayInZone
} from './dates';

const NEW_YORK = 'America/New_York';

// Outside reference for every check below: the IANA tz database rule for
// America/New_York since 2007 (rule "US", from memory): EST is UTC−5, EDT is UTC−4;
// DST starts the second Sunday in March at 02:00 local and ends the first Sunday
// in November at 02:00 local. In 2026 those Sundays are Mar 8 and Nov 1
// (worked by hand from 1 Jan 2026 being a Thursday, from memory).

describe('formatShopDateTime in America/New_York', () => {
	it('is UTC−5 (EST) in winter', () => {
		expect(formatShopDateTime(new Date('2026-01-15T17:30:00Z'), NEW_YORK)).toBe(
			'Thu, Jan 15, 2026, 12:30 PM EST'
		);
	});

	it('is UTC−4 (EDT) in summer', () => {
		expect(formatShopDateTime('2026-07-15T17:30:00Z', NEW_YORK)).toBe(
			'Wed, Jul 15, 2026, 1:30 PM EDT'
		);
	});

	it('springs forward on the second Sunday in March at 02:00 local', () => {
		// 06:59 UTC is 01:59 EST; one minute later 07:00 UTC is 03:00 EDT (02:xx never happens).
		expect(formatShopDateTime('2026-03-08T06:59:00Z', NEW_YORK)).toBe(
			'Sun, Mar 8, 2026, 1:59 AM EST'
		);
		expect(formatShopDateTime('2026-03-08T07:00:00Z', NEW_YORK)).toBe(
			'Sun, Mar 8, 2026, 3:00 AM EDT'
		);
		// A week earlier (first Sunday) is still standard time.
		expect(formatShopDateTime('2026-03-01T07:00:00Z', NEW_YORK)).toBe(
			'Sun, Mar 1, 2026, 2:00 AM EST'
		);
	});

	it('falls back on the first Sunday in November at 02:00 local', () => {
		// 05:59 UTC is 01:59 EDT; 06:00 UTC is 01:00 EST (the hour repeats).
		expect(formatShopDateTime('2026-11-01T05:59:00Z', NEW_YORK)).toBe(
			'Sun, Nov 1, 2026, 1:59 AM EDT'
		);
		expect(formatShopDateTime('2026-11-01T06:00:00Z', NEW_YORK)).toBe(
			'Sun, Nov 1, 2026, 1:00 AM EST'
		);
	});
});

describe('formatShopDate', () => {
	it('shows an instant as the day it is in the shop zone', () => {
		// 03:00 UTC on Jan 15 is 22:00 EST on Jan 14 (UTC−5).
		expect(formatShopDate('2026-01-15T03:00:00Z', NEW_YORK)).toBe('Wed, Jan 14, 2026');
		// 03:59 UTC on Jul 15 is 23:59 EDT on Jul 14; 04:00 UTC is midnight EDT on Jul 15 (UTC−4).
		expect(formatShopDate(new Date('2026-07-15T03:59:00Z'), NEW_YORK)).toBe('Tue, Jul 14, 2026');
		expect(formatShopDate(new Date('2026-07-15T04:00:00Z'), NEW_YORK)).toBe('Wed, Jul 15, 2026');
	});

	it('never shifts a calendar date, whatever the zone', () => {
		expect(formatShopDate('2026-03-08', NEW_YORK)).toBe('Sun, Mar 8, 2026');
		expect(formatShopDate('2026-03-08', 'Pacific/Kiritimati')).toBe('Sun, Mar 8, 2026');
		expect(formatShopDate('2026-03-08', 'Pacific/Pago_Pago')).toBe('Sun, Mar 8, 2026');
	});

	it('refuses what is not a date', () => {
		expect(() => formatShopDate('2026-02-30', NEW_YORK)).toThrow(RangeError);
		expect(() => formatShopDate('soon', NEW_YORK)).toThrow(RangeError);
	});
});

describe('calendar arithmetic', () => {
	it('finds today in the shop zone', () => {
		// 02:30 UTC on Mar 9 is still Mar 8 in New York (22:30 EDT, UTC−4 after the change).
		expect(todayInZone(NEW_YORK, new Date('2026-03-09T02:30:00Z'))).toBe('2026-03-08');
		expect(todayInZone(NEW_YORK, new Date('2026-03-09T04:00:00Z'))).toBe('2026-03-09');
	});

	it('adds and counts days across month, leap-day and DST edges', () => {
		expect(addDays('2026-02-27', 2)).toBe('2026-03-01');
		// 2028 is a leap year (divisible by 4, not a century), so Feb 29 exists.
		expect(addDays('2028-02-28', 1)).toBe('2028-02-29');
		expect(addDays('2026-03-07', 84)).toBe('2026-05-30');
		expect(daysBetween('2026-03-07', '2026-03-09')).toBe(2);
		expect(daysBetween('2026-03-09', '2026-03-07')).toBe(-2);
		expect(() => parseIsoDate('2027-02-29')).toThrow(RangeError);
	});

	it('says how far off a sale-ready date is', () => {
		expect(formatReadyIn('2026-03-09', '2026-03-01')).toBe('ready any day now');
		expect(formatReadyIn('2026-03-09', '2026-03-09')).toBe('ready any day now');
		expect(formatReadyIn('2026-03-09', '2026-03-12')).toBe('ready within a week');
		expect(formatReadyIn('2026-03-09', '2026-03-16')).toBe('ready in about 1 week');
		expect(formatReadyIn('2026-03-09', '2026-04-06')).toBe('ready in about 4 weeks');
		expect(formatReadyIn('2026-03-09', '2026-06-01')).toBe('ready in about 12 weeks');
	});
});
