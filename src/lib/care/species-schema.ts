// The species form: names, the care profile and its schedule defaults, in the units a
// keeper thinks in (weeks or days, mm or inches), checked against the limits the
// species table enforces and converted exactly to the stored columns.
import { z } from 'zod';
import { formatTemperature } from '$lib/format/temperature';
import type { AnimalGroup, MoistureLevel, Species } from '$lib/server/db/schema';

export const ANIMAL_GROUPS = [
	'millipede',
	'isopod',
	'springtail',
	'beetle',
	'roach'
] as const satisfies readonly AnimalGroup[];
export const MOISTURE_LEVELS = [
	'drier',
	'moist',
	'humid'
] as const satisfies readonly MoistureLevel[];

/** The species table's CHECK limits, plus a sanity band for temperatures (ours). */
export const SPECIES_LIMITS = {
	// Kept indoors: nothing this shop keeps lives below 40 °F or above 100 °F (our bound).
	temperatureF: { min: 40, max: 100 },
	adultLengthMm: { min: 1, max: 999 },
	growOutWeeks: { min: 1, max: 260 },
	// Half the substrate every 3–6 months (common practice, PRODUCT.md): 90 to 184 days.
	refreshIntervalDays: { min: 90, max: 184 },
	// Old substrate held 4–8 weeks (common practice, PRODUCT.md): 28 to 56 days.
	tubHoldDays: { min: 28, max: 56 },
	moltQuietDays: { min: 7, max: 90 }
} as const;

export const SLUG_PATTERN = /^[a-z0-9]+(-[a-z0-9]+)*$/;
export const SLUG_MAX = 80;

export const PERIOD_UNITS = ['days', 'weeks'] as const;
export type PeriodUnit = (typeof PERIOD_UNITS)[number];
export const LENGTH_UNITS = ['mm', 'in'] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];

/** 1 in = 25.4 mm exactly (international inch of 1959; NIST SP 811 appendix B). */
export const MM_PER_INCH = 25.4;

export const TEMPERATURE_FIELDS = [
	{ field: 'tempLowF', word: 'low' },
	{ field: 'tempIdealLowF', word: 'ideal low' },
	{ field: 'tempIdealHighF', word: 'ideal high' },
	{ field: 'tempHighF', word: 'high' }
] as const;
export type TemperatureField = (typeof TEMPERATURE_FIELDS)[number]['field'];

/** A required whole number in a range: one clear message per problem, empty is "required". */
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

/** A required amount whose range depends on its unit; the object checks the range. */
function amount(required: string) {
	return z
		.number({ error: 'Enter a number.' })
		.nullable()
		.superRefine((value, ctx) => {
			if (value === null) ctx.addIssue({ code: 'custom', message: required });
			else if (value <= 0) ctx.addIssue({ code: 'custom', message: 'It must be more than 0.' });
		});
}

function temperature(word: string) {
	const { min, max } = SPECIES_LIMITS.temperatureF;
	return wholeNumber({
		required: `Enter the ${word} in whole °F.`,
		min,
		max,
		range: `Enter ${min} to ${max} °F; the shop keeps nothing outside that band.`
	});
}

function notes(max: number) {
	return z
		.string()
		.trim()
		.max(max, `Keep it under ${max.toLocaleString('en-US')} characters.`)
		.default('');
}

/** Lower-case words joined by hyphens: "Narceus americanus" → "narceus-americanus". */
export function slugFromScientificName(scientificName: string): string {
	return scientificName
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '')
		.slice(0, SLUG_MAX)
		.replace(/-+$/, '');
}

/** Where each temperature sits between the others, as a sentence with °F and °C. */
function boundText(word: string, fahrenheit: number): string {
	return `the ${word}, ${formatTemperature(fahrenheit)}`;
}

export interface FieldProblem<F extends string = string> {
	field: F;
	message: string;
}

/**
 * The four temperatures must read low ≤ ideal low ≤ ideal high ≤ high. Each problem is
 * put on the field that breaks the order: the one out of step with most of the others
 * (on a tie, the later field, usually the one typed last). Missing values are skipped.
 */
