import { describe, expect, it } from 'vitest';
import {
	OVERRIDE_REASON_MIN_LENGTH,
	overrideReasonProblem,
	overrideShipDateProblem
} from './override';

// Weekdays checked with Python's datetime.date(...).strftime('%A') (proleptic Gregorian):
// 2026-12-01 Tuesday, 2026-12-03 Thursday, 2026-12-04 Friday, 2026-12-05 Saturday,
// 2026-12-07 Monday, 2026-12-24 Thursday.
const today = '2026-12-01';

describe('overrideReasonProblem', () => {
	it('wants a sentence, not a word', () => {
		expect(overrideReasonProblem('ok')).toMatch(/at least 10 characters/);
		// Whitespace does not count towards the length.
		expect(overrideReasonProblem(`   ${'x'.repeat(OVERRIDE_REASON_MIN_LENGTH - 1)}   `)).not.toBe(
			null
		);
		expect(overrideReasonProblem('Buyer collects at the depot himself.')).toBe(null);
		expect(overrideReasonProblem('x'.repeat(1001))).toMatch(/under 1,000/);
	});
});

describe('overrideShipDateProblem', () => {
	const check = (shipDate: string, service: 'overnight' | 'two_day' = 'overnight') =>
		overrideShipDateProblem({ shipDate, today, service, extraClosedDates: ['2026-12-07'] });

	it('takes today and later business days whose transit stays on business days', () => {
		expect(check('2026-12-01')).toBe(null);
		// Overnight on a Thursday lands on Friday: allowed, though not a default ship weekday.
		expect(check('2026-12-03')).toBe(null);
		expect(check('2026-12-02', 'two_day')).toBe(null);
	});

	it('refuses a date that has passed, and one that is not a date', () => {
		expect(check('2026-11-30')).toMatch(/has passed/);
		expect(check('2026-02-30')).toMatch(/Pick a date/);
		expect(check('next week')).toMatch(/Pick a date/);
	});

	it('refuses a weekend day, a federal holiday and a shop closed day', () => {
		expect(check('2026-12-05')).toMatch(/weekend/);
		// Christmas Day is a federal holiday (5 U.S.C. 6103(a)); Dec 25, 2026 is a Friday.
		expect(check('2026-12-25')).toMatch(/Christmas Day/);
		expect(check('2026-12-07')).toMatch(/closed days/);
	});

	it('refuses a day whose transit would sit in a depot over a weekend or holiday', () => {
		// Friday overnight arrives on Saturday.
		expect(check('2026-12-04')).toMatch(/depot/);
		// Thursday two-day spends Saturday in transit.
		expect(check('2026-12-03', 'two_day')).toMatch(/depot/);
		// Christmas Eve overnight would arrive on Christmas Day.
		expect(check('2026-12-24')).toMatch(/depot/);
	});
});
