// The shop settings form: the one shop_setting row in the units an owner thinks in
// (dollars and cents, °F with °C beside, ticked weekdays, a list of dates), checked
// against the CHECK constraints of that table and converted exactly to its columns.
// Pure and safe on the client: the "is this ZIP real" check needs the ZIP dataset,
// so the server module does it (updateShopSetting) and answers with a field error.
import { z } from 'zod';
import { daysBetween, parseIsoDate, type IsoDate } from '$lib/format/dates';
import { formatTemperature } from '$lib/format/temperature';
import type { ShopSetting, SlipPaper } from '$lib/server/db/schema';
import type { ServiceLevel } from './calendar';
import { DEFAULT_SHIP_WEEKDAYS, DEFAULT_THRESHOLDS, type ShipThresholds } from './defaults';

/** The columns the form writes: every column of the row but its key and stamp. */
export type ShopSettingValues = Omit<ShopSetting, 'id' | 'updated_at'>;

export const SETTINGS_LIMITS = {
	shopNameLength: 80,
	// A typo guard (ours): no forecast in the lower 48 states reaches either end.
	thresholdF: { min: -40, max: 130 },
	// Two-day needs the ship day and two days in transit forecast, so 3 days at least;
	// the open daily-forecast source the shop asks gives 16 days at most.
	forecastHorizonDays: { min: 3, max: 16 },
	// Fees: the table allows any cents ≥ 0; $999.99 is our typo guard.
	feeCents: { min: 0, max: 99_999 },
	// These two mirror the table's CHECKs.
	reservationMinutes: { min: 1, max: 240 },
	claimWindowHours: { min: 1, max: 168 },
	// Closures further out than two years are almost surely a mistyped year.
	closedDaysAhead: 731,
	closedDatesCount: 200
} as const;

// ---- weekdays

/** ISO 8601 weekday numbers, 1 = Monday … 7 = Sunday, as the table stores them. */
export const ISO_WEEKDAYS = [
	{ day: 1, short: 'Mon', name: 'Monday' },
	{ day: 2, short: 'Tue', name: 'Tuesday' },
	{ day: 3, short: 'Wed', name: 'Wednesday' },
	{ day: 4, short: 'Thu', name: 'Thursday' },
	{ day: 5, short: 'Fri', name: 'Friday' },
	{ day: 6, short: 'Sat', name: 'Saturday' },
	{ day: 7, short: 'Sun', name: 'Sunday' }
] as const;

/** Each day once, Monday first. */
export function normalizeWeekdays(days: readonly number[]): number[] {
	return [...new Set(days)].sort((a, b) => a - b);
}

function shipWeekdays(service: string) {
	return z
		.array(
			z
				.number({ error: 'Pick days from Monday to Sunday.' })
				.int('Pick days from Monday to Sunday.')
				.min(1, 'Pick days from Monday to Sunday.')
				.max(7, 'Pick days from Monday to Sunday.')
		)
		.overwrite(normalizeWeekdays)
		.min(1, `Tick at least one day the shop hands ${service} boxes to the carrier.`)
		.max(7, 'Pick days from Monday to Sunday.');
}

// ---- weather limits

/** The form names the four limits as the ship check does. */
export type ThresholdField = keyof ShipThresholds;

