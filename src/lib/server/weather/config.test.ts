import { describe, expect, it } from 'vitest';
import { weatherSettingsFrom } from './config';

describe('weatherSettingsFrom', () => {
	it('falls back to the local fake, 4 s and 3 hours when nothing is set', () => {
		expect(weatherSettingsFrom({})).toEqual({
			baseUrl: 'http://127.0.0.1:2590',
			timeoutMs: 4_000,
			cacheHours: 3
		});
		expect(weatherSettingsFrom({ WEATHER_API_URL: ' ', WEATHER_TIMEOUT_MS: '' }).baseUrl).toBe(
			'http://127.0.0.1:2590'
		);
	});

	it('takes the real service and its own limits', () => {
		expect(
			weatherSettingsFrom({
				WEATHER_API_URL: 'https://api.open-meteo.com/',
				WEATHER_TIMEOUT_MS: '2500',
				WEATHER_CACHE_HOURS: '1.5'
			})
		).toEqual({ baseUrl: 'https://api.open-meteo.com', timeoutMs: 2_500, cacheHours: 1.5 });
	});

	it('refuses values that would make the forecast unsafe or a page hang', () => {
		expect(() => weatherSettingsFrom({ WEATHER_API_URL: 'api.open-meteo.com' })).toThrow(
			/not a URL/
		);
		expect(() => weatherSettingsFrom({ WEATHER_API_URL: 'ftp://127.0.0.1' })).toThrow(/http/);
		expect(() => weatherSettingsFrom({ WEATHER_TIMEOUT_MS: '0' })).toThrow(/WEATHER_TIMEOUT_MS/);
		expect(() => weatherSettingsFrom({ WEATHER_TIMEOUT_MS: '600000' })).toThrow(/at most 60000/);
		expect(() => weatherSettingsFrom({ WEATHER_CACHE_HOURS: 'three' })).toThrow(
			/WEATHER_CACHE_HOURS/
		);
		expect(() => weatherSettingsFrom({ WEATHER_CACHE_HOURS: '48' })).toThrow(/at most 24/);
	});
});
