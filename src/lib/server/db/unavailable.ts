// "PostgreSQL cannot be reached" told apart from every other database error, so a request
// answers 503 (come back in a moment) rather than 500 (our fault) while the server restarts
// or is away, and the app needs no restart when it returns.
import { error, isHttpError } from '@sveltejs/kit';
import type {
	CompiledQuery,
	DatabaseConnection,
	Dialect,
	Driver,
	QueryCompiler,
	QueryResult,
	TransactionSettings
} from 'kysely';

/** What a page, an API call or a form post says while the ledger is away. */
export const DATABASE_UNAVAILABLE_MESSAGE =
	'The shop cannot reach its ledger just now. Please try again in a minute.';

// PostgreSQL's SQLSTATEs (Appendix A of its manual) for a connection that failed or a server
// that is going down, starting up or full: class 08, 57P01–57P03 and 53300.
const UNAVAILABLE_SQLSTATES = new Set([
	'08000', // connection_exception
	'08001', // sqlclient_unable_to_establish_sqlconnection
	'08003', // connection_does_not_exist
	'08004', // sqlserver_rejected_establishment_of_sqlconnection
	'08006', // connection_failure
	'08007', // transaction_resolution_unknown
	'57P01', // admin_shutdown: pg_ctl stop -m fast ends every session with it
	'57P02', // crash_shutdown
	'57P03', // cannot_connect_now: starting up or shutting down
	'53300' // too_many_connections
]);

// Node's socket errors (errno names) for a host that refuses, drops or cannot be found.
const NETWORK_CODES = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'ETIMEDOUT',
	'EPIPE',
	'EHOSTUNREACH',
	'ENETUNREACH',
	'ENOTFOUND',
	'EAI_AGAIN'
]);

// node-postgres and pg-pool say these in words only, without a code.
const DRIVER_MESSAGES = [
	/^Connection terminated/,
	/^timeout exceeded when trying to connect$/,
	/is not queryable$/,
	/^timeout expired$/
];

/** True for an error that means the database could not be reached or went away mid-query. */
export function isConnectionFailure(failure: unknown, depth = 0): boolean {
	if (typeof failure !== 'object' || failure === null || depth > 3) return false;
	// "localhost" refused on IPv4 and IPv6 at once comes as an AggregateError.
	if (failure instanceof AggregateError && failure.errors.length > 0)
		return failure.errors.every((inner) => isConnectionFailure(inner, depth + 1));
	const code = (failure as { code?: unknown }).code;
	if (typeof code === 'string' && (UNAVAILABLE_SQLSTATES.has(code) || NETWORK_CODES.has(code)))
		return true;
	const message = (failure as { message?: unknown }).message;
	if (typeof message === 'string' && DRIVER_MESSAGES.some((pattern) => pattern.test(message)))
		return true;
	// pg-pool wraps a connect timeout's socket error as the cause of its own.
	return isConnectionFailure((failure as { cause?: unknown }).cause, depth + 1);
}

/** A raw connection failure, or the 503 the app's database handle already turned one into. */
export function isDatabaseUnavailable(failure: unknown): boolean {
	return isHttpError(failure, 503) || isConnectionFailure(failure);
}

/**
 * Throws SvelteKit's 503 for a connection failure, and the failure itself otherwise. Thrown
 * from a load, an action, an endpoint or a handle, the 503 reaches the visitor as it is.
 */
export function rethrowAsUnavailable(failure: unknown): never {
	if (!isConnectionFailure(failure)) throw failure;
	try {
		error(503, DATABASE_UNAVAILABLE_MESSAGE);
	} catch (unavailable) {
		causes.set(unavailable as object, failure);
		throw unavailable;
	}
}

// The driver's own error behind each 503, for the health report's one-word reason.
const causes = new WeakMap<object, unknown>();

/** The connection failure a 503 from rethrowAsUnavailable stands for, if it is one. */
export function unavailableCause(failure: unknown): unknown {
	return typeof failure === 'object' && failure !== null ? causes.get(failure) : undefined;
}

/**
 * The dialect with every connection failure turned into that 503: taking a connection,
 * each query and the transaction statements. Other errors (constraints, serialization
 * failures) pass through untouched, so the code that handles them is unchanged.
 */
export function unavailableAs503(
	dialect: Dialect,
	onFailure?: (failure: unknown) => void
): Dialect {
	const guard = async <T>(work: () => Promise<T>): Promise<T> => {
		try {
			return await work();
		} catch (failure) {
			if (isConnectionFailure(failure)) onFailure?.(failure);
			return rethrowAsUnavailable(failure);
		}
	};
	// Kysely hands the driver back the connection it acquired, so unwrap it before delegating;
	// one wrapper per connection, as Kysely keeps each connection it has seen in a set.
	const inner = new WeakMap<DatabaseConnection, DatabaseConnection>();
	const outer = new WeakMap<DatabaseConnection, DatabaseConnection>();
	const unwrap = (connection: DatabaseConnection) => inner.get(connection) ?? connection;

	const wrapConnection = (connection: DatabaseConnection): DatabaseConnection => {
		const known = outer.get(connection);
		if (known) return known;
		const wrapped: DatabaseConnection = {
			executeQuery: <R>(query: CompiledQuery) =>
				guard<QueryResult<R>>(() => connection.executeQuery<R>(query)),
			async *streamQuery<R>(query: CompiledQuery, chunkSize?: number) {
				try {
					yield* connection.streamQuery<R>(query, chunkSize);
				} catch (failure) {
					if (isConnectionFailure(failure)) onFailure?.(failure);
					rethrowAsUnavailable(failure);
				}
			}
		};
		inner.set(wrapped, connection);
		outer.set(connection, wrapped);
		return wrapped;
	};

	const wrapDriver = (driver: Driver): Driver => ({
		init: () => guard(() => driver.init()),
		acquireConnection: async () => wrapConnection(await guard(() => driver.acquireConnection())),
		beginTransaction: (connection: DatabaseConnection, settings: TransactionSettings) =>
			guard(() => driver.beginTransaction(unwrap(connection), settings)),
		commitTransaction: (connection: DatabaseConnection) =>
			guard(() => driver.commitTransaction(unwrap(connection))),
		rollbackTransaction: (connection: DatabaseConnection) =>
			guard(() => driver.rollbackTransaction(unwrap(connection))),
		...(driver.savepoint && {
			savepoint: (
				connection: DatabaseConnection,
				name: string,
				compile: QueryCompiler['compileQuery']
			) => guard(() => driver.savepoint!(unwrap(connection), name, compile))
		}),
		...(driver.rollbackToSavepoint && {
			rollbackToSavepoint: (
				connection: DatabaseConnection,
				name: string,
				compile: QueryCompiler['compileQuery']
			) => guard(() => driver.rollbackToSavepoint!(unwrap(connection), name, compile))
		}),
		...(driver.releaseSavepoint && {
			releaseSavepoint: (
				connection: DatabaseConnection,
				name: string,
				compile: QueryCompiler['compileQuery']
			) => guard(() => driver.releaseSavepoint!(unwrap(connection), name, compile))
		}),
		releaseConnection: (connection: DatabaseConnection) =>
			driver.releaseConnection(unwrap(connection)),
		destroy: () => driver.destroy()
	});

	return {
		createDriver: () => wrapDriver(dialect.createDriver()),
		createQueryCompiler: () => dialect.createQueryCompiler(),
		createAdapter: () => dialect.createAdapter(),
		createIntrospector: (db) => dialect.createIntrospector(db)
	};
}
