import { describe, expect, it } from 'vitest';
import {
	STANDARD_RECIPE,
	decimalRatio,
	dimensionProblem,
	formatLitres,
	formatPartAmount,
	formatShare,
	partShares,
	formatUsGallons,
	formatUsMeasure,
	formatUsQuarts,
	parsePartAmount,
	partAmountText,
	roundRatio,
	splitByParts,
	substrateVolume,
	volumeOfCubicInches,
	type Ratio
} from './substrate';

const asNumber = (r: Ratio) => Number(r.num) / Number(r.den);
const same = (a: Ratio, b: Ratio) => a.num * b.den === b.num * a.den;

describe('substrate volume', () => {
	it('gives one US gallon for 231 in³, exactly 3.785411784 L and 4 US qt', () => {
		// NIST Handbook 44 appendix C: 1 US gallon = 231 in³ = 3.785411784 L (exact).
		const volume = substrateVolume({ lengthIn: 11, widthIn: 7, depthIn: 3 });
		expect(volume.cubicInches).toEqual({ num: 231n, den: 1n });
		expect(same(volume.litres, { num: 3_785_411_784n, den: 1_000_000_000n })).toBe(true);
		expect(same(volume.usGallons, { num: 1n, den: 1n })).toBe(true);
		expect(same(volume.usQuarts, { num: 4n, den: 1n })).toBe(true);
		expect(formatLitres(volume)).toBe('3.8 L');
		expect(formatUsQuarts(volume)).toBe('4.0 US qt');
		expect(formatUsGallons(volume)).toBe('1.00 US gal');
	});

	it('gives exactly 0.946352946 L for one US quart (57.75 in³)', () => {
		// NIST Handbook 44 appendix C: 1 US quart = 57.75 in³ = 0.946352946 L (exact).
		const volume = substrateVolume({ lengthIn: 5.5, widthIn: 3.5, depthIn: '3.0' });
		expect(same(volume.cubicInches, { num: 5775n, den: 100n })).toBe(true);
		expect(same(volume.litres, { num: 946_352_946n, den: 1_000_000_000n })).toBe(true);
		expect(same(volume.usQuarts, { num: 1n, den: 1n })).toBe(true);
		expect(formatLitres(volume)).toBe('0.9 L');
	});

	it('gives 28.316846592 L for a cubic foot, from 1 in = 2.54 cm', () => {
		// NIST SP 811 appendix B: 1 in = 2.54 cm exactly, so 1 ft³ = 0.028316846592 m³.
		const volume = substrateVolume({ lengthIn: '12.0', widthIn: '12.0', depthIn: '12.0' });
		expect(same(volume.litres, { num: 28_316_846_592n, den: 1_000_000_000n })).toBe(true);
		expect(formatLitres(volume)).toBe('28.3 L');
		// 1728 / 231 = 7.4805… gal and 29.922… qt.
		expect(formatUsGallons(volume)).toBe('7.48 US gal');
		expect(formatUsQuarts(volume)).toBe('29.9 US qt');
	});

	it('stays exact for the largest enclosure the colony table allows', () => {
		// 120 × 120 × 48 in = 691 200 in³; × 16.387064 cm³/in³ (NIST SP 811) = 11 326 738.6368 cm³.
		const volume = substrateVolume({ lengthIn: 120, widthIn: 120, depthIn: 48 });
		expect(same(volume.litres, { num: 113_267_386_368n, den: 10_000_000n })).toBe(true);
		expect(formatLitres(volume)).toBe('11,326.7 L');
	});

	it('keeps tenths of an inch exact (no binary rounding)', () => {
		// 0.1 × 0.1 × 0.1 in³ = 1/1000 in³ exactly; a float product gives 0.0010000000000000002.
		expect(substrateVolume({ lengthIn: 0.1, widthIn: 0.1, depthIn: 0.1 }).cubicInches).toEqual({
			num: 1n,
			den: 1000n
		});
	});
});