/** The four limits in the order they must rise, each with its words. */
export const THRESHOLD_FIELDS = [
	{
		field: 'holdBelowF',
		column: 'hold_below_f',
		label: 'Hold when a low is under',
		short: 'the hold-for-cold limit',
		explain:
			'No box leaves while a forecast low anywhere on the route, at the shop or at the buyer, is under this. The order waits for milder days.'
	},
	{
		field: 'heatPackBelowF',
		column: 'heat_pack_below_f',
		label: 'Heat pack when a low is under',
		short: 'the heat-pack limit',
		explain:
			'A heat pack goes in the box when a forecast low on the route is under this. Between this and the hold-for-cold limit at the buyer, the ship check advises pickup at a staffed carrier facility.'
	},
	{
		field: 'coldPackAboveF',
		column: 'cold_pack_above_f',
		label: 'Cold pack when a high is over',
		short: 'the cold-pack limit',
		explain:
			'A cold pack goes in the box when a forecast high on the route is over this. Between this and the hold-for-heat limit at the buyer, the ship check advises pickup at a staffed carrier facility.'
	},
	{
		field: 'holdAboveF',
		column: 'hold_above_f',
		label: 'Hold when a high is over',
		short: 'the hold-for-heat limit',
		explain:
			'No box leaves while a forecast high anywhere on the route is over this. The order waits for cooler days.'
	}
] as const satisfies readonly {
	field: ThresholdField;
	column: keyof ShopSettingValues;
	label: string;
	short: string;
	explain: string;
}[];

export interface FieldProblem<F extends string = string> {
	field: F;
	message: string;
}

/**
 * The limits must rise strictly: hold-for-cold < heat pack < cold pack < hold-for-heat
 * (the table's CHECK). The field out of step with the most others is blamed, then the
 * next, until the rest are in order. Of fields tied for most, the ones changed from
 * `stored` (what is saved now) are blamed; with none changed, or nothing stored, all of
 * them. Each message names the nearest limit it clashes with, in °F with °C beside.
 * Missing values are skipped.
 */
export function thresholdOrderProblems(
	values: Partial<Record<ThresholdField, number | null>>,
	stored?: Partial<Record<ThresholdField, number>>
): FieldProblem<ThresholdField>[] {
	const present = THRESHOLD_FIELDS.map((entry, position) => ({
		...entry,
		position,
		value: values[entry.field]
	})).filter(
		(entry): entry is typeof entry & { value: number } =>
			typeof entry.value === 'number' && Number.isFinite(entry.value)
	);
	type Entry = (typeof present)[number];
	const clash = (a: Entry, b: Entry) =>
		(a.position < b.position && a.value >= b.value) ||
		(a.position > b.position && a.value <= b.value);

	const blamed = new Set<number>();
	for (;;) {
		const standing = present.filter((entry) => !blamed.has(entry.position));
		const counts = standing.map((entry) => ({
			position: entry.position,
			count: standing.filter((other) => clash(entry, other)).length
		}));
		const most = Math.max(0, ...counts.map((c) => c.count));
		if (most === 0) break;
		const tied = standing.filter((_, i) => counts[i]!.count === most);
		const changed = tied.filter((entry) => stored && stored[entry.field] !== entry.value);
		for (const entry of changed.length > 0 ? changed : tied) blamed.add(entry.position);
	}

	return present
		.filter((entry) => blamed.has(entry.position))
		.map((entry) => {
			const clashes = present.filter((other) => clash(entry, other));
			const lower = clashes.filter((other) => other.position < entry.position).at(-1);
			const higher = clashes.find((other) => other.position > entry.position);
			const own = formatTemperature(entry.value);
			const named = (other: Entry) => `${other.short}, ${formatTemperature(other.value)}`;
			let message: string;
			if (lower && higher) {
				message = `${own} must be above ${named(lower)}, and below ${named(higher)}.`;
			} else if (higher) {
				message = `${own} must be below ${named(higher)}.`;
			} else {
				// A clash always has a side; `lower` is set when `higher` is not.
				message = `${own} must be above ${named(lower!)}.`;
			}
			return { field: entry.field, message };
		});
}

// ---- money

const DOLLARS = /^\$?\s*(?<whole>\d{1,3}(?:,\d{3})+|\d+)?(?:\.(?<fraction>\d*))?$/;

export type DollarsParse = { ok: true; cents: number } | { ok: false; problem: string };

/**
 * "12.50", "$12.5", "12", ".99", "1,250.00" → whole cents, exactly: the digits are
 * read as integers, never through a float (0.29 × 100 is 28.999… in binary floating point).
 */
