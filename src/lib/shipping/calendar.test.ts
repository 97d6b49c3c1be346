import Holidays from 'date-holidays';
import { describe, expect, it } from 'vitest';
import { addDays } from '$lib/format/dates';
import {
	deliveryDateFor,
	federalHolidayOn,
	federalHolidays,
	isBusinessDay,
	isoWeekday,
	observedHolidayDates
} from './calendar';

describe('isoWeekday', () => {
	it('agrees with the ICU calendar behind Intl for three years of dates', () => {
		// Reference: Intl.DateTimeFormat (ICU), read in UTC so the day cannot shift.
		const names = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];
		const icu = new Intl.DateTimeFormat('en-US', { weekday: 'short', timeZone: 'UTC' });
		for (let offset = 0; offset < 3 * 366; offset++) {
			const date = addDays('2026-01-01', offset);
			const expected = names.indexOf(icu.format(new Date(`${date}T12:00:00Z`))) + 1;
			expect(isoWeekday(date), date).toBe(expected);
		}
	});
	it('numbers Monday 1 and Sunday 7, as ISO 8601 does', () => {
		// ISO 8601: 2026-01-05 is a Monday, 2026-01-04 a Sunday (paper calendar).
		expect(isoWeekday('2026-01-05')).toBe(1);
		expect(isoWeekday('2026-01-04')).toBe(7);
	});
});

describe('federal holidays on their observed dates (US OPM published lists, from memory)', () => {
	it.each([
		['2026-01-19', 'Martin Luther King Jr. Day, Monday'],
		['2026-06-19', 'Juneteenth, Friday'],
		['2026-07-03', 'Independence Day observed: July 4, 2026 is a Saturday'],
		['2026-11-11', 'Veterans Day, Wednesday'],
		['2026-11-26', 'Thanksgiving Day, Thursday'],
		['2026-12-25', 'Christmas Day, Friday'],
		['2027-07-05', 'Independence Day observed: July 4, 2027 is a Sunday'],
		['2027-11-25', 'Thanksgiving Day, Thursday'],
		['2027-12-24', 'Christmas Day observed: Dec 25, 2027 is a Saturday'],
		['2027-12-31', "New Year's Day 2028 observed: Jan 1, 2028 is a Saturday"],
		['2028-11-10', 'Veterans Day observed: Nov 11, 2028 is a Saturday']
	])('%s is not a business day (%s)', (date) => {
		expect(isoWeekday(date)).toBeLessThanOrEqual(5); // a weekday, so only the holiday closes it
		expect(isBusinessDay(date)).toBe(false);
		expect(federalHolidayOn(date)).toBeDefined();
	});

	it.each([
		['2026-11-27', 'the day after Thanksgiving is not a federal holiday'],
		['2026-12-24', 'Christmas Eve 2026 (a Thursday) is not a federal holiday'],
		['2028-11-07', 'Election Day is not a federal holiday'],
		['2026-07-06', 'the Monday after a Saturday Independence Day is an ordinary day']
	])('%s is a business day (%s)', (date) => {
		expect(isBusinessDay(date)).toBe(true);
	});

	it("puts a Saturday New Year's Day on the Friday before, in the old year (OPM, from memory)", () => {
		const newYear2028 = federalHolidays(2028).find((holiday) => holiday.date === '2028-01-01');
		expect(newYear2028?.observedDate).toBe('2027-12-31');
		expect(observedHolidayDates(2027).has('2027-12-31')).toBe(true);
	});
});

