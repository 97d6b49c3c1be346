// The report range from the URL (?from=YYYY-MM-DD&to=YYYY-MM-DD), checked the same way
// by the page and by the JSON route. Both ends are calendar days in the shop's zone and
// both are included.
import { addDays, daysBetween, parseIsoDate, type IsoDate } from '$lib/format/dates';

/** The longest range a report draws: five years of months still read on one chart. */
export const MAX_RANGE_YEARS = 5;

export type RangeResult =
	| { ok: true; from: IsoDate; to: IsoDate; defaulted: boolean }
	| {
			ok: false;
			/** What was typed, kept so the form shows it back. */
			from: string;
			to: string;
			errors: { from?: string; to?: string };
	  };

/** The first day of the month `months` before the month of `isoDate`. */
export function monthStartBefore(isoDate: IsoDate, months: number): IsoDate {
	const date = parseIsoDate(isoDate);
	const start = new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth() - months, 1));
	return start.toISOString().slice(0, 10);
}

/** The same calendar day `years` later; 29 Feb falls back to 28 Feb. */
function yearsAfter(isoDate: IsoDate, years: number): IsoDate {
	const date = parseIsoDate(isoDate);
	const later = new Date(Date.UTC(date.getUTCFullYear() + years, date.getUTCMonth(), 1));
	const lastDay = new Date(Date.UTC(later.getUTCFullYear(), later.getUTCMonth() + 1, 0));
	later.setUTCDate(Math.min(date.getUTCDate(), lastDay.getUTCDate()));
	return later.toISOString().slice(0, 10);
}

/** The default range: this month and the eleven before it, up to today. */
export function defaultRange(today: IsoDate): { from: IsoDate; to: IsoDate } {
	return { from: monthStartBefore(today, 11), to: today };
}

function readDate(raw: string): IsoDate | null {
	try {
		parseIsoDate(raw);
		return raw;
	} catch {
		return null;
	}
}

export function parseReportRange(params: URLSearchParams, today: IsoDate): RangeResult {
	const rawFrom = (params.get('from') ?? '').trim();
	const rawTo = (params.get('to') ?? '').trim();
	const errors: { from?: string; to?: string } = {};
	const fallback = defaultRange(rawTo && readDate(rawTo) ? rawTo : today);

	const from = rawFrom === '' ? fallback.from : readDate(rawFrom);
	const to = rawTo === '' ? today : readDate(rawTo);
	if (from === null) errors.from = 'Give the first day as a date, like 2026-01-31.';
	if (to === null) errors.to = 'Give the last day as a date, like 2026-12-31.';
	if (from !== null && to !== null) {
		if (daysBetween(from, to) < 0) {
			errors.to = 'The range ends before it starts. Choose a last day on or after the first.';
		} else if (to >= yearsAfter(from, MAX_RANGE_YEARS)) {
			errors.to = `A report covers at most ${MAX_RANGE_YEARS} years. Choose a later first day or an earlier last day.`;
		}
	}
	if (from === null || to === null || errors.from || errors.to) {
		return { ok: false, from: rawFrom, to: rawTo, errors };
	}
	return { ok: true, from, to, defaulted: rawFrom === '' && rawTo === '' };
}

/** Every 'YYYY-MM' from the month of `from` to the month of `to`. */
export function monthsOf(from: IsoDate, to: IsoDate): string[] {
	const months: string[] = [];
	let cursor = monthStartBefore(from, 0);
	while (cursor.slice(0, 7) <= to.slice(0, 7)) {
		months.push(cursor.slice(0, 7));
		cursor = monthStartBefore(addDays(cursor, 32), 0);
	}
	return months;
}
