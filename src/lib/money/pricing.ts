// Tier pricing and cart totals, all in integer cents. Pure: no clock, no I/O.
// A tier is a total price for a quantity of units ("5 for $60"); a larger quantity pays
// the rate of the largest tier it reaches, rounded to the cent once per line, so a line
// never carries a fraction of a cent and the lines always add up to the subtotal.

export interface PriceTier {
	/** Units (each, or groups of the listing's unit size) this price is for. */
	minQuantity: number;
	/** Total price of minQuantity units, in cents. */
	priceCents: number;
}

/** The most units one cart line may hold; mirrors cart_line's CHECK. */
export const MAX_LINE_QUANTITY = 1000;

/** Why a set of tiers cannot be stored or priced from, or null. */
export function tiersProblem(tiers: readonly PriceTier[]): string | null {
	if (tiers.length === 0) return 'Give at least one price.';
	const seen = new Set<number>();
	for (const tier of tiers) {
		if (!Number.isSafeInteger(tier.minQuantity) || tier.minQuantity < 1)
			return 'Each tier is for a whole number of units, 1 or more.';
		if (tier.minQuantity > MAX_LINE_QUANTITY)
			return `A tier can be for at most ${MAX_LINE_QUANTITY} units.`;
		if (!Number.isSafeInteger(tier.priceCents) || tier.priceCents < 0)
			return 'Prices are whole cents, zero or more.';
		if (seen.has(tier.minQuantity)) return `Two tiers are for ${tier.minQuantity}; keep one.`;
		seen.add(tier.minQuantity);
	}
	if (!seen.has(1)) return 'The first tier must be for a single unit, so any quantity has a price.';
	return null;
}

/** Tiers from smallest quantity up. */
export function sortedTiers(tiers: readonly PriceTier[]): PriceTier[] {
	return [...tiers].sort((a, b) => a.minQuantity - b.minQuantity);
}

/** The tier whose rate `quantity` units pay: the largest one it reaches. */
export function tierFor(tiers: readonly PriceTier[], quantity: number): PriceTier {
	let chosen: PriceTier | undefined;
	for (const tier of tiers) {
		if (tier.minQuantity <= quantity && (!chosen || tier.minQuantity > chosen.minQuantity))
			chosen = tier;
	}
	if (!chosen) throw new RangeError(`no price tier covers a quantity of ${quantity}`);
	return chosen;
}

function assertQuantity(quantity: number): void {
	if (!Number.isSafeInteger(quantity) || quantity < 1)
		throw new RangeError(`a line needs a whole quantity of 1 or more, got ${String(quantity)}`);
}

/** What `quantity` units cost, in cents: quantity × the reached tier's rate, rounded half up once. */
export function lineTotalCents(tiers: readonly PriceTier[], quantity: number): number {
	assertQuantity(quantity);
	const tier = tierFor(tiers, quantity);
	// Integer arithmetic: (q·p + m/2) div m is round-half-up of q·p/m without a float.
	return Math.floor((quantity * tier.priceCents * 2 + tier.minQuantity) / (2 * tier.minQuantity));
}

/** A tier's price for one animal (a unit may be a group or a pair), rounded to the cent. */
export function perAnimalCents(tier: PriceTier, unitSize: number): number {
	const animals = tier.minQuantity * unitSize;
	return Math.floor((tier.priceCents * 2 + animals) / (2 * animals));
}

/** The cheapest tier's price per animal: the figure the catalogue sorts and filters by. */
export function basePriceCents(tiers: readonly PriceTier[], unitSize: number): number | null {
	if (tiers.length === 0) return null;
	return Math.min(...tiers.map((tier) => perAnimalCents(tier, unitSize)));
}

export interface TierRow {
	tier: PriceTier;
	/** Price per unit at this tier. */
	perUnitCents: number;
	perAnimalCents: number;
	/** Saved per animal against the single-unit tier, in whole percent (0 for the first). */
	savingPercent: number;
}

/** The tier table a listing page shows: each tier with its per-unit and per-animal price. */
export function tierTable(tiers: readonly PriceTier[], unitSize: number): TierRow[] {
	const sorted = sortedTiers(tiers);
	const first = sorted[0];
	const firstPerAnimal = first ? first.priceCents / (first.minQuantity * unitSize) : 0;
	return sorted.map((tier) => {
		const exactPerAnimal = tier.priceCents / (tier.minQuantity * unitSize);
		return {
			tier,
			perUnitCents: Math.floor((tier.priceCents * 2 + tier.minQuantity) / (2 * tier.minQuantity)),
			perAnimalCents: perAnimalCents(tier, unitSize),
			savingPercent:
				firstPerAnimal > 0
					? Math.max(0, Math.round((1 - exactPerAnimal / firstPerAnimal) * 100))
					: 0
		};
	});
}

/** The next tier up from `quantity`, for a "buy N more to pay less" hint; null at the top. */
export function nextTier(tiers: readonly PriceTier[], quantity: number): PriceTier | null {
	return sortedTiers(tiers).find((tier) => tier.minQuantity > quantity) ?? null;
}

export interface PricedLineInput {
	listingId: number;
	quantity: number;
	tiers: readonly PriceTier[];
	isLive: boolean;
}

export interface PricedLine {
	listingId: number;
	quantity: number;
	tier: PriceTier;
	lineTotalCents: number;
	isLive: boolean;
}

export interface CartTotals {
	lines: PricedLine[];
	subtotalCents: number;
	/** Zero for an empty cart; otherwise the fee of the chosen service. */
	shippingCents: number;
	totalCents: number;
	hasLive: boolean;
}

/**
 * The cart's money: each line priced by its own listing's tiers (quantities of one
 * listing are one line, so tiers apply to the total per listing), the subtotal as the
 * exact sum of the lines, and the shipping fee once per order.
 */
export function cartTotals(
	lines: readonly PricedLineInput[],
	shippingFeeCents: number
): CartTotals {
	if (!Number.isSafeInteger(shippingFeeCents) || shippingFeeCents < 0)
		throw new RangeError('the shipping fee is whole cents, zero or more');
	const ids = new Set<number>();
	const priced = lines.map((line) => {
		if (ids.has(line.listingId))
			throw new RangeError(`listing ${line.listingId} appears twice; merge its quantities first`);
		ids.add(line.listingId);
		return {
			listingId: line.listingId,
			quantity: line.quantity,
			tier: tierFor(line.tiers, line.quantity),
			lineTotalCents: lineTotalCents(line.tiers, line.quantity),
			isLive: line.isLive
		};
	});
	const subtotalCents = priced.reduce((sum, line) => sum + line.lineTotalCents, 0);
	const shippingCents = priced.length > 0 ? shippingFeeCents : 0;
	return {
		lines: priced,
		subtotalCents,
		shippingCents,
		totalCents: subtotalCents + shippingCents,
		hasLive: priced.some((line) => line.isLive)
	};
}
