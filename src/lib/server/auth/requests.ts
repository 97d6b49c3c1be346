// Small helpers the account routes share: the client's address, the limit
// check with its audit entry, and setting the session cookie.
import type { Cookies, RequestEvent } from '@sveltejs/kit';
import { writeAudit } from '../audit';
import { getDb } from '../db';
import { accountLimits, authSettings } from '.';
import type { LimitedAction } from './limits';
import { createSession, endSession, sessionCookieName, sessionCookieOptions } from './sessions';

export function clientAddress(event: Pick<RequestEvent, 'getClientAddress'>): string | null {
	try {
		return event.getClientAddress();
	} catch {
		return null;
	}
}

/** null when allowed; otherwise the sentence to show. A burst is audited once. */
export async function limitProblem(
	event: Pick<RequestEvent, 'getClientAddress'>,
	action: LimitedAction,
	email: string
): Promise<string | null> {
	const address = clientAddress(event) ?? 'unknown';
	const verdict = await accountLimits().consume(action, address, email);
	if (verdict.allowed) return null;
	if (verdict.firstRefusal) {
		await writeAudit(getDb(), {
			actorUserId: null,
			actorIp: clientAddress(event),
			action: 'account.limit_reached',
			entity: 'account_form',
			entityId: action,
			detail: { email: email.toLowerCase() }
		});
	}
	const minutes = Math.ceil(verdict.retryAfterSeconds / 60);
	return `Too many tries. Please wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again.`;
}

/** A fresh session for this sign-in; whatever session the browser had ends, so its id never carries over. */
export async function startSession(
	cookies: Cookies,
	userId: string,
	previousToken: string | null
): Promise<void> {
	const db = getDb();
	if (previousToken) await endSession(db, previousToken);
	const secure = authSettings().secure;
	const token = await createSession(db, userId);
	cookies.set(sessionCookieName(secure), token, sessionCookieOptions(secure));
}

export async function finishSession(cookies: Cookies, token: string | null): Promise<void> {
	if (token) await endSession(getDb(), token);
	cookies.delete(sessionCookieName(authSettings().secure), { path: '/' });
}
