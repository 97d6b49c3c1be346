// The app's forecast source, configured from its environment (WEATHER_API_URL,
// WEATHER_TIMEOUT_MS, WEATHER_CACHE_HOURS; see .env.example). Only code that runs
// inside SvelteKit imports this file; tests build theirs with ./provider.ts.
import { env } from '$env/dynamic/private';
import type { Db } from '../db/connect';
import { weatherSettingsFrom } from './config';
import { createForecastSource } from './provider';
import type { ForecastSource } from './source';

export type { ForecastOutcome, ForecastSource } from './source';
export { zipLocation, type ZipLocation } from './provider';

// One source per database handle, so requests already on their way are shared.
const sources = new WeakMap<Db, ForecastSource>();

export function forecastSource(db: Db): ForecastSource {
	let source = sources.get(db);
	if (!source) {
		source = createForecastSource(
			db,
			weatherSettingsFrom({
				WEATHER_API_URL: env.WEATHER_API_URL,
				WEATHER_TIMEOUT_MS: env.WEATHER_TIMEOUT_MS,
				WEATHER_CACHE_HOURS: env.WEATHER_CACHE_HOURS
			})
		);
		sources.set(db, source);
	}
	return source;
}
