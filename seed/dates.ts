// Calendar arithmetic on 'YYYY-MM-DD' strings for laying the demo out around one day.
// Pure: no clock, no I/O. Dates are whole days, so all maths runs in UTC where no
// daylight-saving shift can move a day.

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const DAY_MS = 86_400_000;

function toUtcMs(date: string): number {
	const match = ISO_DATE.exec(date);
	if (!match) throw new RangeError(`not a YYYY-MM-DD date: ${JSON.stringify(date)}`);
	const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
	const ms = Date.UTC(year, month - 1, day);
	// Date.UTC rolls 2026-02-31 over into March; a real date must survive the round trip.
	if (fromUtcMs(ms) !== date) throw new RangeError(`no such calendar day: ${date}`);
	return ms;
}

function fromUtcMs(ms: number): string {
	return new Date(ms).toISOString().slice(0, 10);
}

/** Throws unless `date` is a real calendar day written as YYYY-MM-DD. */
export function assertIsoDate(date: string): string {
	toUtcMs(date);
	return date;
}

/** The day `days` after `date` (negative goes back). */
export function addDays(date: string, days: number): string {
	if (!Number.isInteger(days)) throw new RangeError(`whole days only, got ${days}`);
	return fromUtcMs(toUtcMs(date) + days * DAY_MS);
}

/** Whole days from `from` to `to` (positive when `to` is later). */
export function daysBetween(from: string, to: string): number {
	return Math.round((toUtcMs(to) - toUtcMs(from)) / DAY_MS);
}

/** ISO weekday: 1 = Monday … 7 = Sunday, the numbering shop_setting's ship weekdays use. */
export function isoWeekday(date: string): number {
	const day = new Date(toUtcMs(date)).getUTCDay();
	return day === 0 ? 7 : day;
}

function checkWeekdays(weekdays: readonly number[]): void {
	if (!weekdays.some((d) => Number.isInteger(d) && d >= 1 && d <= 7)) {
		throw new RangeError(`no usable weekday in [${weekdays.join(', ')}]`);
	}
}

/** The first day on or after `date` that falls on one of `weekdays` (ISO numbering). */
export function weekdayOnOrAfter(date: string, weekdays: readonly number[]): string {
	checkWeekdays(weekdays);
	let day = date;
	while (!weekdays.includes(isoWeekday(day))) day = addDays(day, 1);
	return day;
}

/** The last day on or before `date` that falls on one of `weekdays` (ISO numbering). */
export function weekdayOnOrBefore(date: string, weekdays: readonly number[]): string {
	checkWeekdays(weekdays);
	let day = date;
	while (!weekdays.includes(isoWeekday(day))) day = addDays(day, -1);
	return day;
}

/** A UTC instant on `date` as an ISO string, e.g. instantOn('2026-12-01', '15:00') → '2026-12-01T15:00:00Z'. */
export function instantOn(date: string, time: string): string {
	assertIsoDate(date);
	if (!/^([01]\d|2[0-3]):[0-5]\d$/.test(time)) throw new RangeError(`not an HH:MM time: ${time}`);
	return `${date}T${time}:00Z`;
}

/** The calendar day an instant falls on in `timeZone` (e.g. the shop's America/New_York). */
export function dateInTimeZone(instant: Date, timeZone: string): string {
	// en-CA formats as YYYY-MM-DD, so no part-by-part assembly is needed.
	return new Intl.DateTimeFormat('en-CA', {
		timeZone,
		year: 'numeric',
		month: '2-digit',
		day: '2-digit'
	}).format(instant);
}
