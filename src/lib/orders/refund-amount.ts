// What a refund of some animals or goods off an order line comes to, in cents. Pure, so
// the refund form suggests the same amount the server checks.

/** A line as sold: how many, and what they cost together (cents). */
export type SoldLine = { quantity: number; lineTotalCents: number };

/**
 * The share of a line's price for `quantity` of its units, in whole cents. All of a
 * line gives back exactly what it cost; part of it is its share rounded to the
 * nearest cent, halves up.
 */
export function lineRefundCents(line: SoldLine, quantity: number): number {
	if (!Number.isInteger(quantity) || quantity <= 0 || line.quantity <= 0) return 0;
	if (quantity >= line.quantity) return line.lineTotalCents;
	return Math.round((line.lineTotalCents * quantity) / line.quantity);
}

/** The amount suggested for several lines at once. */
export function suggestedRefundCents(picks: Array<{ line: SoldLine; quantity: number }>): number {
	return picks.reduce((sum, pick) => sum + lineRefundCents(pick.line, pick.quantity), 0);
}
