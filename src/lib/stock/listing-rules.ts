// The rules of a listing a keeper writes in the back office: the form and its checks,
// price tiers typed in dollars and read into exact cents, the slug, and every refusal
// (publish, withdraw, unit size) as a sentence meant to sit beside the field that caused
// it. Pure: no clock, no I/O. The server (src/lib/server/listings/listings.ts) checks it
// all again against the rows as they are inside its transaction.
import { z } from 'zod';
import { MAX_INTEGER_COLUMN } from '$lib/forms/row-id';
import { MAX_LINE_QUANTITY, lineTotalCents, sortedTiers, tiersProblem } from '$lib/money/pricing';
import type { PriceTier } from '$lib/money/pricing';
import { formatCents } from '$lib/format/money';
import { centsToDollarText, parseDollarsToCents } from '$lib/shipping/settings-schema';
import type { ClutchState, ListingKind, ListingState, Sex } from '$lib/server/db/schema';

export const LISTING_LIMITS = {
	titleLength: 120,
	descriptionLength: 4000,
	// Mirrors listing.unit_size's CHECK.
	unitSize: { min: 1, max: 1000 },
	// Shelf counts: a typo guard (ours); the table only asks for ≥ 0.
	supplyStock: { min: 0, max: 100_000 },
	// A tier price above this is almost surely a slipped digit (our typo guard).
	tierPriceCents: { min: 1, max: 999_999 },
	// Rows the tier editor offers at most; three cover "1, 5, 10" with room to spare.
	tierRows: 8,
	// Longest slug body before the clutch code; URLs stay readable and under any limit.
	slugBody: 60
} as const;

export const sexValues = ['unsexed', 'male', 'female', 'pair'] as const satisfies readonly Sex[];

/** The form field a refusal belongs beside; '' is the form as a whole. */
export type ListingField =
	| 'title'
	| 'description'
	| 'unitSize'
	| 'sex'
	| 'isLive'
	| 'speciesId'
	| 'supplyStock'
	| 'tierQuantity'
	| `tierQuantity[${number}]`
	| `tierPrice[${number}]`
	| 'stamp'
	| '';

export interface FieldProblem {
	field: ListingField;
	message: string;
}

// ---- the form

const TIER_QUANTITY_LENGTH = String(MAX_LINE_QUANTITY).length + 2;

// Tiers are two lists of text posted as repeated fields (one quantity and one price a
// row), so the editor works as a plain form: rows are added and removed by the server.
const listingShape = {
	title: z
		.string()
		.trim()
		.min(1, 'Give the listing a title buyers will read.')
		.max(
			LISTING_LIMITS.titleLength,
			`Keep the title under ${LISTING_LIMITS.titleLength} characters.`
		),
	description: z
		.string()
		.trim()
		.max(
			LISTING_LIMITS.descriptionLength,
			`Keep the description under ${LISTING_LIMITS.descriptionLength} characters.`
		)
		.default(''),
	unitSize: z
		.number({ error: 'Give the unit as a whole number of animals.' })
		.int('Give the unit as a whole number of animals.')
		.min(LISTING_LIMITS.unitSize.min, 'A unit is at least 1 animal.')
		.max(LISTING_LIMITS.unitSize.max, `A unit is at most ${LISTING_LIMITS.unitSize.max} animals.`)
		.default(1),
	sex: z.enum(sexValues, { error: 'Pick unsexed, male, female or pair.' }).default('unsexed'),
	isLive: z.boolean().default(true),
	speciesId: z
		.number({ error: 'Pick a species from the list.' })
		.int('Pick a species from the list.')
		.positive('Pick a species from the list.')
		.max(MAX_INTEGER_COLUMN, 'Pick a species from the list.')
		.optional(),
	supplyStock: z
		.number({ error: 'Give the shelf count as a whole number.' })
		.int('Give the shelf count as a whole number.')
		.min(LISTING_LIMITS.supplyStock.min, 'A shelf count cannot be below zero.')
		.max(LISTING_LIMITS.supplyStock.max, 'That is more than any shelf holds; check the count.')
		.optional(),
	tierQuantity: z
		.array(z.string().trim().max(TIER_QUANTITY_LENGTH, 'A whole number of units, 1 or more.'))
		.max(LISTING_LIMITS.tierRows, `At most ${LISTING_LIMITS.tierRows} price rows.`)
		.default([]),
	tierPrice: z
		.array(z.string().trim().max(20, 'Write the price as dollars and cents, e.g. 14.00.'))
		.max(LISTING_LIMITS.tierRows, `At most ${LISTING_LIMITS.tierRows} price rows.`)
		.default([])
};