export function parseDollarsToCents(text: string): DollarsParse {
	const typed = text.trim();
	if (typed === '') return { ok: false, problem: 'Enter an amount in dollars, e.g. 12.50.' };
	if (typed.startsWith('-') || typed.startsWith('$-')) {
		return { ok: false, problem: 'A fee cannot be negative; enter 0.00 for free shipping.' };
	}
	const match = DOLLARS.exec(typed);
	const whole = match?.groups?.whole;
	const fraction = match?.groups?.fraction;
	if (!match || (whole === undefined && !fraction)) {
		return { ok: false, problem: 'Write the amount as dollars and cents, e.g. 12.50.' };
	}
	if (fraction !== undefined && fraction.length > 2) {
		return { ok: false, problem: 'Use at most two digits after the point: whole cents.' };
	}
	const dollarDigits = (whole ?? '0').replaceAll(',', '');
	// Beyond 13 digits a dollar amount stops being a safe integer of cents.
	if (dollarDigits.replace(/^0+/, '').length > 13) {
		return { ok: false, problem: 'That amount is far too large.' };
	}
	const cents = Number(dollarDigits) * 100 + Number((fraction ?? '').padEnd(2, '0'));
	return { ok: true, cents };
}

/** 4500 → "45.00": cents as the fee box shows them, without sign or grouping. */
export function centsToDollarText(cents: number): string {
	if (!Number.isSafeInteger(cents) || cents < 0) {
		throw new RangeError(`a fee is whole cents ≥ 0, got ${String(cents)}`);
	}
	return `${Math.floor(cents / 100)}.${String(cents % 100).padStart(2, '0')}`;
}

function fee(service: string) {
	const { min, max } = SETTINGS_LIMITS.feeCents;
	return z
		.string()
		.trim()
		.max(20, 'Write the amount as dollars and cents, e.g. 12.50.')
		.superRefine((text, ctx) => {
			const parsed = parseDollarsToCents(text);
			if (!parsed.ok) ctx.addIssue({ code: 'custom', message: parsed.problem });
			else if (parsed.cents < min || parsed.cents > max)
				ctx.addIssue({
					code: 'custom',
					message: `The ${service} fee must be $0.00 to $${centsToDollarText(max)}.`
				});
		});
}

// ---- closed dates

const ISO_DAY = /^(\d{4})-(\d{1,2})-(\d{1,2})$/;
const US_DAY = /^(\d{1,2})\/(\d{1,2})\/(\d{4})$/;

/** "2026-12-24" or the US "12/24/2026" → '2026-12-24', or null when no such day exists. */
export function readCalendarDate(text: string): IsoDate | null {
	const iso = ISO_DAY.exec(text);
	const us = US_DAY.exec(text);
	const parts = iso ? [iso[1], iso[2], iso[3]] : us ? [us[3], us[1], us[2]] : null;
	if (!parts) return null;
	const [year, month, day] = parts as [string, string, string];
	const date = `${year}-${month.padStart(2, '0')}-${day.padStart(2, '0')}`;
	try {
		parseIsoDate(date);
		return date;
	} catch {
		return null;
	}
}

export type ClosedDatesParse = { dates: IsoDate[]; problems: string[] };

/**
 * The extra closed dates from the text box: one a line (commas and spaces also split),
 * blank lines skipped, each day kept once, earliest first. Each line that is not a real
 * calendar day is named in `problems`.
 */
export function parseClosedDates(text: string): ClosedDatesParse {
	const dates = new Set<IsoDate>();
	const problems: string[] = [];
	for (const piece of text.split(/[\s,;]+/)) {
		if (piece === '') continue;
		const date = readCalendarDate(piece);
		if (date) dates.add(date);
		else if (ISO_DAY.test(piece) || US_DAY.test(piece))
			problems.push(`“${piece}” is not a day of the calendar.`);
		else problems.push(`“${piece}” is not a date: write it as 2026-12-24 or 12/24/2026.`);
	}
	return { dates: [...dates].sort(), problems };
}

