import { describe, expect, it } from 'vitest';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	SPECIES_LIMITS,
	aboutMonths,
	describePeriod,
	inchesToMm,
	newSpeciesForm,
	periodToDays,
	slugFromScientificName,
	speciesFormFromRow,
	speciesFormSchema,
	speciesValuesFromForm,
	temperatureOrderProblems,
	type SpeciesForm
} from './species-schema';

/** A complete, valid form: the demo's Narceus americanus profile. */
function narceus(overrides: Partial<SpeciesForm> = {}): SpeciesForm {
	return {
		...newSpeciesForm(),
		scientificName: 'Narceus americanus',
		commonName: 'American giant millipede',
		animalGroup: 'millipede',
		tempLowF: 62,
		tempIdealLowF: 70,
		tempIdealHighF: 77,
		tempHighF: 86,
		adultSize: 100,
		growOutWeeks: 30,
		refreshInterval: 120,
		refreshIntervalUnit: 'days',
		tubHold: 7,
		tubHoldUnit: 'weeks',
		...overrides
	};
}

/** field → messages, from a failed parse. */
function problems(input: unknown): Record<string, string[]> {
	const result = speciesFormSchema.safeParse(input);
	if (result.success) return {};
	const byField: Record<string, string[]> = {};
	for (const issue of result.error.issues) {
		const field = String(issue.path[0] ?? '');
		(byField[field] ??= []).push(issue.message);
	}
	return byField;
}

describe('speciesFormSchema limits', () => {
	it('accepts the demo profile and stores it in the table’s units', () => {
		const parsed = speciesFormSchema.parse(narceus());
		const values = speciesValuesFromForm(parsed);
		expect(values.slug).toBe('narceus-americanus');
		expect(values.refresh_interval_days).toBe(120);
		expect(values.tub_hold_days).toBe(49);
		expect(values.adult_length_mm).toBe(100);
	});

	it('holds grow-out weeks to 1–260, the table’s CHECK', () => {
		expect(problems(narceus({ growOutWeeks: 1 }))).toEqual({});
		expect(problems(narceus({ growOutWeeks: 260 }))).toEqual({});
		expect(problems(narceus({ growOutWeeks: 0 })).growOutWeeks).toHaveLength(1);
		expect(problems(narceus({ growOutWeeks: 261 })).growOutWeeks).toHaveLength(1);
		expect(problems(narceus({ growOutWeeks: 12.5 })).growOutWeeks).toEqual(['Use a whole number.']);
		expect(problems(narceus({ growOutWeeks: null })).growOutWeeks).toEqual([
			'Enter the weeks from found to sale size.'
		]);
	});

	it('holds the refresh interval to 90–184 days, half the substrate every 3–6 months', () => {
		// Common practice (PRODUCT.md): half the substrate every 3–6 months. Six calendar
		// months at most run Jul–Dec: 31+31+30+31+30+31 = 184 days; three at least, 89–92, so 90.
		expect(problems(narceus({ refreshInterval: 90 }))).toEqual({});
		expect(problems(narceus({ refreshInterval: 184 }))).toEqual({});
		expect(problems(narceus({ refreshInterval: 89 })).refreshInterval).toHaveLength(1);
		expect(problems(narceus({ refreshInterval: 185 })).refreshInterval).toHaveLength(1);
		// In weeks: 13 weeks = 91 days and 26 weeks = 182 days are inside; 12 and 27 are not.
		expect(problems(narceus({ refreshInterval: 13, refreshIntervalUnit: 'weeks' }))).toEqual({});
		expect(problems(narceus({ refreshInterval: 26, refreshIntervalUnit: 'weeks' }))).toEqual({});
		expect(
			problems(narceus({ refreshInterval: 12, refreshIntervalUnit: 'weeks' })).refreshInterval?.[0]
		).toContain('12 weeks is 84 days');
		expect(
			problems(narceus({ refreshInterval: 27, refreshIntervalUnit: 'weeks' })).refreshInterval
		).toHaveLength(1);
	});

	it('holds the tub hold to 4–8 weeks (28–56 days)', () => {
		// Common practice (PRODUCT.md): tub hold 4–8 weeks; old substrate kept 1–2 months.
		expect(problems(narceus({ tubHold: 4, tubHoldUnit: 'weeks' }))).toEqual({});
		expect(problems(narceus({ tubHold: 8, tubHoldUnit: 'weeks' }))).toEqual({});
		expect(problems(narceus({ tubHold: 28, tubHoldUnit: 'days' }))).toEqual({});
		expect(problems(narceus({ tubHold: 56, tubHoldUnit: 'days' }))).toEqual({});
		expect(problems(narceus({ tubHold: 3, tubHoldUnit: 'weeks' })).tubHold).toHaveLength(1);
		expect(problems(narceus({ tubHold: 9, tubHoldUnit: 'weeks' })).tubHold).toHaveLength(1);
		expect(problems(narceus({ tubHold: 27, tubHoldUnit: 'days' })).tubHold).toHaveLength(1);
		expect(problems(narceus({ tubHold: 57, tubHoldUnit: 'days' })).tubHold).toHaveLength(1);
		expect(problems(narceus({ tubHold: 5.5, tubHoldUnit: 'weeks' })).tubHold).toEqual([
			'Use whole weeks.'
		]);
	});

	it('holds molt quiet days to 7–90 and adult size to 1–999 mm', () => {
		expect(problems(narceus({ moltQuietDays: 7 }))).toEqual({});
		expect(problems(narceus({ moltQuietDays: 90 }))).toEqual({});
		expect(problems(narceus({ moltQuietDays: 6 })).moltQuietDays).toHaveLength(1);
		expect(problems(narceus({ moltQuietDays: 91 })).moltQuietDays).toHaveLength(1);
		expect(problems(narceus({ adultSize: 1 }))).toEqual({});
		expect(problems(narceus({ adultSize: 999 }))).toEqual({});
		expect(problems(narceus({ adultSize: 1000 })).adultSize).toHaveLength(1);
		expect(problems(narceus({ adultSize: 0 })).adultSize).toEqual(['It must be more than 0.']);
		expect(problems(narceus({ adultSize: 4.5 })).adultSize).toEqual(['Use whole millimetres.']);
		// 40 in = 1016 mm: past the table's 999.
		expect(problems(narceus({ adultSize: 40, adultSizeUnit: 'in' })).adultSize?.[0]).toContain(
			'40 in is 1016 mm'
		);
	});

	it('asks for names and a web name the table accepts', () => {
		expect(problems(narceus({ scientificName: '' })).scientificName).toEqual([
			'Enter the scientific name.'
		]);
		expect(problems(narceus({ scientificName: 'narceus americanus' })).scientificName).toHaveLength(
			1
		);
		expect(problems(narceus({ scientificName: "Porcellio laevis 'Dairy Cow'" }))).toEqual({});
		expect(problems(narceus({ commonName: '   ' })).commonName).toHaveLength(1);
		expect(problems(narceus({ slug: 'giant--millipede' })).slug).toHaveLength(1);
		expect(problems(narceus({ slug: 'giant_millipede' })).slug).toHaveLength(1);
		expect(speciesFormSchema.parse(narceus({ slug: ' Giant-Millipede ' })).slug).toBe(
			'giant-millipede'
		);
	});

	it('tidies spaces in the names', () => {
		const parsed = speciesFormSchema.parse(narceus({ scientificName: '  Narceus   americanus ' }));
		expect(parsed.scientificName).toBe('Narceus americanus');
	});
});

