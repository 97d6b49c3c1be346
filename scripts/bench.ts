// npm run bench: the shop's speed against the production build, measured side by side in
// one run on a seeded database of more than 12,000 live listings, each pair in rounds taken
// in turn (A B A B). Prints the raw figures and these ratios: catalogue page 1 requests/s ÷
// a static file's requests/s from the same server; p95 of page 500 ÷ p95 of page 1; p99 ÷
// p50 of the catalogue at 8 connections; /api/cart add-line requests/s ÷ /api/health
// requests/s; the gzipped JavaScript the catalogue and a listing page load; lab LCP and CLS
// of the home and a listing page in headless Chromium, each ÷ its "good" threshold. Then
// the owner's reports over the demo plus 100,000 generated orders, each drawn in-process
// for 12 months and for 5 years beside a baseline query: median and p95, and both ÷ the
// baseline and ÷ the one-second budget. Every figure also goes to .data/bench.json.
// A script, never a test: the figures depend on the machine, the ratios much less.
// Traffic goes only to 127.0.0.1; every request loop stops by itself at a count and a time.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import {
	closeSync,
	createWriteStream,
	existsSync,
	mkdirSync,
	openSync,
	readFileSync,
	readdirSync,
	statSync,
	writeFileSync
} from 'node:fs';
import { createServer } from 'node:net';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { sql } from 'kysely';
import { planBenchCatalogue, type BenchListing, type BenchSpecies } from '../seed/bench-catalogue';
import { addBenchOrders, BENCH_ORDERS, type BenchOrdersResult } from '../seed/bench-orders';
import { dateInTimeZone } from '../seed/dates';
import { seedDemo } from '../seed/demo';
import { DEMO_SHOP } from '../seed/sales';
import { createDb, type Db } from '../src/lib/server/db/connect';
import { resolveShopTimeZone } from '../src/lib/server/backoffice/settings';
import { assertMigrated, migratorFor } from '../src/lib/server/db/migrator';
import { installJobSchema } from '../src/lib/server/jobs';
import { speciesPrefix } from '../src/lib/server/stock/codes';
import { BenchError } from './bench/load';
import { textTable } from './bench/measure';
import { measureShop, printShop, type ShopFigures } from './bench/shop';
import { REPORT_BUDGET_MS, TIMING_HEADER, timingCells } from './bench/report-timing';
import { BASELINE_SQL, measureReports, type ReportsPhaseResult } from './bench/reports';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const BENCH_DATABASE = 'hatchlot_bench';
const HOST = '127.0.0.1';
const PORT = 3299;
const BASE = `http://${HOST}:${PORT}`;
/** 24 listings a page: page 500 needs at least 11,977 of them in the default view. */
const PAGE_SIZE = 24;
const FAR_PAGE = 500;
const ANIMAL_LISTINGS = 12_200;
const SUPPLY_LISTINGS = 300;
// The lead's builds hold the same lock, so two builds never write build/ at once.
const BUILD_LOCK = '/tmp/hatchlot-build.lock';
// The server runs from a private copy, so a rebuild of build/ during the run cannot pull
// files from under it.
const SERVER_DIR = path.join(ROOT, '.data', 'bench-build');
const SERVER_LOG = path.join(ROOT, '.data', 'bench-server.log');
const BUILD_LOG = path.join(ROOT, '.data', 'bench-build.log');
const BENCH_JSON = path.join(ROOT, '.data', 'bench.json');

/** Reports: one warm-up round, then rounds of every report and range, each beside its baseline. */
const REPORT_ROUNDS = { warmup: 1, rounds: 7, maxSeconds: 300 };

const startedAt = performance.now();
const say = (message: string) => console.log(`\x1b[1;32m[bench]\x1b[0m ${message}`);
const seconds = (since: number) => `${((performance.now() - since) / 1000).toFixed(1)} s`;
const int = (n: number) => n.toLocaleString('en-US');

// ---------------------------------------------------------------- database