/** The stored dates as the text box shows them: from `today` on, one a line. */
export function closedDatesText(dates: readonly IsoDate[], today: IsoDate): string {
	return [...new Set(dates)]
		.filter((date) => date >= today)
		.sort()
		.join('\n');
}

function closedDates(today: IsoDate) {
	const { closedDaysAhead, closedDatesCount } = SETTINGS_LIMITS;
	return (
		z
			.string()
			.max(8_000, 'That is too much text for a list of dates.')
			.superRefine((text, ctx) => {
				const { dates, problems } = parseClosedDates(text);
				for (const date of dates) {
					const ahead = daysBetween(today, date);
					if (ahead < 0)
						problems.push(`${date} is already past: closures only matter from today on.`);
					else if (ahead > closedDaysAhead)
						problems.push(`${date} is more than two years away: check the year.`);
				}
				if (dates.length > closedDatesCount)
					problems.push(`List at most ${closedDatesCount} dates.`);
				for (const message of problems.slice(0, 5)) ctx.addIssue({ code: 'custom', message });
				if (problems.length > 5)
					ctx.addIssue({ code: 'custom', message: `…and ${problems.length - 5} more.` });
			})
			// A list that reads cleanly is written back sorted, one a line; a faulty one stays as typed.
			.overwrite((text) => {
				const { dates, problems } = parseClosedDates(text);
				return problems.length === 0 ? dates.join('\n') : text;
			})
			.default('')
	);
}

// ---- time zone

/** True when Intl knows the IANA zone name (case aside). */
export function isKnownTimeZoneName(timeZone: string): boolean {
	try {
		new Intl.DateTimeFormat('en-US', { timeZone });
		return true;
	} catch {
		return false;
	}
}

/** "america/chicago" → "America/Chicago": Intl's spelling when the two differ only in case. */
export function canonicalTimeZoneCase(timeZone: string): string {
	try {
		const resolved = new Intl.DateTimeFormat('en-US', { timeZone }).resolvedOptions().timeZone;
		return resolved.toLowerCase() === timeZone.toLowerCase() ? resolved : timeZone;
	} catch {
		return timeZone;
	}
}

/** The zones of the fifty states, offered first. */
export const US_TIME_ZONES = [
	{ value: 'America/New_York', label: 'America/New_York — Eastern' },
	{ value: 'America/Chicago', label: 'America/Chicago — Central' },
	{ value: 'America/Denver', label: 'America/Denver — Mountain' },
	{ value: 'America/Phoenix', label: 'America/Phoenix — Arizona (no daylight saving)' },
	{ value: 'America/Los_Angeles', label: 'America/Los_Angeles — Pacific' },
	{ value: 'America/Anchorage', label: 'America/Anchorage — Alaska' },
	{ value: 'Pacific/Honolulu', label: 'Pacific/Honolulu — Hawaii' }
] as const;

/** The choices of the time-zone box: the US zones, then every other zone Intl knows, with `current` kept. */
export function timeZoneOptions(
	known: readonly string[],
	current: string
): { value: string; label: string }[] {
	const first = new Set<string>(US_TIME_ZONES.map((zone) => zone.value));
	const rest = [...new Set([...known, current])]
		.filter((zone) => zone !== '' && !first.has(zone))
		.sort();
	return [...US_TIME_ZONES, ...rest.map((zone) => ({ value: zone, label: zone }))];
}

// ---- packing slips

/** The paper the slips and care cards print on; the label block is 4 × 6 in on either. */
export const SLIP_PAPER_OPTIONS = [
	{ value: 'letter', label: 'US Letter (8.5 × 11 in)' },
	{ value: 'a4', label: 'A4 (210 × 297 mm)' }
] as const satisfies readonly { value: SlipPaper; label: string }[];

// ---- the form

