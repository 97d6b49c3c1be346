// The dispatch board's forms: "check again now", and a keeper's override of the
// computed decision, which always needs a written reason.
import { z } from 'zod';
import { MAX_INTEGER_COLUMN, NO_SUCH_ROW } from '$lib/forms/row-id';

const orderId = z.number().int().positive().max(MAX_INTEGER_COLUMN, NO_SUCH_ROW);

export const recheckSchema = z.object({ orderId });

export const overrideSchema = z
	.object({
		orderId,
		decision: z.enum(['ship', 'hold'], { error: 'Ship on a date, or hold.' }),
		shipDate: z
			.union([z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Pick a date.'), z.literal('')])
			.default(''),
		reason: z
			.string()
			.trim()
			.min(10, 'Write why, in a sentence: the audit log keeps it.')
			.max(1000, 'Keep the reason under 1,000 characters.')
	})
	.superRefine((form, ctx) => {
		if (form.decision === 'ship' && !form.shipDate)
			ctx.addIssue({ code: 'custom', path: ['shipDate'], message: 'Pick the day it ships.' });
	});
export type OverrideForm = z.infer<typeof overrideSchema>;
