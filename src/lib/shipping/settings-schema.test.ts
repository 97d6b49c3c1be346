import { describe, expect, it } from 'vitest';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { DEFAULT_SHIP_WEEKDAYS, DEFAULT_THRESHOLDS } from './defaults';
import {
	centsToDollarText,
	closedDatesText,
	newSettingsForm,
	parseClosedDates,
	parseDollarsToCents,
	readCalendarDate,
	settingChanges,
	settingValuesFromForm,
	settingsFormFromRow,
	settingsFormSchema,
	shippingDefaults,
	thresholdOrderProblems,
	timeZoneOptions,
	type SettingsForm,
	type ShopSettingValues
} from './settings-schema';

const TODAY = '2026-12-01';

/** The demo shop's row: Knoxville, TN, everything else at the column defaults. */
const demoRow: ShopSettingValues = {
	shop_name: 'Mossback Hollow Inverts',
	origin_zip: '37902',
	time_zone: 'America/New_York',
	ship_weekdays_overnight: [1, 2, 3],
	ship_weekdays_two_day: [1, 2],
	hold_below_f: 25,
	heat_pack_below_f: 50,
	cold_pack_above_f: 85,
	hold_above_f: 95,
	extra_closed_dates: [],
	forecast_horizon_days: 10,
	fee_overnight_cents: 4500,
	fee_two_day_cents: 2800,
	reservation_minutes: 15,
	claim_window_hours: 2,
	slip_paper: 'letter'
};

function demoForm(overrides: Partial<SettingsForm> = {}): SettingsForm {
	return { ...settingsFormFromRow(demoRow, TODAY), ...overrides };
}

/** field → messages, from a failed parse. */
function problems(input: unknown): Record<string, string[]> {
	const result = settingsFormSchema(TODAY).safeParse(input);
	if (result.success) return {};
	const byField: Record<string, string[]> = {};
	for (const issue of result.error.issues) {
		const field = String(issue.path[0] ?? '');
		(byField[field] ??= []).push(issue.message);
	}
	return byField;
}

describe('the weather limits’ order', () => {
	it('takes the general-practice defaults (PRODUCT.md: hold < 25, heat pack < 50, cold pack > 85, hold > 95 °F)', () => {
		expect(thresholdOrderProblems({ ...DEFAULT_THRESHOLDS })).toEqual([]);
		expect(problems(demoForm())).toEqual({});
	});

	it('blames a heat-pack limit under the hold-for-cold limit, with °C beside', () => {
		// °C = (°F − 32) / 1.8 (NIST SP 811, B.9): 20 °F = −6.7 → −7 °C, 25 °F = −3.9 → −4 °C.
		const typed = { ...DEFAULT_THRESHOLDS, heatPackBelowF: 20 };
		const heatPackError = {
			field: 'heatPackBelowF',
			message: '20 °F (−7 °C) must be above the hold-for-cold limit, 25 °F (−4 °C).'
		};
		// Knowing what is saved, the error goes beside the limit that was changed.
		expect(thresholdOrderProblems(typed, DEFAULT_THRESHOLDS)).toEqual([heatPackError]);
		// Without that, neither of the two is more wrong than the other: both are marked.
		expect(thresholdOrderProblems(typed)).toEqual([
			{
				field: 'holdBelowF',
				message: '25 °F (−4 °C) must be below the heat-pack limit, 20 °F (−7 °C).'
			},
			heatPackError
		]);
	});

	it('blames only the one limit that clashes with most others', () => {
		// 90 °F = 32.2 → 32 °C; 50 °F = 10 °C exactly (NIST SP 811, B.9).
		const found = thresholdOrderProblems({ ...DEFAULT_THRESHOLDS, holdBelowF: 90 });
		expect(found).toEqual([
			{
				field: 'holdBelowF',
				message: '90 °F (32 °C) must be below the heat-pack limit, 50 °F (10 °C).'
			}
		]);
	});

	it('is strict: equal limits are refused, as the table’s CHECK refuses them', () => {
		// 85 °F = 29.4 → 29 °C.
		const found = thresholdOrderProblems({ ...DEFAULT_THRESHOLDS, holdAboveF: 85 });
		expect(found.map((p) => p.field).sort()).toEqual(['coldPackAboveF', 'holdAboveF']);
		expect(found.find((p) => p.field === 'holdAboveF')?.message).toBe(
			'85 °F (29 °C) must be above the cold-pack limit, 85 °F (29 °C).'
		);
	});

	it('names both neighbours of a limit out of place in the middle', () => {
		// 100 °F = 37.8 → 38 °C; 95 °F = 35 °C exactly.
		const found = thresholdOrderProblems({
			holdBelowF: 25,
			heatPackBelowF: 100,
			coldPackAboveF: 85,
			holdAboveF: 95
		});
		expect(found).toEqual([
			{
				field: 'heatPackBelowF',
				message: '100 °F (38 °C) must be below the cold-pack limit, 85 °F (29 °C).'
			}
		]);
		const squeezed = thresholdOrderProblems({
			holdBelowF: 30,
			heatPackBelowF: 20,
			coldPackAboveF: 10,
			holdAboveF: 95
		});
		expect(squeezed.find((p) => p.field === 'heatPackBelowF')?.message).toBe(
			'20 °F (−7 °C) must be above the hold-for-cold limit, 30 °F (−1 °C), and below the cold-pack limit, 10 °F (−12 °C).'
		);
	});

	it('puts the order problem on the changed field through the form schema, and skips empty limits', () => {
		const stored = settingsFormSchema(TODAY, DEFAULT_THRESHOLDS).safeParse(
			demoForm({ coldPackAboveF: 40 })
		);
		expect(stored.success).toBe(false);
		expect(stored.error?.issues.map((i) => [i.path[0], i.message])).toEqual([
			['coldPackAboveF', '40 °F (4 °C) must be above the heat-pack limit, 50 °F (10 °C).']
		]);
		expect(problems(demoForm({ coldPackAboveF: 40 }))).toEqual({
			heatPackBelowF: ['50 °F (10 °C) must be below the cold-pack limit, 40 °F (4 °C).'],
			coldPackAboveF: ['40 °F (4 °C) must be above the heat-pack limit, 50 °F (10 °C).']
		});
		// An empty box is "required", not an order problem.
		const empty = problems(demoForm({ heatPackBelowF: null }));
		expect(Object.keys(empty)).toEqual(['heatPackBelowF']);
		expect(empty.heatPackBelowF?.[0]).toMatch(/whole °F/);
	});
});