describe('federal holidays against the date-holidays reference library, 2026–2030', () => {
	const library = new Holidays('US');
	const years = [2026, 2027, 2028, 2029, 2030];

	it.each(years)('%i has 11 federal holidays (5 U.S.C. 6103 since Juneteenth, 2021)', (year) => {
		const libraryFederal = library
			.getHolidays(year, 'en')
			.filter((holiday) => holiday.type === 'public' && !holiday.substitute);
		expect(libraryFederal).toHaveLength(11);
		expect(federalHolidays(year)).toHaveLength(11);
		expect(federalHolidays(year).map((holiday) => holiday.name)).toEqual(
			libraryFederal.map((holiday) => holiday.name)
		);
	});

	it.each(years)(
		'%i: a weekday is closed exactly when the library has a federal holiday or its substitute on it',
		(year) => {
			// The library's own entries: public holidays plus every substitute day (its
			// Veterans Day substitute is filed as 'bank', "Federal Government offices are closed").
			const libraryClosed = new Set(
				library
					.getHolidays(year, 'en')
					.filter((holiday) => holiday.type === 'public' || holiday.substitute === true)
					.map((holiday) => holiday.date.slice(0, 10))
			);
			for (let offset = 0; addDays(`${year}-01-01`, offset).startsWith(`${year}-`); offset++) {
				const date = addDays(`${year}-01-01`, offset);
				if (isoWeekday(date) >= 6) continue;
				expect(isBusinessDay(date), date).toBe(!libraryClosed.has(date));
			}
		}
	);

	it('gives one observed date per holiday, on a weekday', () => {
		for (const year of years) {
			for (const holiday of federalHolidays(year)) {
				expect(isoWeekday(holiday.observedDate), holiday.name).toBeLessThanOrEqual(5);
				expect(isBusinessDay(holiday.observedDate)).toBe(false);
			}
		}
	});

	it('has no Juneteenth before it became a federal holiday in 2021 (Pub. L. 117-17)', () => {
		expect(federalHolidays(2020).some((holiday) => holiday.name === 'Juneteenth')).toBe(false);
		expect(federalHolidays(2020)).toHaveLength(10);
		// June 18, 2021 was its first observed date (June 19, 2021 was a Saturday).
		expect(isBusinessDay('2021-06-18')).toBe(false);
	});
});

describe('isBusinessDay', () => {
	it('is false on weekends and on the shop’s extra closed dates', () => {
		expect(isBusinessDay('2026-12-05')).toBe(false); // Saturday
		expect(isBusinessDay('2026-12-06')).toBe(false); // Sunday
		expect(isBusinessDay('2026-12-08')).toBe(true);
		expect(isBusinessDay('2026-12-08', ['2026-12-08'])).toBe(false);
	});
	it('refuses a malformed date rather than guessing', () => {
		expect(() => isBusinessDay('2026-02-30')).toThrow(RangeError);
	});
});

describe('deliveryDateFor', () => {
	it('delivers overnight the next business day', () => {
		expect(deliveryDateFor('2026-12-07', 'overnight')).toBe('2026-12-08'); // Mon → Tue
		expect(deliveryDateFor('2026-12-07', 'two_day')).toBe('2026-12-09'); // Mon → Wed
	});
	it('refuses a ship date whose delivery lands on a holiday (Thanksgiving 2026, OPM)', () => {
		expect(deliveryDateFor('2026-11-25', 'overnight')).toBeNull();
		expect(deliveryDateFor('2026-11-24', 'two_day')).toBeNull();
		expect(deliveryDateFor('2026-11-24', 'overnight')).toBe('2026-11-25');
	});
	it('refuses a two-day shipment over a mid-week holiday (Veterans Day, Wed 2026-11-11, OPM)', () => {
		expect(deliveryDateFor('2026-11-09', 'two_day')).toBeNull(); // Tue 10 ok, Wed 11 closed
		expect(deliveryDateFor('2026-11-10', 'two_day')).toBeNull();
		expect(deliveryDateFor('2026-11-09', 'overnight')).toBe('2026-11-10');
	});
	it('never lets a box sit over a weekend: Friday overnight would arrive Saturday', () => {
		expect(deliveryDateFor('2026-12-04', 'overnight')).toBeNull();
		expect(deliveryDateFor('2026-12-03', 'two_day')).toBeNull(); // Thu → Sat
		expect(deliveryDateFor('2026-12-03', 'overnight')).toBe('2026-12-04');
	});
	it('refuses a ship date that is itself closed', () => {
		expect(deliveryDateFor('2026-12-05', 'overnight')).toBeNull(); // Saturday
		expect(deliveryDateFor('2026-11-26', 'overnight')).toBeNull(); // Thanksgiving
	});
	it('honours the shop’s extra closed dates in transit', () => {
		expect(deliveryDateFor('2026-12-07', 'two_day', ['2026-12-08'])).toBeNull();
		expect(deliveryDateFor('2026-12-07', 'overnight', ['2026-12-09'])).toBe('2026-12-08');
	});
});