export function temperatureOrderProblems(
	values: Partial<Record<TemperatureField, number | null>>
): FieldProblem<TemperatureField>[] {
	const present = TEMPERATURE_FIELDS.map((entry, position) => ({
		...entry,
		position,
		value: values[entry.field]
	})).filter(
		(entry): entry is typeof entry & { value: number } =>
			typeof entry.value === 'number' && Number.isFinite(entry.value)
	);
	const blamed = new Set<number>();
	const outOfStep = (a: (typeof present)[number], b: (typeof present)[number]) =>
		(a.position < b.position && a.value > b.value) ||
		(a.position > b.position && a.value < b.value);
	for (;;) {
		const standing = present.filter((entry) => !blamed.has(entry.position));
		let worst: { position: number; count: number } | null = null;
		for (const entry of standing) {
			const count = standing.filter((other) => outOfStep(entry, other)).length;
			if (count > 0 && (!worst || count >= worst.count))
				worst = { position: entry.position, count };
		}
		if (!worst) break;
		blamed.add(worst.position);
	}
	const standing = present.filter((entry) => !blamed.has(entry.position));
	return present
		.filter((entry) => blamed.has(entry.position))
		.map((entry) => {
			const below = standing.filter((other) => other.position < entry.position).at(-1);
			const above = standing.find((other) => other.position > entry.position);
			const name = entry.word[0]!.toUpperCase() + entry.word.slice(1);
			let message: string;
			if (below && above) {
				message = `${name} must lie between ${boundText(below.word, below.value)}, and ${boundText(above.word, above.value)}.`;
			} else if (below) {
				message = `${name} cannot be below ${boundText(below.word, below.value)}.`;
			} else if (above) {
				message = `${name} cannot be above ${boundText(above.word, above.value)}.`;
			} else {
				message = 'Put the temperatures in order: low, ideal low, ideal high, high.';
			}
			return { field: entry.field, message };
		});
}

/** A period in days from what was typed: weeks are exactly 7 days. */
export function periodToDays(value: number, unit: PeriodUnit): number {
	return unit === 'weeks' ? value * 7 : value;
}

/** Inches to whole mm, rounding half up, on integer hundredths so 2.5 in is 63.5 → 64 mm. */
export function inchesToMm(inches: number): number {
	const hundredths = Math.round(inches * 100);
	// mm = hundredths × 25.4 / 100 = hundredths × 254 / 1000, kept in integers until the end.
	return Math.floor((hundredths * 254 + 500) / 1000);
}

/** Whole mm from what was typed. */
export function lengthToMm(value: number, unit: LengthUnit): number {
	return unit === 'in' ? inchesToMm(value) : value;
}

function hasAtMostDecimals(value: number, decimals: number): boolean {
	const scaled = value * 10 ** decimals;
	return Math.abs(scaled - Math.round(scaled)) < 1e-9;
}

function periodProblem(
	value: number,
	unit: PeriodUnit,
	limits: { min: number; max: number },
	what: string
): string | null {
	if (!Number.isInteger(value)) return `Use whole ${unit}.`;
	const days = periodToDays(value, unit);
	if (days >= limits.min && days <= limits.max) return null;
	const fromWeeks = Math.ceil(limits.min / 7);
	const toWeeks = Math.floor(limits.max / 7);
	const typed = unit === 'weeks' ? ` (${value} weeks is ${days} days)` : '';
	return `The ${what} must be ${limits.min} to ${limits.max} days, or ${fromWeeks} to ${toWeeks} whole weeks${typed}.`;
}

function adultSizeProblem(value: number, unit: LengthUnit): string | null {
	const { min, max } = SPECIES_LIMITS.adultLengthMm;
	if (unit === 'mm' && !Number.isInteger(value)) return 'Use whole millimetres.';
	if (unit === 'in' && !hasAtMostDecimals(value, 2)) return 'Use at most two decimals of an inch.';
	const mm = lengthToMm(value, unit);
	if (mm < min || mm > max) {
		const shown = unit === 'in' ? ` (${value} in is ${mm} mm)` : '';
		return `The adult size must be ${min} to ${max} mm${shown}.`;
	}
	return null;
}

const scientificName = z
	.string()
	.trim()
	.overwrite((value) => value.replace(/\s+/g, ' '))
	.min(1, 'Enter the scientific name.')
	.max(120, 'Keep the scientific name under 120 characters.')
	// Genus (capitalised) then the species or a morph name: "Porcellio laevis 'Dairy Cow'".
	.refine(
		(value) => value === '' || /^[A-Z][a-z]+ \S/.test(value),
		'Write it as Genus species, e.g. Narceus americanus.'
	);

