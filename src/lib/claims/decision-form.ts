// The owner's three decisions on an open claim: refund (an amount in dollars, or the
// dead lines' share when left blank, and a note), reship at no charge (a note), or
// decline (a reason). The customer reads every note. Pure, so page and server agree.
import { z } from 'zod';
import { refundAmountProblem, REFUND_REASON_MAX } from '$lib/orders/refund-form';
import { parseDollarsToCents } from '$lib/shipping/settings-schema';

/** Notes and reasons the customer reads: a claim refund's note is the refund's reason. */
export const CLAIM_NOTE_MAX = REFUND_REASON_MAX;
/** The shortest decline reason; the claims module refuses shorter ones with the same number. */
export const DECLINE_REASON_MIN = 10;

const noteTooLong = `Keep it under ${CLAIM_NOTE_MAX} characters.`;

export const claimRefundSchema = z
	.object({
		amount: z.string().trim().max(20).default(''),
		note: z
			.string()
			.trim()
			.min(1, 'Write the customer a line on the refund: they read it.')
			.max(CLAIM_NOTE_MAX, noteTooLong)
	})
	.superRefine((form, ctx) => {
		const problem = form.amount === '' ? null : refundAmountProblem(form.amount);
		if (problem) ctx.addIssue({ code: 'custom', path: ['amount'], message: problem });
	});
export type ClaimRefundForm = z.infer<typeof claimRefundSchema>;

export const claimReshipSchema = z.object({
	note: z.string().trim().max(CLAIM_NOTE_MAX, noteTooLong).default('')
});
export type ClaimReshipForm = z.infer<typeof claimReshipSchema>;

export const claimDeclineSchema = z.object({
	reason: z
		.string()
		.trim()
		.min(
			DECLINE_REASON_MIN,
			`Give the customer a reason of at least ${DECLINE_REASON_MIN} characters.`
		)
		.max(CLAIM_NOTE_MAX, noteTooLong)
});
export type ClaimDeclineForm = z.infer<typeof claimDeclineSchema>;

/** The typed amount in cents, or undefined for "the dead lines' share". */
export function refundCentsOf(form: ClaimRefundForm): number | undefined {
	if (form.amount === '') return undefined;
	const parsed = parseDollarsToCents(form.amount);
	return parsed.ok ? parsed.cents : undefined;
}

/** What a decision action answers with; the page shows it as a notice. */
export type DecisionMessage = { ok: boolean; text: string };
