import { describe, expect, it } from 'vitest';
import { deliveryDayWeather, NO_FORECAST_FOR_DAY, storedForecasts } from './delivery-weather';

// A snapshot shaped as the app stores it (ShipCheckSnapshot): both places' days in order.
const snapshot = {
	today: '2026-11-23',
	service: 'overnight',
	originZip: '37902',
	destinationZip: '55805',
	thresholds: { heatPackBelowF: 50, holdBelowF: 25, coldPackAboveF: 85, holdAboveF: 95 },
	origin: [
		{ date: '2026-11-23', lowF: 41, highF: 58 },
		{ date: '2026-11-24', lowF: 44, highF: 60 }
	],
	destination: [
		{ date: '2026-11-23', lowF: 18, highF: 30 },
		{ date: '2026-11-24', lowF: 27, highF: 36 },
		{ date: '2026-11-25', lowF: 31, highF: 40 }
	]
};

describe('storedForecasts', () => {
	it('reads the stored origin and destination lists, the ZIPs and the limits', () => {
		const stored = storedForecasts(snapshot);
		expect(stored.origin).toHaveLength(2);
		expect(stored.destination).toHaveLength(3);
		expect(stored).toMatchObject({
			originZip: '37902',
			destinationZip: '55805',
			thresholds: { heatPackBelowF: 50, holdBelowF: 25, coldPackAboveF: 85, holdAboveF: 95 }
		});
	});

	it('reads the demo’s one-list shape, each day tagged with its place', () => {
		const stored = storedForecasts({
			originZip: '37902',
			destinationZip: '85719',
			forecast: [
				{ place: 'origin', zip: '37902', date: '2026-11-24', lowF: 52, highF: 70 },
				{ place: 'destination', zip: '85719', date: '2026-11-24', lowF: 74, highF: 92 },
				{ place: 'destination', zip: '85719', date: '2026-11-25', lowF: 74, highF: 92 }
			]
		});
		expect(stored.origin).toEqual([{ date: '2026-11-24', lowF: 52, highF: 70 }]);
		expect(stored.destination.map((day) => day.date)).toEqual(['2026-11-24', '2026-11-25']);
		expect(stored.thresholds).toBeNull();
	});

	it('drops days that are not readings and survives anything that is not a snapshot', () => {
		const stored = storedForecasts({
			destination: [
				{ date: '2026-11-24', lowF: 27, highF: 36 },
				{ date: '24/11/2026', lowF: 27, highF: 36 },
				{ date: '2026-11-25', lowF: null, highF: 36 },
				{ date: '2026-11-26', lowF: 'cold', highF: 36 },
				'2026-11-27'
			]
		});
		expect(stored.destination).toEqual([{ date: '2026-11-24', lowF: 27, highF: 36 }]);
		for (const nothing of [null, undefined, {}, [], 'inputs', 12])
			expect(storedForecasts(nothing)).toEqual({
				origin: [],
				destination: [],
				originZip: null,
				destinationZip: null,
				thresholds: null
			});
	});
});

describe('deliveryDayWeather', () => {
	it('picks both places’ readings for the day it arrived', () => {
		expect(
			deliveryDayWeather(snapshot, { deliveredOn: '2026-11-24', plannedOn: '2026-11-25' })
		).toEqual({
			found: true,
			day: '2026-11-24',
			basis: 'delivered',
			destination: { date: '2026-11-24', lowF: 27, highF: 36 },
			origin: { date: '2026-11-24', lowF: 44, highF: 60 },
			destinationZip: '55805',
			originZip: '37902',
			thresholds: snapshot.thresholds
		});
	});

	it('gives one place alone when the other has no reading for the day', () => {
		const weather = deliveryDayWeather(snapshot, { deliveredOn: '2026-11-25', plannedOn: null });
		expect(weather).toMatchObject({
			found: true,
			day: '2026-11-25',
			destination: { lowF: 31, highF: 40 },
			origin: null
		});
	});

	it('falls back to the planned delivery date when the day it arrived is not in the snapshot', () => {
		const weather = deliveryDayWeather(snapshot, {
			deliveredOn: '2026-11-27',
			plannedOn: '2026-11-23'
		});
		expect(weather).toMatchObject({ found: true, day: '2026-11-23', basis: 'planned' });
	});

	it('says no forecast was stored when neither day is in it, naming the day it arrived', () => {
		expect(
			deliveryDayWeather(snapshot, { deliveredOn: '2026-12-02', plannedOn: '2026-12-01' })
		).toEqual({ found: false, day: '2026-12-02', problem: NO_FORECAST_FOR_DAY });
		// A keeper's override copies an empty snapshot when no check ran before it.
		expect(deliveryDayWeather({}, { deliveredOn: '2026-11-24', plannedOn: null })).toEqual({
			found: false,
			day: '2026-11-24',
			problem: NO_FORECAST_FOR_DAY
		});
		expect(deliveryDayWeather(snapshot, { deliveredOn: null, plannedOn: null })).toMatchObject({
			found: false,
			day: null
		});
	});
});
