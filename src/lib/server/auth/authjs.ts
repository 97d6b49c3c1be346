// Auth.js: e-mail sign-in links (Nodemailer provider) with database sessions
// kept by its Kysely adapter in our PostgreSQL. Passwords are ours (accounts.ts)
// but end in the same "Session" table and cookie, so one reader serves both.
import { Auth, raw, skipCSRFCheck, type AuthConfig } from '@auth/core';
import { KyselyAdapter } from '@auth/kysely-adapter';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import type { Kysely } from 'kysely';
import type { Database } from '../db/schema';
import { queueMail } from '../mail';
import { writeAudit } from '../audit';
import { logger as log } from '../log';
import { claimGuestOrders } from './accounts';
import { SESSION_DAYS, sessionCookieName, sessionCookieOptions } from './sessions';

export const SIGN_IN_LINK_MINUTES = 15;

export type AuthSettings = {
	db: Kysely<Database>;
	secret: string;
	origin: string;
	secure: boolean;
	smtpUrl: string;
	mailFrom: string;
};

export function authConfig(settings: AuthSettings): AuthConfig {
	const { db } = settings;
	return {
		// The adapter types its own view of the four Auth.js tables; ours is a superset.
		adapter: KyselyAdapter(db as unknown as Parameters<typeof KyselyAdapter>[0]),
		secret: settings.secret,
		basePath: '/auth',
		trustHost: true,
		// SvelteKit already refuses cross-origin form posts; Auth.js's own token would be a second copy.
		skipCSRFCheck,
		// Auth.js's own lines go through the app's logger: JSON like the rest, and scrubbed.
		logger: {
			error: (error) => log.error({ err: error }, `[auth] ${error.name}`),
			warn: (code) => log.warn(`[auth] ${code}`),
			debug: (message, metadata) => log.debug({ metadata }, `[auth] ${message}`)
		},
		useSecureCookies: settings.secure,
		session: { strategy: 'database', maxAge: SESSION_DAYS * 86_400, updateAge: 86_400 },
		cookies: {
			sessionToken: {
				name: sessionCookieName(settings.secure),
				options: { ...sessionCookieOptions(settings.secure), maxAge: undefined }
			}
		},
		pages: {
			signIn: '/signin',
			verifyRequest: '/signin/check-email',
			error: '/signin/link-problem'
		},
		providers: [
			Nodemailer({
				server: settings.smtpUrl,
				from: settings.mailFrom,
				maxAge: SIGN_IN_LINK_MINUTES * 60,
				// Through our mail queue: the request never waits on SMTP, and a failed send retries.
				async sendVerificationRequest({ identifier, url }) {
					await queueMail(db, {
						kind: 'sign_in_link',
						to: identifier,
						url,
						expiresInMinutes: SIGN_IN_LINK_MINUTES
					});
				}
			})
		],
		callbacks: {
			async signIn({ user }) {
				if (!user.email) return false;
				const row = await db
					.selectFrom('User as u')
					.innerJoin('user_role as r', 'r.user_id', 'u.id')
					.select('r.disabled_at')
					.where('u.email', '=', user.email.toLowerCase())
					.executeTakeFirst();
				return !row?.disabled_at;
			}
		},
		events: {
			async createUser({ user }) {
				if (!user.id) return;
				await db
					.insertInto('user_role')
					.values({ user_id: user.id, role: 'customer' })
					.onConflict((oc) => oc.column('user_id').doNothing())
					.execute();
			},
			async signIn({ user }) {
				if (!user.id || !user.email) return;
				const claimed = await claimGuestOrders(db, user.id, user.email);
				await writeAudit(db, {
					actorUserId: user.id,
					actorIp: null,
					action: 'account.sign_in_link',
					entity: 'user',
					entityId: user.id,
					detail: { guestOrdersClaimed: claimed }
				});
			}
		}
	};
}

/** Asks Auth.js to e-mail a sign-in link, as its own sign-in endpoint would. */
export async function requestSignInLink(
	config: AuthConfig,
	origin: string,
	email: string,
	callbackUrl: string
): Promise<void> {
	const request = new Request(`${origin}/auth/signin/nodemailer`, {
		method: 'POST',
		headers: { 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email, callbackUrl })
	});
	const result = await Auth(request, { ...config, raw });
	const redirect = (result as { redirect?: string }).redirect ?? '';
	if (redirect.includes('error=')) {
		const reason = new URL(redirect, origin).searchParams.get('error');
		throw new Error(`Auth.js refused the sign-in link request (${reason})`);
	}
}
