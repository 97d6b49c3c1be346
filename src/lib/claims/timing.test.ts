import { describe, expect, it } from 'vitest';
import { describeFiledAfter, formatDuration, hoursBetween } from './timing';

// 1 h = 60 min = 3600 s (the SI Brochure's and NIST SP 811's table of units accepted for
// use with the SI; cited from memory). Instants are built with Date.UTC, not our code.
describe('hoursBetween', () => {
	it('counts hours between two instants, fractional and signed', () => {
		const delivered = new Date(Date.UTC(2026, 10, 25, 16, 30));
		expect(hoursBetween(delivered, new Date(Date.UTC(2026, 10, 25, 17, 10)))).toBeCloseTo(
			40 / 60,
			12
		);
		expect(hoursBetween(delivered, new Date(Date.UTC(2026, 10, 25, 18, 30)))).toBe(2);
		expect(hoursBetween(delivered, new Date(Date.UTC(2026, 10, 26, 16, 30)))).toBe(24);
		expect(hoursBetween(delivered, new Date(Date.UTC(2026, 10, 25, 16, 0)))).toBe(-0.5);
	});

	it('counts a night the clocks fall back as the 25 hours it lasts, not a calendar day', () => {
		// US daylight time ended at 2:00 EDT on Sun 1 Nov 2026 (first Sunday in November,
		// 15 U.S.C. 260a as amended in 2005): New York noon to noon spans 25 hours.
		const saturdayNoon = new Date('2026-10-31T12:00:00-04:00');
		const sundayNoon = new Date('2026-11-01T12:00:00-05:00');
		expect(hoursBetween(saturdayNoon, sundayNoon)).toBe(25);
	});
});

describe('formatDuration and describeFiledAfter', () => {
	it('says minutes under an hour, hours and minutes under a day, days and hours beyond', () => {
		expect(formatDuration(40 / 60)).toBe('40 min');
		expect(formatDuration(0)).toBe('0 min');
		expect(formatDuration(70 / 60)).toBe('1 h 10 min');
		expect(formatDuration(2)).toBe('2 h');
		// 59.6 minutes round to the next whole hour, not "60 min".
		expect(formatDuration(59.6 / 60)).toBe('1 h');
		expect(formatDuration(24)).toBe('1 day');
		expect(formatDuration(51)).toBe('2 days 3 h');
	});

	it('says after delivery, or before it for a delivery time moved later', () => {
		expect(describeFiledAfter(50 / 60)).toBe('50 min after delivery');
		expect(describeFiledAfter(-0.5)).toBe('30 min before the recorded delivery');
	});
});