/** A required whole number in a range: one clear message per problem; empty is "required". */
function wholeNumber(opts: { required: string; min: number; max: number; range: string }) {
	return z
		.number({ error: 'Enter a number.' })
		.nullable()
		.superRefine((value, ctx) => {
			if (value === null) ctx.addIssue({ code: 'custom', message: opts.required });
			else if (!Number.isInteger(value))
				ctx.addIssue({ code: 'custom', message: 'Use a whole number.' });
			else if (value < opts.min || value > opts.max)
				ctx.addIssue({ code: 'custom', message: opts.range });
		});
}

function threshold(label: string) {
	const { min, max } = SETTINGS_LIMITS.thresholdF;
	return wholeNumber({
		required: `Enter “${label.toLowerCase()}” in whole °F.`,
		min,
		max,
		range: `Enter ${formatTemperature(min)} to ${formatTemperature(max)}.`
	});
}

const [holdBelow, heatPack, coldPack, holdAbove] = THRESHOLD_FIELDS;

/**
 * The form's schema. `today` (the shop's calendar day) bounds the closed dates; the
 * stored limits, when given, decide which of two clashing limits the error goes beside.
 */
export function settingsFormSchema(
	today: IsoDate,
	storedThresholds?: Partial<Record<ThresholdField, number>>
) {
	const { forecastHorizonDays, reservationMinutes, claimWindowHours, shopNameLength } =
		SETTINGS_LIMITS;
	return z
		.object({
			shopName: z
				.string()
				.trim()
				.overwrite((value) => value.replace(/\s+/g, ' '))
				.min(1, 'Enter the shop’s name, as buyers see it.')
				.max(shopNameLength, `Keep the name under ${shopNameLength} characters.`),
			originZip: z
				.string()
				.trim()
				.regex(/^\d{5}$/, 'Enter the five-digit ZIP code the boxes leave from.'),
			timeZone: z
				.string()
				.trim()
				.min(1, 'Choose the shop’s time zone.')
				.max(64, 'Choose a time zone from the list.')
				.refine(isKnownTimeZoneName, 'Choose a time zone from the list.')
				.overwrite(canonicalTimeZoneCase),
			shipWeekdaysOvernight: shipWeekdays('overnight'),
			shipWeekdaysTwoDay: shipWeekdays('two-day'),
			extraClosedDates: closedDates(today),
			holdBelowF: threshold(holdBelow.label),
			heatPackBelowF: threshold(heatPack.label),
			coldPackAboveF: threshold(coldPack.label),
			holdAboveF: threshold(holdAbove.label),
			forecastHorizonDays: wholeNumber({
				required: 'Enter how many days ahead the ship check looks.',
				...forecastHorizonDays,
				range: `Enter ${forecastHorizonDays.min} to ${forecastHorizonDays.max} days.`
			}),
			feeOvernight: fee('overnight'),
			feeTwoDay: fee('two-day'),
			reservationMinutes: wholeNumber({
				required: 'Enter how long a checkout holds the stock.',
				...reservationMinutes,
				range: `Enter ${reservationMinutes.min} to ${reservationMinutes.max} minutes.`
			}),
			claimWindowHours: wholeNumber({
				required: 'Enter how long after delivery a claim may be filed.',
				...claimWindowHours,
				range: `Enter ${claimWindowHours.min} to ${claimWindowHours.max} hours (a week).`
			}),
			slipPaper: z.enum(['letter', 'a4'], { error: 'Choose US Letter or A4.' }).default('letter')
		})
		.superRefine((form, ctx) => {
			// Zod runs this even when single fields failed, so only values valid on their own count.
			const { min, max } = SETTINGS_LIMITS.thresholdF;
			const valid = (value: number | null) =>
				value !== null && Number.isInteger(value) && value >= min && value <= max ? value : null;
			for (const problem of thresholdOrderProblems(
				{
					holdBelowF: valid(form.holdBelowF),
					heatPackBelowF: valid(form.heatPackBelowF),
					coldPackAboveF: valid(form.coldPackAboveF),
					holdAboveF: valid(form.holdAboveF)
				},
				storedThresholds
			)) {
				ctx.addIssue({ code: 'custom', path: [problem.field], message: problem.message });
			}
		});
}

