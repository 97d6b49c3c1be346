// Where the benchmark's generated buyers live and the weather their boxes meet: the 50
// states and DC weighted by population, and a daily forecast per state drawn from its
// climate normals plus a seeded run of warm and cold spells. Pure: no clock, no I/O;
// the same dates give the same forecasts on every run.
import type { DailyForecast } from '../src/lib/shipping/ship-check';
import { addDays, daysBetween } from './dates';
import { mulberry32, seedFromText } from './random';

/** One state's share of buyers and the normals of one of its large cities, in °F. */
export interface StateClimate {
	/** USPS code. */
	state: string;
	/** Residents in millions: how often the state is the destination. */
	populationM: number;
	janLowF: number;
	janHighF: number;
	julLowF: number;
	julHighF: number;
}

// From memory, approximate: 2020 census populations (millions) and the 1991–2020 normal
// January and July daily low and high of one large city per state. Good enough to send
// heat packs north in winter and hold boxes for southern heat in summer; not a climate record.
// prettier-ignore
export const STATE_CLIMATES: readonly StateClimate[] = [
	{ state: 'AL', populationM: 5.0, janLowF: 34, janHighF: 54, julLowF: 72, julHighF: 91 }, // Birmingham
	{ state: 'AK', populationM: 0.7, janLowF: 11, janHighF: 23, julLowF: 52, julHighF: 66 }, // Anchorage
	{ state: 'AZ', populationM: 7.2, janLowF: 45, janHighF: 67, julLowF: 83, julHighF: 106 }, // Phoenix
	{ state: 'AR', populationM: 3.0, janLowF: 31, janHighF: 51, julLowF: 73, julHighF: 93 }, // Little Rock
	{ state: 'CA', populationM: 39.5, janLowF: 48, janHighF: 68, julLowF: 63, julHighF: 84 }, // Los Angeles
	{ state: 'CO', populationM: 5.8, janLowF: 18, janHighF: 45, julLowF: 59, julHighF: 90 }, // Denver
	{ state: 'CT', populationM: 3.6, janLowF: 17, janHighF: 35, julLowF: 63, julHighF: 85 }, // Hartford
	{ state: 'DE', populationM: 1.0, janLowF: 24, janHighF: 41, julLowF: 67, julHighF: 87 }, // Wilmington
	{ state: 'DC', populationM: 0.7, janLowF: 29, janHighF: 44, julLowF: 71, julHighF: 89 }, // Washington
	{ state: 'FL', populationM: 21.5, janLowF: 50, janHighF: 71, julLowF: 74, julHighF: 92 }, // Orlando
	{ state: 'GA', populationM: 10.7, janLowF: 34, janHighF: 53, julLowF: 72, julHighF: 90 }, // Atlanta
	{ state: 'HI', populationM: 1.5, janLowF: 66, janHighF: 80, julLowF: 74, julHighF: 88 }, // Honolulu
	{ state: 'ID', populationM: 1.8, janLowF: 24, janHighF: 38, julLowF: 59, julHighF: 92 }, // Boise
	{ state: 'IL', populationM: 12.8, janLowF: 18, janHighF: 32, julLowF: 67, julHighF: 84 }, // Chicago
	{ state: 'IN', populationM: 6.8, janLowF: 20, janHighF: 36, julLowF: 66, julHighF: 85 }, // Indianapolis
	{ state: 'IA', populationM: 3.2, janLowF: 14, janHighF: 31, julLowF: 67, julHighF: 86 }, // Des Moines
	{ state: 'KS', populationM: 2.9, janLowF: 22, janHighF: 42, julLowF: 71, julHighF: 93 }, // Wichita
	{ state: 'KY', populationM: 4.5, janLowF: 25, janHighF: 43, julLowF: 70, julHighF: 89 }, // Louisville
	{ state: 'LA', populationM: 4.7, janLowF: 45, janHighF: 62, julLowF: 76, julHighF: 91 }, // New Orleans
	{ state: 'ME', populationM: 1.4, janLowF: 13, janHighF: 31, julLowF: 60, julHighF: 79 }, // Portland
	{ state: 'MD', populationM: 6.2, janLowF: 25, janHighF: 42, julLowF: 68, julHighF: 88 }, // Baltimore
	{ state: 'MA', populationM: 7.0, janLowF: 23, janHighF: 37, julLowF: 66, julHighF: 82 }, // Boston
	{ state: 'MI', populationM: 10.1, janLowF: 19, janHighF: 32, julLowF: 64, julHighF: 84 }, // Detroit
	{ state: 'MN', populationM: 5.7, janLowF: 6, janHighF: 23, julLowF: 64, julHighF: 84 }, // Minneapolis
	{ state: 'MS', populationM: 3.0, janLowF: 36, janHighF: 56, julLowF: 72, julHighF: 92 }, // Jackson
	{ state: 'MO', populationM: 6.2, janLowF: 23, janHighF: 40, julLowF: 71, julHighF: 90 }, // St. Louis
	{ state: 'MT', populationM: 1.1, janLowF: 17, janHighF: 35, julLowF: 57, julHighF: 88 }, // Billings
	{ state: 'NE', populationM: 2.0, janLowF: 14, janHighF: 33, julLowF: 68, julHighF: 88 }, // Omaha
	{ state: 'NV', populationM: 3.1, janLowF: 38, janHighF: 58, julLowF: 81, julHighF: 105 }, // Las Vegas
	{ state: 'NH', populationM: 1.4, janLowF: 11, janHighF: 31, julLowF: 57, julHighF: 83 }, // Concord
	{ state: 'NJ', populationM: 9.3, janLowF: 25, janHighF: 40, julLowF: 70, julHighF: 88 }, // Newark
	{ state: 'NM', populationM: 2.1, janLowF: 26, janHighF: 48, julLowF: 66, julHighF: 92 }, // Albuquerque
	{ state: 'NY', populationM: 20.2, janLowF: 28, janHighF: 39, julLowF: 70, julHighF: 85 }, // New York
	{ state: 'NC', populationM: 10.4, janLowF: 31, janHighF: 51, julLowF: 70, julHighF: 90 }, // Charlotte
	{ state: 'ND', populationM: 0.8, janLowF: 1, janHighF: 22, julLowF: 56, julHighF: 85 }, // Bismarck
	{ state: 'OH', populationM: 11.8, janLowF: 21, janHighF: 36, julLowF: 65, julHighF: 85 }, // Columbus
	{ state: 'OK', populationM: 4.0, janLowF: 28, janHighF: 48, julLowF: 72, julHighF: 94 }, // Oklahoma City
	{ state: 'OR', populationM: 4.2, janLowF: 36, janHighF: 47, julLowF: 57, julHighF: 82 }, // Portland
	{ state: 'PA', populationM: 13.0, janLowF: 26, janHighF: 41, julLowF: 70, julHighF: 88 }, // Philadelphia
	{ state: 'RI', populationM: 1.1, janLowF: 20, janHighF: 37, julLowF: 64, julHighF: 83 }, // Providence
	{ state: 'SC', populationM: 5.1, janLowF: 34, janHighF: 56, julLowF: 72, julHighF: 93 }, // Columbia
	{ state: 'SD', populationM: 0.9, janLowF: 6, janHighF: 26, julLowF: 63, julHighF: 86 }, // Sioux Falls
	{ state: 'TN', populationM: 6.9, janLowF: 29, janHighF: 48, julLowF: 70, julHighF: 90 }, // Nashville
	{ state: 'TX', populationM: 29.1, janLowF: 37, janHighF: 57, julLowF: 76, julHighF: 96 }, // Dallas
	{ state: 'UT', populationM: 3.3, janLowF: 22, janHighF: 38, julLowF: 64, julHighF: 93 }, // Salt Lake City
	{ state: 'VT', populationM: 0.6, janLowF: 10, janHighF: 27, julLowF: 60, julHighF: 82 }, // Burlington
	{ state: 'VA', populationM: 8.6, janLowF: 28, janHighF: 48, julLowF: 69, julHighF: 90 }, // Richmond
	{ state: 'WA', populationM: 7.7, janLowF: 37, janHighF: 48, julLowF: 56, julHighF: 77 }, // Seattle
	{ state: 'WV', populationM: 1.8, janLowF: 25, janHighF: 43, julLowF: 64, julHighF: 86 }, // Charleston
	{ state: 'WI', populationM: 5.9, janLowF: 15, janHighF: 30, julLowF: 64, julHighF: 80 }, // Milwaukee
	{ state: 'WY', populationM: 0.6, janLowF: 17, janHighF: 38, julLowF: 55, julHighF: 84 } // Cheyenne
];

