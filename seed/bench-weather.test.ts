import { describe, expect, it } from 'vitest';
import zipcodes from 'zipcodes';
import { addDays } from './dates';
import { BenchWeather, normalOn, STATE_CLIMATES, summerShare } from './bench-weather';

describe('the bench states', () => {
	it('are the 50 states and DC, as the zipcodes package lists US states', () => {
		// Reference: the zipcodes package's state list and its US ZIP data (territories and
		// Canadian provinces are in the list too, without US ZIP codes).
		const usStates = Object.keys(zipcodes.states.abbr).filter((code) =>
			zipcodes.lookupByState(code).some((place) => place.country === 'US')
		);
		expect(STATE_CLIMATES.map((c) => c.state).sort()).toEqual([...usStates].sort());
		expect(STATE_CLIMATES).toHaveLength(51);
	});

	it('weigh the states by a population that adds up to the 2020 census', () => {
		// The 2020 census counted 331.4 million residents in the states and DC (from memory);
		// rounded state figures land within 1 %.
		const total = STATE_CLIMATES.reduce((sum, c) => sum + c.populationM, 0);
		expect(Math.abs(total - 331.4) / 331.4).toBeLessThan(0.01);
	});

	it('have warmer Julys than Januarys and lows under highs', () => {
		for (const c of STATE_CLIMATES) {
			expect(c.janLowF, c.state).toBeLessThan(c.janHighF);
			expect(c.julLowF, c.state).toBeLessThan(c.julHighF);
			expect(c.julHighF, c.state).toBeGreaterThan(c.janHighF);
		}
	});
});

describe('normals through the year', () => {
	it('is January in mid-January and July in mid-July', () => {
		expect(summerShare('2026-01-15')).toBeCloseTo(0, 6);
		expect(summerShare('2026-07-15')).toBeCloseTo(1, 3);
		const mn = STATE_CLIMATES.find((c) => c.state === 'MN');
		expect(normalOn('MN', '2026-01-15').lowF).toBeCloseTo(mn?.janLowF ?? NaN, 6);
		expect(normalOn('MN', '2026-07-15').highF).toBeCloseTo(mn?.julHighF ?? NaN, 1);
	});

	it('is halfway in mid-April and mid-October', () => {
		// A quarter of a year from mid-January on the cosine: the middle of the swing.
		expect(summerShare('2026-04-15')).toBeCloseTo(0.5, 1);
		expect(summerShare('2026-10-15')).toBeCloseTo(0.5, 1);
	});
});

describe('BenchWeather', () => {
	const first = '2023-01-01';
	const days = 3 * 365;

	it('gives the same forecast for a state and day however it is asked', () => {
		const a = new BenchWeather(first, days);
		const b = new BenchWeather(first, days);
		const list = a.forecasts('TX', '2024-02-10', 10);
		expect(list).toHaveLength(10);
		expect(list[3]).toEqual(b.forecast('TX', '2024-02-13'));
		expect(list.map((f) => f.date)).toEqual(
			Array.from({ length: 10 }, (_, i) => addDays('2024-02-10', i))
		);
	});

	it('refuses a day outside its window', () => {
		const weather = new BenchWeather(first, days);
		expect(() => weather.forecast('TX', '2022-12-31')).toThrow(RangeError);
		expect(() => weather.forecasts('TX', addDays(first, days - 5), 10)).toThrow(RangeError);
		expect(() => weather.forecast('ZZ', '2024-01-01')).toThrow(RangeError);
	});

	it('departs from normal by a few degrees, in spells that last days', () => {
		const weather = new BenchWeather(first, days);
		const departures: number[] = [];
		for (let i = 0; i < days; i++) {
			const date = addDays(first, i);
			departures.push(weather.forecast('OH', date).lowF - normalOn('OH', date).lowF);
		}
		const mean = departures.reduce((s, d) => s + d, 0) / departures.length;
		const sd = Math.sqrt(departures.reduce((s, d) => s + (d - mean) ** 2, 0) / departures.length);
		let lagged = 0;
		for (let i = 1; i < departures.length; i++)
			lagged += ((departures[i] ?? 0) - mean) * ((departures[i - 1] ?? 0) - mean);
		const autocorrelation = lagged / (departures.length - 1) / sd ** 2;
		// Built as an AR(1) walk with a 5–7 °F spread and persistence 0.75: three years of it
		// should show those figures, give or take sampling.
		expect(Math.abs(mean)).toBeLessThan(1.5);
		expect(sd).toBeGreaterThan(4.5);
		expect(sd).toBeLessThan(7.5);
		expect(autocorrelation).toBeGreaterThan(0.6);
		expect(autocorrelation).toBeLessThan(0.9);
	});
});
