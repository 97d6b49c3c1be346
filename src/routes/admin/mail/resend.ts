// The "send again" form of /admin/mail: only the id of the failed row.
import { z } from 'zod';

export const resendSchema = z.object({
	id: z.number({ error: 'Pick a mail to send again.' }).int().positive()
});

export type ResendInput = z.infer<typeof resendSchema>;

/** Each failed row has its own form, told apart by this id. */
export function resendFormId(mailId: number): string {
	return `resend-${mailId}`;
}