describe('temperature order', () => {
	it('accepts equal neighbours: low ≤ ideal low ≤ ideal high ≤ high', () => {
		expect(
			problems(narceus({ tempLowF: 70, tempIdealLowF: 70, tempIdealHighF: 70, tempHighF: 70 }))
		).toEqual({});
	});

	it('puts the error on the one value out of step with the rest', () => {
		// An ideal high typed below both lows is out of step with two fields; the others with one.
		const wrong = problems(narceus({ tempIdealHighF: 60 }));
		expect(Object.keys(wrong)).toEqual(['tempIdealHighF']);
		expect(wrong.tempIdealHighF?.[0]).toBe(
			'Ideal high must lie between the ideal low, 70 °F (21 °C), and the high, 86 °F (30 °C).'
		);
		// An ideal low above the ideal high and the high: the ideal low is to blame.
		expect(Object.keys(problems(narceus({ tempIdealLowF: 90 })))).toEqual(['tempIdealLowF']);
		// A low above everything else.
		const low = problems(narceus({ tempLowF: 95 }));
		expect(Object.keys(low)).toEqual(['tempLowF']);
		expect(low.tempLowF?.[0]).toBe('Low cannot be above the ideal low, 70 °F (21 °C).');
	});

	it('blames the later of two swapped neighbours', () => {
		expect(
			temperatureOrderProblems({
				tempLowF: 62,
				tempIdealLowF: 70,
				tempIdealHighF: 90,
				tempHighF: 86
			})
		).toEqual([
			{ field: 'tempHighF', message: 'High cannot be below the ideal high, 90 °F (32 °C).' }
		]);
	});

	it('skips values missing or out of range, which have their own messages', () => {
		const result = problems(narceus({ tempIdealLowF: null, tempHighF: 150 }));
		expect(result.tempIdealLowF).toEqual(['Enter the ideal low in whole °F.']);
		expect(result.tempHighF).toHaveLength(1);
		expect(result.tempHighF?.[0]).toContain('40 to 100 °F');
	});

	it('finds every field at fault when two are out of order', () => {
		const found = temperatureOrderProblems({
			tempLowF: 80,
			tempIdealLowF: 85,
			tempIdealHighF: 70,
			tempHighF: 75
		});
		// No single change fixes this; two fields must move.
		expect(found.map((p) => p.field)).toHaveLength(2);
	});
});

