import { describe, expect, it } from 'vitest';
import { fetchDailyForecast, forecastUrl, parseForecastBody } from './open-meteo';

// A body in the shape Open-Meteo documents for /v1/forecast with daily variables
// (top-level timezone, daily_units, and daily arrays indexed like daily.time).
function answer(
	min: Array<number | null>,
	max: Array<number | null>,
	overrides: Record<string, unknown> = {}
) {
	return {
		latitude: 46.8,
		longitude: -92.09,
		generationtime_ms: 0.2,
		utc_offset_seconds: -21600,
		timezone: 'America/Chicago',
		timezone_abbreviation: 'CST',
		elevation: 190,
		daily_units: { time: 'iso8601', temperature_2m_max: '°F', temperature_2m_min: '°F' },
		daily: {
			time: min.map((_, index) => `2026-12-${String(index + 1).padStart(2, '0')}`),
			temperature_2m_min: min,
			temperature_2m_max: max
		},
		...overrides
	};
}

const jsonResponse = (status: number, body: unknown) =>
	new Response(JSON.stringify(body), {
		status,
		headers: { 'content-type': 'application/json' }
	});

describe('forecastUrl', () => {
	it('uses the documented parameter names and adds /v1/forecast to the base', () => {
		const url = forecastUrl('https://api.open-meteo.com/', 35.96, -83.92, 8);
		expect(url.origin + url.pathname).toBe('https://api.open-meteo.com/v1/forecast');
		expect(Object.fromEntries(url.searchParams)).toEqual({
			latitude: '35.96',
			longitude: '-83.92',
			daily: 'temperature_2m_max,temperature_2m_min',
			temperature_unit: 'fahrenheit',
			timezone: 'auto',
			forecast_days: '8'
		});
	});
});

describe('parseForecastBody', () => {
	it('pairs each date with its low and high', () => {
		expect(parseForecastBody(answer([10.5, 12], [20, 22.4]))).toEqual({
			ok: true,
			forecast: {
				timezone: 'America/Chicago',
				days: [
					{ date: '2026-12-01', lowF: 10.5, highF: 20 },
					{ date: '2026-12-02', lowF: 12, highF: 22.4 }
				]
			}
		});
	});

	it('counts the days from the first missing reading on as missing', () => {
		const parsed = parseForecastBody(answer([10, 11, null, 13], [20, 21, 22, 23]));
		expect(parsed.ok && parsed.forecast.days.map((day) => day.date)).toEqual([
			'2026-12-01',
			'2026-12-02'
		]);
		const highMissing = parseForecastBody(answer([10, 11], [20, null]));
		expect(highMissing.ok && highMissing.forecast.days).toHaveLength(1);
	});

	it('stops at a day out of date order or with its low above its high', () => {
		const body = answer([10, 11, 12], [20, 21, 22]);
		body.daily.time = ['2026-12-01', '2026-12-03', '2026-12-04'];
		const gap = parseForecastBody(body);
		expect(gap.ok && gap.forecast.days).toHaveLength(1);
		const upsideDown = parseForecastBody(answer([10, 30], [20, 25]));
		expect(upsideDown.ok && upsideDown.forecast.days).toHaveLength(1);
	});

	it('refuses temperatures that are not in °F', () => {
		const celsius = answer([-5], [2], {
			daily_units: { time: 'iso8601', temperature_2m_max: '°C', temperature_2m_min: '°C' }
		});
		expect(parseForecastBody(celsius)).toMatchObject({
			ok: false,
			problem: expect.stringContaining('not in °F')
		});
	});

	it('refuses a body that is not a daily forecast', () => {
		expect(parseForecastBody({ latitude: 1 }).ok).toBe(false);
		expect(parseForecastBody(answer([10], [20], { timezone: 'Mars/Olympus' })).ok).toBe(false);
		const uneven = answer([10, 11], [20, 21]);
		uneven.daily.temperature_2m_max = [20];
		expect(parseForecastBody(uneven).ok).toBe(false);
		expect(parseForecastBody(answer([], [])).ok).toBe(false);
		expect(parseForecastBody(answer([null], [20])).ok).toBe(false);
	});
});

describe('fetchDailyForecast', () => {
	const request = { baseUrl: 'http://forecast.test', latitude: 46.8, longitude: -92.09, days: 7 };

	it('reads a 200 answer', async () => {
		const outcome = await fetchDailyForecast({
			...request,
			timeoutMs: 1_000,
			fetch: async () => jsonResponse(200, answer([10], [20]))
		});
		expect(outcome).toMatchObject({ ok: true, forecast: { days: [{ date: '2026-12-01' }] } });
	});

	it('asks for at most the 16 days the service serves', async () => {
		let asked: URL | undefined;
		await fetchDailyForecast({
			...request,
			days: 30,
			timeoutMs: 1_000,
			fetch: async (input) => {
				asked = new URL(String(input));
				return jsonResponse(200, answer([10], [20]));
			}
		});
		expect(asked?.searchParams.get('forecast_days')).toBe('16');
	});

	it('turns a refusal, an error status, a non-JSON body and no connection into problems', async () => {
		const refused = await fetchDailyForecast({
			...request,
			timeoutMs: 1_000,
			fetch: async () => jsonResponse(400, { error: true, reason: 'Latitude must be in range' })
		});
		expect(refused).toEqual({
			ok: false,
			problem: 'The forecast service refused the request (400): Latitude must be in range'
		});
		const down = await fetchDailyForecast({
			...request,
			timeoutMs: 1_000,
			fetch: async () => new Response('<html>Bad gateway</html>', { status: 502 })
		});
		expect(down).toEqual({ ok: false, problem: 'The forecast service answered with status 502.' });
		const garbled = await fetchDailyForecast({
			...request,
			timeoutMs: 1_000,
			fetch: async () => new Response('{"daily": [', { status: 200 })
		});
		expect(garbled).toMatchObject({ ok: false, problem: expect.stringContaining('not JSON') });
		const unreachable = await fetchDailyForecast({
			...request,
			timeoutMs: 1_000,
			fetch: async () => {
				throw new TypeError('fetch failed');
			}
		});
		expect(unreachable).toEqual({
			ok: false,
			problem: 'The forecast service could not be reached.'
		});
	});

	it('stops waiting at its timeout', async () => {
		// A service that never answers: only the abort signal can end the wait.
		const silent: typeof fetch = (_input, init) =>
			new Promise((_resolve, reject) => {
				init?.signal?.addEventListener('abort', () => reject(init.signal?.reason));
			});
		const outcome = await fetchDailyForecast({ ...request, timeoutMs: 50, fetch: silent });
		expect(outcome).toEqual({
			ok: false,
			problem: 'The forecast service did not answer within 0.05 s.'
		});
	});
});