function checkListing(
	form: { unitSize: number; sex: Sex; tierQuantity: string[]; tierPrice: string[] },
	ctx: z.RefinementCtx
) {
	const pair = pairProblem(form.sex, form.unitSize);
	if (pair) ctx.addIssue({ code: 'custom', path: ['unitSize'], message: pair });
	for (const problem of readTierRows(form.tierQuantity, form.tierPrice).problems) {
		const path = problemPath(problem.field);
		ctx.addIssue({ code: 'custom', path, message: problem.message });
	}
}

function problemPath(field: ListingField): (string | number)[] {
	const element = /^(tierQuantity|tierPrice)\[(\d+)\]$/.exec(field);
	if (element) return [element[1]!, Number(element[2])];
	return field ? [field] : [];
}

/**
 * The listing form, new or edited. A new listing also says what it sells (a clutch by its
 * code, or a supply); an edit carries `stamp`, when the page read the listing, and the
 * server ignores kind and clutch (they never change once a listing exists).
 */
export const listingFormSchema = z
	.object({
		...listingShape,
		kind: z.enum(['animal', 'supply'], { error: 'Choose a clutch or a supply.' }).default('animal'),
		clutchCode: z.string().trim().max(40).default(''),
		stamp: z.string().trim().max(40).default('')
	})
	.superRefine(checkListing);

export type ListingForm = z.output<typeof listingFormSchema>;

/** The stock-moving forms (publish and withdraw) carry only the stale check. */
export const listingStateSchema = z.object({ stamp: z.string().trim().max(40).default('') });

/** Why a unit and sex do not go together, or null. */
export function pairProblem(sex: Sex, unitSize: number): string | null {
	if (sex === 'pair' && unitSize !== 2)
		return 'A pair is two animals, one male and one female: set the unit to 2.';
	return null;
}

// ---- tiers

export interface TierRows {
	/** The filled rows as tiers, smallest quantity first; empty when any row has a problem. */
	tiers: PriceTier[];
	problems: FieldProblem[];
}

const WHOLE = /^\d+$/;

/**
 * The tier editor's rows read into tiers in exact cents. A row left blank on both sides
 * is skipped; every other row must be whole: a quantity of units and a price in dollars.
 * Each problem names the box it belongs beside; problems about the tiers as a set go on
 * the quantity list as a whole.
 */
