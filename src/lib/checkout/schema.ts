// The checkout form's fields: where the box goes, how fast, and the buyer's word that
// they read the live-arrival terms and their state's rules. The ZIP's existence, its
// state and the shipping area are checked on the server (the ZIP data is server-only).
import { z } from 'zod';
import { US_STATES } from '$lib/accounts/schemas';

const line = (missing: string) =>
	z.string().trim().min(1, missing).max(120, 'Keep it under 120 characters.');

export const checkoutSchema = z.object({
	email: z
		.string()
		.trim()
		.min(1, 'Enter the e-mail address for the receipt.')
		.max(254, 'That address is too long.')
		.pipe(z.email('Enter an e-mail address like name@example.com.')),
	ship_name: line('Who should the box be addressed to?'),
	ship_line1: line('Enter the street address.'),
	ship_line2: z.string().trim().max(120, 'Keep it under 120 characters.').default(''),
	ship_city: line('Enter the city.'),
	ship_state: z
		.string()
		.refine((v) => (US_STATES as readonly string[]).includes(v), 'Choose a state.'),
	ship_zip: z
		.string()
		.trim()
		.regex(/^\d{5}$/, 'A US ZIP code has five digits.'),
	service: z.enum(['overnight', 'two_day']).default('overnight'),
	// A boolean (false until ticked), never pre-ticked: the buyer's own word is what counts.
	terms: z
		.boolean()
		.default(false)
		.refine(
			(ticked) => ticked,
			"Tick this once you have read the live-arrival terms and checked your state's rules."
		)
});

export type CheckoutForm = z.infer<typeof checkoutSchema>;
