// What the hostile-input tests share: the built app with every outside service it talks
// to standing in on loopback, a session per role, a fingerprint of every table (to prove
// a refused request wrote nothing) and the signs of an answer that says too much.
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { sql } from 'kysely';
import { DEMO_ACCOUNTS } from '../../../seed/accounts';
import { createSession } from '../../../src/lib/server/auth/sessions';
import type { Db } from '../../../src/lib/server/db/connect';
import { startStripeFake, type StripeFake } from '../../fakes/stripe/server';
import { startWeatherFake, type WeatherFake } from '../../fakes/weather/server';
import { startApp, type RunningApp } from './app';

export type Persona = 'anonymous' | 'customer' | 'keeper' | 'admin';

const STRIPE_KEY = 'sk_test_hostile_input';
const STRIPE_SECRET = 'whsec_hostile_input';
export const TRACKING_SECRET = 'tracking_hostile_input';

export interface HostileShop {
	app: RunningApp;
	stripe: StripeFake;
	weather: WeatherFake;
	photoDir: string;
	stop(): Promise<void>;
}

/**
 * The built app on the scratch database as it runs in production: Stripe, the weather
 * service and tracking configured (so a refusal is the app's own, not a missing
 * setting), mail to a closed port (jobs retry), photos in a folder of this run.
 */
export async function startHostileShop(
	databaseUrl: string,
	env: Record<string, string> = {}
): Promise<HostileShop> {
	const photoDir = await mkdtemp(path.join(os.tmpdir(), 'hatchlot-hostile-'));
	const weather = await startWeatherFake({ port: 0 });
	// No webhook address: an event the fake sends on its own (a session expired when a cart
	// changed) would otherwise land in the middle of a later request.
	const stripe = await startStripeFake({
		port: 0,
		apiKey: STRIPE_KEY,
		webhookSecret: STRIPE_SECRET,
		retryDelaysMs: [],
		log: () => undefined
	});
	const appEnv = {
		DATABASE_URL: databaseUrl,
		PHOTO_STORAGE_DIR: photoDir,
		WEATHER_API_URL: weather.url,
		STRIPE_SECRET_KEY: STRIPE_KEY,
		STRIPE_WEBHOOK_SECRET: STRIPE_SECRET,
		STRIPE_API_HOST: stripe.host,
		STRIPE_API_PORT: String(stripe.port),
		STRIPE_API_PROTOCOL: 'http',
		TRACKING_WEBHOOK_SECRET: TRACKING_SECRET,
		SHOP_TIME_ZONE: 'America/New_York',
		...env
	};
	// On a machine busy with the rest of the suite, start-up can outlast startApp's wait once.
	const app = await startApp(appEnv).catch(() => startApp(appEnv));
	return {
		app,
		stripe,
		weather,
		photoDir,
		stop: async () => {
			await app.stop();
			await stripe.stop();
			await weather.stop();
			await rm(photoDir, { recursive: true, force: true });
		}
	};
}

/** The demo account of a role (the nth customer for `index`). */
export async function demoUserId(db: Db, role: Exclude<Persona, 'anonymous'>, index = 0) {
	const account = DEMO_ACCOUNTS.filter((a) => a.role === role)[index]!;
	const user = await db
		.selectFrom('User')
		.select('id')
		.where('email', '=', account.email)
		.executeTakeFirstOrThrow();
	return user.id;
}

/** A fresh session cookie for each signed-in role. */
export async function sessionCookies(db: Db): Promise<Record<Persona, string | null>> {
	const cookie = async (role: Exclude<Persona, 'anonymous'>) =>
		`hatchlot.session=${await createSession(db, await demoUserId(db, role))}`;
	return {
		anonymous: null,
		customer: await cookie('customer'),
		keeper: await cookie('keeper'),
		admin: await cookie('admin')
	};
}

/**
 * Rows a refused request may still write, on purpose: the abuse counters count refused
 * tries too, and a burst of them is audited once; a page drawn again after a refused form
 * may fetch a forecast, and the cache of the weather service's answers keeps it.
 */
