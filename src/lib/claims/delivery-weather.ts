// The weather a box met on the day it arrived, read back from the ship check that let
// the order go: that check's stored inputs hold the daily forecasts at both ends of the
// route. Pure, so the claim page and its tests read stored snapshots the same way.
import type { IsoDate } from '$lib/format/dates';
import type { DailyForecast, ShipThresholds } from '$lib/shipping/ship-check';

/** The forecasts a stored snapshot holds, by place, with the limits the check used. */
export interface StoredForecasts {
	origin: DailyForecast[];
	destination: DailyForecast[];
	originZip: string | null;
	destinationZip: string | null;
	thresholds: ShipThresholds | null;
}

export type DeliveryWeather =
	| {
			found: true;
			/** The calendar day the readings are for. */
			day: IsoDate;
			/** 'delivered': the day it arrived; 'planned': the check's delivery date, when the day it arrived has none. */
			basis: 'delivered' | 'planned';
			destination: DailyForecast | null;
			origin: DailyForecast | null;
			destinationZip: string | null;
			originZip: string | null;
			thresholds: ShipThresholds | null;
	  }
	| { found: false; day: IsoDate | null; problem: string };

export const NO_FORECAST_FOR_DAY = 'No forecast stored for that day.';

const ISO_DAY = /^\d{4}-\d{2}-\d{2}$/;

function isRecord(value: unknown): value is Record<string, unknown> {
	return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** A day with a date and finite readings; anything else is dropped, as the ship check drops it. */
function asForecast(value: unknown): DailyForecast | null {
	if (!isRecord(value)) return null;
	const { date, lowF, highF } = value;
	if (typeof date !== 'string' || !ISO_DAY.test(date)) return null;
	if (typeof lowF !== 'number' || !Number.isFinite(lowF)) return null;
	if (typeof highF !== 'number' || !Number.isFinite(highF)) return null;
	return { date, lowF, highF };
}

function forecastList(value: unknown): DailyForecast[] {
	if (!Array.isArray(value)) return [];
	return value.map(asForecast).filter((day): day is DailyForecast => day !== null);
}

function asThresholds(value: unknown): ShipThresholds | null {
	if (!isRecord(value)) return null;
	const keys = ['heatPackBelowF', 'holdBelowF', 'coldPackAboveF', 'holdAboveF'] as const;
	if (!keys.every((key) => typeof value[key] === 'number' && Number.isFinite(value[key])))
		return null;
	return {
		heatPackBelowF: value.heatPackBelowF as number,
		holdBelowF: value.holdBelowF as number,
		coldPackAboveF: value.coldPackAboveF as number,
		holdAboveF: value.holdAboveF as number
	};
}

const zipOf = (value: unknown) => (typeof value === 'string' && value.trim() ? value.trim() : null);

/**
 * The forecasts in a ship_check.inputs value. The app stores `origin` and `destination`
 * lists (ShipCheckSnapshot); the demo's snapshots keep both places in one `forecast`
 * list with a `place` on each day, so that shape is read too.
 */
export function storedForecasts(inputs: unknown): StoredForecasts {
	const empty: StoredForecasts = {
		origin: [],
		destination: [],
		originZip: null,
		destinationZip: null,
		thresholds: null
	};
	if (!isRecord(inputs)) return empty;
	const found: StoredForecasts = {
		...empty,
		originZip: zipOf(inputs.originZip),
		destinationZip: zipOf(inputs.destinationZip),
		thresholds: asThresholds(inputs.thresholds)
	};
	if (Array.isArray(inputs.origin) || Array.isArray(inputs.destination)) {
		return {
			...found,
			origin: forecastList(inputs.origin),
			destination: forecastList(inputs.destination)
		};
	}
	const tagged: unknown = inputs.forecast;
	if (Array.isArray(tagged)) {
		const at = (place: string) =>
			forecastList(tagged.filter((day: unknown) => isRecord(day) && day.place === place));
		return { ...found, origin: at('origin'), destination: at('destination') };
	}
	return found;
}

/**
 * The readings for the delivery day: the day it arrived (in the shop's zone) when the
 * snapshot has that day, else the check's planned delivery date, else a problem that
 * says no forecast was stored for it.
 */
export function deliveryDayWeather(
	inputs: unknown,
	days: { deliveredOn: IsoDate | null; plannedOn: IsoDate | null }
): DeliveryWeather {
	const stored = storedForecasts(inputs);
	const tries: Array<{ day: IsoDate; basis: 'delivered' | 'planned' }> = [];
	if (days.deliveredOn) tries.push({ day: days.deliveredOn, basis: 'delivered' });
	if (days.plannedOn && days.plannedOn !== days.deliveredOn)
		tries.push({ day: days.plannedOn, basis: 'planned' });
	if (tries.length === 0)
		return { found: false, day: null, problem: 'The order has no delivery day on record.' };
	for (const { day, basis } of tries) {
		const destination = stored.destination.find((reading) => reading.date === day) ?? null;
		const origin = stored.origin.find((reading) => reading.date === day) ?? null;
		if (destination || origin)
			return {
				found: true,
				day,
				basis,
				destination,
				origin,
				destinationZip: stored.destinationZip,
				originZip: stored.originZip,
				thresholds: stored.thresholds
			};
	}
	return { found: false, day: tries[0]!.day, problem: NO_FORECAST_FOR_DAY };
}
