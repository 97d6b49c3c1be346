// Plain-English sentences for the rules the ship check reports, for customers at
// the cart and keepers per order. Temperatures read °F with °C beside.
import { formatShopDate } from '$lib/format/dates';
import { formatTemperature } from '$lib/format/temperature';
import type { Place, Reason, ReasonRule } from './ship-check';

const placeNames: Record<Place, string> = {
	origin: 'the origin',
	destination: 'the destination'
};

// Calendar dates carry no zone; 'UTC' only tells the formatter not to shift the day.
function day(reason: Reason): string {
	return formatShopDate(reason.date, 'UTC');
}

function where(reason: Reason): string {
	return `at ${placeNames[reason.place]} on ${day(reason)}`;
}

/** One sentence per rule; each names the forecast value and the limit it crossed. */
export const reasonSentences: Readonly<Record<ReasonRule, (reason: Reason) => string>> = {
	hold_below: (reason) =>
		`Low of ${formatTemperature(reason.valueF)} ${where(reason)} is below the ${formatTemperature(reason.limitF)} hold limit.`,
	hold_above: (reason) =>
		`High of ${formatTemperature(reason.valueF)} ${where(reason)} is above the ${formatTemperature(reason.limitF)} hold limit.`,
	heat_pack: (reason) =>
		`Low of ${formatTemperature(reason.valueF)} ${where(reason)} is below ${formatTemperature(reason.limitF)}, so the box gets a heat pack.`,
	cold_pack: (reason) =>
		`High of ${formatTemperature(reason.valueF)} ${where(reason)} is above ${formatTemperature(reason.limitF)}, so the box gets a cold pack.`,
	// valueF and limitF are 0 here: the heat_pack and cold_pack reasons beside it hold the readings.
	both_packs: (reason) =>
		`Shipping on ${day(reason)} would need both a heat pack and a cold pack, which cannot share a box, so that day is ruled out.`,
	facility_pickup_cold: (reason) =>
		`Low of ${formatTemperature(reason.valueF)} ${where(reason)} is below ${formatTemperature(reason.limitF)}: have the box held at a staffed carrier facility for pickup rather than left outside.`,
	facility_pickup_heat: (reason) =>
		`High of ${formatTemperature(reason.valueF)} ${where(reason)} is above ${formatTemperature(reason.limitF)}: have the box held at a staffed carrier facility for pickup rather than left outside.`,
	// valueF and limitF are 0 here: there is no reading to compare.
	no_forecast: (reason) =>
		`There is no forecast yet for ${placeNames[reason.place]} on ${day(reason)}, so that shipment cannot be checked until one is published.`
};

function isReasonRule(rule: string): rule is ReasonRule {
	return Object.hasOwn(reasonSentences, rule);
}

/** The sentence for one fired rule; an unknown rule (say, from newer stored data) still reads sensibly. */
export function describeReason(reason: Reason): string {
	if (isReasonRule(reason.rule)) return reasonSentences[reason.rule](reason);
	return `Rule "${reason.rule}" fired ${where(reason)}.`;
}
