// The forecast source behind the ship check: ZIP → a point on the map → daily lows
// and highs, cached in forecast_cache for a few hours. This module owns that table's
// writes. No $env here (./index.ts reads the settings), so tests build their own.
import { addDays, todayInZone, type IsoDate } from '$lib/format/dates';
import type { DailyForecast } from '$lib/shipping/ship-check';
import { z } from 'zod';
import { lookUpZip } from '../accounts/zip';
import type { Db } from '../db/connect';
import {
	DEFAULT_WEATHER_CACHE_HOURS,
	DEFAULT_WEATHER_TIMEOUT_MS,
	type WeatherSettings
} from './config';
import { fetchDailyForecast, MAX_FORECAST_DAYS, type ServiceOutcome } from './open-meteo';
import type { ForecastOutcome, ForecastSource } from './source';
import { logger } from '../log';

const HOUR_MS = 3_600_000;

export type ForecastSourceOptions = Pick<WeatherSettings, 'baseUrl'> &
	Partial<Pick<WeatherSettings, 'timeoutMs' | 'cacheHours'>> & {
		/** The clock (tests move it past the cache's hours). */
		now?: () => Date;
		/** Stand-in for the global fetch (tests). */
		fetch?: typeof fetch;
	};

/** Where a ZIP's forecast is asked for: the ZIP's point rounded to 2 decimals (about 1 km). */
export type ZipLocation = {
	zip: string;
	city: string;
	state: string;
	latitude: number;
	longitude: number;
	/** The forecast_cache key, "lat,lon" at 2 decimals: nearby ZIPs share one forecast. */
	locationKey: string;
};

const round2 = (value: number) => Math.round(value * 100) / 100;

export function locationKeyOf(latitude: number, longitude: number): string {
	return `${round2(latitude).toFixed(2)},${round2(longitude).toFixed(2)}`;
}

/** A 5-digit US ZIP's forecast point from the open ZIP dataset, or null. */
export function zipLocation(zip: string): ZipLocation | null {
	const trimmed = zip.trim();
	if (!/^\d{5}$/.test(trimmed)) return null;
	const place = lookUpZip(trimmed);
	if (!place || !Number.isFinite(place.latitude) || !Number.isFinite(place.longitude)) return null;
	const latitude = round2(place.latitude);
	const longitude = round2(place.longitude);
	return {
		zip: place.zip,
		city: place.city,
		state: place.state,
		latitude,
		longitude,
		locationKey: locationKeyOf(latitude, longitude)
	};
}

/** Why a ZIP has no forecast point, in words for the form field. */
function zipRefusal(zip: string): string {
	const trimmed = zip.trim();
	if (!/^\d{5}$/.test(trimmed)) return 'A US ZIP code is 5 digits, such as 37902.';
	return `No US ZIP code ${trimmed} is known.`;
}

/** What one forecast_cache.daily holds. */
const cachedForecast = z.object({
	timezone: z.string().min(1),
	/** The last date the request asked for: the row answers asks up to here. */
	coversThrough: z.string(),
	days: z.array(z.object({ date: z.string(), lowF: z.number(), highF: z.number() })).min(1)
});
type CachedForecast = z.infer<typeof cachedForecast>;

type CacheRow = { entry: CachedForecast; fetchedAt: Date };

/** Days from the place's today on, and whether they reach `wanted` days; null if they start late. */
function fromToday(
	entry: CachedForecast,
	wanted: number,
	now: Date
): { days: DailyForecast[]; covers: boolean } | null {
	const today = todayInZone(entry.timezone, now);
	const first = entry.days[0]?.date;
	// A series that starts after the place's today is not the one that was asked for.
	if (first === undefined || first > today) return null;
	const lastWanted: IsoDate = addDays(today, wanted - 1);
	return {
		days: entry.days.filter((day) => day.date >= today).slice(0, wanted),
		covers: entry.coversThrough >= lastWanted
	};
}

