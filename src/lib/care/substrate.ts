// Substrate batch: how much mix an enclosure takes, and how much of each part of a
// recipe goes into it. Pure: no clock, no I/O. Sizes are exact decimal inches, so the
// arithmetic runs on exact fractions (bigint) and only the shown figures are rounded.

/** An exact non-negative fraction. */
export interface Ratio {
	num: bigint;
	den: bigint;
}

// Exact factors (NIST SP 811 appendix B; NIST Handbook 44 appendix C):
// 1 in = 2.54 cm, so 1 in³ = 16.387064 cm³ = 0.016387064 L.
const LITRES_PER_CUBIC_INCH: Ratio = { num: 16_387_064n, den: 1_000_000_000n };
// 1 US gallon = 231 in³; 1 US quart = 1/4 gallon; 1 US cup = 1/4 quart; 1 tablespoon = 1/16 cup.
const CUBIC_INCHES_PER_US_GALLON = 231n;

/** The enclosure sizes a colony may have (the same limits as the colony table). */
export const ENCLOSURE_LIMITS = {
	length: { max: 120, word: 'Length' },
	width: { max: 120, word: 'Width' },
	depth: { max: 48, word: 'Substrate depth' }
} as const;
export type EnclosureDimension = keyof typeof ENCLOSURE_LIMITS;

/**
 * Heat treatment before use, common practice (PRODUCT.md): about 200 °F for about 30
 * minutes, to kill mites and gnat larvae in the soil and leaves.
 */
export const HEAT_TREATMENT = { fahrenheit: 200, minutes: 30 } as const;
/** The caution PRODUCT.md has the product show with the heat-treatment step. */
export const HEAT_TREATMENT_CAUTION =
	'Heat-treating substrate in an oven: fire and burn risk; let it cool.';

export interface RecipePartInput {
	ingredient: string;
	/** 0 means "a little" (a pinch of calcium): no measured share of the volume. */
	numerator: number;
	denominator: number;
}

/**
 * The default recipe, common practice (PRODUCT.md): 1 part compost or organic soil,
 * 1 part soaked hardwood pellets, 1/3 part crushed fallen hardwood leaves, a little calcium.
 */
export const STANDARD_RECIPE = {
	name: 'Standard mix',
	notes: '',
	parts: [
		{ ingredient: 'Compost or organic soil', numerator: 1, denominator: 1 },
		{ ingredient: 'Hardwood pellets, soaked', numerator: 1, denominator: 1 },
		{ ingredient: 'Crushed fallen hardwood leaves', numerator: 1, denominator: 3 },
		{ ingredient: 'Calcium (crushed cuttlebone or eggshell)', numerator: 0, denominator: 1 }
	] satisfies RecipePartInput[]
} as const;

// ---- exact fractions

function gcd(a: bigint, b: bigint): bigint {
	let x = a < 0n ? -a : a;
	let y = b < 0n ? -b : b;
	while (y) [x, y] = [y, x % y];
	return x;
}

function ratio(num: bigint, den: bigint): Ratio {
	if (den <= 0n) throw new RangeError('a fraction needs a positive denominator');
	const divisor = gcd(num, den) || 1n;
	return { num: num / divisor, den: den / divisor };
}

function times(a: Ratio, b: Ratio): Ratio {
	return ratio(a.num * b.num, a.den * b.den);
}

function plus(a: Ratio, b: Ratio): Ratio {
	return ratio(a.num * b.den + b.num * a.den, a.den * b.den);
}

function dividedBy(a: Ratio, b: Ratio): Ratio {
	if (b.num === 0n) throw new RangeError('division by zero');
	return ratio(a.num * b.den, a.den * b.num);
}

/** Round half up to `decimals` places; the result is a plain number, for display. */
export function roundRatio(value: Ratio, decimals: number): number {
	const scale = 10n ** BigInt(decimals);
	const scaled = (2n * value.num * scale + value.den) / (2n * value.den);
	return Number(scaled) / Number(scale);
}

/** The fraction a decimal text stands for exactly: "12.5" → 25/2. */
export function decimalRatio(text: string): Ratio | null {
	const match = /^(\d{1,6})(?:\.(\d{1,6}))?$/.exec(text.trim());
	if (!match) return null;
	const fraction = match[2] ?? '';
	return ratio(BigInt(match[1]! + fraction), 10n ** BigInt(fraction.length));
}

/** A length as the exact fraction of its decimal form (JS prints the shortest exact form). */
function inchesRatio(inches: number | string): Ratio {
	const text = typeof inches === 'number' ? String(inches) : inches;
	const value = decimalRatio(text);
	if (!value) throw new RangeError(`not a length in inches: ${text}`);
	return value;
}

