// The owner's view of the people who can sign in: list, search, change a role,
// disable or enable. One module owns writes to user_role.
import { sql, type Kysely } from 'kysely';
import type { Database, Role } from '../db/schema';
import { writeAudit } from '../audit';
import { endAllSessions } from '../auth/sessions';

export type PersonRow = {
	id: string;
	name: string | null;
	email: string;
	role: Role;
	disabledAt: Date | null;
	verified: boolean;
	joinedAt: Date;
};

export const PEOPLE_PAGE = 50;

function peopleQuery(db: Kysely<Database>) {
	return db
		.selectFrom('User as u')
		.leftJoin('user_role as r', 'r.user_id', 'u.id')
		.select([
			'u.id',
			'u.name',
			'u.email',
			'u.emailVerified',
			sql<Role>`coalesce(r.role, 'customer')`.as('role'),
			'r.disabled_at',
			sql<Date>`coalesce(r.created_at, now())`.as('joined_at')
		]);
}

type PersonQueryRow = Awaited<
	ReturnType<ReturnType<typeof peopleQuery>['executeTakeFirstOrThrow']>
>;

function toPerson(r: PersonQueryRow): PersonRow {
	return {
		id: r.id,
		name: r.name,
		email: r.email,
		role: r.role,
		disabledAt: r.disabled_at,
		verified: r.emailVerified !== null,
		joinedAt: r.joined_at
	};
}

export async function listPeople(
	db: Kysely<Database>,
	opts: { search?: string; role?: Role | ''; limit?: number } = {}
): Promise<PersonRow[]> {
	let query = peopleQuery(db);
	const search = opts.search?.trim();
	if (search) {
		const pattern = `%${search.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
		query = query.where((eb) =>
			eb.or([eb('u.email', 'ilike', pattern), eb('u.name', 'ilike', pattern)])
		);
	}
	if (opts.role) query = query.where(sql`coalesce(r.role, 'customer')`, '=', opts.role);
	const rows = await query
		.orderBy(
			sql`case coalesce(r.role, 'customer') when 'admin' then 0 when 'keeper' then 1 else 2 end`
		)
		.orderBy('u.email')
		.limit(opts.limit ?? PEOPLE_PAGE)
		.execute();
	return rows.map(toPerson);
}

/** One person by account id, or null. */
export async function findPerson(db: Kysely<Database>, userId: string): Promise<PersonRow | null> {
	const row = await peopleQuery(db).where('u.id', '=', userId).executeTakeFirst();
	return row ? toPerson(row) : null;
}

export type { Actor } from '../audit';
import type { Actor } from '../audit';
export type ChangeOutcome = { ok: true } | { ok: false; problem: string };

export async function changeRole(
	db: Kysely<Database>,
	actor: Actor,
	userId: string,
	role: Role
): Promise<ChangeOutcome> {
	if (userId === actor.userId && role !== 'admin') {
		return { ok: false, problem: 'You cannot take away your own admin role; ask another admin.' };
	}
	return db.transaction().execute(async (trx) => {
		const before = await trx
			.selectFrom('User as u')
			.leftJoin('user_role as r', 'r.user_id', 'u.id')
			.select(['u.id', 'r.role'])
			.where('u.id', '=', userId)
			// Lock the person's row only: the role row may not exist yet.
			.forUpdate('u')
			.executeTakeFirst();
		if (!before) return { ok: false, problem: 'That account no longer exists.' };
		const from = before.role ?? 'customer';
		if (from === role) return { ok: true };
		await trx
			.insertInto('user_role')
			.values({ user_id: userId, role })
			.onConflict((oc) => oc.column('user_id').doUpdateSet({ role, updated_at: new Date() }))
			.execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'user.role_changed',
			entity: 'user',
			entityId: userId,
			detail: { from, to: role }
		});
		return { ok: true };
	});
}

export async function setDisabled(
	db: Kysely<Database>,
	actor: Actor,
	userId: string,
	disabled: boolean
): Promise<ChangeOutcome> {
	if (userId === actor.userId)
		return { ok: false, problem: 'You cannot disable your own account.' };
	return db.transaction().execute(async (trx) => {
		const exists = await trx
			.selectFrom('User')
			.select('id')
			.where('id', '=', userId)
			.executeTakeFirst();
		if (!exists) return { ok: false, problem: 'That account no longer exists.' };
		const disabledAt = disabled ? new Date() : null;
		await trx
			.insertInto('user_role')
			.values({ user_id: userId, disabled_at: disabledAt })
			.onConflict((oc) =>
				oc.column('user_id').doUpdateSet({ disabled_at: disabledAt, updated_at: new Date() })
			)
			.execute();
		// A disabled account's sessions end now, not when their cookies expire.
		if (disabled) await endAllSessions(trx, userId);
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: disabled ? 'user.disabled' : 'user.enabled',
			entity: 'user',
			entityId: userId
		});
		return { ok: true };
	});
}
