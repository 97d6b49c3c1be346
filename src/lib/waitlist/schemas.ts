// The waitlist forms. A guest gives an e-mail; a signed-in customer, the confirm and
// the leave pages only press a button, so their schemas carry no fields.
import { z } from 'zod';
import { MAX_INTEGER_COLUMN } from '$lib/forms/row-id';

export const guestJoinSchema = z.object({
	email: z
		.string()
		.trim()
		.min(1, 'Enter your e-mail address.')
		.max(254, 'That address is too long.')
		.pipe(z.email('Enter an e-mail address like name@example.com.'))
});

/** One button: the account's own address is used. */
export const customerJoinSchema = z.object({});

/** The button on a confirm or leave link's page; the token is in the address. */
export const linkButtonSchema = z.object({});

/** "Leave" beside one entry on the account page. */
export const leaveEntrySchema = z.object({
	entryId: z
		.number({ error: 'Pick a waitlist to leave.' })
		.int()
		.positive()
		.max(MAX_INTEGER_COLUMN, 'Pick a waitlist to leave.')
});

export type GuestJoinInput = z.infer<typeof guestJoinSchema>;
export type LeaveEntryInput = z.infer<typeof leaveEntrySchema>;

export const LEAVE_FORM_PREFIX = 'waitlist-leave-';

/** Each entry on the account page has its own leave form, told apart by this id. */
export function leaveFormId(entryId: number): string {
	return `${LEAVE_FORM_PREFIX}${entryId}`;
}
