// When a dead-on-arrival claim may be filed: on a delivered order, within the shop's
// window after delivery, one open claim at a time. Pure, so the order page shows the
// same answer the server gives when the form is posted.
import { formatShopDateTime } from '$lib/format/dates';

const HOUR_MS = 3_600_000;

/** A delivered order, or one part refunded after delivery (a refund must not shut the window). */
export const CLAIMABLE_STATES: readonly string[] = ['delivered', 'part_refunded'];

/**
 * Whether a claim filed at `now` is inside the window after delivery, and if not,
 * the sentence that says so with the delivery time in the shop's zone.
 */
export function claimWindowProblem(
	deliveredAt: Date,
	now: Date,
	windowHours: number,
	timeZone: string
): string | null {
	const closesAt = deliveredAt.getTime() + windowHours * HOUR_MS;
	if (now.getTime() <= closesAt && now.getTime() >= deliveredAt.getTime()) return null;
	const hours = windowHours === 1 ? '1 hour' : `${windowHours} hours`;
	return `Claims are taken within ${hours} of delivery; this order was delivered at ${formatShopDateTime(deliveredAt, timeZone)}.`;
}

export type ClaimAvailability =
	{ canFile: true; closesAt: Date } | { canFile: false; why: string; closesAt: Date | null };

/** Whether the buyer can file a claim on an order now, and until when or why not. */
export function claimAvailability(
	order: { state: string; deliveredAt: Date | null; hasLive: boolean; hasOpenClaim: boolean },
	now: Date,
	windowHours: number,
	timeZone: string
): ClaimAvailability {
	if (!order.hasLive)
		return { canFile: false, why: 'The guarantee covers live animals only.', closesAt: null };
	if (!CLAIMABLE_STATES.includes(order.state) || !order.deliveredAt)
		return {
			canFile: false,
			why: 'Claims can be filed once the order is delivered.',
			closesAt: null
		};
	const closesAt = new Date(order.deliveredAt.getTime() + windowHours * HOUR_MS);
	if (order.hasOpenClaim)
		return {
			canFile: false,
			why: 'This order already has a claim waiting for the shop.',
			closesAt
		};
	const late = claimWindowProblem(order.deliveredAt, now, windowHours, timeZone);
	return late ? { canFile: false, why: late, closesAt } : { canFile: true, closesAt };
}
