// The app's one logger: JSON lines on stdout (pino). Every line written while a
// request is served carries that request's id, and every line written by a job
// carries the job's id and queue, through AsyncLocalStorage: nothing has to pass a
// logger down. Each finished line goes through scrubLogLine, so secrets, cookies and
// card numbers never reach the output, whatever a message or a stack holds.
//
// No $env or $app imports: scripts and tests use this module outside SvelteKit.
import { AsyncLocalStorage } from 'node:async_hooks';
import { randomUUID } from 'node:crypto';
import { pino, type DestinationStream, type Logger, type LevelWithSilent } from 'pino';
import { knownSecretsFrom, scrubLogLine } from './log-scrub';

/** What every line logged inside withLogContext carries. */
export type LogContext = { requestId: string } | { jobId: string; queue: string };

const context = new AsyncLocalStorage<LogContext>();

const LEVELS: readonly LevelWithSilent[] = [
	'fatal',
	'error',
	'warn',
	'info',
	'debug',
	'trace',
	'silent'
];

function levelFrom(value: string | undefined): LevelWithSilent {
	const wanted = value?.trim().toLowerCase();
	return LEVELS.find((level) => level === wanted) ?? 'info';
}

export interface LoggerOptions {
	/** Where lines go; stdout unless given (tests hand in a memory stream). */
	destination?: DestinationStream;
	/** LOG_LEVEL: fatal, error, warn, info (default), debug, trace or silent. */
	level?: string;
	/** Values that must never be printed; read from the process's secrets unless given. */
	knownSecrets?: readonly string[];
}

export function createLogger(options: LoggerOptions = {}): Logger {
	const secrets = options.knownSecrets ?? knownSecretsFrom(process.env);
	const settings = {
		level: levelFrom(options.level ?? process.env.LOG_LEVEL),
		// Readable times that are strings, so no long digit run looks like a card number.
		timestamp: pino.stdTimeFunctions.isoTime,
		formatters: { level: (label: string) => ({ level: label }) },
		// A copy: pino merges the line's own fields into what mixin returns.
		mixin: () => ({ ...context.getStore() }),
		hooks: { streamWrite: (line: string) => scrubLogLine(line, secrets) }
	};
	return options.destination ? pino(settings, options.destination) : pino(settings);
}

export const logger: Logger = createLogger();

/** Runs fn with the given id on every line it (and whatever it awaits) logs. */
export function withLogContext<T>(bindings: LogContext, fn: () => T): T {
	return context.run(bindings, fn);
}

export function currentLogContext(): LogContext | undefined {
	return context.getStore();
}

/** Runs one pg-boss job's work with its id and queue on every line logged meanwhile. */
export function inJobContext<T>(job: { id: string; name: string }, fn: () => T): T {
	return withLogContext({ jobId: job.id, queue: job.name }, fn);
}

// A caller's own id (a load balancer's or a proxy's) is kept only when it is short and plain:
// anything else could forge or break lines, so such a request gets a fresh one.
const SAFE_REQUEST_ID = /^[A-Za-z0-9._:-]{8,64}$/;

/** The id for a request: the incoming x-request-id when it is a safe token, else a new one. */
export function requestIdFor(incoming: string | null | undefined): string {
	const offered = incoming?.trim();
	return offered && SAFE_REQUEST_ID.test(offered) ? offered : randomUUID();
}

/** Plain text for an unknown failure, for one-line messages. */
export function describeFailure(failure: unknown): string {
	return failure instanceof Error ? failure.message || failure.name : String(failure);
}
