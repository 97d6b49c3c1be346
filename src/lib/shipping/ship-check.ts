// The ship check: the earliest day a box of live animals can leave, from the
// carrier's calendar and the forecast at both ends of the route. Pure: no I/O, no
// clock (the caller passes `today`), no state; forecasts are fetched by the caller.
import { addDays, parseIsoDate, type IsoDate } from '$lib/format/dates';
import { deliveryDateFor, isoWeekday, TRANSIT_DAYS, type ServiceLevel } from './calendar';
import type { ShipThresholds } from './defaults';

export type { ServiceLevel } from './calendar';
export type { ShipThresholds } from './defaults';

/** One day's forecast at one place; `date` is local to that place. */
export type DailyForecast = { date: IsoDate; lowF: number; highF: number };

export type Place = 'origin' | 'destination';
export type Pack = 'heat' | 'cold';

export type ShipCheckInput = {
	/** First date that may be a ship date (shop-local). */
	today: IsoDate;
	service: ServiceLevel;
	/** ISO weekdays the shop ships on, 1 = Monday … 7 = Sunday. */
	shipWeekdays: readonly number[];
	thresholds: Readonly<ShipThresholds>;
	/** Consecutive days from `today`. */
	origin: readonly DailyForecast[];
	/** Consecutive days from `today`. */
	destination: readonly DailyForecast[];
	/** Closures besides weekends and US federal holidays. */
	extraClosedDates?: readonly IsoDate[];
};

/**
 * Why a rule fired. `valueF` is the forecast reading that made it fire and `limitF`
 * the threshold it crossed. Two rules compare no reading and carry valueF 0 and
 * limitF 0 (NaN would not survive JSON): 'no_forecast' (`date` and `place` name the
 * route day with no forecast) and 'both_packs' (`date` is the ruled-out ship date,
 * `place` 'origin'; the heat_pack and cold_pack reasons beside it carry the readings).
 */
export type Reason = { rule: string; date: IsoDate; place: Place; valueF: number; limitF: number };

export type ShipCheckResult =
	| {
			decision: 'ship';
			shipDate: IsoDate;
			deliveryDate: IsoDate;
			packs: Array<Pack>;
			facilityPickup: boolean;
			reasons: Reason[];
	  }
	| { decision: 'hold'; recheckDate: IsoDate; reasons: Reason[] };

/** The stable machine names of the rules; sentences for them are in ./reasons. */
export const REASON_RULES = [
	'hold_below',
	'hold_above',
	'heat_pack',
	'cold_pack',
	'both_packs',
	'facility_pickup_cold',
	'facility_pickup_heat',
	'no_forecast'
] as const;
export type ReasonRule = (typeof REASON_RULES)[number];

/**
 * How far ahead to look for a calendar-possible ship date when none turns up. A year
 * of nothing means the settings (no ship weekdays, closures) are the problem, not the weather.
 */
const SCAN_LIMIT_DAYS = 366;

type RouteDay = { date: IsoDate; place: Place };

function reason(
	rule: ReasonRule,
	date: IsoDate,
	place: Place,
	valueF: number,
	limitF: number
): Reason {
	return { rule, date, place, valueF, limitF };
}

/**
 * Where the box is on each day: at the origin on the ship date, at the destination
 * on the delivery date, and in transit (both places' weather counts) on days between.
 */
function routeDays(shipDate: IsoDate, deliveryDate: IsoDate, transitDays: number): RouteDay[] {
	const days: RouteDay[] = [{ date: shipDate, place: 'origin' }];
	for (let day = 1; day < transitDays; day++) {
		const date = addDays(shipDate, day);
		days.push({ date, place: 'origin' }, { date, place: 'destination' });
	}
	days.push({ date: deliveryDate, place: 'destination' });
	return days;
}

/** Forecasts by date; a day whose readings are not finite counts as having no forecast. */
function forecastsByDate(forecasts: readonly DailyForecast[]): Map<IsoDate, DailyForecast> {
	const byDate = new Map<IsoDate, DailyForecast>();
	for (const forecast of forecasts) {
		if (Number.isFinite(forecast.lowF) && Number.isFinite(forecast.highF)) {
			byDate.set(forecast.date, forecast);
		}
	}
	return byDate;
}

function assertThresholds(thresholds: Readonly<ShipThresholds>): void {
	for (const [name, value] of Object.entries(thresholds)) {
		// A NaN limit would make every comparison false and let any weather through.
		if (!Number.isFinite(value)) throw new RangeError(`ship threshold ${name} is not a number`);
	}
}

type RouteVerdict =
	| { ruledOut: true; reasons: Reason[] }
	| { ruledOut: false; packs: Pack[]; facilityPickup: boolean; reasons: Reason[] };

/**
 * Between the pack and hold limits at the destination on the delivery day, the box
 * should wait at a staffed carrier facility rather than on a doorstep.
 */
function facilityPickupReasons(
	delivery: DailyForecast,
	thresholds: Readonly<ShipThresholds>
): Reason[] {
	const found: Reason[] = [];
	if (delivery.lowF < thresholds.heatPackBelowF && delivery.lowF >= thresholds.holdBelowF) {
		found.push(
			reason(
				'facility_pickup_cold',
				delivery.date,
				'destination',
				delivery.lowF,
				thresholds.heatPackBelowF
			)
		);
	}
	if (delivery.highF > thresholds.coldPackAboveF && delivery.highF <= thresholds.holdAboveF) {
		found.push(
			reason(
				'facility_pickup_heat',
				delivery.date,
				'destination',
				delivery.highF,
				thresholds.coldPackAboveF
			)
		);
	}
	return found;
}