const CLIMATE_BY_STATE = new Map(STATE_CLIMATES.map((c) => [c.state, c]));

export function stateClimate(state: string): StateClimate {
	const climate = CLIMATE_BY_STATE.get(state);
	if (!climate) throw new RangeError(`no climate for state ${state}`);
	return climate;
}

const MID_JANUARY_DOY = 15;
const YEAR_DAYS = 365.25;

/** Day of the year, 1 = 1 January, of a 'YYYY-MM-DD' date. */
export function dayOfYear(date: string): number {
	return daysBetween(`${date.slice(0, 4)}-01-01`, date) + 1;
}

/**
 * How far into summer a date is: 0 in mid-January, 1 in mid-July, on a cosine, the
 * usual shape of the northern-hemisphere year.
 */
export function summerShare(date: string): number {
	const angle = (2 * Math.PI * (dayOfYear(date) - MID_JANUARY_DOY)) / YEAR_DAYS;
	return (1 - Math.cos(angle)) / 2;
}

/** The normal low and high of a state on a date, between its January and July normals. */
export function normalOn(state: string, date: string): { lowF: number; highF: number } {
	const c = stateClimate(state);
	const s = summerShare(date);
	return {
		lowF: c.janLowF + (c.julLowF - c.janLowF) * s,
		highF: c.janHighF + (c.julHighF - c.janHighF) * s
	};
}

