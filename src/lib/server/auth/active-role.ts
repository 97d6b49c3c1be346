// The role an account holds now, read from the database rather than trusted from the
// session: a role taken away or an account disabled since sign-in counts at once.
import type { Kysely } from 'kysely';
import type { Database, Role } from '../db/schema';
import { roleAtLeast } from './roles';

/** The account's role while it can still sign in; null for a disabled or unknown one. */
export async function activeRole(db: Kysely<Database>, userId: string): Promise<Role | null> {
	const row = await db
		.selectFrom('user_role')
		.select('role')
		.where('user_id', '=', userId)
		.where('disabled_at', 'is', null)
		.executeTakeFirst();
	return row?.role ?? null;
}

/** Whether the account holds `minimum` or a higher role now. */
export async function hasActiveRole(
	db: Kysely<Database>,
	userId: string,
	minimum: Role
): Promise<boolean> {
	const role = await activeRole(db, userId);
	return role !== null && roleAtLeast(role, minimum);
}