describe('enclosure size checks', () => {
	it('refuses a zero, absurd or badly written size with a reason', () => {
		expect(dimensionProblem('length', '0')).toBe('Length must be more than 0 in.');
		expect(dimensionProblem('width', '')).toBe('Enter the width in inches.');
		expect(dimensionProblem('length', '121')).toBe('Length can be at most 120 in; check the size.');
		expect(dimensionProblem('depth', '48.1')).toBe(
			'Substrate depth can be at most 48 in; check the size.'
		);
		expect(dimensionProblem('depth', '4.25')).toBe('Give inches to one decimal place at most.');
		expect(dimensionProblem('width', '12in')).toBe('Use a plain number of inches, like 18 or 4.5.');
		expect(dimensionProblem('width', '-3')).toBe('Use a plain number of inches, like 18 or 4.5.');
	});

	it('accepts the limits themselves and one decimal', () => {
		expect(dimensionProblem('length', '120')).toBeNull();
		expect(dimensionProblem('width', '0.1')).toBeNull();
		expect(dimensionProblem('depth', '48')).toBeNull();
		expect(dimensionProblem('depth', ' 4.5 ')).toBeNull();
	});
});

describe('recipe parts', () => {
	it('reads whole numbers, fractions, mixed numbers, decimals and "a little"', () => {
		expect(parsePartAmount('1')).toEqual({ ok: true, amount: { numerator: 1, denominator: 1 } });
		expect(parsePartAmount('1/3')).toEqual({ ok: true, amount: { numerator: 1, denominator: 3 } });
		expect(parsePartAmount('2/6')).toEqual({ ok: true, amount: { numerator: 1, denominator: 3 } });
		expect(parsePartAmount('1 1/2')).toEqual({
			ok: true,
			amount: { numerator: 3, denominator: 2 }
		});
		expect(parsePartAmount('0.25')).toEqual({
			ok: true,
			amount: { numerator: 1, denominator: 4 }
		});
		expect(parsePartAmount('a little')).toEqual({
			ok: true,
			amount: { numerator: 0, denominator: 1 }
		});
		expect(parsePartAmount('0')).toEqual({ ok: true, amount: { numerator: 0, denominator: 1 } });
	});

	it('refuses what is not an amount', () => {
		expect(parsePartAmount('')).toMatchObject({ ok: false });
		expect(parsePartAmount('1/0')).toEqual({
			ok: false,
			problem: 'A fraction cannot have 0 below the line.'
		});
		expect(parsePartAmount('lots')).toMatchObject({ ok: false });
		expect(parsePartAmount('101')).toEqual({
			ok: false,
			problem: 'Keep it to 100 parts or fewer.'
		});
		expect(parsePartAmount('1/1001')).toMatchObject({ ok: false });
	});

	it('writes amounts back as people say them', () => {
		expect(formatPartAmount({ numerator: 1, denominator: 1 })).toBe('1 part');
		expect(formatPartAmount({ numerator: 1, denominator: 3 })).toBe('1/3 part');
		expect(formatPartAmount({ numerator: 3, denominator: 2 })).toBe('1 1/2 parts');
		expect(formatPartAmount({ numerator: 2, denominator: 1 })).toBe('2 parts');
		expect(formatPartAmount({ numerator: 0, denominator: 1 })).toBe('a little');
		expect(partAmountText({ numerator: 3, denominator: 2 })).toBe('1 1/2');
		expect(partAmountText({ numerator: 1, denominator: 20 })).toBe('1/20');
	});

	it('splits the default recipe 3/7, 3/7, 1/7 and leaves calcium as a little', () => {
		// Common practice (PRODUCT.md): 1 part compost, 1 part soaked hardwood pellets,
		// 1/3 part crushed leaves, a little calcium. 1 + 1 + 1/3 = 7/3, so 1 part is 3/7.
		const total = substrateVolume({ lengthIn: 18, widthIn: 12, depthIn: 4 });
		const [compost, pellets, leaves, calcium] = splitByParts(total, STANDARD_RECIPE.parts);
		expect(compost!.share).toEqual({ num: 3n, den: 7n });
		expect(pellets!.share).toEqual({ num: 3n, den: 7n });
		expect(leaves!.share).toEqual({ num: 1n, den: 7n });
		expect(calcium!.share).toBeNull();
		expect(calcium!.volume).toBeNull();
		// 864 in³ × 0.016387064 L/in³ = 14.158… L; 3/7 of it 6.068 L, 1/7 of it 2.023 L.
		expect(formatLitres(total)).toBe('14.2 L');
		expect(formatLitres(compost!.volume!)).toBe('6.1 L');
		expect(formatLitres(leaves!.volume!)).toBe('2.0 L');
		// 864/231 × 4 × 3/7 = 6.41 qt; × 1/7 = 2.14 qt.
		expect(formatUsMeasure(compost!.volume!)).toBe('6.4 US qt');
		expect(formatUsMeasure(leaves!.volume!)).toBe('2.1 US qt');
	});

	it('adds the measured parts back up to the whole batch exactly', () => {
		const total = substrateVolume({ lengthIn: 17.5, widthIn: 11.3, depthIn: 3.7 });
		const split = splitByParts(total, [
			{ ingredient: 'Soil', numerator: 1, denominator: 1 },
			{ ingredient: 'Leaves', numerator: 1, denominator: 3 },
			{ ingredient: 'Rotten wood', numerator: 3, denominator: 4 },
			{ ingredient: 'Calcium', numerator: 1, denominator: 20 }
		]);
		const sum = split.reduce((acc, part) => acc + asNumber(part.volume!.cubicInches), 0);
		expect(sum).toBeCloseTo(asNumber(total.cubicInches), 9);
		const exact = split
			.map((part) => part.share!)
			.reduce((a, b) => ({ num: a.num * b.den + b.num * a.den, den: a.den * b.den }));
		expect(exact.num).toBe(exact.den);
	});

	it('states a share as a fraction and a percentage', () => {
		// 1 : 1 : 1/3 → 3/7, 3/7, 1/7 (PRODUCT.md's default recipe, common practice).
		const shares = partShares(STANDARD_RECIPE.parts);
		expect(shares.map((s) => (s ? formatShare(s) : null))).toEqual([
			'3/7 of the batch (43%)',
			'3/7 of the batch (43%)',
			'1/7 of the batch (14%)',
			null
		]);
		expect(formatShare({ num: 1n, den: 1n })).toBe('all of the batch (100%)');
	});

	it('refuses a recipe with nothing measured', () => {
		const total = substrateVolume({ lengthIn: 10, widthIn: 10, depthIn: 2 });
		expect(() =>
			splitByParts(total, [{ ingredient: 'Calcium', numerator: 0, denominator: 1 }])
		).toThrow(RangeError);
	});
});

describe('shown figures', () => {
	it('rounds half up', () => {
		expect(roundRatio({ num: 1n, den: 20n }, 1)).toBe(0.1);
		expect(roundRatio({ num: 1n, den: 21n }, 1)).toBe(0);
		expect(roundRatio(decimalRatio('2.449')!, 2)).toBe(2.45);
	});

	it('turns small amounts into millilitres, cups and tablespoons', () => {
		// NIST Handbook 44 appendix C: 1 US cup = 1/4 qt = 14.4375 in³; 1 tbsp = 1/16 cup.
		const cup = volumeOfCubicInches({ num: 231n, den: 16n });
		expect(formatUsMeasure(cup)).toBe('1.0 cup');
		const tablespoon = volumeOfCubicInches({ num: 231n, den: 256n });
		expect(formatUsMeasure(tablespoon)).toBe('1.0 tbsp');
		// 1 tbsp = 14.786764… mL (from 231 in³ = 3.785411784 L, ÷ 256).
		expect(formatLitres(tablespoon)).toBe('15 mL');
	});
});
