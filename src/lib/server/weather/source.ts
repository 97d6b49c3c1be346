// What the ship check asks of the weather: daily lows and highs (°F) for a ZIP, for
// a number of days from today. A failure is an answer too, and it always means hold.
import type { DailyForecast } from '$lib/shipping/ship-check';

export type ForecastOutcome =
	{ ok: true; days: DailyForecast[]; from: 'cache' | 'service' } | { ok: false; problem: string };

export interface ForecastSource {
	/** Up to `days` consecutive days from the place's own today, or why there are none. */
	daily(zip: string, days: number): Promise<ForecastOutcome>;
}
