// The one form field for a day: YYYY-MM-DD as a date input sends it, and a day the calendar
// has. A pattern alone let 2026-13-01 and 2026-02-30 through to code that then threw.
import { z } from 'zod';
import { isCalendarDate } from '$lib/format/dates';

/** A trimmed 'YYYY-MM-DD' that names a real day; `message` is shown beside the field. */
export function calendarDate(message = 'Pick a date.') {
	return z.string().trim().refine(isCalendarDate, message);
}
