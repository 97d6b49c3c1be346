import Holidays from 'date-holidays';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { addDays, daysBetween } from '$lib/format/dates';
import { DEFAULT_THRESHOLDS } from './defaults';
import { shipCheck, type DailyForecast, type ShipCheckInput } from './ship-check';

// The reference for closed days is the date-holidays library itself, read here
// directly: a day is closed when it carries a public holiday or a substitute day.
const library = new Holidays('US');
const libraryClosedByYear = new Map<number, Set<string>>();
function libraryClosed(date: string): boolean {
	const year = Number(date.slice(0, 4));
	let closed = libraryClosedByYear.get(year);
	if (!closed) {
		closed = new Set(
			library
				.getHolidays(year, 'en')
				.filter((holiday) => holiday.type === 'public' || holiday.substitute === true)
				.map((holiday) => holiday.date.slice(0, 10))
		);
		libraryClosedByYear.set(year, closed);
	}
	return closed.has(date);
}

/** Weekday by Intl (ICU) in UTC, 1 = Monday, independent of the code under test. */
const icuWeekday = new Intl.DateTimeFormat('en-US', { weekday: 'short', timeZone: 'UTC' });
function weekdayOf(date: string): number {
	return (
		['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'].indexOf(
			icuWeekday.format(new Date(`${date}T12:00:00Z`))
		) + 1
	);
}

function openForBusiness(date: string, extraClosedDates: readonly string[]): boolean {
	return weekdayOf(date) <= 5 && !libraryClosed(date) && !extraClosedDates.includes(date);
}

const firstDay = '2026-01-01';
const lastDay = '2030-12-31';

// Mostly mild days so that many runs end in a ship date, some from the whole range.
const dayWeather = fc
	.oneof(
		{
			weight: 5,
			arbitrary: fc.tuple(fc.integer({ min: 55, max: 72 }), fc.integer({ min: 0, max: 12 }))
		},
		{
			weight: 1,
			arbitrary: fc.tuple(fc.integer({ min: -10, max: 115 }), fc.integer({ min: 0, max: 40 }))
		}
	)
	.map(([lowF, spread]) => ({ lowF, highF: Math.min(115, lowF + spread) }));

function consecutive(today: string, weather: readonly { lowF: number; highF: number }[]) {
	return weather.map((day, offset): DailyForecast => ({ date: addDays(today, offset), ...day }));
}

// The defaults, or any consistent set: hold below < heat pack below < cold pack above < hold above.
const randomThresholds = fc
	.tuple(
		fc.integer({ min: 0, max: 40 }),
		fc.integer({ min: 1, max: 30 }),
		fc.integer({ min: 1, max: 40 }),
		fc.integer({ min: 1, max: 20 })
	)
	.map(([holdBelowF, toHeat, toCold, toHold]) => ({
		holdBelowF,
		heatPackBelowF: holdBelowF + toHeat,
		coldPackAboveF: holdBelowF + toHeat + toCold,
		holdAboveF: holdBelowF + toHeat + toCold + toHold
	}));
const thresholds = fc.oneof(
	{ weight: 2, arbitrary: fc.constant({ ...DEFAULT_THRESHOLDS }) },
	{ weight: 1, arbitrary: randomThresholds }
);

// Usually a week or more of forecast, sometimes too little for any route.
const forecastDays = fc.oneof(
	{ weight: 4, arbitrary: fc.array(dayWeather, { minLength: 7, maxLength: 21 }) },
	{ weight: 1, arbitrary: fc.array(dayWeather, { maxLength: 6 }) }
);

const shipCheckInput = fc
	.record({
		todayOffset: fc.integer({ min: 0, max: daysBetween(firstDay, lastDay) }),
		service: fc.constantFrom('overnight' as const, 'two_day' as const),
		shipWeekdays: fc.subarray([1, 2, 3, 4, 5, 6, 7]),
		thresholds,
		originWeather: forecastDays,
		destinationWeather: forecastDays,
		closedOffsets: fc.uniqueArray(fc.integer({ min: 0, max: 13 }), { maxLength: 2 })
	})
	.map((drawn): ShipCheckInput => {
		const today = addDays(firstDay, drawn.todayOffset);
		return {
			today,
			service: drawn.service,
			shipWeekdays: drawn.shipWeekdays,
			thresholds: drawn.thresholds,
			origin: consecutive(today, drawn.originWeather),
			destination: consecutive(today, drawn.destinationWeather),
			extraClosedDates: drawn.closedOffsets.map((offset) => addDays(today, offset))
		};
	});

describe('shipCheck properties (random forecasts, 2026–2030)', () => {
	it('only ever ships on an open ship weekday, arriving on a business day, within every limit', () => {
		let shipped = 0;
		fc.assert(
			fc.property(shipCheckInput, (input) => {
				const result = shipCheck(input);
				if (result.decision === 'hold') {
					expect(result.recheckDate).toBe(addDays(input.today, 1));
					return;
				}
				shipped++;
				const closed = input.extraClosedDates ?? [];
				const transitDays = input.service === 'overnight' ? 1 : 2;
				const limits = input.thresholds;

				expect(daysBetween(input.today, result.shipDate)).toBeGreaterThanOrEqual(0);
				expect(input.shipWeekdays).toContain(weekdayOf(result.shipDate));
				expect(openForBusiness(result.shipDate, closed)).toBe(true);
				expect(daysBetween(result.shipDate, result.deliveryDate)).toBe(transitDays);
				// Each day in transit and the delivery day: no weekend, no holiday, no closure.
				for (let day = 1; day <= transitDays; day++) {
					expect(openForBusiness(addDays(result.shipDate, day), closed)).toBe(true);
				}

				// The route: origin from the ship date up to the day before delivery, destination after it.
				const routeWeather: DailyForecast[] = [];
				for (let day = 0; day <= transitDays; day++) {
					const date = addDays(result.shipDate, day);
					const atOrigin = input.origin.find((forecast) => forecast.date === date);
					const atDestination = input.destination.find((forecast) => forecast.date === date);
					if (day < transitDays) routeWeather.push(atOrigin as DailyForecast);
					if (day > 0) routeWeather.push(atDestination as DailyForecast);
				}
				for (const weather of routeWeather) {
					expect(weather).toBeDefined();
					expect(weather.lowF).toBeGreaterThanOrEqual(limits.holdBelowF);
					expect(weather.highF).toBeLessThanOrEqual(limits.holdAboveF);
				}
				const needsHeat = routeWeather.some((weather) => weather.lowF < limits.heatPackBelowF);
				const needsCold = routeWeather.some((weather) => weather.highF > limits.coldPackAboveF);
				expect(needsHeat && needsCold).toBe(false);
				expect(result.packs).toEqual([
					...(needsHeat ? ['heat'] : []),
					...(needsCold ? ['cold'] : [])
				]);
			}),
			{ numRuns: 300 }
		);
		// The generator must reach the interesting branch often enough to mean something.
		expect(shipped).toBeGreaterThan(30);
	});
});
