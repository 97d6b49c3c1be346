// The forecast source against the local forecast fake, on its own database: the demo
// places, the cache in forecast_cache, and a failing or slow service (hold, never ship).
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { addDays } from '../../src/lib/format/dates';
import { createForecastSource, zipLocation } from '../../src/lib/server/weather/provider';
import { DEFAULT_SHIP_WEEKDAYS, DEFAULT_THRESHOLDS } from '../../src/lib/shipping/defaults';
import { shipCheck, type DailyForecast } from '../../src/lib/shipping/ship-check';
import { startWeatherFake, type WeatherFake } from '../fakes/weather/server';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

// 15:00 UTC on Tuesday 1 December 2026 is the morning of that same day in every
// contiguous US zone (10:00 EST … 07:00 PST), so every place's today is 2026-12-01.
const TUESDAY = '2026-12-01';
const MORNING = new Date(`${TUESDAY}T15:00:00Z`);
const HOUR_MS = 3_600_000;

const DULUTH = '55805';
const GRAND_MARAIS = '55604';
const TUCSON = '85719';
const ASTORIA = '97103';
const SHOP = '37902';

describe('forecast source against the local forecast fake', () => {
	let scratch: ScratchDatabase;
	let fake: WeatherFake;
	let clock = MORNING;
	let asked: URL[] = [];
	// The real fetch, with each URL the client built written down.
	const recordingFetch: typeof fetch = (input, init) => {
		asked.push(new URL(input instanceof Request ? input.url : String(input)));
		return fetch(input, init);
	};
	const source = (options: { cacheHours?: number; timeoutMs?: number } = {}) =>
		createForecastSource(scratch.db, {
			baseUrl: fake.url,
			timeoutMs: options.timeoutMs ?? 4_000,
			cacheHours: options.cacheHours ?? 3,
			now: () => clock,
			fetch: recordingFetch
		});

	beforeAll(async () => {
		scratch = await scratchDatabase();
		fake = await startWeatherFake({ port: 0, now: () => clock });
	});
	afterAll(async () => {
		await fake?.stop();
		await scratch?.drop();
	});
	beforeEach(async () => {
		fake.reset();
		clock = MORNING;
		asked = [];
		await scratch.db.deleteFrom('forecast_cache').execute();
	});

	async function daysFor(zip: string, days = 7): Promise<DailyForecast[]> {
		const outcome = await source().daily(zip, days);
		if (!outcome.ok) throw new Error(`no forecast for ${zip}: ${outcome.problem}`);
		return outcome.days;
	}

	const lows = (days: DailyForecast[]) => days.map((day) => day.lowF);
	const highs = (days: DailyForecast[]) => days.map((day) => day.highF);
	const everyWithin = (values: number[], low: number, high: number) =>
		values.every((value) => value >= low && value <= high);

	const check = (origin: DailyForecast[], destination: DailyForecast[]) =>
		shipCheck({
			today: TUESDAY,
			service: 'overnight',
			shipWeekdays: DEFAULT_SHIP_WEEKDAYS.overnight,
			thresholds: DEFAULT_THRESHOLDS,
			origin,
			destination
		});

	it('asks with the parameters Open-Meteo documents for a daily forecast', async () => {
		await daysFor(DULUTH, 7);
		expect(asked).toHaveLength(1);
		const url = asked[0]!;
		expect(url.pathname).toBe('/v1/forecast');
		// Duluth, MN in the zipcodes dataset: 46.7987, -92.0946, asked at 2 decimals.
		expect(Object.fromEntries(url.searchParams)).toEqual({
			latitude: '46.8',
			longitude: '-92.09',
			daily: 'temperature_2m_max,temperature_2m_min',
			temperature_unit: 'fahrenheit',
			timezone: 'auto',
			// One day more than asked, so the cached row still covers the ask after midnight.
			forecast_days: '8'
		});
	});

	it('serves the demo places, and the ship check reads them as the demo needs', async () => {
		const shop = await daysFor(SHOP);
		const duluth = await daysFor(DULUTH);
		const grandMarais = await daysFor(GRAND_MARAIS);
		const tucson = await daysFor(TUCSON);
		const astoria = await daysFor(ASTORIA);

		for (const days of [shop, duluth, grandMarais, tucson, astoria]) {
			expect(days.map((day) => day.date)).toEqual(
				Array.from({ length: 7 }, (_, offset) => addDays(TUESDAY, offset))
			);
		}
		// The bands the demo is built on (the fake's documented profiles).
		expect(everyWithin(lows(duluth), 6, 14) && everyWithin(highs(duluth), 18, 26)).toBe(true);
		expect(everyWithin(lows(grandMarais), 6, 14)).toBe(true);
		expect(everyWithin(lows(tucson), 66, 72) && everyWithin(highs(tucson), 88, 92)).toBe(true);
		expect(everyWithin(lows(astoria), 51, 55) && everyWithin(highs(astoria), 60, 64)).toBe(true);
		expect(everyWithin(lows(shop), 52, 56) && everyWithin(highs(shop), 64, 68)).toBe(true);

		// Against PRODUCT.md's default thresholds (general practice among live-animal
		// shippers): hold under 25 °F; cold pack over 85 °F with facility pickup up to 95 °F.
		const toDuluth = check(shop, duluth);
		expect(toDuluth.decision).toBe('hold');
		expect(toDuluth.reasons.some((fired) => fired.rule === 'hold_below')).toBe(true);
		expect(check(shop, tucson)).toMatchObject({
			decision: 'ship',
			shipDate: TUESDAY,
			deliveryDate: '2026-12-02',
			packs: ['cold'],
			facilityPickup: true
		});
		expect(check(shop, astoria)).toMatchObject({
			decision: 'ship',
			shipDate: TUESDAY,
			packs: [],
			facilityPickup: false
		});
	});

	it('answers from forecast_cache within its hours and asks again after them', async () => {
		const forecasts = source({ cacheHours: 3 });
		const first = await forecasts.daily(SHOP, 7);
		expect(first).toMatchObject({ ok: true, from: 'service' });
		expect(fake.requests()).toBe(1);

		const row = await scratch.db
			.selectFrom('forecast_cache')
			.select(['location_key', 'latitude', 'longitude', 'fetched_at'])
			.executeTakeFirstOrThrow();
		// Knoxville, TN in the zipcodes dataset: 35.9625, -83.9209.
		expect(row).toEqual({
			location_key: '35.96,-83.92',
			latitude: '35.96000',
			longitude: '-83.92000',
			fetched_at: MORNING
		});

		clock = new Date(MORNING.getTime() + 3 * HOUR_MS - 60_000);
		const second = await forecasts.daily(SHOP, 7);
		expect(second).toMatchObject({ ok: true, from: 'cache' });
		expect(second.ok && first.ok && second.days).toEqual(first.ok && first.days);
		expect(fake.requests()).toBe(1);
		// The count the fake shows over HTTP is the same one.
		const counted = (await (await fetch(`${fake.url}/test/requests`)).json()) as { count: number };
		expect(counted.count).toBe(1);

		clock = new Date(MORNING.getTime() + 3 * HOUR_MS + 60_000);
		expect(await forecasts.daily(SHOP, 7)).toMatchObject({ ok: true, from: 'service' });
		expect(fake.requests()).toBe(2);
	});

	it('asks again when the cached days do not reach as far as asked', async () => {
		const forecasts = source();
		await forecasts.daily(SHOP, 5);
		expect(await forecasts.daily(SHOP, 6)).toMatchObject({ ok: true, from: 'cache' });
		const longer = await forecasts.daily(SHOP, 10);
		expect(longer).toMatchObject({ ok: true, from: 'service' });
		expect(longer.ok && longer.days).toHaveLength(10);
		expect(fake.requests()).toBe(2);
	});

	it('drops the days that have passed at the place once its midnight goes by', async () => {
		const forecasts = source({ cacheHours: 12 });
		clock = new Date(`${TUESDAY}T20:00:00Z`); // 15:00 in Knoxville
		await forecasts.daily(SHOP, 7);
		clock = new Date('2026-12-02T06:00:00Z'); // 01:00 the next day in Knoxville
		const after = await forecasts.daily(SHOP, 7);
		expect(after).toMatchObject({ ok: true, from: 'cache' });
		expect(after.ok && after.days.map((day) => day.date)).toEqual(
			Array.from({ length: 7 }, (_, offset) => addDays('2026-12-02', offset))
		);
		expect(fake.requests()).toBe(1);
	});

	it('holds when the service fails, and never falls back on a forecast past its hours', async () => {
		const forecasts = source({ cacheHours: 3 });
		const shop = await forecasts.daily(SHOP, 7);
		await forecasts.daily(TUCSON, 7);

		// Set through the fake's HTTP control, as the browser tests will.
		const switched = await fetch(`${fake.url}/test/mode`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ mode: 'fail' })
		});
		expect(switched.status).toBe(200);

		clock = new Date(MORNING.getTime() + 4 * HOUR_MS);
		const tucson = await forecasts.daily(TUCSON, 7);
		expect(tucson).toEqual({
			ok: false,
			problem: 'The forecast service refused the request (503): Service unavailable (fake)'
		});
		expect(
			await scratch.db.selectFrom('forecast_cache').select('location_key').execute()
		).toHaveLength(2);

		// With the destination's forecast missing, the ship check must hold.
		expect(shop.ok).toBe(true);
		const verdict = check(shop.ok ? shop.days : [], []);
		expect(verdict.decision).toBe('hold');
		expect(verdict.reasons.some((fired) => fired.rule === 'no_forecast')).toBe(true);
	});

	it('gives up on a slow service at its timeout and reports why', async () => {
		// The fake waits 20 s and the test allows 10 s: only a client that stops waiting passes.
		fake.setMode('slow', 20_000);
		const outcome = await source({ timeoutMs: 250 }).daily(ASTORIA, 7);
		expect(outcome).toEqual({
			ok: false,
			problem: 'The forecast service did not answer within 0.25 s.'
		});
	}, 10_000);

	it('refuses a ZIP code that is not known, without asking the service', async () => {
		expect(zipLocation('00000')).toBeNull();
		expect(await source().daily('00000', 7)).toEqual({
			ok: false,
			problem: 'No US ZIP code 00000 is known.'
		});
		expect(await source().daily('5580', 7)).toEqual({
			ok: false,
			problem: 'A US ZIP code is 5 digits, such as 37902.'
		});
		expect(fake.requests()).toBe(0);
	});

	it('serves a forecast a test sets, and stops at the first day without readings', async () => {
		const duluth = zipLocation(DULUTH)!;
		const put = await fetch(`${fake.url}/test/forecast`, {
			method: 'PUT',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({
				latitude: duluth.latitude,
				longitude: duluth.longitude,
				days: [
					{ lowF: 40, highF: 55.5 },
					{ lowF: 38.2, highF: 51 },
					{ lowF: null, highF: 50 },
					{ lowF: 39, highF: 52 }
				]
			})
		});
		expect(put.status).toBe(200);
		expect(await daysFor(DULUTH, 7)).toEqual([
			{ date: TUESDAY, lowF: 40, highF: 55.5 },
			{ date: '2026-12-02', lowF: 38.2, highF: 51 }
		]);

		// Grand Marais is another point: the set forecast is Duluth's alone.
		expect(everyWithin(lows(await daysFor(GRAND_MARAIS, 3)), 6, 14)).toBe(true);
	});

	it('refuses an unreadable control request', async () => {
		const bad = await fetch(`${fake.url}/test/mode`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ mode: 'sideways' })
		});
		expect(bad.status).toBe(400);
		expect((await (await fetch(`${fake.url}/health`)).json()) as unknown).toEqual({
			status: 'ok',
			mode: 'ok'
		});
	});
});