export function readTierRows(quantities: readonly string[], prices: readonly string[]): TierRows {
	const problems: FieldProblem[] = [];
	const tiers: (PriceTier & { row: number })[] = [];
	const rows = Math.max(quantities.length, prices.length);
	for (let row = 0; row < rows; row++) {
		const quantityText = (quantities[row] ?? '').trim();
		const priceText = (prices[row] ?? '').trim();
		if (quantityText === '' && priceText === '') continue;
		const quantityField = `tierQuantity[${row}]` as const;
		const priceField = `tierPrice[${row}]` as const;
		let minQuantity: number | null = null;
		if (quantityText === '')
			problems.push({ field: quantityField, message: 'Say how many units this price is for.' });
		else if (!WHOLE.test(quantityText) || Number(quantityText) < 1)
			problems.push({ field: quantityField, message: 'A whole number of units, 1 or more.' });
		else if (Number(quantityText) > MAX_LINE_QUANTITY)
			problems.push({
				field: quantityField,
				message: `A price can be for at most ${MAX_LINE_QUANTITY} units.`
			});
		else minQuantity = Number(quantityText);

		let priceCents: number | null = null;
		if (priceText === '')
			problems.push({ field: priceField, message: 'Give the price for these units.' });
		else if (priceText.startsWith('-') || priceText.startsWith('$-'))
			problems.push({ field: priceField, message: 'A price cannot be negative.' });
		else {
			const parsed = parseDollarsToCents(priceText);
			if (!parsed.ok) problems.push({ field: priceField, message: parsed.problem });
			else if (parsed.cents < LISTING_LIMITS.tierPriceCents.min)
				problems.push({
					field: priceField,
					message: 'A price of $0.00 would give them away; enter what they cost.'
				});
			else if (parsed.cents > LISTING_LIMITS.tierPriceCents.max)
				problems.push({
					field: priceField,
					message: `Prices above ${formatCents(LISTING_LIMITS.tierPriceCents.max)} are almost surely a slipped digit.`
				});
			else priceCents = parsed.cents;
		}
		if (minQuantity === null || priceCents === null) continue;
		const twin = tiers.find((tier) => tier.minQuantity === minQuantity);
		if (twin) {
			problems.push({
				field: quantityField,
				message: `Row ${twin.row + 1} is already for ${minQuantity}; keep one of them.`
			});
			continue;
		}
		tiers.push({ minQuantity, priceCents, row });
	}
	if (problems.length > 0) return { tiers: [], problems };

	const plain = tiers.map(({ minQuantity, priceCents }) => ({ minQuantity, priceCents }));
	const setProblem = tiersProblem(plain);
	if (setProblem) {
		// "Give at least one price" and "the first tier must be for 1" are about the list.
		const message =
			plain.length === 0
				? 'Give at least one price: the price of a single unit.'
				: setProblem.startsWith('The first tier')
					? 'Add a row for 1 unit, so any quantity has a price.'
					: setProblem;
		return { tiers: [], problems: [{ field: 'tierQuantity', message }] };
	}

	// Buying more may cost less per unit, never more; and crossing into a tier must not
	// make the whole line cheaper than one unit fewer (nobody would buy 4 if 5 cost less).
	const ordered = [...tiers].sort((a, b) => a.minQuantity - b.minQuantity);
	for (let index = 1; index < ordered.length; index++) {
		const tier = ordered[index]!;
		const below = ordered[index - 1]!;
		const field = `tierPrice[${tier.row}]` as const;
		// Compare rates without division: p/q > p'/q'  ⇔  p·q' > p'·q.
		if (tier.priceCents * below.minQuantity > below.priceCents * tier.minQuantity) {
			problems.push({
				field,
				message: `${tier.minQuantity} units at this price cost more each than ${below.minQuantity} at ${formatCents(below.priceCents)}; a larger tier should not cost more per unit.`
			});
			continue;
		}
		const oneFewer = lineTotalCents(plain, tier.minQuantity - 1);
		if (tier.priceCents < oneFewer) {
			problems.push({
				field,
				message: `At this price ${tier.minQuantity} units cost less than ${tier.minQuantity - 1} (${formatCents(oneFewer)}); make it at least that.`
			});
		}
	}
	if (problems.length > 0) return { tiers: [], problems };
	return { tiers: sortedTiers(plain), problems: [] };
}

/** The editor of a new listing: a row for one unit (the row every listing needs) and two blanks. */
export function newTierRows(): { tierQuantity: string[]; tierPrice: string[] } {
	return { tierQuantity: ['1', '', ''], tierPrice: ['', '', ''] };
}

/** Tiers as the editor shows them: dollars text, smallest quantity first, plus one blank row. */
export function tierRowsOf(
	tiers: readonly PriceTier[],
	blankRows = 1
): { tierQuantity: string[]; tierPrice: string[] } {
	const ordered = sortedTiers(tiers);
	const filled = ordered.slice(0, LISTING_LIMITS.tierRows);
	const blanks = Math.max(0, Math.min(blankRows, LISTING_LIMITS.tierRows - filled.length));
	return {
		tierQuantity: [...filled.map((t) => String(t.minQuantity)), ...Array<string>(blanks).fill('')],
		tierPrice: [
			...filled.map((t) => centsToDollarText(t.priceCents)),
			...Array<string>(blanks).fill('')
		]
	};
}

/** The editor with one more blank row (the "Add a price row" button, with or without JavaScript). */
export function withTierRowAdded(form: { tierQuantity: string[]; tierPrice: string[] }) {
	const rows = Math.max(form.tierQuantity.length, form.tierPrice.length);
	if (rows >= LISTING_LIMITS.tierRows) return null;
	const pad = (list: string[]) => [...list, ...Array<string>(rows - list.length).fill(''), ''];
	return { tierQuantity: pad(form.tierQuantity), tierPrice: pad(form.tierPrice) };
}

