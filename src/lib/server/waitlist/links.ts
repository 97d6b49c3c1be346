// The links in waitlist mail. A confirm link carries a random token whose SHA-256 is
// stored (auth/tokens.ts). A leave link must keep working for as long as the entry
// exists, in every mail, and the table keeps no second token, so it is signed instead:
// the entry id and an HMAC-SHA-256 of the id and the address under the shop's secret.
// Leaving deletes the entry, so its old links stop working with it.
//
// No $env here: the request side passes the app's origin and secret, the job its options.
import { createHmac, timingSafeEqual } from 'node:crypto';

export interface WaitlistLinks {
	/** The shop's public origin, e.g. https://shop.example.com (no trailing slash needed). */
	origin: string;
	/** The app's AUTH_SECRET; at least 32 characters. */
	secret: string;
}

/** Keeps leave signatures apart from anything else the same secret signs. */
const LEAVE_PURPOSE = 'hatchlot:waitlist-leave:v1';

/** HMAC-SHA-256 of `message` under `key`, as lower-case hex. */
export function hmacSha256Hex(key: string, message: string): string {
	return createHmac('sha256', key).update(message).digest('hex');
}

function leaveSignature(secret: string, entryId: number, email: string): Buffer {
	if (secret.length < 32)
		throw new Error('the waitlist link secret must be at least 32 characters');
	return createHmac('sha256', secret).update(`${LEAVE_PURPOSE}\n${entryId}\n${email}`).digest();
}

/** `<entry id>.<signature>`: opaque to the reader, checked by readLeaveToken. */
export function leaveToken(secret: string, entryId: number, email: string): string {
	return `${entryId}.${leaveSignature(secret, entryId, email).toString('base64url')}`;
}

/** The entry id a leave token names, or null when it is not shaped like one. */
export function leaveTokenEntryId(token: string): number | null {
	const match = /^([1-9][0-9]{0,9})\.([A-Za-z0-9_-]{43})$/.exec(token);
	if (!match) return null;
	const id = Number(match[1]);
	return id <= 2_147_483_647 ? id : null;
}

/** Whether `token` was signed for this entry and address (compared in constant time). */
export function leaveTokenMatches(
	secret: string,
	token: string,
	entry: { id: number; email: string }
): boolean {
	if (leaveTokenEntryId(token) !== entry.id) return false;
	const given = Buffer.from(token.slice(token.indexOf('.') + 1), 'base64url');
	const expected = leaveSignature(secret, entry.id, entry.email);
	return given.length === expected.length && timingSafeEqual(given, expected);
}

function absolute(links: WaitlistLinks, path: string): string {
	return `${links.origin.replace(/\/+$/, '')}${path}`;
}

export function confirmUrl(links: WaitlistLinks, token: string): string {
	return absolute(links, `/waitlist/confirm/${encodeURIComponent(token)}`);
}

export function leaveUrl(links: WaitlistLinks, entry: { id: number; email: string }): string {
	return absolute(links, `/waitlist/leave/${leaveToken(links.secret, entry.id, entry.email)}`);
}

export function listingUrl(links: WaitlistLinks, slug: string): string {
	return absolute(links, `/listings/${encodeURIComponent(slug)}`);
}

export function speciesWaitlistUrl(links: WaitlistLinks, slug: string): string {
	return absolute(links, `/species/${encodeURIComponent(slug)}/waitlist`);
}
