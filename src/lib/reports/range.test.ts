import { describe, expect, it } from 'vitest';
import { defaultRange, monthStartBefore, monthsOf, parseReportRange } from './range';

const TODAY = '2026-12-02';
const parse = (query: Record<string, string>) =>
	parseReportRange(new URLSearchParams(query), TODAY);

describe('report range', () => {
	it('defaults to this month and the eleven before it', () => {
		expect(defaultRange(TODAY)).toEqual({ from: '2026-01-01', to: TODAY });
		expect(parse({})).toEqual({ ok: true, from: '2026-01-01', to: TODAY, defaulted: true });
	});

	it('takes a range that is one day long', () => {
		expect(parse({ from: '2026-03-08', to: '2026-03-08' })).toMatchObject({
			ok: true,
			from: '2026-03-08',
			to: '2026-03-08'
		});
	});

	it('refuses a range that ends before it starts, keeping what was typed', () => {
		const result = parse({ from: '2026-06-01', to: '2026-01-01' });
		expect(result.ok).toBe(false);
		if (result.ok) return;
		expect(result.errors.to).toMatch(/ends before it starts/);
		expect(result).toMatchObject({ from: '2026-06-01', to: '2026-01-01' });
	});

	it('refuses ten years, and takes five years less a day', () => {
		const ten = parse({ from: '2016-12-02', to: '2026-12-01' });
		expect(ten.ok).toBe(false);
		if (!ten.ok) expect(ten.errors.to).toMatch(/at most 5 years/);
		expect(parse({ from: '2021-12-03', to: '2026-12-02' }).ok).toBe(true);
		expect(parse({ from: '2021-12-02', to: '2026-12-02' }).ok).toBe(false);
	});

	it('refuses dates that are not on the calendar', () => {
		// 2026 is not a leap year (Gregorian rule: divisible by 4, not by 100 unless by 400).
		const result = parse({ from: '2026-02-29', to: 'soon' });
		expect(result.ok).toBe(false);
		if (result.ok) return;
		expect(result.errors.from).toMatch(/date/);
		expect(result.errors.to).toMatch(/date/);
	});

	it('fills a missing first day from the last day given', () => {
		expect(parse({ to: '2025-06-15' })).toMatchObject({ ok: true, from: '2024-07-01' });
	});

	it('lists the months of a range across a year end', () => {
		expect(monthStartBefore('2026-01-31', 1)).toBe('2025-12-01');
		expect(monthsOf('2025-11-30', '2026-02-01')).toEqual([
			'2025-11',
			'2025-12',
			'2026-01',
			'2026-02'
		]);
	});
});
