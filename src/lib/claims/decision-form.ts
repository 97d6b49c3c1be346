// The owner's three decisions on an open claim: refund (an amount in dollars, or the
// dead lines' share when left blank, and a note), reship at no charge (a note), or
// decline (a reason). The customer reads every note. Pure, so page and server agree.
import { z } from 'zod';
import { parseDollarsToCents } from '$lib/shipping/settings-schema';

/** Notes and reasons the customer reads; the refund module keeps reasons to 500 characters. */
export const CLAIM_NOTE_MAX = 500;
/** Matches the claims module's MIN_DECLINE_REASON (the integration test holds them together). */
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
		if (form.amount === '') return;
		if (/^\$?\s*-/.test(form.amount)) {
			ctx.addIssue({ code: 'custom', path: ['amount'], message: 'A refund cannot be negative.' });
			return;
		}
		const parsed = parseDollarsToCents(form.amount);
		if (!parsed.ok) ctx.addIssue({ code: 'custom', path: ['amount'], message: parsed.problem });
		else if (parsed.cents === 0)
			ctx.addIssue({
				code: 'custom',
				path: ['amount'],
				message: 'A refund must be more than $0.00.'
			});
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
