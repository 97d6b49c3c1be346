// The local stand-in for the public daily-forecast API (Open-Meteo's documented
// request and response shape for GET /v1/forecast). It serves the same forecast for a
// place whatever the calendar says, so the demo and the tests are stable:
//
//   cold north    latitude ≥ 45 and longitude -98 … -88 (Duluth 55805, Grand Marais 55604):
//                 lows 6–14 °F, highs 18–26 °F
//   hot desert    latitude < 37, longitude -125 … -105 (Tucson 85719): lows 66–72, highs 88–92
//   mild coast    latitude 42 … 49.5, longitude -125 … -120 (Astoria 97103): lows 51–55, highs 60–64
//   the shop      within half a degree of Knoxville 37902: lows 52–56, highs 64–68
//   elsewhere     a smooth function of latitude (colder northwards), US-winter-like
//
// Each day's value inside its band comes from a hash of its offset from the place's
// today, so day 3 is always the same. Dates start at the place's local today, in a time
// zone guessed from the coordinates (see `timeZoneFor`), as `timezone=auto` asks.
//
// Test controls (this fake only): PUT /test/forecast {latitude, longitude, days:
// [{lowF, highF}]} sets a place (matched at 2 decimals; days after the list come back
// null), POST /test/mode {mode: 'ok'|'fail'|'slow', delayMs?} (fail = 503, slow = wait
// before answering), POST /test/reset, GET /test/requests ({count} of forecast requests).
// GET /health answers while it runs.
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { z } from 'zod';
import { addDays, todayInZone } from '../../../src/lib/format/dates';

const HOST = '127.0.0.1';
const MAX_FORECAST_DAYS = 16;
const DEFAULT_FORECAST_DAYS = 7;
const DEFAULT_SLOW_MS = 10_000;
const KNOWN_DAILY = new Set(['temperature_2m_max', 'temperature_2m_min']);

export type FakeDay = { lowF: number | null; highF: number | null };
export type WeatherFakeMode = 'ok' | 'fail' | 'slow';

export interface WeatherFakeOptions {
	/** 0 picks a free port; `url` has the real one. */
	port: number;
	/** The fake's clock for "today at the place"; the real one unless given. */
	now?: () => Date;
	/** One line per forecast request; silent unless given. */
	log?: (line: string) => void;
}

export interface WeatherFake {
	/** The base URL to hand the app as WEATHER_API_URL. */
	url: string;
	port: number;
	/** Serve these days (from the place's today) for a place, matched at 2 decimals. */
	setForecast(latitude: number, longitude: number, days: readonly FakeDay[]): void;
	/** 'fail' answers 503; 'slow' waits `delayMs` (10 s unless given) before answering. */
	setMode(mode: WeatherFakeMode, delayMs?: number): void;
	/** Forecast requests received since start or the last reset. */
	requests(): number;
	/** Set forecasts cleared, mode 'ok', count 0. */
	reset(): void;
	stop(): Promise<void>;
}

export type DemoRegion = 'cold-north' | 'hot-desert' | 'mild-coast' | 'shop' | 'elsewhere';

const KNOXVILLE = { latitude: 35.96, longitude: -83.92 };

export function demoRegionOf(latitude: number, longitude: number): DemoRegion {
	if (latitude >= 45 && longitude >= -98 && longitude <= -88) return 'cold-north';
	// Both western bands stop at the coast (-125), so Alaska and Hawaii fall to 'elsewhere'.
	if (latitude < 37 && longitude < -105 && longitude >= -125) return 'hot-desert';
	if (latitude >= 42 && latitude < 49.5 && longitude < -120 && longitude >= -125) {
		return 'mild-coast';
	}
	if (
		Math.abs(latitude - KNOXVILLE.latitude) <= 0.5 &&
		Math.abs(longitude - KNOXVILLE.longitude) <= 0.5
	) {
		return 'shop';
	}
	return 'elsewhere';
}

/**
 * A US time zone from coordinates, by longitude bands near the real zone lines, with
 * Arizona (no daylight time), Alaska and Hawaii apart. Close enough for a fake: the
 * dates only need to be the place's own, and the real service resolves the true zone.
 */
