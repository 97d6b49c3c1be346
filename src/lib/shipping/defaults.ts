// The shop's starting ship-check settings (PRODUCT.md, Computations 1). These are
// general practice among live-animal shippers, whose published limits range widely;
// every value is adjustable in the shop settings.
import type { ServiceLevel } from './calendar';

/** Forecast limits in °F; every comparison against them is strict. */
export type ShipThresholds = {
	/** Add a heat pack when a route day's low is below this. */
	heatPackBelowF: number;
	/** Hold the shipment when a route day's low is below this. */
	holdBelowF: number;
	/** Add a cold pack when a route day's high is above this. */
	coldPackAboveF: number;
	/** Hold the shipment when a route day's high is above this. */
	holdAboveF: number;
};

/** Heat pack under 50 °F, hold under 25 °F; cold pack over 85 °F, hold over 95 °F. */
export const DEFAULT_THRESHOLDS: Readonly<ShipThresholds> = Object.freeze({
	heatPackBelowF: 50,
	holdBelowF: 25,
	coldPackAboveF: 85,
	holdAboveF: 95
});

/**
 * ISO weekdays (1 = Monday) the shop ships on: Monday to Wednesday overnight,
 * Monday and Tuesday two-day, so a box reaches its buyer well before the weekend.
 */
export const DEFAULT_SHIP_WEEKDAYS: Readonly<Record<ServiceLevel, readonly number[]>> =
	Object.freeze({
		overnight: Object.freeze([1, 2, 3]),
		two_day: Object.freeze([1, 2])
	});
