// The client of a public daily-forecast API in Open-Meteo's documented shape
// (GET /v1/forecast with latitude, longitude, daily, temperature_unit, timezone,
// forecast_days). Anything but a readable 200 answer within the time allowed is a
// problem, never a forecast: the caller holds the shipment.
import { z } from 'zod';
import { addDays, isCalendarDate, type IsoDate } from '$lib/format/dates';
import type { DailyForecast } from '$lib/shipping/ship-check';

/** Open-Meteo serves at most 16 days ahead (its `forecast_days` runs 0–16). */
export const MAX_FORECAST_DAYS = 16;
/** A daily answer for 16 days is a few kB; anything far larger is not one. */
const MAX_BODY_CHARS = 1_000_000;
const FAHRENHEIT = '°F';

export type ServiceForecast = {
	/** The place's IANA time zone; `days` start at the place's own today. */
	timezone: string;
	days: DailyForecast[];
};

export type ServiceOutcome =
	{ ok: true; forecast: ServiceForecast } | { ok: false; problem: string };

export type ForecastRequest = {
	baseUrl: string;
	latitude: number;
	longitude: number;
	/** 1–16 days from the place's today. */
	days: number;
	timeoutMs: number;
	/** Stand-in for the global fetch (tests). */
	fetch?: typeof fetch;
};

/** The request URL, with only the parameters Open-Meteo documents for a daily forecast. */
export function forecastUrl(
	baseUrl: string,
	latitude: number,
	longitude: number,
	days: number
): URL {
	const url = new URL(`${baseUrl.replace(/\/+$/, '')}/v1/forecast`);
	url.search = new URLSearchParams({
		latitude: String(latitude),
		longitude: String(longitude),
		daily: 'temperature_2m_max,temperature_2m_min',
		temperature_unit: 'fahrenheit',
		// "auto" makes the service pick the place's own zone, so the dates are local there.
		timezone: 'auto',
		forecast_days: String(days)
	}).toString();
	return url;
}

const reading = z.number().nullable();

const forecastBody = z.object({
	timezone: z.string().min(1),
	daily_units: z.object({ temperature_2m_min: z.string(), temperature_2m_max: z.string() }),
	daily: z.object({
		time: z.array(z.string()),
		temperature_2m_min: z.array(reading),
		temperature_2m_max: z.array(reading)
	})
});

const errorBody = z.object({ error: z.literal(true), reason: z.string() });

function isKnownZone(timeZone: string): boolean {
	try {
		new Intl.DateTimeFormat('en-US', { timeZone });
		return true;
	} catch {
		return false;
	}
}

const unreadable = (why: string): ServiceOutcome => ({
	ok: false,
	problem: `The forecast service sent an answer that could not be read (${why}).`
});

/**
 * Days from a decoded answer. The series stops at the first day that is missing a
 * reading (null), is out of date order, or has a low above its high: a forecast with
 * a hole in it cannot say that a route is safe, so later days count as missing too.
 */
export function parseForecastBody(body: unknown): ServiceOutcome {
	const parsed = forecastBody.safeParse(body);
	if (!parsed.success) return unreadable('not a daily forecast');
	const { timezone, daily_units: units, daily } = parsed.data;
	// Celsius read as Fahrenheit would turn a hot day into a mild one.
	if (units.temperature_2m_min !== FAHRENHEIT || units.temperature_2m_max !== FAHRENHEIT) {
		return unreadable(`temperatures not in ${FAHRENHEIT}`);
	}
	if (!isKnownZone(timezone)) return unreadable(`unknown time zone ${timezone}`);
	const count = daily.time.length;
	if (daily.temperature_2m_min.length !== count || daily.temperature_2m_max.length !== count) {
		return unreadable('series of different lengths');
	}

	const days: DailyForecast[] = [];
	const first = daily.time[0];
	if (first === undefined || !isCalendarDate(first)) {
		return { ok: false, problem: 'The forecast service sent no days.' };
	}
	for (let index = 0; index < count; index++) {
		const date: IsoDate = daily.time[index] ?? '';
		const lowF = daily.temperature_2m_min[index];
		const highF = daily.temperature_2m_max[index];
		if (date !== addDays(first, index)) break;
		if (typeof lowF !== 'number' || !Number.isFinite(lowF)) break;
		if (typeof highF !== 'number' || !Number.isFinite(highF)) break;
		if (lowF > highF) break;
		days.push({ date, lowF, highF });
	}
	if (days.length === 0) {
		return { ok: false, problem: 'The forecast service has no temperatures for today yet.' };
	}
	return { ok: true, forecast: { timezone, days } };
}

/** One request to the service; every failure, including a timeout, comes back as a problem. */
export async function fetchDailyForecast(request: ForecastRequest): Promise<ServiceOutcome> {
	const days = Math.min(MAX_FORECAST_DAYS, Math.max(1, Math.trunc(request.days)));
	const url = forecastUrl(request.baseUrl, request.latitude, request.longitude, days);
	const fetchImpl = request.fetch ?? fetch;
	let status: number;
	let text: string;
	try {
		// The one signal covers the headers and the body, so a service that trickles stops too.
		const response = await fetchImpl(url, {
			headers: { accept: 'application/json' },
			signal: AbortSignal.timeout(request.timeoutMs)
		});
		status = response.status;
		text = await response.text();
	} catch (error) {
		if (error instanceof Error && (error.name === 'TimeoutError' || error.name === 'AbortError')) {
			return {
				ok: false,
				problem: `The forecast service did not answer within ${request.timeoutMs / 1000} s.`
			};
		}
		return { ok: false, problem: 'The forecast service could not be reached.' };
	}
	if (text.length > MAX_BODY_CHARS) return unreadable('far too long');

	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
		body = undefined;
	}
	if (status !== 200) {
		const refusal = errorBody.safeParse(body);
		return {
			ok: false,
			problem: refusal.success
				? `The forecast service refused the request (${status}): ${refusal.data.reason}`
				: `The forecast service answered with status ${status}.`
		};
	}
	if (body === undefined) return unreadable('not JSON');
	return parseForecastBody(body);
}
