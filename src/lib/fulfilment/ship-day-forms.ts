// The ship-day page's own inputs: which day (from the URL), and moving a short line to
// another clutch. The marking forms are in ./mark-forms.
import { z } from 'zod';
import { MAX_INTEGER_COLUMN, NO_SUCH_ROW } from '$lib/forms/row-id';
import { addDays, type IsoDate } from '$lib/format/dates';

/** How far from today a ship day may be opened: the forecast horizon is far shorter. */
export const SHIP_DAY_RANGE_DAYS = 366;

/** The day the URL asks for, or today with a note when it asks for nothing sensible. */
export function shipDayFromQuery(
	value: string | null,
	today: IsoDate
): { date: IsoDate; note: string | null } {
	if (value === null || value === '') return { date: today, note: null };
	const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value);
	const parsed = match ? new Date(Date.UTC(+match[1]!, +match[2]! - 1, +match[3]!)) : null;
	if (!parsed || parsed.toISOString().slice(0, 10) !== value)
		return { date: today, note: `“${value.slice(0, 20)}” is not a date; showing today.` };
	if (value < addDays(today, -SHIP_DAY_RANGE_DAYS) || value > addDays(today, SHIP_DAY_RANGE_DAYS))
		return {
			date: today,
			note: 'Ship days open up to a year either side of today; showing today.'
		};
	return { date: value, note: null };
}

export const substituteSchema = z.object({
	orderLineId: z.number().int().positive().max(MAX_INTEGER_COLUMN, NO_SUCH_ROW),
	clutchId: z
		.number({ error: 'Pick the clutch that takes this line.' })
		.int()
		.positive()
		.max(MAX_INTEGER_COLUMN, 'Pick the clutch that takes this line.')
});
export type SubstituteForm = z.infer<typeof substituteSchema>;
