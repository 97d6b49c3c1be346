// What goes on a packing slip, decided without I/O: which orders may have one (and the
// sentence that says why not), the order boxes are packed in on a ship day, and the
// words for a line's count. The server module (server/fulfilment/slip-data.ts) reads the
// rows; the PDF (server/fulfilment/slips-pdf.ts) only draws what these answer.
import { formatCount } from '$lib/format/labels';
import type { OrderState, Pack, Service, Sex } from '$lib/server/db/schema';

/** A day of up to this many boxes is made while the keeper waits; more is a background job. */
export const SLIP_SYNC_LIMIT = 50;

/** The states a ship day's batch prints: boxes to pack today and boxes packed already. */
export const SHIP_DAY_SLIP_STATES = [
	'scheduled',
	'packed'
] as const satisfies readonly OrderState[];

export interface SlipCandidate {
	orderNumber: string;
	state: OrderState;
	/** The order carries live animals (so it goes out only on a ship check's date). */
	hasLive: boolean;
}

/**
 * Why an order may not get a slip, or null when it may. Unpaid, cancelled and refunded
 * orders have no box; an order with animals waiting for (or held by) the ship check has
 * no ship date or packs yet, so a slip would tell the packer nothing true. Orders already
 * packed, shipped or delivered may be printed again (a torn slip, a lost care card).
 */
export function slipRefusal(order: SlipCandidate): string | null {
	const number = order.orderNumber;
	switch (order.state) {
		case 'awaiting_payment':
			return `${number} is not paid yet: a box is packed only for a paid order.`;
		case 'cancelled':
			return `${number} was cancelled: nothing goes out for it.`;
		case 'refunded':
			return `${number} was refunded in full: nothing goes out for it.`;
		case 'weather_hold':
			return `${number} is on weather hold: it has no safe ship date yet, so there is no box to pack. Print its slip once the ship check sets a date.`;
		case 'paid':
			return order.hasLive
				? `${number} is waiting for its ship check: print its slip once it has a ship date.`
				: null;
		default:
			return null;
	}
}

const SERVICE_RANK: Record<Service, number> = { overnight: 0, two_day: 1 };

const orderNumbers = new Intl.Collator('en-US', { numeric: true });

/**
 * Ship order, as the ship-day page lists the boxes: overnight first (its carrier cut-off
 * is the one that matters most), then two-day, then by order number ("HL-9999" before
 * "HL-10000").
 */
export function compareShipOrder(
	a: { service: Service; orderNumber: string },
	b: { service: Service; orderNumber: string }
): number {
	return (
		SERVICE_RANK[a.service] - SERVICE_RANK[b.service] ||
		orderNumbers.compare(a.orderNumber, b.orderNumber)
	);
}

/** Units still to pack on a line: what was sold less what was refunded and restocked. */
export function unitsToPack(line: { quantity: number; restockedQuantity: number }): number {
	return Math.max(0, line.quantity - line.restockedQuantity);
}

/** "each", "pair", "group of 10": one unit of a listing as the buyer bought it. */
export function unitWords(unitSize: number, sex: Sex): string {
	if (sex === 'pair') return 'pair';
	return unitSize === 1 ? 'each' : `group of ${unitSize}`;
}

/** "3 × group of 10", "1 × pair", "5 × each" reads badly, so single animals are "5 animals". */
export function unitCountText(units: number, unitSize: number, sex: Sex): string {
	if (sex !== 'pair' && unitSize === 1) return formatCount(units, 'animal');
	return `${units} × ${unitWords(unitSize, sex)}`;
}

/** Animals on an animal line: units × animals per unit. */
export function animalCount(units: number, unitSize: number): number {
	return units * unitSize;
}

export const PACK_WORDS: Record<Pack, string> = { heat: 'Heat pack', cold: 'Cold pack' };

/** "Add a heat pack", "Add a heat pack and a cold pack", or null when the box needs none. */
export function packInstruction(packs: readonly Pack[]): string | null {
	const unique = [...new Set(packs)];
	if (unique.length === 0) return null;
	return `Add ${unique.map((pack) => `a ${PACK_WORDS[pack].toLowerCase()}`).join(' and ')}`;
}