// ---- enclosure sizes

/**
 * Why an entered size is refused, or null. The limits are the colony table's: length and
 * width above 0 and at most 120 in, substrate depth above 0 and at most 48 in, to 0.1 in.
 */
export function dimensionProblem(dimension: EnclosureDimension, text: string): string | null {
	const { max, word } = ENCLOSURE_LIMITS[dimension];
	const trimmed = text.trim();
	if (trimmed === '') return `Enter the ${word.toLowerCase()} in inches.`;
	if (!/^\d*\.?\d*$/.test(trimmed) || trimmed === '.')
		return 'Use a plain number of inches, like 18 or 4.5.';
	if (!/^\d*(\.\d)?$/.test(trimmed)) return 'Give inches to one decimal place at most.';
	const value = Number(trimmed);
	if (value <= 0) return `${word} must be more than 0 in.`;
	if (value > max) return `${word} can be at most ${max} in; check the size.`;
	return null;
}

export interface Enclosure {
	lengthIn: number | string;
	widthIn: number | string;
	depthIn: number | string;
}

/** A volume, exact in cubic inches, with the figures shown rounded. */
export interface SubstrateVolume {
	cubicInches: Ratio;
	litres: Ratio;
	usGallons: Ratio;
	usQuarts: Ratio;
}

export function volumeOfCubicInches(cubicInches: Ratio): SubstrateVolume {
	const usGallons = dividedBy(cubicInches, { num: CUBIC_INCHES_PER_US_GALLON, den: 1n });
	return {
		cubicInches,
		litres: times(cubicInches, LITRES_PER_CUBIC_INCH),
		usGallons,
		usQuarts: times(usGallons, { num: 4n, den: 1n })
	};
}

/** The substrate in an enclosure: inside length × width × substrate depth. */
export function substrateVolume(enclosure: Enclosure): SubstrateVolume {
	const cubicInches = times(
		times(inchesRatio(enclosure.lengthIn), inchesRatio(enclosure.widthIn)),
		inchesRatio(enclosure.depthIn)
	);
	return volumeOfCubicInches(cubicInches);
}

// ---- recipe parts

/** A part amount in lowest terms, as stored (numerator/denominator). */
export interface PartAmount {
	numerator: number;
	denominator: number;
}

const MAX_PARTS = 100;
const MAX_DENOMINATOR = 1000;

/** Words that mean an unmeasured pinch rather than a share of the volume. */
const A_LITTLE = /^(0|a little|little|a pinch|pinch|some|a dusting|dusting)$/i;

/**
 * Reads a part amount as typed: "1", "1/3", "1 1/2", "0.5", or "0" / "a little" for an
 * unmeasured pinch. Returns the amount in lowest terms, or the reason it is refused.
 */
export function parsePartAmount(
	text: string
): { ok: true; amount: PartAmount } | { ok: false; problem: string } {
	const typed = text.trim().replace(/\s+/g, ' ');
	if (typed === '')
		return { ok: false, problem: 'Give the amount in parts, like 1 or 1/3 (0 for a little).' };
	if (A_LITTLE.test(typed)) return { ok: true, amount: { numerator: 0, denominator: 1 } };
	let value: Ratio | null = null;
	const mixed = /^(?:(\d{1,4}) )?(\d{1,4})\/(\d{1,4})$/.exec(typed);
	if (mixed) {
		const whole = BigInt(mixed[1] ?? '0');
		const top = BigInt(mixed[2]!);
		const bottom = BigInt(mixed[3]!);
		if (bottom === 0n) return { ok: false, problem: 'A fraction cannot have 0 below the line.' };
		value = ratio(whole * bottom + top, bottom);
	} else if (/^\d{1,4}(\.\d{1,3})?$/.test(typed)) {
		value = decimalRatio(typed);
	}
	if (!value)
		return {
			ok: false,
			problem: 'Write it as a whole number, a fraction like 1/3, or a decimal like 0.5.'
		};
	if (value.num === 0n) return { ok: true, amount: { numerator: 0, denominator: 1 } };
	if (value.num > BigInt(MAX_PARTS) * value.den)
		return { ok: false, problem: `Keep it to ${MAX_PARTS} parts or fewer.` };
	if (value.den > BigInt(MAX_DENOMINATOR))
		return { ok: false, problem: 'That fraction is finer than a scoop can measure.' };
	return { ok: true, amount: { numerator: Number(value.num), denominator: Number(value.den) } };
}