function databaseUrls(): { admin: string; bench: string } {
	const given = process.env.DATABASE_URL;
	if (!given) throw new BenchError('DATABASE_URL is not set; run through `npm run bench`.');
	const url = new URL(given);
	// The bench drops and creates a database: only ever on this machine's own cluster.
	if (!['127.0.0.1', 'localhost', '[::1]'].includes(url.hostname))
		throw new BenchError(
			`DATABASE_URL points at ${url.hostname}; the bench runs only on 127.0.0.1.`
		);
	url.pathname = '/postgres';
	const admin = url.href;
	url.pathname = `/${BENCH_DATABASE}`;
	return { admin, bench: url.href };
}

async function freshDatabase(adminUrl: string, benchUrl: string): Promise<void> {
	const admin = createDb(adminUrl, 1);
	try {
		await sql`drop database if exists ${sql.id(BENCH_DATABASE)} with (force)`.execute(admin);
		await sql`create database ${sql.id(BENCH_DATABASE)}`.execute(admin);
	} finally {
		await admin.destroy();
	}
	const db = createDb(benchUrl, 2);
	try {
		assertMigrated(await migratorFor(db).migrateToLatest());
	} finally {
		await db.destroy();
	}
	await installJobSchema(benchUrl);
}

async function benchSpecies(db: Db): Promise<BenchSpecies[]> {
	const rows = await db
		.selectFrom('species')
		.select(['id', 'slug', 'scientific_name', 'common_name', 'animal_group', 'grow_out_weeks'])
		.orderBy('id')
		.execute();
	const tubs = await db
		.selectFrom('resting_tub')
		.innerJoin('colony', 'colony.id', 'resting_tub.colony_id')
		.select(['resting_tub.id', 'colony.species_id'])
		.orderBy('resting_tub.id')
		.execute();
	const species: BenchSpecies[] = [];
	for (const row of rows) {
		const prefix = await speciesPrefix(db, row.id);
		const top = await db
			.selectFrom('clutch')
			.select(
				sql<number>`coalesce(max(substring(code from ${prefix.length + 3}::int)::int), 0)`.as('top')
			)
			.where('code', '~', `^${prefix}-C[0-9]+$`)
			.executeTakeFirstOrThrow();
		species.push({
			id: row.id,
			slug: row.slug,
			scientificName: row.scientific_name,
			commonName: row.common_name,
			group: row.animal_group,
			growOutWeeks: row.grow_out_weeks,
			codePrefix: prefix,
			highestClutchNumber: Number(top.top),
			tubIds: tubs.filter((t) => t.species_id === row.id).map((t) => t.id)
		});
	}
	return species;
}

function chunks<T>(rows: readonly T[], size: number): T[][] {
	const out: T[][] = [];
	for (let i = 0; i < rows.length; i += size) out.push(rows.slice(i, i + size));
	return out;
}

function listingRow(listing: BenchListing, clutchId: number | null) {
	return {
		slug: listing.slug,
		kind: listing.kind,
		species_id: listing.speciesId,
		clutch_id: clutchId,
		title: listing.title,
		description: listing.description,
		unit_size: listing.unitSize,
		sex: listing.sex,
		is_live: listing.isLive,
		state: 'live' as const,
		supply_stock: listing.supplyStock,
		published_at: listing.publishedAt,
		base_price_cents: listing.basePriceCents,
		created_at: listing.publishedAt,
		updated_at: listing.publishedAt
	};
}

/**
 * The demo shop plus thousands of listed clutches and their listings, in a few bulk
 * inserts. A benchmark fixture: it writes rows directly, with no audit or clutch history.
 */