export function createForecastSource(db: Db, options: ForecastSourceOptions): ForecastSource {
	const timeoutMs = options.timeoutMs ?? DEFAULT_WEATHER_TIMEOUT_MS;
	const cacheMs = (options.cacheHours ?? DEFAULT_WEATHER_CACHE_HOURS) * HOUR_MS;
	const clock = options.now ?? (() => new Date());
	// One request per location at a time: a page asking for origin and destination
	// together, or two buyers at once, share the answer.
	const inFlight = new Map<string, Promise<ServiceOutcome>>();

	async function readCache(locationKey: string): Promise<CacheRow | null> {
		try {
			const row = await db
				.selectFrom('forecast_cache')
				.select(['daily', 'fetched_at'])
				.where('location_key', '=', locationKey)
				.executeTakeFirst();
			if (!row) return null;
			const entry = cachedForecast.safeParse(row.daily);
			// A row in an older shape is simply not a cache hit.
			return entry.success ? { entry: entry.data, fetchedAt: row.fetched_at } : null;
		} catch (error) {
			// The cache is a convenience; the service can still answer.
			logger.warn(`[weather] forecast cache unreadable: ${(error as Error).message}`);
			return null;
		}
	}

	async function writeCache(
		location: ZipLocation,
		entry: CachedForecast,
		fetchedAt: Date
	): Promise<void> {
		const values = {
			location_key: location.locationKey,
			latitude: location.latitude,
			longitude: location.longitude,
			daily: JSON.stringify(entry),
			fetched_at: fetchedAt
		};
		try {
			await db
				.insertInto('forecast_cache')
				.values(values)
				.onConflict((conflict) =>
					conflict.column('location_key').doUpdateSet({
						latitude: values.latitude,
						longitude: values.longitude,
						daily: values.daily,
						fetched_at: values.fetched_at
					})
				)
				.execute();
		} catch (error) {
			// The forecast itself is good; the next ask just fetches again.
			logger.warn(`[weather] forecast cache not written: ${(error as Error).message}`);
		}
	}

	function askService(location: ZipLocation, forecastDays: number): Promise<ServiceOutcome> {
		const flightKey = `${location.locationKey}|${forecastDays}`;
		let pending = inFlight.get(flightKey);
		if (!pending) {
			pending = fetchDailyForecast({
				baseUrl: options.baseUrl,
				latitude: location.latitude,
				longitude: location.longitude,
				days: forecastDays,
				timeoutMs,
				fetch: options.fetch
			}).finally(() => inFlight.delete(flightKey));
			inFlight.set(flightKey, pending);
		}
		return pending;
	}

	return {
		async daily(zip: string, days: number): Promise<ForecastOutcome> {
			if (!Number.isInteger(days) || days < 1) {
				throw new RangeError(`forecast days must be a whole number from 1, got ${days}`);
			}
			const location = zipLocation(zip);
			if (!location) return { ok: false, problem: zipRefusal(zip) };
			const wanted = Math.min(days, MAX_FORECAST_DAYS);
			const now = clock();

			const cached = await readCache(location.locationKey);
			const age = cached ? now.getTime() - cached.fetchedAt.getTime() : Infinity;
			// Past its hours a forecast is never used, not even when the service is down.
			const fresh =
				cached && age >= 0 && age < cacheMs ? fromToday(cached.entry, wanted, now) : null;
			if (fresh?.covers && fresh.days.length > 0) {
				return { ok: true, days: fresh.days, from: 'cache' };
			}

			// One day more than asked, so the row still covers the ask after midnight there.
			const forecastDays = Math.min(MAX_FORECAST_DAYS, wanted + 1);
			const answer = await askService(location, forecastDays);
			if (!answer.ok) {
				// A fresh forecast that is only shorter than asked is still a true one.
				if (fresh && fresh.days.length > 0) return { ok: true, days: fresh.days, from: 'cache' };
				return { ok: false, problem: answer.problem };
			}

			const first = answer.forecast.days[0]?.date ?? todayInZone(answer.forecast.timezone, now);
			const entry: CachedForecast = {
				timezone: answer.forecast.timezone,
				coversThrough: addDays(first, forecastDays - 1),
				days: answer.forecast.days
			};
			await writeCache(location, entry, now);
			const today = todayInZone(entry.timezone, now);
			const served = entry.days.filter((day) => day.date >= today).slice(0, wanted);
			if (served.length === 0) {
				return { ok: false, problem: 'The forecast service sent only days that have passed.' };
			}
			return { ok: true, days: served, from: 'service' };
		}
	};
}
