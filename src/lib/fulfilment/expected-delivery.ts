// The day a box that just left should arrive: what the ship check said when it leaves
// on the check's own ship date, otherwise counted on the carrier's calendar from the
// day it really left. That date is what "late" is measured against.
import { addDays, type IsoDate } from '$lib/format/dates';
import { deliveryDateFor, isBusinessDay, TRANSIT_DAYS } from '$lib/shipping/calendar';
import type { Service } from '$lib/server/db/schema';
import type { Carrier } from './carriers';

export interface ExpectedDeliveryInput {
	/** The shop-local date the box was handed over. */
	shippedOn: IsoDate;
	service: Service;
	carrier: Carrier;
	/** The ship check the box was packed on, when it said ship. */
	check: { shipDate: IsoDate | null; deliveryDate: IsoDate | null } | null;
	extraClosedDates: readonly IsoDate[];
}

/** The next carrier business day after `date`. */
function nextBusinessDay(date: IsoDate, extraClosedDates: readonly IsoDate[]): IsoDate {
	let day = addDays(date, 1);
	while (!isBusinessDay(day, extraClosedDates)) day = addDays(day, 1);
	return day;
}

export function expectedDeliveryOn(input: ExpectedDeliveryInput): IsoDate {
	const { shippedOn, service, extraClosedDates } = input;
	// Handed over in person: it arrives the day it goes.
	if (input.carrier === 'hand') return shippedOn;
	if (input.check?.shipDate === shippedOn && input.check.deliveryDate)
		return input.check.deliveryDate;
	const direct = deliveryDateFor(shippedOn, service, extraClosedDates);
	if (direct) return direct;
	// Left on a day the ship check would not pick: the carrier moves it from its next
	// working day, one business day per transit day.
	let day = isBusinessDay(shippedOn, extraClosedDates)
		? shippedOn
		: nextBusinessDay(shippedOn, extraClosedDates);
	for (let step = 0; step < TRANSIT_DAYS[service]; step++)
		day = nextBusinessDay(day, extraClosedDates);
	return day;
}