/** The editor without row `row` (0-based); the last row left is blanked instead. */
export function withTierRowRemoved(
	form: { tierQuantity: string[]; tierPrice: string[] },
	row: number
) {
	const rows = Math.max(form.tierQuantity.length, form.tierPrice.length);
	if (!Number.isInteger(row) || row < 0 || row >= rows) return null;
	const pad = (list: string[]) => [...list, ...Array<string>(rows - list.length).fill('')];
	if (rows === 1) return { tierQuantity: [''], tierPrice: [''] };
	const without = (list: string[]) => pad(list).filter((_, index) => index !== row);
	return { tierQuantity: without(form.tierQuantity), tierPrice: without(form.tierPrice) };
}

// ---- titles and slugs

/** "each", "pair", "group of 5": how a unit reads in a title. */
export function unitWords(unitSize: number, sex: Sex): string {
	if (sex === 'pair' && unitSize === 2) return 'pair';
	return unitSize === 1 ? 'each' : `group of ${unitSize}`;
}

const stageWords: Record<string, string> = {
	hatchling: 'hatchling',
	juvenile: 'juvenile',
	sub_adult: 'sub-adult',
	adult: 'adult'
};

/** A first title for a clutch's listing: "American giant millipede (Narceus americanus), juvenile, each". */
export function suggestedTitle(input: {
	commonName: string;
	scientificName: string;
	stage: string;
	unitSize: number;
	sex: Sex;
}): string {
	const sexWord = input.sex === 'male' || input.sex === 'female' ? `${input.sex}, ` : '';
	const stage = stageWords[input.stage] ?? input.stage;
	const title = `${input.commonName} (${input.scientificName}), ${stage}, ${sexWord}${unitWords(input.unitSize, input.sex)}`;
	return title.slice(0, LISTING_LIMITS.titleLength);
}

/** Lower-case ASCII words joined by hyphens, as listing.slug's CHECK wants them. */
export function slugWords(text: string, maxLength: number): string {
	const words = text
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.split(/[^a-z0-9]+/)
		.filter(Boolean);
	let slug = '';
	for (const word of words) {
		const next = slug ? `${slug}-${word}` : word;
		if (next.length > maxLength) break;
		slug = next;
	}
	// One word longer than the limit on its own is cut rather than dropped.
	if (!slug && words[0]) slug = words[0].slice(0, maxLength);
	return slug;
}

/** The slug a listing is first given: its title's words and, for animals, the clutch code. */
export function listingSlug(title: string, clutchCode: string | null): string {
	const body = slugWords(title, LISTING_LIMITS.slugBody);
	const code = clutchCode ? slugWords(clutchCode, 40) : '';
	return [body, code].filter(Boolean).join('-') || 'listing';
}

/** The n-th choice for a slug that is taken: "…-2", "…-3". */
export function slugCandidate(slug: string, attempt: number): string {
	return attempt <= 1 ? slug : `${slug}-${attempt}`;
}

// ---- refusals of publish, withdraw and the unit

const pausedWords = { molting: 'molting', unwell: 'unwell' } as const;

export interface PublishCheck {
	kind: ListingKind;
	state: ListingState;
	tierCount: number;
	unitSize: number;
	/** The clutch of an animal listing as it is now. */
	clutch: {
		code: string;
		state: ClutchState;
		pausedReason: 'molting' | 'unwell' | null;
		countAlive: number;
	} | null;
	supplyStock: number | null;
}

/** Why a listing cannot go live now, or null; checked before it is tried. */
export function publishProblem(check: PublishCheck): string | null {
	if (check.state === 'live') return 'It is already live in the shop.';
	if (check.tierCount === 0) return 'Give it at least one price first.';
	if (check.kind === 'supply') {
		if ((check.supplyStock ?? 0) < 1)
			return 'The shelf count is 0: count the stock and save it before putting this on sale.';
		return null;
	}
	const clutch = check.clutch;
	if (!clutch) return 'An animal listing needs its clutch.';
	switch (clutch.state) {
		case 'paused':
			return `Its clutch ${clutch.code} is paused (${clutch.pausedReason ? pausedWords[clutch.pausedReason] : 'resting'}): a paused clutch is never sold. Unpause it once the animals are settled.`;
		case 'growing':
			return `Its clutch ${clutch.code} is still growing. Mark it ready on the clutch page once they reach sale size.`;
		case 'sold_out':
			return `Its clutch ${clutch.code} is closed (sold out): there is nothing left to offer.`;
		default:
			break;
	}
	return unitSizeProblem(check.unitSize, clutch.countAlive, clutch.code);
}

