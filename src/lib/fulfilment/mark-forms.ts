// The ship-day marking forms: packed (one box or the day's batch), shipped with carrier
// and tracking number, delivered, an admin's undo with a reason, and the late-delivery
// e-mail. Shapes only: the published tracking formats are checked on the server by
// markShipped (src/lib/server/fulfilment/marks.ts), which answers with the field.
import { z } from 'zod';
import { MAX_INTEGER_COLUMN } from '$lib/forms/row-id';
import { MOVE_REASON_MIN_LENGTH } from '$lib/orders/state-machine';
import type { OrderState } from '$lib/server/db/schema';
import {
	CARRIERS,
	needsTrackingNumber,
	normalizeTrackingNumber,
	TRACKING_NUMBER_MAX_LENGTH
} from './carriers';
import { instantFromShopTime } from './local-time';

/** A day's batch is at most this many boxes in one post (the slip batch's own ceiling). */
export const MAX_PACK_ORDERS = 1000;
/** A keeper's clock may run a little ahead of the server's. */
export const DELIVERY_CLOCK_SLACK_MS = 5 * 60_000;

const orderId = z
	.number({ error: 'Pick an order.' })
	.int()
	.positive()
	.max(MAX_INTEGER_COLUMN, 'Pick an order.');

export const packSchema = z.object({
	orderIds: z
		.array(orderId)
		.min(1, 'Pick at least one order to mark packed.')
		.max(MAX_PACK_ORDERS, `Mark at most ${MAX_PACK_ORDERS} orders at once.`),
	/** Orders whose changed ship check the keeper has looked at and packs anyway. */
	confirmChangedCheck: z.array(orderId).default([])
});
export type PackForm = z.infer<typeof packSchema>;

export const shipSchema = z
	.object({
		orderId,
		carrier: z.enum(CARRIERS, { error: 'Pick the carrier, or hand delivery.' }),
		trackingNumber: z
			.string()
			.trim()
			.max(TRACKING_NUMBER_MAX_LENGTH, 'That is longer than any tracking number.')
			.default(''),
		/** Ticked when a live box goes out on another day than its ship check cleared. */
		confirmOffDay: z.boolean().default(false)
	})
	.superRefine((form, ctx) => {
		if (needsTrackingNumber(form.carrier) && normalizeTrackingNumber(form.trackingNumber) === '')
			ctx.addIssue({
				code: 'custom',
				path: ['trackingNumber'],
				message: 'Enter the tracking number from the label (only hand delivery goes without one).'
			});
	});
export type ShipForm = z.infer<typeof shipSchema>;

export const deliverSchema = z.object({
	orderId,
	/** On the shop's clock, as a datetime-local input sends it; empty means now. */
	deliveredAt: z
		.union([
			z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/, 'Pick the day and time.'),
			z.literal('')
		])
		.default('')
});
export type DeliverForm = z.infer<typeof deliverSchema>;

/** The marks an admin can undo, and the state each one goes back to. */
export const REVERSAL_TO = {
	packed: 'scheduled',
	shipped: 'packed',
	delivered: 'shipped'
} as const satisfies Partial<Record<OrderState, OrderState>>;
export type ReversibleMark = keyof typeof REVERSAL_TO;
export const REVERSIBLE_MARKS = Object.keys(REVERSAL_TO) as ReversibleMark[];

export const reverseSchema = z.object({
	orderId,
	/** The mark the admin saw and is undoing: a page gone stale undoes nothing. */
	from: z.enum(REVERSIBLE_MARKS as [ReversibleMark, ...ReversibleMark[]], {
		error: 'Only packed, shipped and delivered can be undone.'
	}),
	reason: z
		.string()
		.trim()
		.min(
			MOVE_REASON_MIN_LENGTH,
			`Write why in a sentence (at least ${MOVE_REASON_MIN_LENGTH} characters): the order's history keeps it.`
		)
		.max(1000, 'Keep the reason under 1,000 characters.')
});
export type ReverseForm = z.infer<typeof reverseSchema>;

export const lateNoticeSchema = z.object({ orderId });
export type LateNoticeForm = z.infer<typeof lateNoticeSchema>;

/** The pack form as markPacked's items; `checkChanged` is the page's own verdict per order. */
export function packItemsFrom(
	form: PackForm,
	checkChanged: (orderId: number) => boolean
): { orderId: number; checkChanged: boolean; confirmChangedCheck: boolean }[] {
	return [...new Set(form.orderIds)].map((id) => ({
		orderId: id,
		checkChanged: checkChanged(id),
		confirmChangedCheck: form.confirmChangedCheck.includes(id)
	}));
}

/**
 * The delivery instant the deliver form names (now when left empty), or the sentence
 * for the field. `now` is the server's clock.
 */
export function deliveredAtFrom(
	value: string,
	timeZone: string,
	now: Date
): { ok: true; at: Date } | { ok: false; problem: string } {
	if (value === '') return { ok: true, at: now };
	const at = instantFromShopTime(value, timeZone);
	if (!at)
		return {
			ok: false,
			problem:
				"That time does not exist on the shop's clock (the clocks went forward); pick another."
		};
	if (at.getTime() > now.getTime() + DELIVERY_CLOCK_SLACK_MS)
		return { ok: false, problem: 'That is in the future: mark it delivered once it has arrived.' };
	return { ok: true, at };
}
