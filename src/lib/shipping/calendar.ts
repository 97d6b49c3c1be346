// The carrier's calendar for live shipments: which days a box can be handed over,
// travel and be delivered. Pure: dates are 'YYYY-MM-DD' strings, weekdays are read
// in UTC from the string itself, so no local-time shift can move a day.
import Holidays from 'date-holidays';
import { addDays, parseIsoDate, type IsoDate } from '$lib/format/dates';

/** Carrier service level: overnight = 1 business day in transit, two-day = 2. */
export type ServiceLevel = 'overnight' | 'two_day';

/** Calendar days a box spends in transit, each of which must be a business day. */
export const TRANSIT_DAYS: Readonly<Record<ServiceLevel, number>> = Object.freeze({
	overnight: 1,
	two_day: 2
});

/** A US federal holiday of one year: its legal date and the date it is observed. */
export type FederalHoliday = {
	readonly name: string;
	/** The day offices and carriers close (a Saturday holiday moves to Friday, a Sunday one to Monday). */
	readonly observedDate: IsoDate;
	/** The legal date, which may fall on a weekend. */
	readonly date: IsoDate;
};

/** ISO 8601 weekday of a calendar date: 1 = Monday … 7 = Sunday. */
export function isoWeekday(date: IsoDate): number {
	const utcDay = parseIsoDate(date).getUTCDay(); // 0 = Sunday
	return utcDay === 0 ? 7 : utcDay;
}

export function isWeekend(date: IsoDate): boolean {
	return isoWeekday(date) >= 6;
}

// One reader of the library's US data, built on first use (it parses every rule once).
let usHolidays: Holidays | undefined;
function holidayLibrary(): Holidays {
	usHolidays ??= new Holidays('US');
	return usHolidays;
}

// Pure memoization: the same year always yields the same list, so caching per year
// at module level changes no result, it only spares re-parsing the library's rules.
const holidaysByYear = new Map<number, readonly FederalHoliday[]>();
const closedDatesByYear = new Map<number, ReadonlySet<IsoDate>>();

/**
 * The federal holidays of `year` (11 since Juneteenth became one in 2021), each with
 * its observed date, from the date-holidays package's US data.
 *
 * Federal holidays are the library's nationwide 'public' holidays. Their observed
 * dates are the library's substitute days, whatever type it files them under: it
 * lists Veterans Day's substitute as 'bank' ("Federal Government offices are
 * closed"), so a filter on 'public' alone would miss Fri 2028-11-10. The substitute
 * of a Saturday New Year's Day falls on Dec 31 of the year before.
 */
export function federalHolidays(year: number): readonly FederalHoliday[] {
	if (!Number.isInteger(year)) throw new RangeError(`year must be whole, got ${year}`);
	const cached = holidaysByYear.get(year);
	if (cached) return cached;

	const library = holidayLibrary();
	// English names so a substitute ("Christmas Day (substitute day)") pairs with its holiday.
	const entries = [...library.getHolidays(year - 1, 'en'), ...library.getHolidays(year, 'en')];
	const dayOf = (libraryDate: string): IsoDate => libraryDate.slice(0, 10); // "YYYY-MM-DD hh:mm:ss"
	const substitutes = entries.filter((entry) => entry.substitute === true);

	const holidays = entries
		.filter(
			(entry) =>
				entry.type === 'public' &&
				entry.substitute !== true &&
				dayOf(entry.date).startsWith(`${year}-`)
		)
		.map((entry): FederalHoliday => {
			const date = dayOf(entry.date);
			// A substitute within three days of the legal date, named after it, is its observed day.
			const substitute = substitutes.find((candidate) => {
				const gap = Math.abs(
					parseIsoDate(dayOf(candidate.date)).getTime() - parseIsoDate(date).getTime()
				);
				return candidate.name.startsWith(entry.name) && gap <= 3 * 86_400_000;
			});
			return Object.freeze({
				name: entry.name,
				date,
				observedDate: substitute ? dayOf(substitute.date) : date
			});
		});

	const frozen = Object.freeze(holidays);
	holidaysByYear.set(year, frozen);
	return frozen;
}

/** Every observed federal holiday that falls in calendar year `year` (Dec 31 may belong to next year's list). */
export function observedHolidayDates(year: number): ReadonlySet<IsoDate> {
	const cached = closedDatesByYear.get(year);
	if (cached) return cached;
	const dates = new Set<IsoDate>();
	for (const holiday of [...federalHolidays(year), ...federalHolidays(year + 1)]) {
		if (holiday.observedDate.startsWith(`${year}-`)) dates.add(holiday.observedDate);
	}
	closedDatesByYear.set(year, dates);
	return dates;
}

/** The observed federal holiday on `date`, if any. */
export function federalHolidayOn(date: IsoDate): FederalHoliday | undefined {
	const year = parseIsoDate(date).getUTCFullYear();
	return [...federalHolidays(year), ...federalHolidays(year + 1)].find(
		(holiday) => holiday.observedDate === date
	);
}

/**
 * A carrier business day: Monday to Friday, not an observed US federal holiday,
 * and not one of the shop's own extra closed dates.
 */
export function isBusinessDay(date: IsoDate, extraClosedDates: readonly IsoDate[] = []): boolean {
	if (isWeekend(date)) return false;
	if (observedHolidayDates(parseIsoDate(date).getUTCFullYear()).has(date)) return false;
	return !extraClosedDates.includes(date);
}

/**
 * The delivery date of a box handed over on `shipDate`, or null when that day cannot
 * be a ship date (the shop's ship weekdays aside): the ship date and each of the next
 * N calendar days (N = 1 overnight, 2 two-day) must be business days, so a box never
 * sits in a depot over a weekend or a holiday.
 */
export function deliveryDateFor(
	shipDate: IsoDate,
	service: ServiceLevel,
	extraClosedDates: readonly IsoDate[] = []
): IsoDate | null {
	if (!isBusinessDay(shipDate, extraClosedDates)) return null;
	const transitDays = TRANSIT_DAYS[service];
	for (let day = 1; day <= transitDays; day++) {
		if (!isBusinessDay(addDays(shipDate, day), extraClosedDates)) return null;
	}
	return addDays(shipDate, transitDays);
}