export function timeZoneFor(latitude: number, longitude: number): string {
	if (latitude >= 51 && longitude <= -130) return 'America/Anchorage';
	if (latitude < 23 && longitude <= -154) return 'Pacific/Honolulu';
	if (longitude > -86.5) return 'America/New_York';
	if (longitude > -101.5) return 'America/Chicago';
	if (longitude > -114.5) {
		return latitude < 37 && longitude < -109.05 ? 'America/Phoenix' : 'America/Denver';
	}
	return 'America/Los_Angeles';
}

/** 0 … 1 from a day offset and a salt (FNV-1a): the same every run, scattered day to day. */
function wobble(offset: number, salt: string): number {
	let hash = 0x811c9dc5;
	for (const char of `${salt}:${offset}`) {
		hash ^= char.charCodeAt(0);
		hash = Math.imul(hash, 0x01000193) >>> 0;
	}
	// MurmurHash3's final mix, so a change in the last character reaches the high bits.
	hash ^= hash >>> 16;
	hash = Math.imul(hash, 0x85ebca6b) >>> 0;
	hash ^= hash >>> 13;
	hash = Math.imul(hash, 0xc2b2ae35) >>> 0;
	hash ^= hash >>> 16;
	return (hash >>> 0) / 0xffffffff;
}

/** A whole degree from `low` to `high`, both included. */
function within(low: number, high: number, offset: number, salt: string): number {
	return low + Math.min(high - low, Math.floor(wobble(offset, salt) * (high - low + 1)));
}

const BANDS: Record<
	Exclude<DemoRegion, 'elsewhere'>,
	{ low: [number, number]; high: [number, number] }
> = {
	'cold-north': { low: [6, 14], high: [18, 26] },
	'hot-desert': { low: [66, 72], high: [88, 92] },
	'mild-coast': { low: [51, 55], high: [60, 64] },
	shop: { low: [52, 56], high: [64, 68] }
};

/** The fake's own forecast for a place, `offset` days after its today. */
export function demoDay(latitude: number, longitude: number, offset: number): FakeDay {
	const region = demoRegionOf(latitude, longitude);
	if (region !== 'elsewhere') {
		const band = BANDS[region];
		return {
			lowF: within(band.low[0], band.low[1], offset, `${region}-low`),
			highF: within(band.high[0], band.high[1], offset, `${region}-high`)
		};
	}
	// About 60 °F lows at latitude 25 down to about 14 °F at 49, a December-like slope;
	// ±3 °F from day to day, and highs 12–16 °F above the low.
	const base = 107.5 - 1.9 * latitude;
	const lowF = Math.round(base + (wobble(offset, 'elsewhere-low') * 6 - 3));
	const highF = lowF + 12 + Math.round(wobble(offset, 'elsewhere-spread') * 4);
	return { lowF, highF };
}

function zoneParts(timeZone: string, now: Date): { offsetSeconds: number; abbreviation: string } {
	const part = (style: 'longOffset' | 'short') =>
		new Intl.DateTimeFormat('en-US', { timeZone, timeZoneName: style })
			.formatToParts(now)
			.find((piece) => piece.type === 'timeZoneName')?.value ?? 'GMT';
	const match = /^GMT([+-])(\d{2}):(\d{2})$/.exec(part('longOffset'));
	const offsetSeconds = match
		? (match[1] === '-' ? -1 : 1) * (Number(match[2]) * 3600 + Number(match[3]) * 60)
		: 0;
	return { offsetSeconds, abbreviation: part('short') };
}

function isKnownZone(timeZone: string): boolean {
	try {
		new Intl.DateTimeFormat('en-US', { timeZone });
		return true;
	} catch {
		return false;
	}
}

const keyOf = (latitude: number, longitude: number) =>
	`${(Math.round(latitude * 100) / 100).toFixed(2)},${(Math.round(longitude * 100) / 100).toFixed(2)}`;

const toCelsius = (fahrenheit: number | null) =>
	fahrenheit === null ? null : Math.round((((fahrenheit - 32) * 5) / 9) * 10) / 10;