/** The sentence for a publish that would offer nothing (the derived quantity came out 0). */
export function nothingOnOfferProblem(input: {
	kind: ListingKind;
	unitSize: number;
	/** Animals of the clutch not sold and not held (may be negative: a shortfall). */
	freeAnimals: number | null;
	/** Units of a supply held in carts now. */
	heldUnits: number;
}): string {
	if (input.kind === 'supply')
		return `Nothing to offer: every unit on the shelf is held in a cart (${input.heldUnits} held).`;
	const free = Math.max(0, input.freeAnimals ?? 0);
	if (free === 0)
		return 'Nothing to offer: every animal in the clutch is sold or held in a cart right now.';
	return `Nothing to offer: only ${free} ${free === 1 ? 'animal is' : 'animals are'} free, fewer than one unit (a group of ${input.unitSize}).`;
}

/** Why a listing cannot be withdrawn, or null. */
export function withdrawProblem(state: ListingState): string | null {
	switch (state) {
		case 'live':
			return null;
		case 'draft':
			return 'A draft is not in the shop; there is nothing to withdraw.';
		case 'withdrawn':
			return 'It is already withdrawn.';
		case 'sold_out':
			return 'It is sold out and already off the shop.';
	}
}

/** Why a unit of `unitSize` animals cannot be offered from a clutch with `countAlive`, or null. */
export function unitSizeProblem(
	unitSize: number,
	countAlive: number,
	clutchCode: string
): string | null {
	if (unitSize > countAlive)
		return countAlive === 0
			? `No animals are alive in ${clutchCode}.`
			: `A unit of ${unitSize} is more than the ${countAlive} alive in ${clutchCode}.`;
	return null;
}

/** Why the unit of a listing cannot change now, or null: carts and holds count in units. */
export function unitChangeProblem(state: ListingState, heldUnits: number): string | null {
	if (state === 'live')
		return 'Withdraw the listing before changing its unit: carts hold it by the unit.';
	if (heldUnits > 0)
		return `${heldUnits} ${heldUnits === 1 ? 'unit is' : 'units are'} still held in carts; change the unit once they lapse.`;
	return null;
}

/** Why a supply's shelf count cannot be set to `stock`, or null. */
export function shelfCountProblem(stock: number, heldUnits: number): string | null {
	if (stock < heldUnits)
		return `${heldUnits} ${heldUnits === 1 ? 'unit is' : 'units are'} held in carts right now; the shelf count cannot go below that until they lapse.`;
	return null;
}

/** Which clutch states a new listing may be drafted from. */
export function draftFromClutchProblem(state: ClutchState, code: string): string | null {
	if (state === 'ready' || state === 'listed') return null;
	switch (state) {
		case 'growing':
			return `${code} is still growing; mark it ready on its page once they reach sale size.`;
		case 'paused':
			return `${code} is paused; list it once it is unpaused.`;
		default:
			return `${code} is closed (sold out).`;
	}
}

// ---- the clutch side: when nothing is left

/**
 * Whether a clutch is sold out: nothing free (alive less sold less held) and no
 * unexpired hold that could still come back. Growing clutches are never closed here
 * (they were never offered); a paused one only when no animal is alive at all (sold
 * animals still in its care keep the pause, which guards them until they ship).
 */
export function soldOutDue(input: {
	state: ClutchState;
	/** The state a paused clutch had before its pause. */
	stateBeforePause: ClutchState | null;
	countAlive: number;
	freeAnimals: number;
	heldAnimals: number;
}): boolean {
	if (input.heldAnimals > 0 || input.freeAnimals > 0) return false;
	if (input.state === 'listed' || input.state === 'ready') return true;
	if (input.state === 'paused')
		return (
			input.countAlive === 0 &&
			(input.stateBeforePause === 'listed' || input.stateBeforePause === 'ready')
		);
	return false;
}

// ---- what changed in an edit, for the audit entry

export type ListingChanges = Record<string, { from: unknown; to: unknown }>;

/** Only the fields whose value differs, each as from → to. */
export function listingChanges(
	before: Record<string, unknown>,
	after: Record<string, unknown>
): ListingChanges {
	const changes: ListingChanges = {};
	for (const key of Object.keys(after)) {
		const from = before[key];
		const to = after[key];
		if (JSON.stringify(from) !== JSON.stringify(to)) changes[key] = { from, to };
	}
	return changes;
}

