// Builds a Kysely instance on a pg pool. No $env here, so scripts, seeds and
// tests use the same connection rules as the app.
import { Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import type { Database } from './schema';
import { logger } from '../log';

const { Pool, types } = pg;

const INT8 = 20;
const DATE = 1082;
const DATE_ARRAY = 1182;

/** bigint counts and sums as exact integers; refuse rather than round. */
export function parseInt8(value: string): number {
	const parsed = Number(value);
	if (!Number.isSafeInteger(parsed))
		throw new RangeError(`bigint ${value} is beyond a safe integer`);
	return parsed;
}

// Dates stay 'YYYY-MM-DD' text: a JS Date would move them with the server's zone.
const TEXT_ARRAY = 1009;
const dateArrayParser = types.getTypeParser(
	TEXT_ARRAY as Parameters<typeof types.getTypeParser>[0]
);
function getTypeParser(oid: number, format?: 'text' | 'binary') {
	if (oid === INT8) return parseInt8;
	if (oid === DATE) return (value: string) => value;
	if (oid === DATE_ARRAY) return dateArrayParser;
	return types.getTypeParser(oid, format);
}

export type Db = Kysely<Database>;

/** Opening one connection: past this, PostgreSQL counts as unreachable. */
export const CONNECT_TIMEOUT_MS = 3_000;
/**
 * Waiting for a free connection while every one is busy. A drop's checkouts queue on one
 * clutch's row lock, each holding a connection meanwhile; the requests behind them wait
 * their turn rather than fail after the few seconds that suit a dead server.
 */
export const POOL_WAIT_TIMEOUT_MS = 30_000;

// pg-pool spends its connectionTimeoutMillis on the queue wait and the connect together;
// the client's own timer bounds the connect alone.
class ShopClient extends pg.Client {
	constructor(config?: string | pg.ClientConfig) {
		super({
			...(typeof config === 'string' ? { connectionString: config } : config),
			connectionTimeoutMillis: CONNECT_TIMEOUT_MS
		});
	}
}

export function createPool(connectionString: string, max = 10): pg.Pool {
	const pool = new Pool({
		connectionString,
		max,
		types: { getTypeParser } as pg.CustomTypesConfig,
		Client: ShopClient,
		connectionTimeoutMillis: POOL_WAIT_TIMEOUT_MS,
		idleTimeoutMillis: 30_000
	});
	// An idle client losing its server (a restart) must not crash the process;
	// the next query opens a fresh connection.
	pool.on('error', (err) => {
		logger.warn(`[db] idle connection lost: ${err.message}`);
	});
	// A checked-out client (inside a transaction, between two queries) has no pool listener,
	// so its server going away would be an unhandled 'error' that ends the process. With this
	// one the client only turns unusable: its next query fails and the pool drops it.
	pool.on('connect', (client) => {
		client.on('error', () => undefined);
	});
	return pool;
}

export function createDb(connectionString: string, max = 10): Db {
	return new Kysely<Database>({
		dialect: new PostgresDialect({ pool: createPool(connectionString, max) })
	});
}
