// The app's one database handle, opened lazily so the server starts (and
// answers /api/health with 503) even while PostgreSQL is still down. Through it a
// lost or refused connection throws SvelteKit's 503, so every page, action and
// endpoint says "try again in a minute" while the server restarts, not 500.
import { Kysely, PostgresDialect } from 'kysely';
import type pg from 'pg';
import { env } from '$env/dynamic/private';
import { createPool, type Db } from './connect';
import type { Database } from './schema';
import { unavailableAs503 } from './unavailable';
import { describeFailure, logger } from '../log';

let instance: { db: Db; pool: pg.Pool } | undefined;

// One line per outage, not one per request: each request that meets it answers 503 anyway.
let lastNoted = 0;
function noteUnreachable(failure: unknown): void {
	const now = Date.now();
	if (now - lastNoted < 30_000) return;
	lastNoted = now;
	const code = (failure as { code?: unknown }).code;
	const said = typeof code === 'string' ? code : describeFailure(failure);
	logger.warn(`[db] PostgreSQL unreachable (${said}): answering 503`);
}

function open(): { db: Db; pool: pg.Pool } {
	if (!instance) {
		const url = env.DATABASE_URL;
		if (!url) throw new Error('DATABASE_URL is not set; copy .env.example to .env');
		const pool = createPool(url);
		const dialect = unavailableAs503(new PostgresDialect({ pool }), noteUnreachable);
		instance = { pool, db: new Kysely<Database>({ dialect }) };
	}
	return instance;
}

export function getDb(): Db {
	return open().db;
}

/** The same pool, for libraries that take a pg pool (the rate limiter). */
export function getPool(): pg.Pool {
	return open().pool;
}

/** Ends the pool so the process can exit at once on shutdown. */
export async function closeDb(): Promise<void> {
	const current = instance;
	instance = undefined;
	await current?.db.destroy();
}

export type { Db } from './connect';