// ---- the listings table's filters (a GET form; an empty field means no filter)

const blankIsAbsent = <T extends z.ZodType>(schema: T) =>
	z.preprocess(
		(value) => (typeof value === 'string' && value.trim() === '' ? undefined : value),
		schema.optional()
	);

export const listingStateValues = ['draft', 'live', 'withdrawn', 'sold_out'] as const;

export const listingFiltersSchema = z.object({
	state: blankIsAbsent(
		z.enum(listingStateValues, { error: 'State must be draft, live, withdrawn or sold_out.' })
	),
	kind: blankIsAbsent(z.enum(['animal', 'supply'], { error: 'Kind must be animal or supply.' })),
	species: blankIsAbsent(
		z
			.string()
			.trim()
			.max(120, 'That species is not one the shop keeps.')
			.regex(
				/^[a-z0-9]+(-[a-z0-9]+)*$/,
				'Species must be given by its slug, like narceus-americanus.'
			)
	),
	q: blankIsAbsent(z.string().trim().max(100, 'Search text is at most 100 characters.'))
});

export type ListingFilters = z.output<typeof listingFiltersSchema>;

/** Filters from a page's URL, or the first thing wrong with them. */
export function parseListingFilters(
	params: URLSearchParams
): { ok: true; filters: ListingFilters } | { ok: false; problem: string } {
	const raw: Record<string, string> = {};
	for (const key of ['state', 'kind', 'species', 'q']) {
		const value = params.get(key);
		if (value !== null) raw[key] = value;
	}
	const parsed = listingFiltersSchema.safeParse(raw);
	if (parsed.success) return { ok: true, filters: parsed.data };
	return { ok: false, problem: parsed.error.issues[0]?.message ?? 'Those filters cannot be read.' };
}

// ---- words a new listing starts with

/** The shop's line on movement rules; every listing carries it (PRODUCT.md's cautions). */
export const STATE_RULES_LINE =
	"Check your state's rules on keeping and moving invertebrates before you order.";
const MILLIPEDE_HANDLING_LINE =
	'Millipedes release a defensive fluid that can stain and irritate: handle low over a soft surface and wash hands afterwards.';

/** A first description for a clutch's listing, with the cautions a buyer must read. */
export function suggestedDescription(input: {
	generation: number;
	stage: string;
	clutchCode: string;
	animalGroup: string;
}): string {
	const origin = input.generation === 0 ? 'Wild-caught' : `Captive-bred F${input.generation}`;
	const stage = stageWords[input.stage] ?? input.stage;
	const lines = [`${origin} ${stage}s from clutch ${input.clutchCode}. Sent with a care sheet.`];
	if (input.animalGroup === 'millipede') lines.push(MILLIPEDE_HANDLING_LINE);
	lines.push(STATE_RULES_LINE);
	return lines.join(' ');
}

// ---- a listing's history, in words

const changedFieldWords: Record<string, string> = {
	title: 'title',
	description: 'description',
	unitSize: 'unit',
	sex: 'sex',
	isLive: 'live flag',
	speciesId: 'species',
	supplyStock: 'shelf count',
	tiers: 'prices'
};

/** One audit entry of a listing as a line of its history. */
export function describeListingAudit(action: string, detail: Record<string, unknown>): string {
	switch (action) {
		case 'listing.create':
			return 'Drafted.';
		case 'listing.edit': {
			const changes =
				detail.changes && typeof detail.changes === 'object'
					? Object.keys(detail.changes as Record<string, unknown>)
					: [];
			const words = changes.map((key) => changedFieldWords[key] ?? key);
			if (words.length === 0) return 'Edited.';
			const list =
				words.length === 1 ? words[0] : `${words.slice(0, -1).join(', ')} and ${words.at(-1)}`;
			return `Changed the ${list}.`;
		}
		case 'listing.publish': {
			const onOffer = typeof detail.onOffer === 'number' ? detail.onOffer : null;
			const lead = detail.firstTime === true ? 'Put on sale for the first time' : 'Put on sale';
			return onOffer === null ? `${lead}.` : `${lead}, ${onOffer} on offer.`;
		}
		case 'listing.withdraw':
			return 'Taken off sale.';
		case 'listing.sold_out':
			return 'Sold out: its clutch has nothing left.';
		default:
			return action.replace(/^listing\./, '').replace(/_/g, ' ');
	}
}