describe('dollars to cents', () => {
	it('reads cents exactly where binary floating point would not', () => {
		// IEEE 754 binary64 has no exact 0.29, 19.99 or 1.15: in JavaScript 0.29 * 100 is
		// 28.999999999999996 and 19.99 * 100 is 1998.9999999999998 (checked in Node 20).
		expect(0.29 * 100).not.toBe(29);
		expect(parseDollarsToCents('0.29')).toEqual({ ok: true, cents: 29 });
		expect(parseDollarsToCents('19.99')).toEqual({ ok: true, cents: 1999 });
		expect(parseDollarsToCents('1.15')).toEqual({ ok: true, cents: 115 });
	});

	it('takes the ways people write a fee', () => {
		expect(parseDollarsToCents('12.50')).toEqual({ ok: true, cents: 1250 });
		expect(parseDollarsToCents('$12.5')).toEqual({ ok: true, cents: 1250 });
		expect(parseDollarsToCents(' 45 ')).toEqual({ ok: true, cents: 4500 });
		expect(parseDollarsToCents('.99')).toEqual({ ok: true, cents: 99 });
		expect(parseDollarsToCents('0')).toEqual({ ok: true, cents: 0 });
		expect(parseDollarsToCents('$ 1,250.00')).toEqual({ ok: true, cents: 125000 });
	});

	it('refuses fractions of a cent, signs and nonsense', () => {
		for (const typed of [
			'12.505',
			'-5',
			'$-5.00',
			'',
			'.',
			'$',
			'12,5',
			'1,25.00',
			'12.50 USD',
			'ten'
		]) {
			expect(parseDollarsToCents(typed).ok, typed).toBe(false);
		}
	});

	it('round-trips with the CLDR en-US two-decimal form for every cent up to $100', () => {
		// Outside reference: Intl (Node's ICU/CLDR data) writes each amount; USD has two
		// minor-unit digits (ISO 4217).
		const cldr = new Intl.NumberFormat('en-US', {
			minimumFractionDigits: 2,
			maximumFractionDigits: 2,
			useGrouping: true
		});
		for (let cents = 0; cents <= 10_000; cents++) {
			const written = cldr.format(cents / 100);
			expect(parseDollarsToCents(written)).toEqual({ ok: true, cents });
			expect(centsToDollarText(cents)).toBe(written.replaceAll(',', ''));
		}
	});

	it('caps a fee at $999.99 in the form and refuses bad text beside the field', () => {
		expect(problems(demoForm({ feeOvernight: '1000.00' })).feeOvernight).toEqual([
			'The overnight fee must be $0.00 to $999.99.'
		]);
		expect(problems(demoForm({ feeTwoDay: '28.005' })).feeTwoDay).toEqual([
			'Use at most two digits after the point: whole cents.'
		]);
		const values = settingValuesFromForm(
			settingsFormSchema(TODAY).parse(demoForm({ feeOvernight: '$38.5', feeTwoDay: '0' }))
		);
		expect(values.fee_overnight_cents).toBe(3850);
		expect(values.fee_two_day_cents).toBe(0);
	});
});

