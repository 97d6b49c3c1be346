import net from 'node:net';
import { isHttpError } from '@sveltejs/kit';
import {
	Kysely,
	PostgresAdapter,
	PostgresDialect,
	PostgresIntrospector,
	PostgresQueryCompiler,
	sql,
	type DatabaseConnection,
	type Dialect,
	type Driver
} from 'kysely';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
	DATABASE_UNAVAILABLE_MESSAGE,
	isConnectionFailure,
	isDatabaseUnavailable,
	unavailableAs503,
	unavailableCause
} from './unavailable';

/** A loopback port nobody listens on: taken, then given back. */
async function closedPort(): Promise<number> {
	const server = net.createServer();
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
	const { port } = server.address() as net.AddressInfo;
	await new Promise((resolve) => server.close(resolve));
	return port;
}

/** What node-postgres really throws when connecting to `port` fails. */
async function connectFailure(port: number): Promise<unknown> {
	const client = new pg.Client({ host: '127.0.0.1', port, user: 'x', database: 'x' });
	try {
		await client.connect();
	} catch (failure) {
		return failure;
	} finally {
		await client.end().catch(() => undefined);
	}
	throw new Error('the connection was expected to fail');
}

// SQLSTATEs from PostgreSQL 15's manual, Appendix A "PostgreSQL Error Codes".
const sqlState = (code: string) => Object.assign(new Error(`server said ${code}`), { code });

describe('isConnectionFailure', () => {
	let refused: number;
	let hangUp: net.Server;
	let hangUpPort: number;

	beforeAll(async () => {
		refused = await closedPort();
		// A host that takes the connection and drops it at once, as a server going down does.
		hangUp = net.createServer((socket) => socket.destroy());
		await new Promise<void>((resolve) => hangUp.listen(0, '127.0.0.1', resolve));
		hangUpPort = (hangUp.address() as net.AddressInfo).port;
	});
	afterAll(async () => {
		await new Promise((resolve) => hangUp.close(resolve));
	});

	it('knows what node-postgres throws for a refused and for a dropped connection', async () => {
		const refusal = await connectFailure(refused);
		expect((refusal as { code?: string }).code).toBe('ECONNREFUSED');
		expect(isConnectionFailure(refusal)).toBe(true);
		const dropped = await connectFailure(hangUpPort);
		expect(String((dropped as Error).message)).toMatch(/Connection terminated/);
		expect(isConnectionFailure(dropped)).toBe(true);
	});

	it('knows the server going down, starting up or full', () => {
		for (const code of ['57P01', '57P02', '57P03', '08006', '08001', '53300'])
			expect(isConnectionFailure(sqlState(code)), code).toBe(true);
		// pg-pool's connect timeout, with the socket's error as its cause.
		expect(isConnectionFailure(new Error('timeout exceeded when trying to connect'))).toBe(true);
		const wrapped = new Error('Connection terminated due to connection timeout', {
			cause: sqlState('ECONNRESET')
		});
		expect(isConnectionFailure(wrapped)).toBe(true);
		// "localhost" refused on both addresses.
		const both = new AggregateError([sqlState('ECONNREFUSED'), sqlState('ECONNREFUSED')], '');
		expect(isConnectionFailure(both)).toBe(true);
	});

	it('leaves every other database error alone', () => {
		for (const code of ['23505', '23503', '40001', '40P01', '42P01', '22P02'])
			expect(isConnectionFailure(sqlState(code)), code).toBe(false);
		expect(isConnectionFailure(new Error('bigint 9007199254740993 is beyond a safe integer'))).toBe(
			false
		);
		expect(isConnectionFailure(null)).toBe(false);
		expect(isConnectionFailure('ECONNREFUSED')).toBe(false);
		expect(isConnectionFailure(new AggregateError([sqlState('23505')], ''))).toBe(false);
	});
});

/** A dialect whose one connection answers each query with `answer()`. */
function scriptedDialect(answer: () => Promise<never>): {
	dialect: Dialect;
	connection: DatabaseConnection;
	released: DatabaseConnection[];
} {
	const released: DatabaseConnection[] = [];
	const connection: DatabaseConnection = {
		executeQuery: () => answer(),
		async *streamQuery() {
			yield await answer();
		}
	};
	const driver: Driver = {
		init: async () => undefined,
		acquireConnection: async () => connection,
		beginTransaction: async () => undefined,
		commitTransaction: async () => undefined,
		rollbackTransaction: async () => undefined,
		releaseConnection: async (given) => {
			released.push(given);
		},
		destroy: async () => undefined
	};
	const dialect: Dialect = {
		createDriver: () => driver,
		createQueryCompiler: () => new PostgresQueryCompiler(),
		createAdapter: () => new PostgresAdapter(),
		createIntrospector: (db) => new PostgresIntrospector(db)
	};
	return { dialect, connection, released };
}

describe('unavailableAs503', () => {
	it('turns a refused connection into SvelteKit 503 with its plain sentence', async () => {
		const port = await closedPort();
		const pool = new pg.Pool({ host: '127.0.0.1', port, user: 'x', database: 'x', max: 1 });
		const seen: unknown[] = [];
		const db = new Kysely<Record<string, never>>({
			dialect: unavailableAs503(new PostgresDialect({ pool }), (failure) => seen.push(failure))
		});
		try {
			const failure = await sql`select 1`.execute(db).then(
				() => null,
				(caught: unknown) => caught
			);
			expect(isHttpError(failure, 503)).toBe(true);
			expect(isHttpError(failure) && failure.body.message).toBe(DATABASE_UNAVAILABLE_MESSAGE);
			expect(isDatabaseUnavailable(failure)).toBe(true);
			expect((unavailableCause(failure) as { code?: string }).code).toBe('ECONNREFUSED');
			expect(seen).toHaveLength(1);
			// A transaction meets the same refusal before it begins.
			const inTransaction = await db
				.transaction()
				.execute((trx) => sql`select 1`.execute(trx))
				.then(
					() => null,
					(caught: unknown) => caught
				);
			expect(isHttpError(inTransaction, 503)).toBe(true);
		} finally {
			await db.destroy();
		}
	});

	it('maps a session ended mid-query, and passes every other error through as it was', async () => {
		let next: unknown = sqlState('57P01');
		const { dialect, connection, released } = scriptedDialect(() => Promise.reject(next));
		const db = new Kysely<Record<string, never>>({ dialect: unavailableAs503(dialect) });
		const dropped = await sql`select 1`.execute(db).catch((caught: unknown) => caught);
		expect(isHttpError(dropped, 503)).toBe(true);

		const duplicate = sqlState('23505');
		next = duplicate;
		const refused = await sql`select 1`.execute(db).catch((caught: unknown) => caught);
		expect(refused).toBe(duplicate);
		expect(isDatabaseUnavailable(refused)).toBe(false);

		// The driver gets back the very connection it handed out, to release it.
		expect(released).toEqual([connection, connection]);
		expect(released.every((given) => given === connection)).toBe(true);
		await db.destroy();
	});

	it('maps a stream that loses its connection', async () => {
		const { dialect } = scriptedDialect(() =>
			Promise.reject(new Error('Connection terminated unexpectedly'))
		);
		const db = new Kysely<Record<string, never>>({ dialect: unavailableAs503(dialect) });
		const rows = sql`select 1`.compile(db);
		const failure = await (async () => {
			try {
				for await (const chunk of db.getExecutor().stream(rows, 10)) void chunk;
			} catch (caught) {
				return caught;
			}
			return null;
		})();
		expect(isHttpError(failure, 503)).toBe(true);
		await db.destroy();
	});
});
