// Password accounts: sign-up, e-mail verification, sign-in, reset. Answers
// never reveal whether an e-mail has an account; the mail says it instead.
import { sql, type Kysely } from 'kysely';
import type { Database } from '../db/schema';
import { queueMail } from '../mail';
import { writeAudit } from '../audit';
import { decoyHash, hashPassword, verifyPassword } from './passwords';
import { endAllSessions } from './sessions';
import { hashSecret, newSecret } from './tokens';
import type { SessionUser } from './guard';

export const VERIFY_LINK_MINUTES = 24 * 60;
export const RESET_LINK_MINUTES = 60;

type Db = Kysely<Database>;
type Actor = { ip: string | null };

export function normaliseEmail(email: string): string {
	return email.trim().toLowerCase();
}

async function issueToken(
	db: Db,
	userId: string,
	purpose: 'verify_email' | 'reset_password',
	minutes: number,
	now: Date
): Promise<string> {
	const token = newSecret();
	// One live link per purpose: a new one replaces the old.
	await db
		.deleteFrom('account_token')
		.where('user_id', '=', userId)
		.where('purpose', '=', purpose)
		.where('used_at', 'is', null)
		.execute();
	await db
		.insertInto('account_token')
		.values({
			token_hash: hashSecret(token),
			purpose,
			user_id: userId,
			expires_at: new Date(now.getTime() + minutes * 60_000)
		})
		.execute();
	return token;
}

export async function signUp(
	db: Db,
	input: { name: string; email: string; password: string },
	origin: string,
	actor: Actor,
	now = new Date()
): Promise<void> {
	const email = normaliseEmail(input.email);
	const passwordHash = await hashPassword(input.password);
	await db.transaction().execute(async (trx) => {
		const existing = await trx
			.selectFrom('User')
			.select(['id', 'name'])
			.where('email', '=', email)
			.executeTakeFirst();
		if (existing) {
			const hasPassword = await trx
				.selectFrom('user_password')
				.select('user_id')
				.where('user_id', '=', existing.id)
				.executeTakeFirst();
			if (hasPassword) {
				const token = await issueToken(trx, existing.id, 'reset_password', RESET_LINK_MINUTES, now);
				await queueMail(trx, {
					kind: 'account_exists',
					to: email,
					url: `${origin}/reset/${token}`,
					expiresInMinutes: RESET_LINK_MINUTES
				});
				return;
			}
		}
		// An account made earlier by a sign-in link gains a password here, once the address is confirmed.
		const userId =
			existing?.id ??
			(
				await trx
					.insertInto('User')
					.values({ name: input.name.trim(), email })
					.returning('id')
					.executeTakeFirstOrThrow()
			).id;
		if (!existing)
			await trx.insertInto('user_role').values({ user_id: userId, role: 'customer' }).execute();
		await trx
			.insertInto('user_password')
			.values({ user_id: userId, password_hash: passwordHash })
			.execute();
		const token = await issueToken(trx, userId, 'verify_email', VERIFY_LINK_MINUTES, now);
		await queueMail(trx, {
			kind: 'verify_email',
			to: email,
			name: existing?.name ?? input.name.trim(),
			url: `${origin}/verify/${token}`,
			expiresInMinutes: VERIFY_LINK_MINUTES
		});
		await writeAudit(trx, {
			actorUserId: userId,
			actorIp: actor.ip,
			action: 'account.sign_up',
			entity: 'user',
			entityId: userId,
			detail: { hadAccount: Boolean(existing) }
		});
	});
}

export type LinkOutcome =
	{ ok: true; userId: string } | { ok: false; reason: 'unknown' | 'expired' | 'used' };

async function takeToken(
	db: Db,
	token: string,
	purpose: 'verify_email' | 'reset_password',
	now: Date
): Promise<LinkOutcome> {
	const row = await db
		.selectFrom('account_token')
		.select(['user_id', 'expires_at', 'used_at'])
		.where('token_hash', '=', hashSecret(token))
		.where('purpose', '=', purpose)
		.forUpdate()
		.executeTakeFirst();
	if (!row) return { ok: false, reason: 'unknown' };
	if (row.used_at) return { ok: false, reason: 'used' };
	if (row.expires_at <= now) return { ok: false, reason: 'expired' };
	return { ok: true, userId: row.user_id };
}

/** Takes a one-time link inside the caller's transaction and marks it used. */
async function consumeToken(
	trx: Db,
	token: string,
	purpose: 'verify_email' | 'reset_password',
	now: Date
): Promise<LinkOutcome> {
	const outcome = await takeToken(trx, token, purpose, now);
	if (outcome.ok) {
		await trx
			.updateTable('account_token')
			.set({ used_at: now })
			.where('token_hash', '=', hashSecret(token))
			.execute();
	}
	return outcome;
}

