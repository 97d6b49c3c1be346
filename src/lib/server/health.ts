// What /api/health reports: can we reach PostgreSQL, and which migration is it on.
import { sql } from 'kysely';
import type { Db } from './db/connect';
import { unavailableCause } from './db/unavailable';

export type HealthReport =
	| { status: 'ok'; database: 'reachable'; migration: string | null; checkedAt: string }
	| { status: 'unavailable'; database: 'unreachable'; reason: string; checkedAt: string };

export async function checkHealth(
	db: Db,
	now = new Date()
): Promise<{ httpStatus: 200 | 503; report: HealthReport }> {
	const checkedAt = now.toISOString();
	try {
		await sql`select 1`.execute(db);
	} catch (error) {
		return {
			httpStatus: 503,
			report: { status: 'unavailable', database: 'unreachable', reason: describe(error), checkedAt }
		};
	}
	let migration: string | null;
	try {
		const latest = await db
			.selectFrom('kysely_migration')
			.select('name')
			.orderBy('name', 'desc')
			.limit(1)
			.executeTakeFirst();
		migration = latest?.name ?? null;
	} catch {
		// Reachable but never migrated: the table does not exist yet.
		migration = null;
	}
	return { httpStatus: 200, report: { status: 'ok', database: 'reachable', migration, checkedAt } };
}

// Only the driver's error code or a short message leaves the server, never a stack.
function describe(failure: unknown): string {
	// The app's handle turns a refused connection into a 503; the reason is the driver's.
	const error = unavailableCause(failure) ?? failure;
	if (error && typeof error === 'object' && 'code' in error && typeof error.code === 'string') {
		return error.code;
	}
	return error instanceof Error ? error.message.slice(0, 120) : 'unknown error';
}