function sendJson(response: ServerResponse, status: number, body: unknown): void {
	const text = JSON.stringify(body);
	response.writeHead(status, {
		'content-type': 'application/json; charset=utf-8',
		'content-length': Buffer.byteLength(text),
		'cache-control': 'no-store'
	});
	response.end(text);
}

/** Open-Meteo's refusal shape: HTTP 400 with {error: true, reason}. */
const refuse = (response: ServerResponse, reason: string) =>
	sendJson(response, 400, { error: true, reason });

async function readJson(request: IncomingMessage): Promise<unknown> {
	const chunks: Buffer[] = [];
	let size = 0;
	for await (const chunk of request) {
		size += (chunk as Buffer).length;
		if (size > 64 * 1024) throw new Error('control body too large');
		chunks.push(chunk as Buffer);
	}
	return JSON.parse(Buffer.concat(chunks).toString('utf8'));
}

const setForecastBody = z.object({
	latitude: z.number().min(-90).max(90),
	longitude: z.number().min(-180).max(180),
	days: z
		.array(z.object({ lowF: z.number().nullable(), highF: z.number().nullable() }))
		.max(MAX_FORECAST_DAYS)
});
const modeBody = z.object({
	mode: z.enum(['ok', 'fail', 'slow']),
	delayMs: z.number().int().min(0).max(600_000).optional()
});

