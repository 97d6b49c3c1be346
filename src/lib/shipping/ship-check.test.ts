import { describe, expect, it } from 'vitest';
import { addDays } from '$lib/format/dates';
import { DEFAULT_SHIP_WEEKDAYS, DEFAULT_THRESHOLDS } from './defaults';
import { shipCheck, type DailyForecast, type ShipCheckInput } from './ship-check';

/** `count` consecutive days of the same mild weather from `from`, with some days changed. */
function forecast(
	from: string,
	count: number,
	changes: Record<string, Partial<DailyForecast>> = {}
): DailyForecast[] {
	return Array.from({ length: count }, (_, offset) => {
		const date = addDays(from, offset);
		return { date, lowF: 62, highF: 74, ...changes[date] };
	});
}

function check(overrides: Partial<ShipCheckInput> & Pick<ShipCheckInput, 'today'>) {
	const service = overrides.service ?? 'overnight';
	return shipCheck({
		service,
		shipWeekdays: [...DEFAULT_SHIP_WEEKDAYS[service]],
		thresholds: { ...DEFAULT_THRESHOLDS },
		origin: forecast(overrides.today, 14),
		destination: forecast(overrides.today, 14),
		...overrides
	});
}

describe('default settings (general practice among live-animal shippers, PRODUCT.md)', () => {
	it('heat pack below 50 °F, hold below 25 °F, cold pack above 85 °F, hold above 95 °F', () => {
		expect(DEFAULT_THRESHOLDS).toEqual({
			heatPackBelowF: 50,
			holdBelowF: 25,
			coldPackAboveF: 85,
			holdAboveF: 95
		});
	});
	it('ships Monday–Wednesday overnight and Monday–Tuesday two-day (ISO weekdays)', () => {
		expect(DEFAULT_SHIP_WEEKDAYS.overnight).toEqual([1, 2, 3]);
		expect(DEFAULT_SHIP_WEEKDAYS.two_day).toEqual([1, 2]);
	});
});

describe('shipCheck: the calendar (holiday dates from the US OPM lists, from memory)', () => {
	it('ships today in mild weather on a ship weekday', () => {
		// Mon 2026-12-07 (paper calendar) → Tue 2026-12-08.
		expect(check({ today: '2026-12-07' })).toEqual({
			decision: 'ship',
			shipDate: '2026-12-07',
			deliveryDate: '2026-12-08',
			packs: [],
			facilityPickup: false,
			reasons: []
		});
	});

	it('will not ship the day before Thanksgiving (Thu 2026-11-26) overnight', () => {
		const result = check({ today: '2026-11-25' });
		// Wed 25 would deliver on Thanksgiving, Thu 26 is closed, Fri 27 is no default ship day.
		expect(result).toMatchObject({
			decision: 'ship',
			shipDate: '2026-11-30',
			deliveryDate: '2026-12-01'
		});
	});

	it('never ships on a Friday with the default weekdays', () => {
		expect(check({ today: '2026-12-04' })).toMatchObject({ shipDate: '2026-12-07' });
		expect(check({ today: '2026-12-04', service: 'two_day' })).toMatchObject({
			shipDate: '2026-12-07'
		});
	});

	it('refuses Friday even when the shop ships on Fridays: overnight would arrive Saturday', () => {
		const fridaysOnly = check({ today: '2026-12-04', shipWeekdays: [5] });
		expect(fridaysOnly.decision).toBe('hold');
		const fridayOrMonday = check({ today: '2026-12-04', shipWeekdays: [1, 5] });
		expect(fridayOrMonday).toMatchObject({ shipDate: '2026-12-07' });
	});

	it('holds a two-day shipment back over Veterans Day (Wed 2026-11-11)', () => {
		// Mon 9: Tue 10 fine, Wed 11 closed. Tue 10: Wed 11 closed. Next Monday is the 16th.
		expect(check({ today: '2026-11-09', service: 'two_day' })).toMatchObject({
			decision: 'ship',
			shipDate: '2026-11-16',
			deliveryDate: '2026-11-18'
		});
		// Overnight on Mon 9 arrives Tue 10, before the holiday.
		expect(check({ today: '2026-11-09' })).toMatchObject({ shipDate: '2026-11-09' });
	});

	it('skips the shop’s extra closed dates', () => {
		// Closed Tue 2026-12-08: Mon 7 cannot deliver, Tue 8 cannot ship, Wed 9 → Thu 10.
		expect(check({ today: '2026-12-07', extraClosedDates: ['2026-12-08'] })).toMatchObject({
			shipDate: '2026-12-09',
			deliveryDate: '2026-12-10'
		});
	});
});

