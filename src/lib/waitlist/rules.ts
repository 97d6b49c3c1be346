// What joining a species' waitlist does to the entry already there (if any). Pure: the
// server module reads the row under a lock, asks here, and writes what it is told.

/** How long a guest's confirmation link works, counted from when it was sent. */
export const CONFIRM_LINK_DAYS = 7;
const DAY_MS = 24 * 60 * 60 * 1000;

/** The parts of a waitlist_entry row the rules look at. */
export interface EntryState {
	confirmedAt: Date | null;
	notifiedAt: Date | null;
}

/**
 * A guest's join, by e-mail only, so nothing here may depend on who is asking:
 * - `create`: a new entry, unconfirmed, with a fresh link;
 * - `reissue`: not confirmed yet (or already told about an earlier listing): a fresh
 *   link replaces the old one and the entry waits for confirmation again;
 * - `nothing`: confirmed and still waiting; a stranger typing the address changes nothing.
 */
export type GuestJoinStep = 'create' | 'reissue' | 'nothing';

export function guestJoinStep(existing: EntryState | null): GuestJoinStep {
	if (!existing) return 'create';
	if (existing.confirmedAt && !existing.notifiedAt) return 'nothing';
	return 'reissue';
}

/**
 * A signed-in customer's join with the account's own (verified) address:
 * - `create`: a new entry, confirmed at once;
 * - `confirm`: an unconfirmed guest entry for the same address: the sign-in proves it;
 * - `rejoin`: they were told about an earlier listing and want to wait for the next one;
 * - `already`: confirmed and waiting.
 */
export type CustomerJoinStep = 'create' | 'confirm' | 'rejoin' | 'already';

export function customerJoinStep(existing: EntryState | null): CustomerJoinStep {
	if (!existing) return 'create';
	if (!existing.confirmedAt) return 'confirm';
	if (existing.notifiedAt) return 'rejoin';
	return 'already';
}

/** When a link sent at `sentAt` stops working. */
export function confirmLinkExpiresAt(sentAt: Date): Date {
	return new Date(sentAt.getTime() + CONFIRM_LINK_DAYS * DAY_MS);
}

export function confirmLinkExpired(sentAt: Date, now: Date): boolean {
	return now.getTime() >= confirmLinkExpiresAt(sentAt).getTime();
}

/** Where an entry stands, as the account page and the join page say it. */
export type WaitlistStanding = 'unconfirmed' | 'waiting' | 'told';

export function standingOf(entry: EntryState): WaitlistStanding {
	if (!entry.confirmedAt) return 'unconfirmed';
	return entry.notifiedAt ? 'told' : 'waiting';
}

/** Addresses are stored lower-case (the table's CHECK), so one mailbox is one entry. */
export function normaliseWaitlistEmail(email: string): string {
	return email.trim().toLowerCase();
}