/** "1 part", "1/3 part", "1 1/2 parts", "a little". */
export function formatPartAmount(amount: PartAmount): string {
	const { num, den } = ratio(BigInt(amount.numerator), BigInt(amount.denominator));
	if (num === 0n) return 'a little';
	const whole = num / den;
	const rest = num % den;
	const text =
		rest === 0n ? `${whole}` : whole === 0n ? `${rest}/${den}` : `${whole} ${rest}/${den}`;
	return `${text} ${num === den || num < den ? 'part' : 'parts'}`;
}

/** The amount as the editor shows it in its text box: "1", "1/3", "1 1/2", "0". */
export function partAmountText(amount: PartAmount): string {
	const { num, den } = ratio(BigInt(amount.numerator), BigInt(amount.denominator));
	const whole = num / den;
	const rest = num % den;
	if (rest === 0n) return `${whole}`;
	return whole === 0n ? `${rest}/${den}` : `${whole} ${rest}/${den}`;
}

export interface PartShare {
	ingredient: string;
	amount: PartAmount;
	/** The part's share of the batch; null for "a little" (not measured by volume). */
	share: Ratio | null;
	volume: SubstrateVolume | null;
}

/**
 * Each part's exact share of a batch, in proportion to the amounts; null for "a little"
 * (not measured by volume). The measured shares add up to exactly 1.
 */
export function partShares(parts: readonly PartAmount[]): (Ratio | null)[] {
	const measured = parts.filter((p) => p.numerator > 0);
	if (measured.length === 0) throw new RangeError('a recipe needs at least one measured part');
	const sum = measured.reduce<Ratio>(
		(acc, p) => plus(acc, ratio(BigInt(p.numerator), BigInt(p.denominator))),
		{ num: 0n, den: 1n }
	);
	return parts.map((p) =>
		p.numerator > 0 ? dividedBy(ratio(BigInt(p.numerator), BigInt(p.denominator)), sum) : null
	);
}

/** "3/7 of the batch (43%)". */
export function formatShare(share: Ratio): string {
	const percent = roundRatio(times(share, { num: 100n, den: 1n }), 0);
	const fraction = share.num === share.den ? 'all' : `${share.num}/${share.den}`;
	return `${fraction} of the batch (${percent}%)`;
}

/**
 * Splits a batch between a recipe's parts in proportion to their amounts. "A little"
 * parts take no share; the measured parts add up to the whole volume exactly.
 */
export function splitByParts(
	total: SubstrateVolume,
	parts: readonly RecipePartInput[]
): PartShare[] {
	const shares = partShares(parts);
	return parts.map((part, index) => {
		const share = shares[index] ?? null;
		return {
			ingredient: part.ingredient,
			amount: { numerator: part.numerator, denominator: part.denominator },
			share,
			volume: share ? volumeOfCubicInches(times(total.cubicInches, share)) : null
		};
	});
}

// ---- shown figures

function fixed(value: number, decimals: number): string {
	return value.toLocaleString('en-US', {
		minimumFractionDigits: decimals,
		maximumFractionDigits: decimals
	});
}

/** Litres to 0.1 L; below 0.05 L, whole millilitres so a pinch does not read "0.0 L". */
export function formatLitres(volume: SubstrateVolume): string {
	const tenths = roundRatio(volume.litres, 1);
	if (tenths > 0) return `${fixed(tenths, 1)} L`;
	const millilitres = roundRatio(times(volume.litres, { num: 1000n, den: 1n }), 0);
	return millilitres > 0 ? `${fixed(millilitres, 0)} mL` : 'under 1 mL';
}

/** US quarts to 0.1 qt. */
export function formatUsQuarts(volume: SubstrateVolume): string {
	return `${fixed(roundRatio(volume.usQuarts, 1), 1)} US qt`;
}

/** US gallons to 0.01 gal. */
export function formatUsGallons(volume: SubstrateVolume): string {
	return `${fixed(roundRatio(volume.usGallons, 2), 2)} US gal`;
}

/**
 * A US kitchen measure for one part: quarts from 1 qt up, cups below that, tablespoons
 * below a quarter cup (1 qt = 4 cups, 1 cup = 16 tbsp; NIST Handbook 44 appendix C).
 */
export function formatUsMeasure(volume: SubstrateVolume): string {
	const cups = times(volume.usQuarts, { num: 4n, den: 1n });
	if (volume.usQuarts.num >= volume.usQuarts.den) return formatUsQuarts(volume);
	if (cups.num * 4n >= cups.den) {
		const shown = roundRatio(cups, 1);
		return `${fixed(shown, 1)} ${shown === 1 ? 'cup' : 'cups'}`;
	}
	const tablespoons = roundRatio(times(cups, { num: 16n, den: 1n }), 1);
	return `${fixed(tablespoons, 1)} tbsp`;
}
