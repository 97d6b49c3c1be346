// The "send again" form of /admin/mail: only the id of the failed row.
import { z } from 'zod';
import { MAX_INTEGER_COLUMN } from '$lib/forms/row-id';

export const resendSchema = z.object({
	id: z
		.number({ error: 'Pick a mail to send again.' })
		.int()
		.positive()
		.max(MAX_INTEGER_COLUMN, 'Pick a mail to send again.')
});

export type ResendInput = z.infer<typeof resendSchema>;

/** Each failed row has its own form, told apart by this id. */
export function resendFormId(mailId: number): string {
	return `resend-${mailId}`;
}