describe('unit conversions', () => {
	it('converts weeks to days at exactly 7 days a week', () => {
		expect(periodToDays(6, 'weeks')).toBe(42);
		expect(periodToDays(120, 'days')).toBe(120);
	});

	it('converts inches to whole mm at 25.4 mm per inch (NIST SP 811, exact)', () => {
		// 6 in = 152.4 mm → 152; 4 in = 101.6 → 102; 2.5 in = 63.5 → 64 (half rounds up).
		expect(inchesToMm(6)).toBe(152);
		expect(inchesToMm(4)).toBe(102);
		expect(inchesToMm(2.5)).toBe(64);
		expect(inchesToMm(0.75)).toBe(19);
		expect(
			speciesValuesFromForm(speciesFormSchema.parse(narceus({ adultSize: 4, adultSizeUnit: 'in' })))
				.adult_length_mm
		).toBe(102);
	});

	it('shows a stored period back in whole weeks when it is whole weeks', () => {
		const values = speciesValuesFromForm(speciesFormSchema.parse(narceus()));
		const form = speciesFormFromRow({ ...values, refresh_interval_days: 105, tub_hold_days: 30 });
		expect([form.refreshInterval, form.refreshIntervalUnit]).toEqual([15, 'weeks']);
		expect([form.tubHold, form.tubHoldUnit]).toEqual([30, 'days']);
		// And the round trip stores the same days.
		expect(speciesValuesFromForm(speciesFormSchema.parse(form)).tub_hold_days).toBe(30);
	});

	it('reads periods in months of the Gregorian mean length, 30.436875 days', () => {
		// 365.2425 days a Gregorian year / 12 (from memory).
		expect(aboutMonths(SPECIES_LIMITS.refreshIntervalDays.min)).toBe('about 3 months');
		expect(aboutMonths(SPECIES_LIMITS.refreshIntervalDays.max)).toBe('about 6 months');
		expect(aboutMonths(120)).toBe('about 4 months');
		expect(aboutMonths(105)).toBe('about 3½ months');
		expect(describePeriod(42)).toBe('42 days (6 weeks)');
		expect(describePeriod(120)).toBe('120 days (about 4 months)');
	});
});

describe('slugFromScientificName', () => {
	it('makes the web name from the scientific name', () => {
		expect(slugFromScientificName('Narceus americanus')).toBe('narceus-americanus');
		expect(slugFromScientificName("Porcellio laevis 'Dairy Cow'")).toBe(
			'porcellio-laevis-dairy-cow'
		);
		expect(slugFromScientificName('Cubaris sp. “Rubber Ducky”')).toBe('cubaris-sp-rubber-ducky');
		expect(slugFromScientificName('Armadillidium klugii Montenegro')).toBe(
			'armadillidium-klugii-montenegro'
		);
		expect(slugFromScientificName('Glomeris marginata ×  hybrid')).toMatch(
			/^[a-z0-9]+(-[a-z0-9]+)*$/
		);
	});

	it('fills an empty web name on save', () => {
		const values = speciesValuesFromForm(
			speciesFormSchema.parse(narceus({ scientificName: 'Anadenobolus monilicornis', slug: '' }))
		);
		expect(values.slug).toBe('anadenobolus-monilicornis');
	});
});

describe('the form as posted', () => {
	// superforms reads FormData by the JSON Schema of the form: an empty number box must
	// come through as "required", not as 0, and a decimal must not be cut to an integer.
	async function post(fields: Record<string, string>) {
		const body = new FormData();
		for (const [key, value] of Object.entries(fields)) body.set(key, value);
		return superValidate(body, zod4(speciesFormSchema));
	}
	const filled = {
		scientificName: 'Narceus americanus',
		commonName: 'American giant millipede',
		slug: '',
		animalGroup: 'millipede',
		tempLowF: '62',
		tempIdealLowF: '70',
		tempIdealHighF: '77',
		tempHighF: '86',
		moistureLevel: 'moist',
		adultSize: '3.94',
		adultSizeUnit: 'in',
		growOutWeeks: '30',
		refreshInterval: '120',
		refreshIntervalUnit: 'days',
		tubHold: '7',
		tubHoldUnit: 'weeks',
		moltQuietDays: '21'
	};

	it('accepts a filled form and converts its units', async () => {
		const form = await post(filled);
		expect(form.valid).toBe(true);
		const values = speciesValuesFromForm(form.data);
		// 3.94 in × 25.4 = 100.076 mm → 100.
		expect(values.adult_length_mm).toBe(100);
		expect(values.tub_hold_days).toBe(49);
	});

	it('reports an empty number box as missing, and keeps a decimal as typed', async () => {
		const form = await post({ ...filled, growOutWeeks: '', tempHighF: '86.5' });
		expect(form.valid).toBe(false);
		expect(form.errors.growOutWeeks).toEqual(['Enter the weeks from found to sale size.']);
		expect(form.errors.tempHighF).toEqual(['Use a whole number.']);
		expect(form.data.tempHighF).toBe(86.5);
	});
});