function judgeRoute(
	route: readonly { day: RouteDay; forecast: DailyForecast }[],
	shipDate: IsoDate,
	deliveryDate: IsoDate,
	thresholds: Readonly<ShipThresholds>
): RouteVerdict {
	const holds: Reason[] = [];
	const packReasons: Reason[] = [];
	const pickupReasons: Reason[] = [];
	for (const { day, forecast } of route) {
		// Strict comparisons: a low of exactly the limit does not fire the rule.
		if (forecast.lowF < thresholds.holdBelowF) {
			holds.push(reason('hold_below', day.date, day.place, forecast.lowF, thresholds.holdBelowF));
		} else if (forecast.lowF < thresholds.heatPackBelowF) {
			packReasons.push(
				reason('heat_pack', day.date, day.place, forecast.lowF, thresholds.heatPackBelowF)
			);
		}
		if (forecast.highF > thresholds.holdAboveF) {
			holds.push(reason('hold_above', day.date, day.place, forecast.highF, thresholds.holdAboveF));
		} else if (forecast.highF > thresholds.coldPackAboveF) {
			packReasons.push(
				reason('cold_pack', day.date, day.place, forecast.highF, thresholds.coldPackAboveF)
			);
		}
		if (day.place === 'destination' && day.date === deliveryDate) {
			pickupReasons.push(...facilityPickupReasons(forecast, thresholds));
		}
	}
	if (holds.length > 0) return { ruledOut: true, reasons: holds };

	const packs: Pack[] = [];
	if (packReasons.some((fired) => fired.rule === 'heat_pack')) packs.push('heat');
	if (packReasons.some((fired) => fired.rule === 'cold_pack')) packs.push('cold');
	if (packs.length === 2) {
		// One box cannot be both warmed and cooled (a heat pack can overheat a sealed box).
		return {
			ruledOut: true,
			reasons: [...packReasons, reason('both_packs', shipDate, 'origin', 0, 0)]
		};
	}
	return {
		ruledOut: false,
		packs,
		facilityPickup: pickupReasons.length > 0,
		reasons: [...packReasons, ...pickupReasons]
	};
}

/** Overlapping two-day routes see the same day twice; name each fired rule once. */
function withoutRepeats(reasons: readonly Reason[]): Reason[] {
	const seen = new Set<string>();
	return reasons.filter((fired) => {
		const key = `${fired.rule}|${fired.date}|${fired.place}|${fired.valueF}|${fired.limitF}`;
		if (seen.has(key)) return false;
		seen.add(key);
		return true;
	});
}

/**
 * The earliest date from `today` that the calendar allows, that has a forecast for
 * each of its route days, and that the weather does not rule out; otherwise a hold
 * to look again tomorrow. A `ship` result's reasons are the rules that fired for that
 * shipment (packs, facility pickup); a `hold` lists what ruled out each date looked at.
 * The scan stops at the first date lacking a forecast: forecasts run consecutively
 * from `today`, so no later date can have one.
 */
export function shipCheck(input: ShipCheckInput): ShipCheckResult {
	parseIsoDate(input.today); // refuses a malformed date before any arithmetic
	assertThresholds(input.thresholds);
	const forecasts: Record<Place, Map<IsoDate, DailyForecast>> = {
		origin: forecastsByDate(input.origin),
		destination: forecastsByDate(input.destination)
	};
	const shipWeekdays = new Set(input.shipWeekdays);
	const extraClosedDates = input.extraClosedDates ?? [];
	const transitDays = TRANSIT_DAYS[input.service];
	const ruledOutBy: Reason[] = [];

	for (let offset = 0; offset < SCAN_LIMIT_DAYS; offset++) {
		const shipDate = addDays(input.today, offset);
		if (!shipWeekdays.has(isoWeekday(shipDate))) continue;
		const deliveryDate = deliveryDateFor(shipDate, input.service, extraClosedDates);
		if (deliveryDate === null) continue;

		const route: { day: RouteDay; forecast: DailyForecast }[] = [];
		const missing: RouteDay[] = [];
		for (const day of routeDays(shipDate, deliveryDate, transitDays)) {
			const forecast = forecasts[day.place].get(day.date);
			if (forecast) route.push({ day, forecast });
			else missing.push(day);
		}
		if (missing.length > 0) {
			ruledOutBy.push(...missing.map((day) => reason('no_forecast', day.date, day.place, 0, 0)));
			break;
		}

		const verdict = judgeRoute(route, shipDate, deliveryDate, input.thresholds);
		if (verdict.ruledOut) {
			ruledOutBy.push(...verdict.reasons);
			continue;
		}
		return {
			decision: 'ship',
			shipDate,
			deliveryDate,
			packs: verdict.packs,
			facilityPickup: verdict.facilityPickup,
			reasons: verdict.reasons
		};
	}

	return {
		decision: 'hold',
		recheckDate: addDays(input.today, 1),
		reasons: withoutRepeats(ruledOutBy)
	};
}