export async function startWeatherFake(options: WeatherFakeOptions): Promise<WeatherFake> {
	const clock = options.now ?? (() => new Date());
	const log = options.log ?? (() => undefined);
	const setDays = new Map<string, FakeDay[]>();
	let mode: WeatherFakeMode = 'ok';
	let slowMs = DEFAULT_SLOW_MS;
	let requestCount = 0;
	const waiting = new Set<NodeJS.Timeout>();

	const control = {
		setForecast(latitude: number, longitude: number, days: readonly FakeDay[]) {
			setDays.set(
				keyOf(latitude, longitude),
				days.map((day) => ({ ...day }))
			);
		},
		setMode(next: WeatherFakeMode, delayMs?: number) {
			mode = next;
			slowMs = delayMs ?? DEFAULT_SLOW_MS;
		},
		requests: () => requestCount,
		reset() {
			setDays.clear();
			mode = 'ok';
			slowMs = DEFAULT_SLOW_MS;
			requestCount = 0;
		}
	};

	function forecast(url: URL, response: ServerResponse): void {
		const query = url.searchParams;
		const latitude = Number(query.get('latitude') ?? '');
		const longitude = Number(query.get('longitude') ?? '');
		if (!query.get('latitude') || !Number.isFinite(latitude) || Math.abs(latitude) > 90) {
			return refuse(response, 'Latitude must be a number from -90 to 90');
		}
		if (!query.get('longitude') || !Number.isFinite(longitude) || Math.abs(longitude) > 180) {
			return refuse(response, 'Longitude must be a number from -180 to 180');
		}
		const daily = (query.get('daily') ?? '').split(',').filter(Boolean);
		const unknown = daily.find((name) => !KNOWN_DAILY.has(name));
		if (unknown) return refuse(response, `This fake serves no daily variable ${unknown}`);
		const unit = query.get('temperature_unit') ?? 'celsius';
		if (unit !== 'celsius' && unit !== 'fahrenheit') {
			return refuse(response, `Unknown temperature_unit ${unit}`);
		}
		const daysText = query.get('forecast_days');
		const forecastDays = daysText === null ? DEFAULT_FORECAST_DAYS : Number(daysText);
		if (!Number.isInteger(forecastDays) || forecastDays < 0 || forecastDays > MAX_FORECAST_DAYS) {
			return refuse(
				response,
				`forecast_days must be a whole number from 0 to ${MAX_FORECAST_DAYS}`
			);
		}
		const zoneAsked = query.get('timezone') ?? 'GMT';
		const timezone = zoneAsked === 'auto' ? timeZoneFor(latitude, longitude) : zoneAsked;
		if (!isKnownZone(timezone)) return refuse(response, `Unknown timezone ${zoneAsked}`);

		const now = clock();
		const today = todayInZone(timezone, now);
		const chosen = setDays.get(keyOf(latitude, longitude));
		const days = Array.from({ length: forecastDays }, (_, offset) =>
			chosen
				? (chosen[offset] ?? { lowF: null, highF: null })
				: demoDay(latitude, longitude, offset)
		);
		const inUnit = (value: number | null) => (unit === 'fahrenheit' ? value : toCelsius(value));
		const unitLabel = unit === 'fahrenheit' ? '°F' : '°C';
		const zone = zoneParts(timezone, now);
		const body: Record<string, unknown> = {
			latitude,
			longitude,
			generationtime_ms: 0.1,
			utc_offset_seconds: zone.offsetSeconds,
			timezone,
			timezone_abbreviation: zone.abbreviation,
			elevation: 0
		};
		if (daily.length > 0) {
			body.daily_units = {
				time: 'iso8601',
				...Object.fromEntries(daily.map((name) => [name, unitLabel]))
			};
			body.daily = {
				time: days.map((_, offset) => addDays(today, offset)),
				...Object.fromEntries(
					daily.map((name) => [
						name,
						days.map((day) => inUnit(name === 'temperature_2m_min' ? day.lowF : day.highF))
					])
				)
			};
		}
		log(
			`[weather-fake] ${keyOf(latitude, longitude)} ${forecastDays} days from ${today} (${timezone})`
		);
		sendJson(response, 200, body);
	}

	const http = createServer((request, response) => {
		const url = new URL(request.url ?? '/', `http://${HOST}`);
		const route = `${request.method ?? 'GET'} ${url.pathname.replace(/\/+$/, '') || '/'}`;
		const handle = async () => {
			if (route === 'GET /health') return sendJson(response, 200, { status: 'ok', mode });
			if (route === 'GET /v1/forecast') {
				requestCount++;
				if (mode === 'fail') {
					return sendJson(response, 503, { error: true, reason: 'Service unavailable (fake)' });
				}
				if (mode === 'slow') {
					const timer = setTimeout(() => {
						waiting.delete(timer);
						if (!response.destroyed) forecast(url, response);
					}, slowMs);
					waiting.add(timer);
					// A client that gave up leaves nothing waiting here.
					response.on('close', () => {
						clearTimeout(timer);
						waiting.delete(timer);
					});
					return;
				}
				return forecast(url, response);
			}
			if (route === 'GET /test/requests') return sendJson(response, 200, { count: requestCount });
			if (route === 'POST /test/reset') {
				control.reset();
				return sendJson(response, 200, { reset: true });
			}
			if (route === 'PUT /test/forecast') {
				const parsed = setForecastBody.safeParse(await readJson(request));
				if (!parsed.success) {
					return sendJson(response, 400, {
						error: 'send JSON: {"latitude", "longitude", "days": [{"lowF", "highF"}]}'
					});
				}
				const { latitude, longitude, days } = parsed.data;
				control.setForecast(latitude, longitude, days);
				return sendJson(response, 200, { location: keyOf(latitude, longitude), days });
			}
			if (route === 'POST /test/mode') {
				const parsed = modeBody.safeParse(await readJson(request));
				if (!parsed.success) {
					return sendJson(response, 400, {
						error: 'send JSON: {"mode": "ok"|"fail"|"slow", "delayMs"?: number}'
					});
				}
				control.setMode(parsed.data.mode, parsed.data.delayMs);
				return sendJson(response, 200, { mode, delayMs: slowMs });
			}
			return sendJson(response, 404, { error: true, reason: `No route ${route}` });
		};
		handle().catch((error: Error) => {
			if (!response.headersSent) sendJson(response, 400, { error: error.message });
			else response.destroy();
		});
	});

	await new Promise<void>((resolve, reject) => {
		http.once('error', reject);
		http.listen(options.port, HOST, () => resolve());
	});
	const port = (http.address() as AddressInfo).port;

	return {
		url: `http://${HOST}:${port}`,
		port,
		...control,
		async stop() {
			for (const timer of waiting) clearTimeout(timer);
			waiting.clear();
			http.closeAllConnections();
			await new Promise<void>((resolve) => http.close(() => resolve()));
		}
	};
}