const SKIPPED_TABLES = new Set(['rate_limit', 'forecast_cache']);
const BOOKKEEPING = sql`where t.action not like '%.limit_reached'`;

/**
 * Columns the app's background jobs change after a request has long been answered
 * (sending mail, letting holds lapse, drawing slips, notifying a waitlist): left out, so
 * a job finishing during a refused request is not taken for that request's write.
 */
const JOB_COLUMNS: Record<string, string[]> = {
	outgoing_mail: ['status', 'attempts', 'last_error', 'sent_at', 'updated_at'],
	reservation: ['state', 'updated_at'],
	slip_batch: ['state', 'done_count', 'pdf', 'error', 'finished_at'],
	waitlist_entry: ['notified_at', 'notified_listing_id']
};

/**
 * One fingerprint per table of the public schema: its row count and an md5 over its rows
 * in a fixed order. Equal fingerprints before and after a request mean it wrote nothing.
 */
export async function tableFingerprints(db: Db): Promise<Map<string, string>> {
	const tables = await sql<{ name: string }>`
		select table_name as name from information_schema.tables
		where table_schema = 'public' and table_type = 'BASE TABLE' order by table_name`.execute(db);
	const parts = tables.rows
		.map((t) => t.name)
		.filter((name) => !SKIPPED_TABLES.has(name))
		.map((name) => {
			const row = JOB_COLUMNS[name]
				? sql`(to_jsonb(t) - ${JOB_COLUMNS[name]}::text[])::text`
				: sql`t::text`;
			return sql`select ${name}::text as name, count(*)::int as n,
					coalesce(md5(string_agg(md5(${row}), '' order by md5(${row}))), '') as digest
				from ${sql.table(name)} as t ${name === 'audit_log' ? BOOKKEEPING : sql``}`;
		});
	const rows = await sql<{ name: string; n: number; digest: string }>`${sql.join(
		parts,
		sql` union all `
	)}`.execute(db);
	return new Map(rows.rows.map((r) => [r.name, `${r.n}:${r.digest}`]));
}

/** The tables whose fingerprints differ. */
export function changedTables(before: Map<string, string>, after: Map<string, string>): string[] {
	const names = new Set([...before.keys(), ...after.keys()]);
	return [...names].filter((name) => before.get(name) !== after.get(name)).sort();
}

/**
 * Signs that an answer carries the server's insides: a stack frame, a source position,
 * or PostgreSQL's own words (its error texts, or a statement as Kysely writes one).
 */
const LEAKS: [string, RegExp][] = [
	['stack frame', /\n\s*at (?:async )?[\w$.<>[\] ]+ \((?:file:|node:|\/)/],
	['source position', /[\w-]+\.(?:js|ts|svelte|mjs):\d+:\d+/],
	['node internals', /node:internal|node_modules\/[^\s"')]+\.[cm]?[jt]s\b/],
	[
		'PostgreSQL error',
		/syntax error at or near|violates (?:foreign key|check|unique|not-null|exclusion) constraint|duplicate key value|invalid input syntax for type|out of range for type|value too long for type|invalid byte sequence for encoding|current transaction is aborted|relation "\w+" does not exist|column "\w+" (?:of relation "\w+" )?does not exist/i
	],
	[
		'SQL statement',
		/\b(?:select|insert into|update|delete from)\b[^<>\n]{0,300}\b(?:from|set|values|where)\s+"\w+"/i
	],
	[
		'error class',
		/\b(?:DatabaseError|PostgresError|TypeError|RangeError|SyntaxError|ReferenceError): /
	]
];

export function leaksIn(text: string): string[] {
	return LEAKS.filter(([, pattern]) => pattern.test(text)).map(([name, pattern]) => {
		const at = text.search(pattern);
		return `${name}: …${text.slice(Math.max(0, at - 40), at + 120).replace(/\s+/g, ' ')}…`;
	});
}