export type SettingsForm = z.infer<ReturnType<typeof settingsFormSchema>>;
export type SettingsFormField = keyof SettingsForm;

/** Which form field shows a problem with each column. */
export const FIELD_OF_COLUMN = {
	shop_name: 'shopName',
	origin_zip: 'originZip',
	time_zone: 'timeZone',
	ship_weekdays_overnight: 'shipWeekdaysOvernight',
	ship_weekdays_two_day: 'shipWeekdaysTwoDay',
	extra_closed_dates: 'extraClosedDates',
	hold_below_f: 'holdBelowF',
	heat_pack_below_f: 'heatPackBelowF',
	cold_pack_above_f: 'coldPackAboveF',
	hold_above_f: 'holdAboveF',
	forecast_horizon_days: 'forecastHorizonDays',
	fee_overnight_cents: 'feeOvernight',
	fee_two_day_cents: 'feeTwoDay',
	reservation_minutes: 'reservationMinutes',
	claim_window_hours: 'claimWindowHours',
	slip_paper: 'slipPaper'
} as const satisfies Record<keyof ShopSettingValues, SettingsFormField>;

/** The four limits of a stored row, keyed as the form and the ship check name them. */
export function rowThresholds(
	row: Pick<ShopSettingValues, (typeof THRESHOLD_FIELDS)[number]['column']>
): ShipThresholds {
	return {
		holdBelowF: row.hold_below_f,
		heatPackBelowF: row.heat_pack_below_f,
		coldPackAboveF: row.cold_pack_above_f,
		holdAboveF: row.hold_above_f
	};
}

/** The same order problems, for a row of values (the server checks a caller that skipped the form). */
export function rowThresholdProblems(
	values: Pick<ShopSettingValues, (typeof THRESHOLD_FIELDS)[number]['column']>
): FieldProblem<ThresholdField>[] {
	return thresholdOrderProblems(rowThresholds(values));
}

function required(value: number | null, field: SettingsFormField): number {
	if (value === null) throw new TypeError(`${field} is missing: validate the form first`);
	return value;
}

function cents(text: string, field: SettingsFormField): number {
	const parsed = parseDollarsToCents(text);
	if (!parsed.ok) throw new TypeError(`${field}: ${parsed.problem}`);
	return parsed.cents;
}

/** The row to store from a valid form: dollars to cents, the date list parsed and sorted. */
export function settingValuesFromForm(form: SettingsForm): ShopSettingValues {
	return {
		shop_name: form.shopName,
		origin_zip: form.originZip,
		time_zone: form.timeZone,
		ship_weekdays_overnight: normalizeWeekdays(form.shipWeekdaysOvernight),
		ship_weekdays_two_day: normalizeWeekdays(form.shipWeekdaysTwoDay),
		extra_closed_dates: parseClosedDates(form.extraClosedDates).dates,
		hold_below_f: required(form.holdBelowF, 'holdBelowF'),
		heat_pack_below_f: required(form.heatPackBelowF, 'heatPackBelowF'),
		cold_pack_above_f: required(form.coldPackAboveF, 'coldPackAboveF'),
		hold_above_f: required(form.holdAboveF, 'holdAboveF'),
		forecast_horizon_days: required(form.forecastHorizonDays, 'forecastHorizonDays'),
		fee_overnight_cents: cents(form.feeOvernight, 'feeOvernight'),
		fee_two_day_cents: cents(form.feeTwoDay, 'feeTwoDay'),
		reservation_minutes: required(form.reservationMinutes, 'reservationMinutes'),
		claim_window_hours: required(form.claimWindowHours, 'claimWindowHours'),
		slip_paper: form.slipPaper
	};
}