/** Hands guest orders placed with this (now proven) e-mail to its account. */
export async function claimGuestOrders(db: Db, userId: string, email: string): Promise<number> {
	const result = await db
		.updateTable('customer_order')
		.set({ user_id: userId })
		.where('user_id', 'is', null)
		.where(sql<string>`lower(email)`, '=', email.toLowerCase())
		.executeTakeFirst();
	return Number(result.numUpdatedRows);
}

/** Marks the e-mail verified and gives the account any guest orders placed with it. */
export async function verifyEmail(
	db: Db,
	token: string,
	actor: Actor,
	now = new Date()
): Promise<LinkOutcome> {
	return db.transaction().execute(async (trx) => {
		const outcome = await consumeToken(trx, token, 'verify_email', now);
		if (!outcome.ok) return outcome;
		const user = await trx
			.updateTable('User')
			.set({ emailVerified: now })
			.where('id', '=', outcome.userId)
			.returning('email')
			.executeTakeFirstOrThrow();
		const claimed = await claimGuestOrders(trx, outcome.userId, user.email);
		await writeAudit(trx, {
			actorUserId: outcome.userId,
			actorIp: actor.ip,
			action: 'account.verify_email',
			entity: 'user',
			entityId: outcome.userId,
			detail: { guestOrdersClaimed: claimed }
		});
		return outcome;
	});
}

export type PasswordSignIn =
	{ ok: true; user: SessionUser } | { ok: false; reason: 'wrong' | 'unverified' | 'disabled' };

export async function checkPassword(
	db: Db,
	emailInput: string,
	password: string
): Promise<PasswordSignIn> {
	const email = normaliseEmail(emailInput);
	const row = await db
		.selectFrom('User as u')
		.leftJoin('user_password as p', 'p.user_id', 'u.id')
		.leftJoin('user_role as r', 'r.user_id', 'u.id')
		.select([
			'u.id',
			'u.name',
			'u.email',
			'u.emailVerified',
			'p.password_hash',
			'r.role',
			'r.disabled_at'
		])
		.where('u.email', '=', email)
		.executeTakeFirst();
	if (!row?.password_hash) {
		await verifyPassword(await decoyHash(), password);
		return { ok: false, reason: 'wrong' };
	}
	if (!(await verifyPassword(row.password_hash, password))) return { ok: false, reason: 'wrong' };
	if (row.disabled_at) return { ok: false, reason: 'disabled' };
	if (!row.emailVerified) return { ok: false, reason: 'unverified' };
	return {
		ok: true,
		user: { id: row.id, name: row.name, email: row.email, role: row.role ?? 'customer' }
	};
}

export async function requestPasswordReset(
	db: Db,
	emailInput: string,
	origin: string,
	now = new Date()
): Promise<void> {
	const email = normaliseEmail(emailInput);
	await db.transaction().execute(async (trx) => {
		const user = await trx
			.selectFrom('User')
			.select(['id', 'name'])
			.where('email', '=', email)
			.executeTakeFirst();
		if (!user) return;
		const token = await issueToken(trx, user.id, 'reset_password', RESET_LINK_MINUTES, now);
		await queueMail(trx, {
			kind: 'password_reset',
			to: email,
			name: user.name ?? '',
			url: `${origin}/reset/${token}`,
			expiresInMinutes: RESET_LINK_MINUTES
		});
	});
}

/** Checks a reset link without using it (the form page shows its state first). */
export async function peekResetToken(
	db: Db,
	token: string,
	now = new Date()
): Promise<LinkOutcome> {
	return takeToken(db, token, 'reset_password', now);
}

export async function resetPassword(
	db: Db,
	token: string,
	password: string,
	actor: Actor,
	now = new Date()
): Promise<LinkOutcome> {
	const passwordHash = await hashPassword(password);
	return db.transaction().execute(async (trx) => {
		const outcome = await consumeToken(trx, token, 'reset_password', now);
		if (!outcome.ok) return outcome;
		await trx
			.insertInto('user_password')
			.values({ user_id: outcome.userId, password_hash: passwordHash })
			.onConflict((oc) =>
				oc.column('user_id').doUpdateSet({ password_hash: passwordHash, updated_at: now })
			)
			.execute();
		// Following a reset link proves the mailbox, so the address counts as verified.
		const user = await trx
			.updateTable('User')
			.set({ emailVerified: sql`coalesce("emailVerified", now())` })
			.where('id', '=', outcome.userId)
			.returning(['email', 'name'])
			.executeTakeFirstOrThrow();
		// Whoever knew the old password is signed out everywhere.
		await endAllSessions(trx, outcome.userId);
		await queueMail(trx, { kind: 'password_changed', to: user.email, name: user.name ?? '' });
		await writeAudit(trx, {
			actorUserId: outcome.userId,
			actorIp: actor.ip,
			action: 'account.reset_password',
			entity: 'user',
			entityId: outcome.userId
		});
		return outcome;
	});
}