async function fillCatalogue(benchUrl: string, today: string): Promise<number> {
	const db = createDb(benchUrl, 2);
	try {
		await seedDemo(db, { today });
		const plan = planBenchCatalogue(await benchSpecies(db), {
			today,
			animalListings: ANIMAL_LISTINGS,
			supplies: SUPPLY_LISTINGS
		});
		await db.transaction().execute(async (trx) => {
			const clutchIdByCode = new Map<string, number>();
			// Batches stay under PostgreSQL's 65,535 parameters per statement.
			for (const batch of chunks(plan.clutches, 2000)) {
				const inserted = await trx
					.insertInto('clutch')
					.values(
						batch.map((c) => ({
							code: c.code,
							species_id: c.speciesId,
							tub_id: c.tubId,
							origin: c.tubId === null ? ('bought_in' as const) : ('tub' as const),
							generation: c.generation,
							found_on: c.foundOn,
							stage: c.stage,
							size_class: c.sizeClass,
							count_found: c.countFound,
							count_alive: c.countAlive,
							count_lost: c.countLost,
							state: 'listed' as const,
							sale_ready_on: c.saleReadyOn,
							created_at: new Date(`${c.foundOn}T15:00:00Z`),
							updated_at: c.listedAt
						}))
					)
					.returning(['id', 'code'])
					.execute();
				for (const row of inserted) clutchIdByCode.set(row.code, row.id);
			}
			const listings = [
				...plan.clutches.flatMap((c) =>
					c.listings.map((l) => ({ listing: l, clutchId: clutchIdByCode.get(c.code) ?? null }))
				),
				...plan.supplies.map((l) => ({ listing: l, clutchId: null }))
			];
			const tiers: { listing_id: number; min_quantity: number; price_cents: number }[] = [];
			for (const batch of chunks(listings, 3000)) {
				const inserted = await trx
					.insertInto('listing')
					.values(batch.map(({ listing, clutchId }) => listingRow(listing, clutchId)))
					.returning(['id'])
					.execute();
				// PostgreSQL returns inserted rows in the order of the VALUES list.
				inserted.forEach((row, index) => {
					for (const tier of batch[index]?.listing.tiers ?? [])
						tiers.push({
							listing_id: row.id,
							min_quantity: tier.minQuantity,
							price_cents: tier.priceCents
						});
				});
			}
			for (const batch of chunks(tiers, 10_000))
				await trx.insertInto('price_tier').values(batch).execute();
		});
		// Fresh planner statistics, as a shop that has been running would have.
		await sql`analyze clutch, listing, price_tier, species`.execute(db);
		const { live } = await db
			.selectFrom('listing')
			.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
			.select((eb) => eb.fn.countAll<number>().as('live'))
			.where('listing.state', '=', 'live')
			.where((eb) => eb.or([eb('listing.kind', '=', 'supply'), eb('clutch.state', '=', 'listed')]))
			.executeTakeFirstOrThrow();
		return Number(live);
	} finally {
		await db.destroy();
	}
}

/** The generated order history, once, on top of the demo and the catalogue. */
async function fillOrders(benchUrl: string, today: string): Promise<BenchOrdersResult> {
	const db = createDb(benchUrl, 2);
	try {
		return await addBenchOrders(db, { today, orders: BENCH_ORDERS });
	} finally {
		await db.destroy();
	}
}

/** Every report timed in-process on the bench database, or null when the reports do not load. */
async function timeReports(
	benchUrl: string,
	today: string
): Promise<{ timeZone: string; result: ReportsPhaseResult } | null> {
	const db = createDb(benchUrl, 2);
	try {
		const timeZone = await resolveShopTimeZone(
			db,
			process.env.SHOP_TIME_ZONE ?? DEMO_SHOP.timeZone
		);
		const result = await measureReports(db, { today, timeZone, ...REPORT_ROUNDS, say });
		return { timeZone, result };
	} catch (error) {
		// The catalogue figures are already out; a report module that does not load costs only this.
		console.error(
			`\x1b[1;31m[bench]\x1b[0m reports not timed: ${error instanceof Error ? error.message : String(error)}`
		);
		return null;
	} finally {
		await db.destroy();
	}
}

// ---------------------------------------------------------------- build and server

function newestMtime(dir: string): number {
	let newest = 0;
	for (const entry of readdirSync(dir, { withFileTypes: true })) {
		const full = path.join(dir, entry.name);
		newest = Math.max(newest, entry.isDirectory() ? newestMtime(full) : statSync(full).mtimeMs);
	}
	return newest;
}

/** Runs a command to its end; its output goes to `log` (its tail shown on failure) or the terminal. */
function run(command: string, args: string[], log?: string): void {
	const fd = log ? openSync(log, 'w') : null;
	try {
		const result = spawnSync(command, args, {
			cwd: ROOT,
			stdio: fd === null ? 'inherit' : ['ignore', fd, fd]
		});
		if (result.status === 0) return;
		if (log) console.error(readFileSync(log, 'utf8').split('\n').slice(-40).join('\n'));
		throw new BenchError(
			`${command} ${args.join(' ')} failed (exit ${result.status ?? result.signal})` +
				(log ? `; its output is in ${path.relative(ROOT, log)}` : '')
		);
	} finally {
		if (fd !== null) closeSync(fd);
	}
}