describe('extra closed dates', () => {
	it('reads one a line, keeps each day once and sorts them', () => {
		expect(parseClosedDates('2026-12-31\n\n2026-12-24\n2026-12-31\n 12/26/2026 ')).toEqual({
			dates: ['2026-12-24', '2026-12-26', '2026-12-31'],
			problems: []
		});
	});

	it('refuses days the Gregorian calendar does not have', () => {
		// Gregorian leap rule: every 4th year, except centuries not divisible by 400.
		expect(readCalendarDate('2028-02-29')).toBe('2028-02-29');
		expect(readCalendarDate('2027-02-29')).toBeNull();
		expect(readCalendarDate('2100-02-29')).toBeNull();
		expect(readCalendarDate('2000-02-29')).toBe('2000-02-29');
		expect(readCalendarDate('2026-04-31')).toBeNull();
		expect(readCalendarDate('2/3/2027')).toBe('2027-02-03');
		expect(parseClosedDates('2026-13-01\nsoon').problems).toEqual([
			'“2026-13-01” is not a day of the calendar.',
			'“soon” is not a date: write it as 2026-12-24 or 12/24/2026.'
		]);
	});

	it('refuses past dates and dates over two years ahead, and writes a clean list back sorted', () => {
		expect(problems(demoForm({ extraClosedDates: '2026-11-30' })).extraClosedDates).toEqual([
			'2026-11-30 is already past: closures only matter from today on.'
		]);
		expect(problems(demoForm({ extraClosedDates: '2062-12-24' })).extraClosedDates).toEqual([
			'2062-12-24 is more than two years away: check the year.'
		]);
		// Today itself counts, and so does the same day two years on.
		const parsed = settingsFormSchema(TODAY).parse(
			demoForm({ extraClosedDates: '2028-12-01\n2026-12-01\n12/24/2026\n2026-12-24' })
		);
		expect(parsed.extraClosedDates).toBe('2026-12-01\n2026-12-24\n2028-12-01');
		expect(settingValuesFromForm(parsed).extra_closed_dates).toEqual([
			'2026-12-01',
			'2026-12-24',
			'2028-12-01'
		]);
	});

	it('leaves past closures out of the form, so the next save drops them', () => {
		expect(closedDatesText(['2026-12-24', '2026-07-03', '2026-12-01'], TODAY)).toBe(
			'2026-12-01\n2026-12-24'
		);
	});
});

