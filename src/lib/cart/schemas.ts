// What the cart's JSON routes and form actions accept. Quantities arrive as text from a
// form and as numbers from fetch; both are coerced, then must be whole and in range, with
// a sentence for beside the field when they are not.
import { z } from 'zod';
import { MAX_LINE_QUANTITY } from '$lib/money/pricing';

const listingId = z.coerce
	.number({ error: 'Choose a listing.' })
	.int('Choose a listing.')
	.positive('Choose a listing.')
	.max(2_147_483_647, 'Choose a listing.');

const quantity = z.coerce
	.number({ error: 'Enter a number.' })
	.refine(Number.isFinite, 'Enter a number.')
	.refine(Number.isInteger, 'Order whole units.')
	.refine((n) => n >= 1, 'Order at least 1, or remove the line.')
	.refine((n) => n <= MAX_LINE_QUANTITY, `At most ${MAX_LINE_QUANTITY} of one listing per order.`);

export const cartLineSchema = z.object({ listingId, quantity });
export const cartRemoveSchema = z.object({ listingId });
export type CartLineInput = z.infer<typeof cartLineSchema>;

/** The first problem of each field, for beside the fields. */
export function fieldProblems(
	error: z.ZodError
): Partial<Record<'listingId' | 'quantity', string>> {
	const problems: Partial<Record<'listingId' | 'quantity', string>> = {};
	for (const issue of error.issues) {
		const field = issue.path[0];
		if ((field === 'listingId' || field === 'quantity') && !problems[field])
			problems[field] = issue.message;
	}
	return problems;
}