describe('shipCheck: the weather along the route', () => {
	it('checks the origin on the ship date and the destination on the delivery date only', () => {
		// Overnight Mon 2026-12-07 → Tue 12-08: a hard frost at the origin on Tuesday is not on the route.
		const result = check({
			today: '2026-12-07',
			origin: forecast('2026-12-07', 14, { '2026-12-08': { lowF: 10 } }),
			destination: forecast('2026-12-07', 14, { '2026-12-07': { lowF: 10 } })
		});
		expect(result).toMatchObject({ decision: 'ship', shipDate: '2026-12-07', packs: [] });
	});

	it('counts both places on a two-day shipment’s middle day', () => {
		// Two-day Mon 2026-12-07 → Wed 12-09 spends Tue 12-08 in transit: a frost at either end rules it out.
		const today = '2026-12-07';
		const frostAtOrigin = check({
			today,
			service: 'two_day',
			origin: forecast(today, 14, { '2026-12-08': { lowF: 20 } })
		});
		// Tue 8 would leave the origin in that frost too; the next ship weekday is Mon 12-14.
		expect(frostAtOrigin).toMatchObject({ decision: 'ship', shipDate: '2026-12-14' });

		const frostAtDestination = check({
			today,
			service: 'two_day',
			destination: forecast(today, 14, { '2026-12-08': { lowF: 20 } })
		});
		// Tue 8 → Thu 10 has the destination only on Wed 9 and Thu 10.
		expect(frostAtDestination).toMatchObject({ decision: 'ship', shipDate: '2026-12-08' });
	});

	it('moves to the first day the weather allows', () => {
		// A cold snap at the destination on Tue 12-08 rules out Mon 7 overnight; Tue 8 → Wed 9 is clear.
		const result = check({
			today: '2026-12-07',
			destination: forecast('2026-12-07', 14, { '2026-12-08': { lowF: 22 } })
		});
		expect(result).toMatchObject({ decision: 'ship', shipDate: '2026-12-08' });
	});

	it('adds a heat pack for a cold origin and a cold pack for a hot destination', () => {
		const cold = check({
			today: '2026-12-07',
			origin: forecast('2026-12-07', 14, { '2026-12-07': { lowF: 38 } })
		});
		expect(cold).toMatchObject({ decision: 'ship', packs: ['heat'], facilityPickup: false });
		expect(cold.reasons).toEqual([
			{ rule: 'heat_pack', date: '2026-12-07', place: 'origin', valueF: 38, limitF: 50 }
		]);

		const hot = check({
			today: '2026-12-07',
			destination: forecast('2026-12-07', 14, { '2026-12-08': { highF: 91 } })
		});
		expect(hot).toMatchObject({ decision: 'ship', packs: ['cold'], facilityPickup: true });
		expect(hot.reasons).toEqual([
			{ rule: 'cold_pack', date: '2026-12-08', place: 'destination', valueF: 91, limitF: 85 },
			{
				rule: 'facility_pickup_heat',
				date: '2026-12-08',
				place: 'destination',
				valueF: 91,
				limitF: 85
			}
		]);
	});

	it('advises facility pickup when the destination’s delivery-day low is between pack and hold', () => {
		const result = check({
			today: '2026-12-07',
			destination: forecast('2026-12-07', 14, { '2026-12-08': { lowF: 30 } })
		});
		expect(result).toMatchObject({ decision: 'ship', packs: ['heat'], facilityPickup: true });
		expect(result.reasons).toContainEqual({
			rule: 'facility_pickup_cold',
			date: '2026-12-08',
			place: 'destination',
			valueF: 30,
			limitF: 50
		});
	});

	it('rules out a date that would need both a heat pack and a cold pack', () => {
		// Mon 2026-06-01: a cool origin morning and a hot destination; no box can carry both packs.
		const today = '2026-06-01';
		const result = check({
			today,
			origin: forecast(today, 2, { '2026-06-01': { lowF: 45 } }),
			destination: forecast(today, 2, { '2026-06-02': { highF: 90 } })
		});
		expect(result).toEqual({
			decision: 'hold',
			recheckDate: '2026-06-02',
			reasons: [
				{ rule: 'heat_pack', date: '2026-06-01', place: 'origin', valueF: 45, limitF: 50 },
				{ rule: 'cold_pack', date: '2026-06-02', place: 'destination', valueF: 90, limitF: 85 },
				{ rule: 'both_packs', date: '2026-06-01', place: 'origin', valueF: 0, limitF: 0 },
				// Tue 06-02 would need the destination's forecast for Wed 06-03.
				{ rule: 'no_forecast', date: '2026-06-03', place: 'destination', valueF: 0, limitF: 0 }
			]
		});
	});

	it('holds with no_forecast when the forecast is too short for any route', () => {
		const today = '2026-12-07';
		const result = check({ today, origin: forecast(today, 1), destination: forecast(today, 1) });
		expect(result).toEqual({
			decision: 'hold',
			recheckDate: '2026-12-08',
			reasons: [
				{ rule: 'no_forecast', date: '2026-12-08', place: 'destination', valueF: 0, limitF: 0 }
			]
		});
		expect(check({ today, origin: [], destination: [] }).reasons).toEqual([
			{ rule: 'no_forecast', date: '2026-12-07', place: 'origin', valueF: 0, limitF: 0 },
			{ rule: 'no_forecast', date: '2026-12-08', place: 'destination', valueF: 0, limitF: 0 }
		]);
	});

	it('treats a day with an unreadable forecast as no forecast, never as safe weather', () => {
		const today = '2026-12-07';
		const result = check({
			today,
			origin: forecast(today, 3),
			destination: forecast(today, 3, { '2026-12-08': { lowF: Number.NaN } })
		});
		expect(result).toMatchObject({ decision: 'hold' });
		expect(result.reasons[0]).toMatchObject({ rule: 'no_forecast', date: '2026-12-08' });
	});

	it('sets the recheck date to the day after today, across a year end', () => {
		// Thu 2026-12-31 overnight would arrive on New Year's Day (OPM); the next ship day,
		// Mon 2027-01-04, is past a two-day forecast.
		const result = check({
			today: '2026-12-31',
			origin: forecast('2026-12-31', 2),
			destination: forecast('2026-12-31', 2)
		});
		expect(result).toEqual({
			decision: 'hold',
			recheckDate: '2027-01-01',
			reasons: [
				{ rule: 'no_forecast', date: '2027-01-04', place: 'origin', valueF: 0, limitF: 0 },
				{ rule: 'no_forecast', date: '2027-01-05', place: 'destination', valueF: 0, limitF: 0 }
			]
		});
	});

	it('lists each fired rule once when two-day routes overlap', () => {
		// A frost in transit on Tue 2026-12-08 rules out Mon 7 and Tue 8 alike.
		const today = '2026-12-07';
		const result = check({
			today,
			service: 'two_day',
			shipWeekdays: [1, 2],
			origin: forecast(today, 4, { '2026-12-08': { lowF: 18 } }),
			destination: forecast(today, 4)
		});
		expect(result.decision).toBe('hold');
		expect(result.reasons.filter((fired) => fired.rule === 'hold_below')).toEqual([
			{ rule: 'hold_below', date: '2026-12-08', place: 'origin', valueF: 18, limitF: 25 }
		]);
	});
});