/** The form's starting values from the stored row; closures already past are left out. */
export function settingsFormFromRow(row: ShopSettingValues, today: IsoDate): SettingsForm {
	return {
		shopName: row.shop_name,
		originZip: row.origin_zip,
		timeZone: row.time_zone,
		shipWeekdaysOvernight: normalizeWeekdays(row.ship_weekdays_overnight),
		shipWeekdaysTwoDay: normalizeWeekdays(row.ship_weekdays_two_day),
		extraClosedDates: closedDatesText(row.extra_closed_dates, today),
		holdBelowF: row.hold_below_f,
		heatPackBelowF: row.heat_pack_below_f,
		coldPackAboveF: row.cold_pack_above_f,
		holdAboveF: row.hold_above_f,
		forecastHorizonDays: row.forecast_horizon_days,
		feeOvernight: centsToDollarText(row.fee_overnight_cents),
		feeTwoDay: centsToDollarText(row.fee_two_day_cents),
		reservationMinutes: row.reservation_minutes,
		claimWindowHours: row.claim_window_hours,
		slipPaper: row.slip_paper
	};
}

/** The columns "Put back the defaults" resets: the four limits and both services' weekdays. */
export function shippingDefaults(): Pick<
	ShopSettingValues,
	| 'hold_below_f'
	| 'heat_pack_below_f'
	| 'cold_pack_above_f'
	| 'hold_above_f'
	| 'ship_weekdays_overnight'
	| 'ship_weekdays_two_day'
> {
	const values = Object.fromEntries(
		THRESHOLD_FIELDS.map((entry) => [entry.column, DEFAULT_THRESHOLDS[entry.field]])
	) as Record<(typeof THRESHOLD_FIELDS)[number]['column'], number>;
	return {
		...values,
		ship_weekdays_overnight: [...DEFAULT_SHIP_WEEKDAYS.overnight],
		ship_weekdays_two_day: [...DEFAULT_SHIP_WEEKDAYS.two_day]
	};
}

/**
 * A form for a shop with no settings row yet: the shipping defaults, and for the rest
 * the column defaults of shop_setting (migration 2026-12-01T2200), which a new row gets.
 */
export function newSettingsForm(timeZone: string): SettingsForm {
	return settingsFormFromRow(
		{
			shop_name: '',
			origin_zip: '',
			time_zone: timeZone,
			extra_closed_dates: [],
			...shippingDefaults(),
			forecast_horizon_days: 10,
			fee_overnight_cents: 4500,
			fee_two_day_cents: 2800,
			reservation_minutes: 15,
			claim_window_hours: 2,
			slip_paper: 'letter'
		},
		'0000-01-01'
	);
}

/** "Put back the defaults" posts nothing but itself. */
export const restoreDefaultsSchema = z.object({});

/** Column → its value before and after, as the audit entry records them. */
export type SettingChanges = Partial<
	Record<keyof ShopSettingValues, { from: unknown; to: unknown }>
>;

function sameValue(a: unknown, b: unknown): boolean {
	if (Array.isArray(a) && Array.isArray(b)) {
		// Weekdays and dates are sets: the order they were stored in carries no meaning.
		const sort = (list: unknown[]) => [...list].map(String).sort();
		const [x, y] = [sort(a), sort(b)];
		return x.length === y.length && x.every((item, i) => item === y[i]);
	}
	return a === b;
}

/** The columns whose values differ, each with before and after, for the audit entry. */
export function settingChanges(
	before: ShopSettingValues,
	after: Partial<ShopSettingValues>
): SettingChanges {
	const changes: SettingChanges = {};
	for (const key of Object.keys(after) as Array<keyof ShopSettingValues>) {
		if (!(key in FIELD_OF_COLUMN)) continue;
		if (!sameValue(before[key], after[key])) changes[key] = { from: before[key], to: after[key] };
	}
	return changes;
}

/** The default weekdays of a service, as words for the form's hints. */
export function defaultWeekdayNames(service: ServiceLevel): string {
	return DEFAULT_SHIP_WEEKDAYS[service].map((day) => ISO_WEEKDAYS[day - 1]!.short).join(', ');
}
