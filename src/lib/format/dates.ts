// Instants are stored in UTC and shown in the shop's own zone. Calendar dates
// (PostgreSQL `date`, kept as 'YYYY-MM-DD' text) have no zone and are never shifted.

const DATE_ONLY = /^(\d{4})-(\d{2})-(\d{2})$/;
const DAY_MS = 86_400_000;

/** A calendar date as 'YYYY-MM-DD'. */
export type IsoDate = string;

type Parts = Partial<Record<Intl.DateTimeFormatPartTypes, string>>;

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(timeZone: string, withTime: boolean): Intl.DateTimeFormat {
	const key = `${timeZone}|${withTime ? 'time' : 'date'}`;
	let found = formatters.get(key);
	if (!found) {
		found = new Intl.DateTimeFormat('en-US', {
			timeZone,
			weekday: 'short',
			year: 'numeric',
			month: 'short',
			day: 'numeric',
			...(withTime
				? { hour: 'numeric', minute: '2-digit', hour12: true, timeZoneName: 'short' }
				: {})
		});
		formatters.set(key, found);
	}
	return found;
}

function partsOf(date: Date, timeZone: string, withTime: boolean): Parts {
	const parts: Parts = {};
	for (const part of formatter(timeZone, withTime).formatToParts(date))
		parts[part.type] = part.value;
	return parts;
}

/** Parse 'YYYY-MM-DD' strictly (no 2026-02-30), as UTC midnight of that calendar day. */
export function parseIsoDate(isoDate: IsoDate): Date {
	const match = DATE_ONLY.exec(isoDate);
	if (!match) throw new RangeError(`not a calendar date (YYYY-MM-DD): ${isoDate}`);
	const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
	const date = new Date(Date.UTC(year, month - 1, day));
	if (
		date.getUTCFullYear() !== year ||
		date.getUTCMonth() !== month - 1 ||
		date.getUTCDate() !== day
	) {
		throw new RangeError(`no such calendar date: ${isoDate}`);
	}
	return date;
}

/** Whether text is a real day written YYYY-MM-DD (no 2026-13-01, no 2026-02-30). */
export function isCalendarDate(text: string): boolean {
	try {
		parseIsoDate(text);
		return true;
	} catch {
		return false;
	}
}

function toInstant(value: Date | string): Date {
	const date = value instanceof Date ? value : new Date(value);
	if (Number.isNaN(date.getTime())) throw new RangeError(`not a date or time: ${String(value)}`);
	return date;
}

/**
 * "Tue, Mar 10, 2026". A 'YYYY-MM-DD' calendar date is shown as that day; a Date
 * or ISO timestamp is shown as the day it is in `timeZone`.
 */
export function formatShopDate(dateOrIso: Date | string, timeZone: string): string {
	const calendar = typeof dateOrIso === 'string' && DATE_ONLY.test(dateOrIso);
	const parts = calendar
		? partsOf(parseIsoDate(dateOrIso), 'UTC', false)
		: partsOf(toInstant(dateOrIso), timeZone, false);
	return `${parts.weekday}, ${parts.month} ${parts.day}, ${parts.year}`;
}

/** "Sun, Mar 8, 2026, 3:00 AM EDT": a stored UTC instant in the shop's zone. */
export function formatShopDateTime(date: Date | string, timeZone: string): string {
	const parts = partsOf(toInstant(date), timeZone, true);
	// Assembled from parts so ICU's choice of (narrow no-break) spaces never leaks out.
	return `${parts.weekday}, ${parts.month} ${parts.day}, ${parts.year}, ${parts.hour}:${parts.minute} ${parts.dayPeriod} ${parts.timeZoneName}`;
}

/** The calendar date it is now in `timeZone`. */
export function todayInZone(timeZone: string, now: Date = new Date()): IsoDate {
	const parts: Parts = {};
	const dayFormat = new Intl.DateTimeFormat('en-US', {
		timeZone,
		year: 'numeric',
		month: '2-digit',
		day: '2-digit'
	});
	for (const part of dayFormat.formatToParts(now)) parts[part.type] = part.value;
	return `${parts.year}-${parts.month}-${parts.day}`;
}

/** The calendar date `days` after (or before, if negative) `isoDate`. */
export function addDays(isoDate: IsoDate, days: number): IsoDate {
	if (!Number.isInteger(days)) throw new RangeError(`days must be whole, got ${days}`);
	return new Date(parseIsoDate(isoDate).getTime() + days * DAY_MS).toISOString().slice(0, 10);
}

/** Whole calendar days from `from` to `to` (negative when `to` is earlier). */
export function daysBetween(from: IsoDate, to: IsoDate): number {
	return Math.round((parseIsoDate(to).getTime() - parseIsoDate(from).getTime()) / DAY_MS);
}

/**
 * "ready within a week", "ready in about 3 weeks". A projection already passed reads
 * "ready any day now": the clutch is still growing, so it is not for sale yet.
 */
export function formatReadyIn(today: IsoDate, saleReadyOn: IsoDate): string {
	const days = daysBetween(today, saleReadyOn);
	if (days <= 0) return 'ready any day now';
	if (days < 7) return 'ready within a week';
	const weeks = Math.round(days / 7);
	return `ready in about ${weeks} ${weeks === 1 ? 'week' : 'weeks'}`;
}
