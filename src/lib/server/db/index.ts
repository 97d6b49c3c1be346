// The app's one database handle, opened lazily so the server starts (and
// answers /api/health with 503) even while PostgreSQL is still down.
import { Kysely, PostgresDialect } from 'kysely';
import type pg from 'pg';
import { env } from '$env/dynamic/private';
import { createPool, type Db } from './connect';
import type { Database } from './schema';

let instance: { db: Db; pool: pg.Pool } | undefined;

function open(): { db: Db; pool: pg.Pool } {
	if (!instance) {
		const url = env.DATABASE_URL;
		if (!url) throw new Error('DATABASE_URL is not set; copy .env.example to .env');
		const pool = createPool(url);
		instance = { pool, db: new Kysely<Database>({ dialect: new PostgresDialect({ pool }) }) };
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
