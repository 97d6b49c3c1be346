// The account forms' fields. Strength of a new password is checked on the
// server (passwords.ts), where the leaked-password list lives.
import { z } from 'zod';

const email = z
	.string()
	.trim()
	.min(1, 'Enter your e-mail address.')
	.max(254, 'That address is too long.')
	.pipe(z.email('Enter an e-mail address like name@example.com.'));

export const passwordSignInSchema = z.object({
	email,
	password: z.string().min(1, 'Enter your password.').max(200),
	next: z.string().max(500).default('')
});

export const linkSignInSchema = z.object({
	email,
	next: z.string().max(500).default('')
});

export const signUpSchema = z.object({
	name: z
		.string()
		.trim()
		.min(1, 'Tell us what to call you.')
		.max(80, 'Keep it under 80 characters.'),
	email,
	password: z.string().max(200, 'Use at most 200 characters.')
});

export const resetRequestSchema = z.object({ email });

export const newPasswordSchema = z
	.object({
		password: z.string().max(200, 'Use at most 200 characters.'),
		confirm: z.string().max(200)
	})
	.refine((v) => v.password === v.confirm, {
		message: 'The two passwords differ.',
		path: ['confirm']
	});

/** Only a path on this site may follow sign-in, never another origin. */
export function safeNext(next: string | null | undefined): string {
	if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return '/';
	return next;
}

const US_STATES = [
	'AL',
	'AK',
	'AZ',
	'AR',
	'CA',
	'CO',
	'CT',
	'DE',
	'DC',
	'FL',
	'GA',
	'HI',
	'ID',
	'IL',
	'IN',
	'IA',
	'KS',
	'KY',
	'LA',
	'ME',
	'MD',
	'MA',
	'MI',
	'MN',
	'MS',
	'MO',
	'MT',
	'NE',
	'NV',
	'NH',
	'NJ',
	'NM',
	'NY',
	'NC',
	'ND',
	'OH',
	'OK',
	'OR',
	'PA',
	'RI',
	'SC',
	'SD',
	'TN',
	'TX',
	'UT',
	'VT',
	'VA',
	'WA',
	'WV',
	'WI',
	'WY'
] as const;
export { US_STATES };

const optionalLine = z.string().trim().max(120, 'Keep it under 120 characters.');

/** The profile: name, a default shipping address (all or nothing), and mail choices. */
export const profileSchema = z
	.object({
		name: z
			.string()
			.trim()
			.min(1, 'Tell us what to call you.')
			.max(80, 'Keep it under 80 characters.'),
		ship_name: optionalLine,
		ship_line1: optionalLine,
		ship_line2: optionalLine,
		ship_city: optionalLine,
		ship_state: z
			.string()
			.refine((v) => v === '' || (US_STATES as readonly string[]).includes(v), 'Choose a state.'),
		ship_zip: z
			.string()
			.trim()
			.regex(/^(\d{5})?$/, 'A US ZIP code has five digits.'),
		wants_waitlist_mail: z.boolean().default(false),
		wants_stock_news: z.boolean().default(false)
	})
	.superRefine((v, ctx) => {
		const address = [v.ship_name, v.ship_line1, v.ship_city, v.ship_state, v.ship_zip];
		if (address.every((part) => part === '') && v.ship_line2 === '') return;
		const required: Array<[keyof typeof v, string]> = [
			['ship_name', 'Who should the box be addressed to?'],
			['ship_line1', 'Enter the street address.'],
			['ship_city', 'Enter the city.'],
			['ship_state', 'Choose a state.'],
			['ship_zip', 'Enter the ZIP code.']
		];
		for (const [field, text] of required) {
			if (v[field] === '') ctx.addIssue({ code: 'custom', path: [field], message: text });
		}
	});

export const ROLES = ['customer', 'keeper', 'admin'] as const;

export const roleChangeSchema = z.object({
	userId: z.uuid('Unknown account.'),
	role: z.enum(ROLES, 'Choose customer, keeper or admin.')
});

export const disableSchema = z.object({
	userId: z.uuid('Unknown account.'),
	disabled: z.boolean()
});
