// Database sessions in the Auth.js "Session" table: the password sign-in makes
// them here, the e-mail link sign-in through Auth.js, and both are read here.
import type { Kysely } from 'kysely';
import type { Database } from '../db/schema';
import type { SessionUser } from './guard';
import { newSecret } from './tokens';

export const SESSION_DAYS = 30;
/** Extend a session's expiry at most once a day, not on every request. */
const REFRESH_AFTER_MS = 24 * 60 * 60 * 1000;

export function sessionCookieName(secure: boolean): string {
	return secure ? '__Secure-hatchlot.session' : 'hatchlot.session';
}

export function sessionCookieOptions(secure: boolean) {
	return {
		path: '/',
		httpOnly: true,
		sameSite: 'lax' as const,
		secure,
		maxAge: SESSION_DAYS * 86_400
	};
}

/** Loopback stays plain HTTP for development; every other origin must be HTTPS. */
export function cookiesMustBeSecure(origin: string): boolean {
	const { protocol, hostname } = new URL(origin);
	const loopback = hostname === '127.0.0.1' || hostname === 'localhost' || hostname === '[::1]';
	return protocol === 'https:' || !loopback;
}

export async function createSession(
	db: Kysely<Database>,
	userId: string,
	now = new Date()
): Promise<string> {
	const token = newSecret();
	await db
		.insertInto('Session')
		.values({
			sessionToken: token,
			userId,
			expires: new Date(now.getTime() + SESSION_DAYS * 86_400_000)
		})
		.execute();
	return token;
}

/** The user behind a live session, or null (unknown, expired, or disabled). */
export async function resolveSession(
	db: Kysely<Database>,
	token: string,
	now = new Date()
): Promise<SessionUser | null> {
	const row = await db
		.selectFrom('Session as s')
		.innerJoin('User as u', 'u.id', 's.userId')
		.leftJoin('user_role as r', 'r.user_id', 'u.id')
		.select(['u.id', 'u.name', 'u.email', 'r.role', 'r.disabled_at', 's.expires'])
		.where('s.sessionToken', '=', token)
		.executeTakeFirst();
	if (!row || row.expires <= now) return null;
	if (row.disabled_at) {
		await endSession(db, token);
		return null;
	}
	const remaining = row.expires.getTime() - now.getTime();
	if (SESSION_DAYS * 86_400_000 - remaining > REFRESH_AFTER_MS) {
		await db
			.updateTable('Session')
			.set({ expires: new Date(now.getTime() + SESSION_DAYS * 86_400_000) })
			.where('sessionToken', '=', token)
			.execute();
	}
	return { id: row.id, name: row.name, email: row.email, role: row.role ?? 'customer' };
}

export async function endSession(db: Kysely<Database>, token: string): Promise<void> {
	await db.deleteFrom('Session').where('sessionToken', '=', token).execute();
}

export async function endAllSessions(db: Kysely<Database>, userId: string): Promise<void> {
	await db.deleteFrom('Session').where('userId', '=', userId).execute();
}
