// The cart as the server hands it to pages and to the browser's fetches. Plain data:
// every figure in it was worked out on the server (src/lib/server/cart/cart.ts).
import type { PriceTier } from '$lib/money/pricing';
import type { ClutchStage, Service, Sex } from '$lib/server/db/schema';

export type LineProblemKind = 'gone' | 'paused' | 'sold_out' | 'short';

/** Why a line cannot be bought as it stands: a sentence for beside the line. */
export interface LineProblem {
	kind: LineProblemKind;
	text: string;
}

export interface CartLineView {
	listingId: number;
	slug: string;
	title: string;
	commonName: string | null;
	stage: ClutchStage | null;
	sex: Sex;
	unitSize: number;
	/** "each", "group of 5", "pair". */
	unitLabel: string;
	/** A live animal (weather-gated shipping), not a dry supply. */
	isLive: boolean;
	/** What the buyer asked for. */
	quantity: number;
	/** What can be sold of it now (0 when the line cannot be bought). */
	quantityToBuy: number;
	/** Units on offer to this cart, its own holds included. */
	available: number;
	tiers: PriceTier[];
	/** The tier quantityToBuy pays the rate of. */
	tier: PriceTier | null;
	lineTotalCents: number;
	problem: LineProblem | null;
}

export interface CartView {
	cartId: string | null;
	lines: CartLineView[];
	/** Units asked for across the lines, for the cart button. */
	itemCount: number;
	service: Service;
	fees: Record<Service, number>;
	/** Minutes a hold lasts once checkout starts (a shop setting). */
	holdMinutes: number;
	subtotalCents: number;
	shippingCents: number;
	totalCents: number;
	hasLive: boolean;
	/** ISO instant the cart's stock hold ends, while one is in force. */
	heldUntil: string | null;
}