/** Rebuild when build/ is missing or older than src/, then copy it aside under the lock. */
function prepareBuild(): void {
	const handler = path.join(ROOT, 'build', 'handler.js');
	const built = existsSync(handler) ? statSync(handler).mtimeMs : 0;
	if (built < newestMtime(path.join(ROOT, 'src'))) {
		const since = performance.now();
		say(built ? 'build/ is older than src/: building…' : 'no build/ yet: building…');
		run('flock', [BUILD_LOCK, 'npx', 'vite', 'build', '--logLevel', 'warn'], BUILD_LOG);
		say(`built in ${seconds(since)} (output: ${path.relative(ROOT, BUILD_LOG)})`);
	} else {
		say('build/ is newer than src/: using it');
	}
	run('flock', [
		BUILD_LOCK,
		'sh',
		'-c',
		'rm -rf "$1" && mkdir -p "$(dirname "$1")" && cp -a build "$1"',
		'copy-build',
		SERVER_DIR
	]);
}

function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const probe = createServer();
		probe.once('error', reject);
		probe.listen(0, HOST, () => {
			const address = probe.address();
			const port = typeof address === 'object' && address ? address.port : 0;
			probe.close(() => resolve(port));
		});
	});
}

async function portTaken(port: number): Promise<boolean> {
	return new Promise((resolve) => {
		const probe = createServer();
		probe.once('error', () => resolve(true));
		probe.listen(port, HOST, () => probe.close(() => resolve(false)));
	});
}

let server: ChildProcess | null = null;

async function startServer(benchUrl: string): Promise<void> {
	if (await portTaken(PORT))
		throw new BenchError(`port ${PORT} on ${HOST} is taken; is another bench running?`);
	// The measured pages need neither mail nor forecasts: both point at ports nobody serves.
	const [smtpPort, weatherPort] = [await freePort(), await freePort()];
	const env: NodeJS.ProcessEnv = {
		...process.env,
		NODE_ENV: 'production',
		HOST,
		PORT: String(PORT),
		ORIGIN: BASE,
		DATABASE_URL: benchUrl,
		AUTH_SECRET: 'bench-only-secret-never-used-for-real-accounts-0000',
		SHOP_TIME_ZONE: process.env.SHOP_TIME_ZONE ?? DEMO_SHOP.timeZone,
		SMTP_URL: `smtp://${HOST}:${smtpPort}`,
		WEATHER_API_URL: `http://${HOST}:${weatherPort}`
	};
	delete env.MAIL_CATCHER_URL;
	const log = createWriteStream(SERVER_LOG);
	const child = spawn(process.execPath, [SERVER_DIR], {
		cwd: ROOT,
		env,
		stdio: ['ignore', 'pipe', 'pipe']
	});
	server = child;
	child.stdout?.pipe(log);
	child.stderr?.pipe(log);
	const deadline = performance.now() + 30_000;
	while (performance.now() < deadline) {
		if (child.exitCode !== null || child.signalCode !== null)
			throw new BenchError(`the server exited during start-up; see ${SERVER_LOG}`);
		try {
			const res = await fetch(`${BASE}/api/health`, { signal: AbortSignal.timeout(2000) });
			const body = (await res.json()) as { status?: string };
			if (res.ok && body.status === 'ok') return;
		} catch {
			// Not listening yet.
		}
		await new Promise((resolve) => setTimeout(resolve, 250));
	}
	throw new BenchError(`the server did not answer /api/health within 30 s; see ${SERVER_LOG}`);
}

async function stopServer(): Promise<void> {
	const child = server;
	server = null;
	if (!child || child.exitCode !== null || child.signalCode !== null) return;
	const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
	child.kill('SIGTERM');
	const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
	await exited;
	clearTimeout(timer);
}

// A last resort if the process ends some other way: the server never outlives the bench.
process.on('exit', () => {
	if (server && server.exitCode === null) server.kill('SIGKILL');
});
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
	process.once(signal, () => {
		console.error(`\n[bench] ${signal}: stopping the server…`);
		void stopServer().finally(() => process.exit(130));
	});
}

