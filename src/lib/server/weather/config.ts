// Forecast settings from plain values, so tests and scripts pass their own; the app
// reads them from its environment in ./index.ts. No $env here.

export interface WeatherSettings {
	/** Where the daily-forecast API answers; `/v1/forecast` is added to it. */
	baseUrl: string;
	/** How long one request may take before the forecast counts as missing. */
	timeoutMs: number;
	/** How long a fetched forecast is trusted for a location. */
	cacheHours: number;
}

/** The local fake (tests/fakes/weather-fake.ts) on its default port. */
export const DEFAULT_WEATHER_API_URL = 'http://127.0.0.1:2590';
/** Short, so a page that asks for a ship estimate never waits long on a slow service. */
export const DEFAULT_WEATHER_TIMEOUT_MS = 4_000;
/** Forecasts change a few times a day; three hours keeps the answer close to the latest run. */
export const DEFAULT_WEATHER_CACHE_HOURS = 3;

function positiveNumber(
	name: string,
	value: string | undefined,
	fallback: number,
	max: number
): number {
	const text = value?.trim();
	if (!text) return fallback;
	const parsed = Number(text);
	if (!Number.isFinite(parsed) || parsed <= 0 || parsed > max) {
		throw new RangeError(`${name} must be a number above 0 and at most ${max}, got: ${text}`);
	}
	return parsed;
}

/** WEATHER_API_URL, WEATHER_TIMEOUT_MS and WEATHER_CACHE_HOURS, checked; empty means the default. */
export function weatherSettingsFrom(values: {
	WEATHER_API_URL?: string | undefined;
	WEATHER_TIMEOUT_MS?: string | undefined;
	WEATHER_CACHE_HOURS?: string | undefined;
}): WeatherSettings {
	const baseUrl = values.WEATHER_API_URL?.trim() || DEFAULT_WEATHER_API_URL;
	let url: URL;
	try {
		url = new URL(baseUrl);
	} catch {
		throw new RangeError(`WEATHER_API_URL is not a URL: ${baseUrl}`);
	}
	if (url.protocol !== 'http:' && url.protocol !== 'https:') {
		throw new RangeError(
			`WEATHER_API_URL must start with http:// or https://, got ${url.protocol}//`
		);
	}
	return {
		baseUrl: baseUrl.replace(/\/+$/, ''),
		// A minute at most: a longer wait would hang the page that asked.
		timeoutMs: Math.ceil(
			positiveNumber(
				'WEATHER_TIMEOUT_MS',
				values.WEATHER_TIMEOUT_MS,
				DEFAULT_WEATHER_TIMEOUT_MS,
				60_000
			)
		),
		// A day at most: an older forecast is not one to ship live animals on.
		cacheHours: positiveNumber(
			'WEATHER_CACHE_HOURS',
			values.WEATHER_CACHE_HOURS,
			DEFAULT_WEATHER_CACHE_HOURS,
			24
		)
	};
}
