// What the ship check is asked: the shop's rules from its settings row, the day to
// start from, and the forecasts at both ends of the route. Forecasts are fetched
// here, before any transaction opens, and a failed one becomes an empty list, so the
// pure check holds with 'no_forecast' and never ships on weather it has not seen.
import type { IsoDate } from '$lib/format/dates';
import type { Service, ShopSetting } from '$lib/server/db/schema';
import type { ForecastSource } from '$lib/server/weather/source';
import type { DailyForecast, Place, ShipCheckInput } from '$lib/shipping/ship-check';

/** Stored with every ship_check row; bump it when a rule or its inputs change meaning. */
export const RULE_VERSION = 'ship-check/1';

/** Why a place had no forecast, when it had none. */
export type ForecastProblems = Partial<Record<Place, string>>;

/**
 * The ship_check.inputs snapshot: the full ShipCheckInput the decision came from,
 * plus where the forecasts were for and why one was missing.
 */
export type ShipCheckSnapshot = ShipCheckInput & {
	originZip: string;
	destinationZip: string;
	horizonDays: number;
	forecastProblems: ForecastProblems;
};

/** The settings-derived part of an input: service, ship weekdays, thresholds, closures. */
export function shipRulesFromSettings(
	settings: ShopSetting,
	service: Service
): Pick<ShipCheckInput, 'service' | 'shipWeekdays' | 'thresholds' | 'extraClosedDates'> {
	return {
		service,
		shipWeekdays: [
			...(service === 'overnight'
				? settings.ship_weekdays_overnight
				: settings.ship_weekdays_two_day)
		],
		thresholds: {
			heatPackBelowF: settings.heat_pack_below_f,
			holdBelowF: settings.hold_below_f,
			coldPackAboveF: settings.cold_pack_above_f,
			holdAboveF: settings.hold_above_f
		},
		extraClosedDates: [...settings.extra_closed_dates]
	};
}

function isDailyForecast(value: unknown): value is DailyForecast {
	const day = value as Partial<DailyForecast> | null;
	return (
		typeof day === 'object' &&
		day !== null &&
		typeof day.date === 'string' &&
		typeof day.lowF === 'number' &&
		typeof day.highF === 'number'
	);
}

/** One place's forecast, or an empty list and the reason; a throwing source counts as a failure. */
export async function forecastFor(
	source: ForecastSource,
	zip: string,
	days: number
): Promise<{ days: DailyForecast[]; problem: string | null }> {
	try {
		const outcome = await source.daily(zip, days);
		if (!outcome.ok) return { days: [], problem: outcome.problem };
		// Only the three fields the check reads, so the stored snapshot is exactly its input.
		const readings = outcome.days
			.filter(isDailyForecast)
			.map(({ date, lowF, highF }) => ({ date, lowF, highF }));
		return { days: readings, problem: null };
	} catch (cause) {
		return { days: [], problem: cause instanceof Error ? cause.message : String(cause) };
	}
}

/**
 * The input for one route: `firstDate` is the first day that may be a ship date
 * (shop-local). Both forecasts are asked for at once, over the shop's horizon.
 */
export async function buildShipCheckInput(
	source: ForecastSource,
	settings: ShopSetting,
	route: { service: Service; destinationZip: string; firstDate: IsoDate }
): Promise<ShipCheckSnapshot> {
	const horizonDays = settings.forecast_horizon_days;
	const originZip = settings.origin_zip.trim();
	const destinationZip = route.destinationZip.trim();
	const [origin, destination] = await Promise.all([
		forecastFor(source, originZip, horizonDays),
		forecastFor(source, destinationZip, horizonDays)
	]);
	const forecastProblems: ForecastProblems = {};
	if (origin.problem !== null) forecastProblems.origin = origin.problem;
	if (destination.problem !== null) forecastProblems.destination = destination.problem;
	return {
		today: route.firstDate,
		...shipRulesFromSettings(settings, route.service),
		origin: origin.days,
		destination: destination.days,
		originZip,
		destinationZip,
		horizonDays,
		forecastProblems
	};
}

/** The same answers for the same ZIP within one run: the daily job asks for the origin once, not per order. */
export function rememberingSource(source: ForecastSource): ForecastSource {
	const asked = new Map<string, ReturnType<ForecastSource['daily']>>();
	return {
		daily(zip, days) {
			const key = `${zip}|${days}`;
			let answer = asked.get(key);
			if (!answer) {
				answer = source.daily(zip, days);
				asked.set(key, answer);
			}
			return answer;
		}
	};
}