export const speciesFormSchema = z
	.object({
		scientificName,
		commonName: z
			.string()
			.trim()
			.overwrite((value) => value.replace(/\s+/g, ' '))
			.min(1, 'Enter the common name buyers know it by.')
			.max(80, 'Keep the common name under 80 characters.'),
		slug: z
			.string()
			.trim()
			.toLowerCase()
			.max(SLUG_MAX, `Keep the web name under ${SLUG_MAX} characters.`)
			.refine(
				(value) => value === '' || SLUG_PATTERN.test(value),
				'Use lower-case letters and digits joined by single hyphens, e.g. narceus-americanus.'
			)
			.default(''),
		animalGroup: z.enum(ANIMAL_GROUPS, 'Choose the group.'),
		summary: notes(600),
		tempLowF: temperature('low'),
		tempIdealLowF: temperature('ideal low'),
		tempIdealHighF: temperature('ideal high'),
		tempHighF: temperature('high'),
		moistureLevel: z.enum(MOISTURE_LEVELS, 'Choose drier, moist or humid.'),
		substrateNotes: notes(2000),
		diet: notes(2000),
		adultSize: amount('Enter the adult size.'),
		adultSizeUnit: z.enum(LENGTH_UNITS, 'Choose mm or inches.').default('mm'),
		handlingNotes: notes(2000),
		cautions: notes(2000),
		growOutWeeks: wholeNumber({
			required: 'Enter the weeks from found to sale size.',
			min: SPECIES_LIMITS.growOutWeeks.min,
			max: SPECIES_LIMITS.growOutWeeks.max,
			range: `Enter ${SPECIES_LIMITS.growOutWeeks.min} to ${SPECIES_LIMITS.growOutWeeks.max} weeks (up to five years).`
		}),
		refreshInterval: amount('Enter how often half the substrate is refreshed.'),
		refreshIntervalUnit: z.enum(PERIOD_UNITS, 'Choose days or weeks.').default('days'),
		tubHold: amount('Enter how long old substrate rests in its tub.'),
		tubHoldUnit: z.enum(PERIOD_UNITS, 'Choose days or weeks.').default('weeks'),
		moltQuietDays: wholeNumber({
			required: 'Enter the quiet days after a molt.',
			min: SPECIES_LIMITS.moltQuietDays.min,
			max: SPECIES_LIMITS.moltQuietDays.max,
			range: `Enter ${SPECIES_LIMITS.moltQuietDays.min} to ${SPECIES_LIMITS.moltQuietDays.max} days.`
		})
	})
	.superRefine((form, ctx) => {
		// Zod runs this even when single fields failed, so only values valid on their own count.
		const { min, max } = SPECIES_LIMITS.temperatureF;
		const valid = (value: number | null) =>
			value !== null && Number.isInteger(value) && value >= min && value <= max ? value : null;
		const problems = temperatureOrderProblems({
			tempLowF: valid(form.tempLowF),
			tempIdealLowF: valid(form.tempIdealLowF),
			tempIdealHighF: valid(form.tempIdealHighF),
			tempHighF: valid(form.tempHighF)
		});
		for (const problem of problems) {
			ctx.addIssue({ code: 'custom', path: [problem.field], message: problem.message });
		}

		const periods = [
			[
				'refreshInterval',
				form.refreshInterval,
				form.refreshIntervalUnit,
				SPECIES_LIMITS.refreshIntervalDays,
				'refresh interval'
			],
			['tubHold', form.tubHold, form.tubHoldUnit, SPECIES_LIMITS.tubHoldDays, 'tub hold']
		] as const;
		for (const [field, value, unit, limits, what] of periods) {
			if (value === null || value <= 0) continue;
			const problem = periodProblem(value, unit, limits, what);
			if (problem) ctx.addIssue({ code: 'custom', path: [field], message: problem });
		}

		if (form.adultSize !== null && form.adultSize > 0) {
			const problem = adultSizeProblem(form.adultSize, form.adultSizeUnit);
			if (problem) ctx.addIssue({ code: 'custom', path: ['adultSize'], message: problem });
		}
	});

export type SpeciesForm = z.infer<typeof speciesFormSchema>;
export type SpeciesFormField = keyof SpeciesForm;

/** The stored columns of a species, as the server module writes them. */
// search is kept by PostgreSQL from the names and summary, never written.
export type SpeciesValues = Omit<Species, 'id' | 'created_at' | 'updated_at' | 'search'>;

function required(value: number | null, field: string): number {
	if (value === null) throw new TypeError(`${field} is missing: validate the form first`);
	return value;
}

