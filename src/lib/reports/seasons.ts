// Meteorological seasons, northern hemisphere: whole months, three to a season, winter
// from December to February. The tub-yield report groups tubs by the season they were set
// aside in; SQL gets the seasons of a range as a list from here, so the rule lives once.
import { parseIsoDate, type IsoDate } from '$lib/format/dates';

export type SeasonName = 'winter' | 'spring' | 'summer' | 'autumn';

export interface Season {
	name: SeasonName;
	/** The season's first day: 1 December, 1 March, 1 June or 1 September. */
	start: IsoDate;
	/** The next season's first day: the season ends the day before (exclusive end). */
	next: IsoDate;
	/** "Winter 2025–26" (it spans the new year), "Spring 2026". */
	label: string;
}

const NAMES: Record<number, SeasonName> = { 12: 'winter', 3: 'spring', 6: 'summer', 9: 'autumn' };
const TITLES: Record<SeasonName, string> = {
	winter: 'Winter',
	spring: 'Spring',
	summer: 'Summer',
	autumn: 'Autumn'
};

function firstOfMonth(year: number, month: number): IsoDate {
	return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-01`;
}

/** The season starting in `month` (12, 3, 6 or 9) of `year`. */
function seasonStartingIn(year: number, month: number): Season {
	const name = NAMES[month];
	if (!name) throw new RangeError(`no season starts in month ${month}`);
	const nextMonth = month === 12 ? 3 : month + 3;
	const nextYear = month === 12 ? year + 1 : year;
	return {
		name,
		start: firstOfMonth(year, month),
		next: firstOfMonth(nextYear, nextMonth),
		label: name === 'winter' ? `Winter ${winterYears(year)}` : `${TITLES[name]} ${year}`
	};
}

/** "2025–26"; a winter across a century reads in full, "1999–2000". */
function winterYears(startYear: number): string {
	const end = startYear + 1;
	const sameCentury = Math.floor(startYear / 100) === Math.floor(end / 100);
	return `${startYear}–${sameCentury ? String(end % 100).padStart(2, '0') : end}`;
}

/** The season a calendar day falls in; January and February belong to the winter begun in December. */
export function seasonOf(isoDate: IsoDate): Season {
	const date = parseIsoDate(isoDate);
	const year = date.getUTCFullYear();
	const month = date.getUTCMonth() + 1;
	if (month === 12) return seasonStartingIn(year, 12);
	if (month <= 2) return seasonStartingIn(year - 1, 12);
	return seasonStartingIn(year, month - ((month - 3) % 3));
}

/** Every season from the one holding `from` to the one holding `to`, in order. */
export function seasonsBetween(from: IsoDate, to: IsoDate): Season[] {
	const last = seasonOf(to);
	const seasons: Season[] = [];
	for (let season = seasonOf(from); season.start <= last.start; season = seasonOf(season.next))
		seasons.push(season);
	return seasons;
}