async function main(): Promise<void> {
	const { admin, bench } = databaseUrls();
	const today = dateInTimeZone(new Date(), DEMO_SHOP.timeZone);

	let since = performance.now();
	say(`fresh database ${BENCH_DATABASE}: migrate, seed the demo, add the catalogue…`);
	await freshDatabase(admin, bench);
	const live = await fillCatalogue(bench, today);
	say(
		`${int(live)} live listings (${Math.ceil(live / PAGE_SIZE)} pages of ${PAGE_SIZE}) in ${seconds(since)}`
	);
	if (live < FAR_PAGE * PAGE_SIZE)
		throw new BenchError(`${int(live)} live listings do not fill ${FAR_PAGE} pages`);

	since = performance.now();
	say(`adding ${int(BENCH_ORDERS)} generated orders over the three years before ${today}…`);
	const orders = await fillOrders(bench, today);
	const orderRows = Object.values(orders.counts).reduce((sum, n) => sum + n, 0);
	say(
		`${int(orders.counts.customer_order)} orders (reships included), ${int(orderRows)} rows in ${seconds(since)} ` +
			`(planned in ${(orders.planMs / 1000).toFixed(1)} s, written in ${(orders.insertMs / 1000).toFixed(1)} s)`
	);

	prepareBuild();
	since = performance.now();
	await startServer(bench);
	say(
		`production server on ${BASE} (log: ${path.relative(ROOT, SERVER_LOG)}), up in ${seconds(since)}`
	);

	const db = createDb(bench, 2);
	let shop: ShopFigures;
	try {
		shop = await measureShop({ base: BASE, db, farPage: FAR_PAGE, serverLog: SERVER_LOG, say });
	} finally {
		await db.destroy();
	}
	printShop(
		shop,
		`Hatchlot shop bench: production build on ${BASE}, database ${BENCH_DATABASE}, ${int(live)} live listings`
	);
	const figures: ShopFigures & { database: string; liveListings: number; reports: unknown } = {
		...shop,
		database: BENCH_DATABASE,
		liveListings: live,
		reports: null
	};
	const writeFigures = () => {
		mkdirSync(path.dirname(BENCH_JSON), { recursive: true });
		writeFileSync(BENCH_JSON, JSON.stringify(figures, null, '\t') + '\n');
	};
	// Written now as well, so the shop's figures survive a reports phase that fails hard.
	writeFigures();

	say(
		`reports: ${REPORT_ROUNDS.warmup} warm-up and ${REPORT_ROUNDS.rounds} timed rounds, each run beside \`${BASELINE_SQL}\`…`
	);
	since = performance.now();
	const reports = await timeReports(bench, today);
	if (reports) {
		const { result, timeZone } = reports;
		say(`reports timed in ${seconds(since)}`);
		console.log('');
		console.log(
			`Hatchlot reports bench: in-process on ${BENCH_DATABASE}, the demo plus ${int(orders.counts.customer_order)} ` +
				`generated orders, today ${today} (${timeZone}), money shown, no filters, ${result.rounds} rounds`
		);
		console.log('');
		console.log(textTable([...TIMING_HEADER], result.rows.map(timingCells)));
		console.log('');
		for (const row of result.rows.filter((r) => r.problem))
			console.log(`${row.report} (${row.range}): ${row.problem}`);
		figures.reports = {
			today,
			timeZone,
			orders: orders.counts,
			orderStates: orders.states,
			baseline: result.baselineSql,
			rounds: result.rounds,
			budgetMs: REPORT_BUDGET_MS,
			reports: result.rows
		};
		writeFigures();
	}
	say(`figures written to ${path.relative(ROOT, BENCH_JSON)}`);
	say(`done in ${seconds(startedAt)}; ${BENCH_DATABASE} is kept for a look until the next run`);
}

try {
	await main();
} catch (error) {
	const message = error instanceof Error ? error.message : String(error);
	console.error(`\x1b[1;31m[bench]\x1b[0m ${message}`);
	if (!(error instanceof BenchError) && error instanceof Error && error.stack)
		console.error(error.stack);
	process.exitCode = 1;
} finally {
	await stopServer();
}