/** The row to store from a valid form: units converted, the slug made when left empty. */
export function speciesValuesFromForm(form: SpeciesForm): SpeciesValues {
	return {
		slug: form.slug || slugFromScientificName(form.scientificName),
		scientific_name: form.scientificName,
		common_name: form.commonName,
		animal_group: form.animalGroup,
		summary: form.summary,
		temp_low_f: required(form.tempLowF, 'tempLowF'),
		temp_ideal_low_f: required(form.tempIdealLowF, 'tempIdealLowF'),
		temp_ideal_high_f: required(form.tempIdealHighF, 'tempIdealHighF'),
		temp_high_f: required(form.tempHighF, 'tempHighF'),
		moisture_level: form.moistureLevel,
		substrate_notes: form.substrateNotes,
		diet: form.diet,
		adult_length_mm: lengthToMm(required(form.adultSize, 'adultSize'), form.adultSizeUnit),
		handling_notes: form.handlingNotes,
		cautions: form.cautions,
		grow_out_weeks: required(form.growOutWeeks, 'growOutWeeks'),
		refresh_interval_days: periodToDays(
			required(form.refreshInterval, 'refreshInterval'),
			form.refreshIntervalUnit
		),
		tub_hold_days: periodToDays(required(form.tubHold, 'tubHold'), form.tubHoldUnit),
		molt_quiet_days: required(form.moltQuietDays, 'moltQuietDays')
	};
}

/** A period as typed back into the form: whole weeks when it is whole weeks, else days. */
function periodForForm(days: number): { value: number; unit: PeriodUnit } {
	return days % 7 === 0 ? { value: days / 7, unit: 'weeks' } : { value: days, unit: 'days' };
}

/** The edit form's starting values from a stored species. */
export function speciesFormFromRow(row: SpeciesValues): SpeciesForm {
	const refresh = periodForForm(row.refresh_interval_days);
	const hold = periodForForm(row.tub_hold_days);
	return {
		scientificName: row.scientific_name,
		commonName: row.common_name,
		slug: row.slug,
		animalGroup: row.animal_group,
		summary: row.summary,
		tempLowF: row.temp_low_f,
		tempIdealLowF: row.temp_ideal_low_f,
		tempIdealHighF: row.temp_ideal_high_f,
		tempHighF: row.temp_high_f,
		moistureLevel: row.moisture_level,
		substrateNotes: row.substrate_notes,
		diet: row.diet,
		adultSize: row.adult_length_mm,
		adultSizeUnit: 'mm',
		handlingNotes: row.handling_notes,
		cautions: row.cautions,
		growOutWeeks: row.grow_out_weeks,
		refreshInterval: refresh.value,
		refreshIntervalUnit: refresh.unit,
		tubHold: hold.value,
		tubHoldUnit: hold.unit,
		moltQuietDays: row.molt_quiet_days
	};
}

/**
 * A new species starts from the room-temperature band most of these animals take
 * (common practice, PRODUCT.md: low to high 70s °F ideal, the 60s and high 80s
 * tolerated) and the table's own schedule defaults (120 days, 6 weeks, 21 days).
 */
export function newSpeciesForm(): SpeciesForm {
	return {
		scientificName: '',
		commonName: '',
		slug: '',
		animalGroup: 'millipede',
		summary: '',
		tempLowF: 60,
		tempIdealLowF: 70,
		tempIdealHighF: 78,
		tempHighF: 88,
		moistureLevel: 'moist',
		substrateNotes: '',
		diet: '',
		adultSize: null,
		adultSizeUnit: 'mm',
		handlingNotes: '',
		cautions: '',
		growOutWeeks: null,
		refreshInterval: 120,
		refreshIntervalUnit: 'days',
		tubHold: 6,
		tubHoldUnit: 'weeks',
		moltQuietDays: 21
	};
}

/** "about 4 months": a period of days to the nearest half month (Gregorian mean month). */
export function aboutMonths(days: number): string {
	// Mean Gregorian month: 365.2425 / 12 = 30.436875 days.
	const halves = Math.round((days / 30.436875) * 2);
	const whole = Math.floor(halves / 2);
	const half = halves % 2 === 1;
	if (whole === 0) return half ? 'about half a month' : 'under a month';
	const text = half ? `${whole}½` : String(whole);
	return `about ${text} ${whole === 1 && !half ? 'month' : 'months'}`;
}

/** "120 days (about 4 months)", "42 days (6 weeks)": a stored period in friendly words. */
export function describePeriod(days: number): string {
	if (days % 7 === 0) return `${days} days (${days / 7} ${days === 7 ? 'week' : 'weeks'})`;
	return `${days} days (${aboutMonths(days)})`;
}