/** Spells last days, not hours: each day keeps this much of yesterday's departure. */
const SPELL_PERSISTENCE = 0.75;
/** The spread of a day's departure from normal, °F (winter spells swing wider). */
const SPREAD_WINTER_F = 7;
const SPREAD_SUMMER_F = 5;

/** A standard normal draw from two uniforms (Box–Muller). */
function gaussian(next: () => number): number {
	const u = Math.max(next(), 1e-12);
	return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * next());
}

/**
 * Daily forecasts for every state from `firstDay` for `days` days: normal plus a
 * departure that drifts from day to day, so cold snaps and heat waves last several days
 * and every box to one state on one day sees the same weather. Each state's run is
 * worked out once, on first use; lists handed out share its day objects.
 */
export class BenchWeather {
	readonly #dates: string[] = [];
	readonly #indexOf = new Map<string, number>();
	readonly #summer: Float64Array;
	readonly #byState = new Map<string, readonly DailyForecast[]>();

	constructor(firstDay: string, days: number) {
		this.#summer = new Float64Array(days);
		for (let i = 0; i < days; i++) {
			const date = addDays(firstDay, i);
			this.#dates.push(date);
			this.#indexOf.set(date, i);
			this.#summer[i] = summerShare(date);
		}
	}

	#run(state: string): readonly DailyForecast[] {
		const cached = this.#byState.get(state);
		if (cached) return cached;
		const c = stateClimate(state);
		const next = mulberry32(seedFromText(`hatchlot-bench-weather:${state}`));
		const run: DailyForecast[] = [];
		let departure = 0;
		this.#dates.forEach((date, i) => {
			const s = this.#summer[i] ?? 0;
			// The stationary spread of this AR(1) walk is the day's spread, whatever the persistence.
			const spread = SPREAD_WINTER_F + (SPREAD_SUMMER_F - SPREAD_WINTER_F) * s;
			departure =
				SPELL_PERSISTENCE * departure +
				Math.sqrt(1 - SPELL_PERSISTENCE ** 2) * spread * gaussian(next);
			run.push({
				date,
				lowF: Math.round(c.janLowF + (c.julLowF - c.janLowF) * s + departure),
				highF: Math.round(c.janHighF + (c.julHighF - c.janHighF) * s + departure)
			});
		});
		this.#byState.set(state, run);
		return run;
	}

	#index(date: string): number {
		const index = this.#indexOf.get(date);
		if (index === undefined)
			throw new RangeError(`${date} is outside the weather's ${this.#dates.length} days`);
		return index;
	}

	/** The forecast low and high (whole °F) of `state` on `date`. */
	forecast(state: string, date: string): DailyForecast {
		return this.#run(state)[this.#index(date)] as DailyForecast;
	}

	/** `days` consecutive forecasts from `from`, the list a ship check is given. */
	forecasts(state: string, from: string, days: number): DailyForecast[] {
		const start = this.#index(from);
		if (start + days > this.#dates.length)
			throw new RangeError(`${days} days from ${from} run past the weather's last day`);
		return this.#run(state).slice(start, start + days);
	}
}
