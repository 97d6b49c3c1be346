// The rules a keeper's override of the ship check must still keep: a written reason,
// and a ship date a carrier can actually take (a business day, today or later, with
// every transit day a business day too). Pure: the caller passes `today`.
import { formatShopDate, isCalendarDate, type IsoDate } from '$lib/format/dates';
import {
	deliveryDateFor,
	federalHolidayOn,
	isBusinessDay,
	isWeekend,
	type ServiceLevel
} from './calendar';

/** The audit log keeps the reason; a word or two ("ok", "rush") says nothing to the next reader. */
export const OVERRIDE_REASON_MIN_LENGTH = 10;
export const OVERRIDE_REASON_MAX_LENGTH = 1000;

/** Why an override reason is refused, or null. */
export function overrideReasonProblem(reason: string): string | null {
	const written = reason.trim();
	if (written.length < OVERRIDE_REASON_MIN_LENGTH)
		return `Write why in a sentence (at least ${OVERRIDE_REASON_MIN_LENGTH} characters): the audit log keeps it.`;
	if (written.length > OVERRIDE_REASON_MAX_LENGTH)
		return `Keep the reason under ${OVERRIDE_REASON_MAX_LENGTH.toLocaleString('en-US')} characters.`;
	return null;
}

/** Why a keeper's chosen ship date is refused, or null when a carrier can take the box that day. */
export function overrideShipDateProblem(input: {
	shipDate: string;
	today: IsoDate;
	service: ServiceLevel;
	extraClosedDates?: readonly IsoDate[];
}): string | null {
	const { shipDate, today, service } = input;
	const extraClosedDates = input.extraClosedDates ?? [];
	if (!isCalendarDate(shipDate)) return 'Pick a date (YYYY-MM-DD).';
	// Calendar dates carry no zone; 'UTC' only tells the formatter not to shift the day.
	const day = formatShopDate(shipDate, 'UTC');
	if (shipDate < today) return `${day} has passed; pick today or a later day.`;
	if (!isBusinessDay(shipDate, extraClosedDates)) {
		if (isWeekend(shipDate)) return `${day} is a weekend day: carriers take no live animals then.`;
		const holiday = federalHolidayOn(shipDate);
		if (holiday) return `${day} is ${holiday.name} (observed), a carrier holiday.`;
		return `${day} is one of the shop's closed days.`;
	}
	if (deliveryDateFor(shipDate, service, extraClosedDates) === null) {
		return `A box shipped ${service === 'overnight' ? 'overnight' : 'two-day'} on ${day} would sit in a depot over a weekend or holiday; pick another day.`;
	}
	return null;
}
