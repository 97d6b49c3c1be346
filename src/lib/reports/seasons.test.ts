import { describe, expect, it } from 'vitest';
import { seasonOf, seasonsBetween } from './seasons';

// The check values are the meteorological seasons as NOAA's National Centers for
// Environmental Information publish them (written from memory of their "Meteorological
// versus astronomical seasons" page): spring 1 March – 31 May, summer 1 June – 31 August,
// fall 1 September – 30 November, winter 1 December – 28 (29) February.
describe('seasonOf', () => {
	it.each([
		// [day, season, first day, next season's first day]
		['2026-03-01', 'spring', '2026-03-01', '2026-06-01'],
		['2026-05-31', 'spring', '2026-03-01', '2026-06-01'],
		['2026-06-01', 'summer', '2026-06-01', '2026-09-01'],
		['2026-08-31', 'summer', '2026-06-01', '2026-09-01'],
		['2026-09-01', 'autumn', '2026-09-01', '2026-12-01'],
		['2026-11-30', 'autumn', '2026-09-01', '2026-12-01'],
		['2026-12-01', 'winter', '2026-12-01', '2027-03-01'],
		['2026-12-31', 'winter', '2026-12-01', '2027-03-01'],
		['2027-01-01', 'winter', '2026-12-01', '2027-03-01'],
		['2027-02-28', 'winter', '2026-12-01', '2027-03-01'],
		// 2028 is a leap year: 29 February is still winter, 1 March is spring.
		['2028-02-29', 'winter', '2027-12-01', '2028-03-01'],
		['2028-03-01', 'spring', '2028-03-01', '2028-06-01']
	])('%s is in %s (%s to before %s)', (day, name, start, next) => {
		const season = seasonOf(day);
		expect(season.name).toBe(name);
		expect(season.start).toBe(start);
		expect(season.next).toBe(next);
	});

	it('names a winter by both its years, the rest by one', () => {
		expect(seasonOf('2026-01-15').label).toBe('Winter 2025–26');
		expect(seasonOf('2025-12-15').label).toBe('Winter 2025–26');
		expect(seasonOf('2026-04-15').label).toBe('Spring 2026');
		expect(seasonOf('2026-07-15').label).toBe('Summer 2026');
		expect(seasonOf('2026-10-15').label).toBe('Autumn 2026');
		// The winter after the 2009 one ends in 2010: written "2009–10", not "2009–010".
		expect(seasonOf('2010-02-01').label).toBe('Winter 2009–10');
		// Across a century the second year is written in full.
		expect(seasonOf('2100-01-10').label).toBe('Winter 2099–2100');
	});

	it('refuses a day that is not on the calendar', () => {
		expect(() => seasonOf('2026-02-30')).toThrow(RangeError);
	});
});

describe('seasonsBetween', () => {
	it('lists every season the range touches, in order, cut ones included', () => {
		// 2025-12-20 is in Winter 2025–26, 2026-09-02 in Autumn 2026: four seasons.
		expect(seasonsBetween('2025-12-20', '2026-09-02').map((s) => s.label)).toEqual([
			'Winter 2025–26',
			'Spring 2026',
			'Summer 2026',
			'Autumn 2026'
		]);
	});

	it('gives one season for a range inside it, and seasons that follow on without a gap', () => {
		expect(seasonsBetween('2026-01-05', '2026-02-10').map((s) => s.start)).toEqual(['2025-12-01']);
		const year = seasonsBetween('2026-01-01', '2026-12-31');
		expect(year.map((s) => s.start)).toEqual([
			'2025-12-01',
			'2026-03-01',
			'2026-06-01',
			'2026-09-01',
			'2026-12-01'
		]);
		for (let i = 1; i < year.length; i++) expect(year[i]!.start).toBe(year[i - 1]!.next);
	});

	it('covers five years (the longest report range) in 21 seasons', () => {
		// 2022-01-01 (Winter 2021–22) to 2026-12-31 (Winter 2026–27): 5 × 4 + 1.
		expect(seasonsBetween('2022-01-01', '2026-12-31')).toHaveLength(21);
	});
});