describe('the rest of the form', () => {
	it('wants at least one ship weekday per service, each 1 (Mon) to 7 (Sun), stored sorted', () => {
		expect(problems(demoForm({ shipWeekdaysTwoDay: [] })).shipWeekdaysTwoDay).toEqual([
			'Tick at least one day the shop hands two-day boxes to the carrier.'
		]);
		expect(
			problems(demoForm({ shipWeekdaysOvernight: [0, 8] })).shipWeekdaysOvernight
		).toBeTruthy();
		const parsed = settingsFormSchema(TODAY).parse(demoForm({ shipWeekdaysOvernight: [3, 1, 1] }));
		expect(settingValuesFromForm(parsed).ship_weekdays_overnight).toEqual([1, 3]);
	});

	it('wants a five-digit ZIP and a zone Intl knows', () => {
		expect(problems(demoForm({ originZip: '3790' })).originZip).toBeTruthy();
		expect(problems(demoForm({ originZip: '37902-1234' })).originZip).toBeTruthy();
		expect(problems(demoForm({ timeZone: 'Mars/Olympus_Mons' })).timeZone).toEqual([
			'Choose a time zone from the list.'
		]);
		// IANA names are case-insensitive to Intl (ECMA-402); the stored name takes its spelling.
		expect(
			settingsFormSchema(TODAY).parse(demoForm({ timeZone: 'america/chicago' })).timeZone
		).toBe('America/Chicago');
	});

	it('keeps the forecast horizon to 3–16 days and the table’s reservation and claim limits', () => {
		expect(problems(demoForm({ forecastHorizonDays: 2 })).forecastHorizonDays).toEqual([
			'Enter 3 to 16 days.'
		]);
		expect(problems(demoForm({ forecastHorizonDays: 17 })).forecastHorizonDays).toBeTruthy();
		expect(problems(demoForm({ forecastHorizonDays: 16 }))).toEqual({});
		expect(problems(demoForm({ reservationMinutes: 241 })).reservationMinutes).toBeTruthy();
		expect(problems(demoForm({ claimWindowHours: 0 })).claimWindowHours).toBeTruthy();
		expect(problems(demoForm({ claimWindowHours: 168 }))).toEqual({});
	});

	it('prints slips on US Letter or A4 only, Letter for a new shop', () => {
		expect(problems(demoForm({ slipPaper: 'a4' }))).toEqual({});
		expect(problems({ ...demoForm(), slipPaper: 'legal' }).slipPaper).toEqual([
			'Choose US Letter or A4.'
		]);
		expect(settingValuesFromForm(demoForm({ slipPaper: 'a4' })).slip_paper).toBe('a4');
		expect(newSettingsForm('America/New_York').slipPaper).toBe('letter');
		expect(settingChanges(demoRow, { ...demoRow, slip_paper: 'a4' })).toEqual({
			slip_paper: { from: 'letter', to: 'a4' }
		});
	});

	it('turns a stored row into the form and back unchanged', () => {
		const parsed = settingsFormSchema(TODAY).parse(settingsFormFromRow(demoRow, TODAY));
		expect(settingValuesFromForm(parsed)).toEqual(demoRow);
		expect(settingChanges(demoRow, settingValuesFromForm(parsed))).toEqual({});
	});

	it('parses posted form data the way superforms reads it, checkbox groups included', async () => {
		const body = new FormData();
		const form = demoForm({ extraClosedDates: '2026-12-24', feeOvernight: '42.10' });
		for (const [name, value] of Object.entries(form)) {
			if (Array.isArray(value)) for (const day of value) body.append(name, String(day));
			else body.append(name, String(value));
		}
		body.delete('shipWeekdaysTwoDay');
		body.append('shipWeekdaysTwoDay', '2');
		body.append('shipWeekdaysTwoDay', '1');
		const validated = await superValidate(body, zod4(settingsFormSchema(TODAY)));
		expect(validated.valid).toBe(true);
		const values = settingValuesFromForm(validated.data);
		expect(values.ship_weekdays_two_day).toEqual([1, 2]);
		expect(values.fee_overnight_cents).toBe(4210);
		expect(values.extra_closed_dates).toEqual(['2026-12-24']);

		const none = new FormData();
		for (const [name, value] of body.entries())
			if (name !== 'shipWeekdaysOvernight') none.append(name, value);
		const refused = await superValidate(none, zod4(settingsFormSchema(TODAY)));
		expect(refused.valid).toBe(false);
		expect(refused.errors.shipWeekdaysOvernight?._errors?.[0]).toMatch(/at least one day/);
	});
});

describe('defaults and changes', () => {
	it('puts back the constants of defaults.ts and nothing else', () => {
		expect(shippingDefaults()).toEqual({
			hold_below_f: DEFAULT_THRESHOLDS.holdBelowF,
			heat_pack_below_f: DEFAULT_THRESHOLDS.heatPackBelowF,
			cold_pack_above_f: DEFAULT_THRESHOLDS.coldPackAboveF,
			hold_above_f: DEFAULT_THRESHOLDS.holdAboveF,
			ship_weekdays_overnight: [...DEFAULT_SHIP_WEEKDAYS.overnight],
			ship_weekdays_two_day: [...DEFAULT_SHIP_WEEKDAYS.two_day]
		});
		const fresh = newSettingsForm('America/Chicago');
		expect(fresh.holdBelowF).toBe(DEFAULT_THRESHOLDS.holdBelowF);
		expect(fresh.shipWeekdaysTwoDay).toEqual([...DEFAULT_SHIP_WEEKDAYS.two_day]);
		expect(fresh.timeZone).toBe('America/Chicago');
	});

	it('lists only the columns that changed, weekdays and dates compared as sets', () => {
		const changes = settingChanges(demoRow, {
			...demoRow,
			ship_weekdays_overnight: [3, 2, 1],
			fee_two_day_cents: 3000,
			extra_closed_dates: ['2026-12-24']
		});
		expect(changes).toEqual({
			fee_two_day_cents: { from: 2800, to: 3000 },
			extra_closed_dates: { from: [], to: ['2026-12-24'] }
		});
	});

	it('offers the US zones first, then the rest once each, keeping an unlisted current zone', () => {
		const options = timeZoneOptions(
			['Europe/Berlin', 'America/Chicago', 'Asia/Tokyo'],
			'US/Eastern'
		);
		expect(options[0]?.value).toBe('America/New_York');
		const values = options.map((o) => o.value);
		expect(new Set(values).size).toBe(values.length);
		expect(values.slice(7)).toEqual(['Asia/Tokyo', 'Europe/Berlin', 'US/Eastern']);
	});
});
