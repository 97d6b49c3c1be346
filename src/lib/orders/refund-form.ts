// The admin's refund form on an order page: an amount typed in dollars, or counts per
// line with a restock tick, and a reason. Pure, so the page and the server read it alike.
import { z } from 'zod';
import { parseDollarsToCents } from '$lib/shipping/settings-schema';

export const REFUND_REASON_MAX = 500;

/** Why a typed refund amount (dollars) cannot be refunded, or null when it can. */
export function refundAmountProblem(amount: string): string | null {
	if (/^\$?\s*-/.test(amount)) return 'A refund cannot be negative.';
	const parsed = parseDollarsToCents(amount);
	if (!parsed.ok) return parsed.problem;
	return parsed.cents === 0 ? 'A refund must be more than $0.00.' : null;
}

export const refundFormSchema = z
	.object({
		/** The order's line ids, in the order the quantity boxes are shown. */
		lineId: z.array(z.number().int()).default([]),
		/** How many of each line go back (blank for none). */
		lineQuantity: z.array(z.string().max(6)).default([]),
		/** The lines whose refunded animals go back on the shelf. */
		restock: z.array(z.number().int()).default([]),
		amount: z.string().trim().max(20).default(''),
		reason: z
			.string()
			.trim()
			.min(1, 'Say why the money goes back: the buyer reads it.')
			.max(REFUND_REASON_MAX, `Keep the reason under ${REFUND_REASON_MAX} characters.`)
	})
	.superRefine((form, ctx) => {
		let picked = 0;
		form.lineQuantity.forEach((text, index) => {
			const typed = text.trim();
			if (typed === '') return;
			if (!/^\d+$/.test(typed)) {
				ctx.addIssue({
					code: 'custom',
					path: ['lineQuantity', index],
					message: 'A whole number of animals, or blank.'
				});
				return;
			}
			picked += Number(typed);
		});
		if (form.amount !== '') {
			const problem = refundAmountProblem(form.amount);
			if (problem) ctx.addIssue({ code: 'custom', path: ['amount'], message: problem });
		} else if (picked === 0) {
			ctx.addIssue({
				code: 'custom',
				path: ['amount'],
				message: 'Type an amount, or give how many of a line go back.'
			});
		}
	});

export type RefundForm = z.infer<typeof refundFormSchema>;

/** A valid form as the refund's amount (when typed) and its lines. */
export function refundRequestOf(form: RefundForm): {
	amountCents?: number;
	lines: Array<{ orderLineId: number; quantity: number; restock: boolean }>;
} {
	const lines = form.lineId.flatMap((orderLineId, index) => {
		const quantity = Number((form.lineQuantity[index] ?? '').trim() || '0');
		return quantity > 0
			? [{ orderLineId, quantity, restock: form.restock.includes(orderLineId) }]
			: [];
	});
	const parsed = form.amount === '' ? undefined : parseDollarsToCents(form.amount);
	return parsed?.ok ? { amountCents: parsed.cents, lines } : { lines };
}