describe('shipCheck: comparisons are strict at the default limits (PRODUCT.md, general practice)', () => {
	const today = '2026-12-07'; // Mon; overnight delivers Tue 12-08
	function atDestination(weather: Partial<DailyForecast>) {
		return check({
			today,
			origin: forecast(today, 2),
			destination: forecast(today, 2, { '2026-12-08': weather })
		});
	}

	it('a low of exactly 50 °F adds nothing; 49 °F adds a heat pack', () => {
		expect(atDestination({ lowF: 50 })).toMatchObject({ packs: [], facilityPickup: false });
		expect(atDestination({ lowF: 49 })).toMatchObject({ packs: ['heat'], facilityPickup: true });
	});
	it('a low of exactly 25 °F ships with a heat pack; 24 °F holds', () => {
		expect(atDestination({ lowF: 25 })).toMatchObject({
			decision: 'ship',
			packs: ['heat'],
			facilityPickup: true
		});
		const held = atDestination({ lowF: 24 });
		expect(held.decision).toBe('hold');
		expect(held.reasons[0]).toEqual({
			rule: 'hold_below',
			date: '2026-12-08',
			place: 'destination',
			valueF: 24,
			limitF: 25
		});
	});
	it('a high of exactly 85 °F adds nothing; 86 °F adds a cold pack', () => {
		expect(atDestination({ highF: 85 })).toMatchObject({ packs: [], facilityPickup: false });
		expect(atDestination({ highF: 86 })).toMatchObject({ packs: ['cold'], facilityPickup: true });
	});
	it('a high of exactly 95 °F ships with a cold pack; 96 °F holds', () => {
		expect(atDestination({ highF: 95, lowF: 70 })).toMatchObject({
			decision: 'ship',
			packs: ['cold']
		});
		const held = atDestination({ highF: 96, lowF: 70 });
		expect(held.decision).toBe('hold');
		expect(held.reasons[0]).toMatchObject({ rule: 'hold_above', valueF: 96, limitF: 95 });
	});
	it('uses the shop’s own thresholds when they differ', () => {
		const stricter = check({
			today,
			thresholds: { heatPackBelowF: 55, holdBelowF: 35, coldPackAboveF: 80, holdAboveF: 90 },
			destination: forecast(today, 14, { '2026-12-08': { lowF: 34 } })
		});
		expect(stricter).toMatchObject({ decision: 'ship', shipDate: '2026-12-08' });
	});
	it('refuses thresholds that are not numbers', () => {
		expect(() =>
			check({ today, thresholds: { ...DEFAULT_THRESHOLDS, holdBelowF: Number.NaN } })
		).toThrow(RangeError);
	});
});
