// The bench's measures of the running shop, against any base URL and the database behind
// it: throughput pairs in A B A B rounds, the catalogue's tail at 8 connections, adding
// cart lines beside /api/health, deep-page latency, the JavaScript pages load and lab
// vitals. Returns plain figures for the printed tables and .data/bench.json.
import os from 'node:os';
import { performance } from 'node:perf_hooks';
import { gzipSync } from 'node:zlib';
import { sql } from 'kysely';
import { MAX_LINE_QUANTITY } from '../../src/lib/money/pricing';
import type { Db } from '../../src/lib/server/db/connect';
import { onOfferSql } from '../../src/lib/server/listings/offer';
import { measureVitals, type PageVitalsAt, type Viewport } from './browser-vitals';
import {
	alternatingRounds,
	BenchError,
	guestCarts,
	loadRound,
	type LoadSettings,
	type RoundResult,
	type Target
} from './load';
import { nextPageUrl, pageScriptUrls, percentile, staticImportUrls, textTable } from './measure';
import { kB, pooledRate, ratio, roundRobin, tail, type Round, type Tail } from './pairs';
import { CLS_GOOD, LCP_GOOD_MS } from './vitals';

export const CATALOGUE_PATH = '/catalogue';
/** Throughput: a warm-up round of each, then rounds of the two targets in turn. */
export const CANNON = { connections: 10, warmupSeconds: 2, rounds: 4, roundSeconds: 2 };
/** Latency: sequential requests of page 1 and the far page, taken in turn. */
export const LATENCY = { warmup: 20, samples: 200, maxSeconds: 180 };
/** The catalogue's tail: every answer's time at a fixed 8 connections. */
export const TAIL = { connections: 8, warmupSeconds: 2, seconds: 8 };
/**
 * Adding a line: guest carts handed out in turn and emptied before every round, so each
 * round adds to the same carts in the same state; a cart never holds more than is on offer.
 */
export const CART = { carts: 200, quantity: 1 };
/** Lab vitals: cold loads of each page at the e2e tests' two viewports, taken in turn. */
export const VITALS = {
	chromium: '/usr/bin/chromium',
	rounds: 5,
	settleMs: 500,
	timeoutMs: 30_000,
	viewports: [
		{ label: 'phone', width: 390, height: 844 },
		{ label: 'desktop', width: 1280, height: 900 }
	] satisfies Viewport[]
};
const WALK_MAX_SECONDS = 300;
const REQUEST_TIMEOUT_MS = 15_000;

export interface ShopBenchOptions {
	base: string;
	/** The database the server at `base` uses (the carts are emptied in it). */
	db: Db;
	/** The catalogue page whose latency is set beside page 1's. */
	farPage: number;
	serverLog: string;
	say: (message: string) => void;
}

const int = (n: number) => n.toLocaleString('en-US');
const seconds = (since: number) => `${((performance.now() - since) / 1000).toFixed(1)} s`;
const roundsOnly = (rounds: readonly RoundResult[]): Round[] =>
	rounds.map(({ answers, seconds }) => ({ answers, seconds }));

// ---------------------------------------------------------------- pages

async function get(url: string): Promise<{ status: number; body: Buffer; link: string | null }> {
	const res = await fetch(url, { signal: AbortSignal.timeout(REQUEST_TIMEOUT_MS) });
	return {
		status: res.status,
		body: Buffer.from(await res.arrayBuffer()),
		link: res.headers.get('link')
	};
}

async function getOk(url: string): Promise<{ body: Buffer; link: string | null }> {
	const res = await get(url);
	if (res.status === 404 && new URL(url).pathname === CATALOGUE_PATH)
		throw new BenchError(
			`${CATALOGUE_PATH} answers 404: the catalogue route is not in this build.`
		);
	if (res.status !== 200) throw new BenchError(`GET ${url} answered ${res.status}`);
	return res;
}

export interface ScriptFile {
	url: string;
	rawBytes: number;
	gzipBytes: number;
	namedByPage: boolean;
}

/** Each script a page names, and what they import statically, fetched once and gzipped. */
async function pageJavaScript(pageUrl: string): Promise<ScriptFile[]> {
	const page = await getOk(pageUrl);
	const named = pageScriptUrls(page.body.toString('utf8'), page.link, pageUrl);
	const queue = [...named];
	const seen = new Set(queue);
	const files: ScriptFile[] = [];
	while (queue.length > 0 && files.length < 500) {
		const url = queue.shift() as string;
		const { body } = await getOk(url);
		files.push({
			url,
			rawBytes: body.length,
			gzipBytes: gzipSync(body).length,
			namedByPage: named.includes(url)
		});
		for (const imported of staticImportUrls(body.toString('utf8'), url)) {
			if (!seen.has(imported) && new URL(imported).pathname.startsWith('/_app/')) {
				seen.add(imported);
				queue.push(imported);
			}
		}
	}
	if (files.length === 0)
		throw new BenchError(`${new URL(pageUrl).pathname} loads no JavaScript under /_app/`);
	return files;
}

export interface PageScripts {
	url: string;
	files: number;
	foundByImports: number;
	gzipBytes: number;
	rawBytes: number;
}

function scriptTotals(url: string, scripts: readonly ScriptFile[]): PageScripts {
	return {
		url,
		files: scripts.length,
		foundByImports: scripts.filter((f) => !f.namedByPage).length,
		gzipBytes: scripts.reduce((sum, f) => sum + f.gzipBytes, 0),
		rawBytes: scripts.reduce((sum, f) => sum + f.rawBytes, 0)
	};
}

/** Follows rel="next" from page 1 until page `target`, and returns that page's URL. */
async function walkTo(
	firstUrl: string,
	target: number,
	say: (message: string) => void
): Promise<string> {
	let url = firstUrl;
	const deadline = performance.now() + WALK_MAX_SECONDS * 1000;
	for (let page = 1; page < target; page++) {
		if (performance.now() > deadline)
			throw new BenchError(`walking to page ${target} took over ${WALK_MAX_SECONDS} s`);
		const { body } = await getOk(url);
		const next = nextPageUrl(body.toString('utf8'), url);
		if (!next)
			throw new BenchError(
				`the catalogue ends at page ${page}; page ${target} needs more listings`
			);
		url = next;
		if (page % 100 === 0) say(`  … page ${page + 1}`);
	}
	return url;
}

/** Sequential timings of each URL in turn, so both see the same moments of the machine. */
async function latencies(urls: readonly string[]): Promise<number[][]> {
	const times = urls.map((): number[] => []);
	const deadline = performance.now() + LATENCY.maxSeconds * 1000;
	for (let round = 0; round < LATENCY.warmup + LATENCY.samples; round++) {
		if (performance.now() > deadline)
			throw new BenchError(`the latency rounds took over ${LATENCY.maxSeconds} s`);
		for (const [index, url] of urls.entries()) {
			const t0 = performance.now();
			const res = await get(url);
			const elapsed = performance.now() - t0;
			if (res.status !== 200) throw new BenchError(`GET ${url} answered ${res.status}`);
			if (round >= LATENCY.warmup) times[index]?.push(elapsed);
		}
	}
	return times;
}

// ---------------------------------------------------------------- cart

export interface CartListing {
	id: number;
	slug: string;
	kind: string;
	onOffer: number;
}

/**
 * The listing the carts add to and the listing page measured: an animal listing (a supply
 * only if none) with a price, the most units on offer, so the carts stay within them.
 */
export async function cartListing(db: Db): Promise<CartListing> {
	const row = await db
		.selectFrom('listing')
		.select((eb) => [
			'listing.id',
			'listing.slug',
			'listing.kind',
			onOfferSql(eb.ref('listing.id')).as('on_offer')
		])
		.where('listing.state', '=', 'live')
		.where((eb) =>
			eb.exists(
				eb
					.selectFrom('price_tier')
					.select('price_tier.id')
					.whereRef('price_tier.listing_id', '=', 'listing.id')
			)
		)
		.orderBy(sql`listing.kind = 'animal'`, 'desc')
		.orderBy('on_offer', 'desc')
		.orderBy('listing.id')
		.limit(1)
		.executeTakeFirst();
	if (!row) throw new BenchError('no live listing with a price to add to a cart');
	return { id: row.id, slug: row.slug, kind: row.kind, onOffer: Number(row.on_offer) };
}

interface CartRounds {
	add: Round[];
	health: Round[];
	maxRequestsPerRound: number;
}

/** The add-line rounds beside /api/health's; the carts are emptied before each round and after. */
async function cartAgainstHealth(
	options: ShopBenchOptions,
	listing: CartListing,
	load: LoadSettings
): Promise<CartRounds> {
	const { base, db } = options;
	// Each add puts one more unit on the cart's line; a round stops before any line could
	// pass what is on offer (one spare for a request built but not yet answered).
	const perCart = Math.min(listing.onOffer, MAX_LINE_QUANTITY) - 1;
	if (perCart < 2)
		throw new BenchError(
			`listing ${listing.slug} has ${listing.onOffer} on offer; the cart rounds need at least 3`
		);
	const before = new Set((await db.selectFrom('cart').select('id').execute()).map((r) => r.id));
	const cookies = await guestCarts(base, listing.id, CART.carts, REQUEST_TIMEOUT_MS);
	// Only the bench's requests make carts in this database, so the new carts are these.
	const cartIds = (await db.selectFrom('cart').select('id').execute())
		.map((r) => r.id)
		.filter((id) => !before.has(id));
	if (cartIds.length !== CART.carts)
		throw new BenchError(`made ${CART.carts} guest carts but found ${cartIds.length} new ones`);
	const emptyCarts = async () => {
		await db.deleteFrom('cart_line').where('cart_id', 'in', cartIds).execute();
	};
	const maxRequests = CART.carts * perCart;
	const add: Target = {
		label: 'POST /api/cart',
		url: `${base}/api/cart`,
		method: 'POST',
		// The headers a browser's fetch sends from the shop's own pages.
		headers: { 'content-type': 'application/json', accept: 'application/json', origin: base },
		body: JSON.stringify({ listingId: listing.id, quantity: CART.quantity }),
		perRequest: roundRobin(cookies),
		maxRequests,
		beforeRound: emptyCarts
	};
	const health: Target = { label: 'GET /api/health', url: `${base}/api/health` };
	const rounds = await alternatingRounds(
		[add, health],
		{ rounds: CANNON.rounds, seconds: CANNON.roundSeconds, warmupSeconds: CANNON.warmupSeconds },
		load
	);
	await emptyCarts();
	// autocannon ends a round that reached its count only at its next one-second tick, so
	// such a round's rate would read low: refuse it rather than print it.
	if (rounds.a.some((r) => r.answers >= maxRequests))
		throw new BenchError(
			`a cart round reached its ${int(maxRequests)} adds before its time; give the bench more carts`
		);
	return {
		add: roundsOnly(rounds.a),
		health: roundsOnly(rounds.b),
		maxRequestsPerRound: maxRequests
	};
}

// ---------------------------------------------------------------- vitals

/** Lab vitals, or null with the reason printed when Chromium cannot be used here. */
async function labVitals(pages: { label: string; url: string }[]): Promise<PageVitalsAt[] | null> {
	try {
		return await measureVitals({
			executablePath: VITALS.chromium,
			pages,
			viewports: VITALS.viewports,
			rounds: VITALS.rounds,
			settleMs: VITALS.settleMs,
			timeoutMs: VITALS.timeoutMs
		});
	} catch (error) {
		// The load figures are measured already; a browser that will not start costs only this.
		console.error(
			`\x1b[1;31m[bench]\x1b[0m lab vitals not measured: ${error instanceof Error ? error.message : String(error)}`
		);
		return null;
	}
}

// ---------------------------------------------------------------- all of it

export interface ShopFigures {
	measuredAt: string;
	server: string;
	machine: { cpus: number; loadAverage: number[]; node: string };
	throughput: {
		connections: number;
		warmupSeconds: number;
		catalogue: { url: string; rounds: Round[]; requestsPerSecond: number };
		staticFile: { url: string; bytes: number; rounds: Round[]; requestsPerSecond: number };
		ratio: number;
	};
	deepPage: {
		page: number;
		url: string;
		requests: number;
		page1: { p50Ms: number; p95Ms: number };
		far: { p50Ms: number; p95Ms: number };
		ratio: number;
	};
	tail: Omit<Tail, 'count' | 'p50' | 'p99'> & {
		url: string;
		connections: number;
		seconds: number;
		answers: number;
		p50Ms: number;
		p99Ms: number;
	};
	cart: {
		connections: number;
		warmupSeconds: number;
		listing: CartListing;
		carts: number;
		quantityPerAdd: number;
		maxRequestsPerRound: number;
		add: { url: string; rounds: Round[]; requestsPerSecond: number };
		health: { url: string; rounds: Round[]; requestsPerSecond: number };
		ratio: number;
	};
	javascript: { catalogue: PageScripts; listing: PageScripts; listingToCatalogue: number };
	vitals: {
		browser: string;
		loadsEach: number;
		settleMs: number;
		goodLcpMs: number;
		goodCls: number;
		pages: (PageVitalsAt & { lcpToGood: number; clsToGood: number })[];
	} | null;
}

/** Every measure of the running shop, in the order the bench takes them. */
export async function measureShop(options: ShopBenchOptions): Promise<ShopFigures> {
	const { base, db, farPage, say } = options;
	const load: LoadSettings = {
		connections: CANNON.connections,
		timeoutSeconds: REQUEST_TIMEOUT_MS / 1000,
		serverLog: options.serverLog
	};
	const page1 = `${base}${CATALOGUE_PATH}`;
	const catalogueScripts = await pageJavaScript(page1);
	// The smallest script the page loads: an immutable file sirv serves from disk.
	const smallest = catalogueScripts.reduce((a, b) => (b.rawBytes < a.rawBytes ? b : a));
	const listing = await cartListing(db);
	const listingUrl = `${base}/listings/${encodeURIComponent(listing.slug)}`;
	const listingScripts = await pageJavaScript(listingUrl);

	say(
		`throughput: ${CANNON.connections} connections, ${CANNON.warmupSeconds} s warm-up each, then ` +
			`${CANNON.rounds} rounds of ${CANNON.roundSeconds} s of the page and the file in turn…`
	);
	const pageAndFile = await alternatingRounds(
		[
			{ label: 'catalogue', url: page1 },
			{ label: 'static file', url: smallest.url }
		],
		{ rounds: CANNON.rounds, seconds: CANNON.roundSeconds, warmupSeconds: CANNON.warmupSeconds },
		load
	);
	const pageRps = pooledRate(pageAndFile.a);
	const staticRps = pooledRate(pageAndFile.b);

	say(
		`tail: page 1 at ${TAIL.connections} connections, ${TAIL.seconds} s after a ${TAIL.warmupSeconds} s warm-up…`
	);
	const tailLoad = { ...load, connections: TAIL.connections };
	const catalogue = { label: 'catalogue', url: page1 };
	await loadRound(catalogue, TAIL.warmupSeconds, tailLoad);
	const tailRound = await loadRound(catalogue, TAIL.seconds, tailLoad, true);
	const tail8 = tail(tailRound.latencies);

	say(
		`cart: ${CART.carts} guest carts adding ${CART.quantity} of ${listing.slug} (${listing.onOffer} on offer) ` +
			`beside /api/health, ${CANNON.rounds} rounds of ${CANNON.roundSeconds} s each in turn…`
	);
	const cart = await cartAgainstHealth(options, listing, load);
	const addRps = pooledRate(cart.add);
	const healthRps = pooledRate(cart.health);

	say(`following rel="next" from page 1 to page ${farPage}…`);
	let since = performance.now();
	const farUrl = await walkTo(page1, farPage, say);
	say(`reached page ${farPage} in ${seconds(since)}`);
	say(`latency: ${LATENCY.samples} sequential requests of page 1 and page ${farPage} in turn…`);
	const [nearTimes = [], farTimes = []] = await latencies([page1, farUrl]);
	const p95Near = percentile(nearTimes, 95);
	const p95Far = percentile(farTimes, 95);

	say(
		`lab vitals: ${VITALS.rounds} cold loads each of / and ${new URL(listingUrl).pathname} at ` +
			`${VITALS.viewports.map((v) => `${v.width}×${v.height}`).join(' and ')}, in turn…`
	);
	since = performance.now();
	const vitals = await labVitals([
		{ label: 'home', url: `${base}/` },
		{ label: 'listing', url: listingUrl }
	]);
	if (vitals) say(`vitals measured in ${seconds(since)}`);

	const catalogueJs = scriptTotals(page1, catalogueScripts);
	const listingJs = scriptTotals(listingUrl, listingScripts);
	return {
		measuredAt: new Date().toISOString(),
		server: base,
		machine: { cpus: os.cpus().length, loadAverage: os.loadavg(), node: process.version },
		throughput: {
			connections: CANNON.connections,
			warmupSeconds: CANNON.warmupSeconds,
			catalogue: { url: page1, rounds: roundsOnly(pageAndFile.a), requestsPerSecond: pageRps },
			staticFile: {
				url: smallest.url,
				bytes: smallest.rawBytes,
				rounds: roundsOnly(pageAndFile.b),
				requestsPerSecond: staticRps
			},
			ratio: ratio(pageRps, staticRps)
		},
		deepPage: {
			page: farPage,
			url: farUrl,
			requests: LATENCY.samples,
			page1: { p50Ms: percentile(nearTimes, 50), p95Ms: p95Near },
			far: { p50Ms: percentile(farTimes, 50), p95Ms: p95Far },
			ratio: ratio(p95Far, p95Near)
		},
		tail: {
			url: page1,
			connections: TAIL.connections,
			seconds: tailRound.seconds,
			answers: tailRound.answers,
			p50Ms: tail8.p50,
			p99Ms: tail8.p99,
			ratio: tail8.ratio
		},
		cart: {
			connections: CANNON.connections,
			warmupSeconds: CANNON.warmupSeconds,
			listing,
			carts: CART.carts,
			quantityPerAdd: CART.quantity,
			maxRequestsPerRound: cart.maxRequestsPerRound,
			add: { url: `${base}/api/cart`, rounds: cart.add, requestsPerSecond: addRps },
			health: { url: `${base}/api/health`, rounds: cart.health, requestsPerSecond: healthRps },
			ratio: ratio(addRps, healthRps)
		},
		javascript: {
			catalogue: catalogueJs,
			listing: listingJs,
			listingToCatalogue: ratio(listingJs.gzipBytes, catalogueJs.gzipBytes)
		},
		vitals: vitals && {
			browser: VITALS.chromium,
			loadsEach: VITALS.rounds,
			settleMs: VITALS.settleMs,
			goodLcpMs: LCP_GOOD_MS,
			goodCls: CLS_GOOD,
			pages: vitals.map((v) => ({
				...v,
				lcpToGood: v.lcpMs / LCP_GOOD_MS,
				clsToGood: v.cls / CLS_GOOD
			}))
		}
	};
}

// ---------------------------------------------------------------- printing

const ms = (value: number) => `${value.toFixed(1)} ms`;
const perSecond = (value: number) => `${int(Math.round(value))} req/s`;
const answersIn = (rounds: readonly Round[]) =>
	`${int(rounds.reduce((sum, r) => sum + r.answers, 0))} answers in ${rounds
		.reduce((sum, r) => sum + r.seconds, 0)
		.toFixed(1)} s`;
const jsDetail = (js: PageScripts) =>
	`${js.files} files${js.foundByImports ? ` (${js.foundByImports} found by their imports)` : ''}, ${kB(js.rawBytes)} raw`;

/** The raw figures as tables, then the ratios, one a line. */
export function printShop(f: ShopFigures, heading: string): void {
	const inTurn = `${CANNON.rounds} × ${CANNON.roundSeconds} s in turn`;
	console.log('');
	console.log(
		`${heading}, ${f.machine.cpus} CPUs, load average ${f.machine.loadAverage[0]?.toFixed(2) ?? '?'}`
	);
	console.log('');
	console.log(
		textTable(
			['measure', 'value', 'detail'],
			[
				[
					`GET ${CATALOGUE_PATH} (page 1)`,
					perSecond(f.throughput.catalogue.requestsPerSecond),
					`${f.throughput.connections} conn, ${inTurn} with the file, ${answersIn(f.throughput.catalogue.rounds)}`
				],
				[
					`GET ${new URL(f.throughput.staticFile.url).pathname}`,
					perSecond(f.throughput.staticFile.requestsPerSecond),
					`${int(f.throughput.staticFile.bytes)} B file, ${answersIn(f.throughput.staticFile.rounds)}`
				],
				[
					'page 1, sequential',
					`p95 ${ms(f.deepPage.page1.p95Ms)}`,
					`p50 ${ms(f.deepPage.page1.p50Ms)}, ${f.deepPage.requests} requests`
				],
				[
					`page ${f.deepPage.page} (after ${f.deepPage.page - 1} rel=next hops), sequential`,
					`p95 ${ms(f.deepPage.far.p95Ms)}`,
					`p50 ${ms(f.deepPage.far.p50Ms)}, ${f.deepPage.requests} requests`
				],
				[
					`GET ${CATALOGUE_PATH} at ${f.tail.connections} connections`,
					`p99 ${ms(f.tail.p99Ms)}`,
					`p50 ${ms(f.tail.p50Ms)}, ${int(f.tail.answers)} answers in ${f.tail.seconds.toFixed(1)} s`
				],
				[
					`POST /api/cart (add ${f.cart.quantityPerAdd} to a line)`,
					perSecond(f.cart.add.requestsPerSecond),
					`${f.cart.connections} conn, ${f.cart.carts} guest carts in turn, ${inTurn} with health, ` +
						answersIn(f.cart.add.rounds)
				],
				[
					'GET /api/health',
					perSecond(f.cart.health.requestsPerSecond),
					answersIn(f.cart.health.rounds)
				],
				[
					'JavaScript the catalogue loads',
					`${kB(f.javascript.catalogue.gzipBytes)} gzip`,
					jsDetail(f.javascript.catalogue)
				],
				[
					'JavaScript a listing page loads',
					`${kB(f.javascript.listing.gzipBytes)} gzip`,
					jsDetail(f.javascript.listing)
				]
			],
			['left', 'right', 'left']
		)
	);
	console.log('');
	if (f.vitals) {
		console.log(
			`Lab vitals in headless Chromium, median of ${f.vitals.loadsEach} cold loads each; ` +
				`listing: ${new URL(f.javascript.listing.url).pathname}`
		);
		console.log('');
		console.log(
			textTable(
				[
					'page',
					'viewport',
					'LCP',
					'÷ 2.5 s',
					'CLS',
					'÷ 0.1',
					'worst CLS',
					'largest paint',
					'moved most'
				],
				f.vitals.pages.map((v) => [
					v.page,
					`${v.width}×${v.height}`,
					`${Math.round(v.lcpMs)} ms`,
					v.lcpToGood.toFixed(2),
					v.cls.toFixed(3),
					v.clsToGood.toFixed(2),
					v.clsWorst.toFixed(3),
					v.lcpElement.slice(0, 30),
					v.largestShift ? [...new Set(v.largestShift.sources)].join(' ') : 'nothing'
				]),
				['left', 'right', 'right', 'right', 'right', 'right', 'right', 'left', 'left']
			)
		);
		console.log('');
	}
	const line = (label: string, value: string) => console.log(`${label.padEnd(44)}${value}`);
	line('catalogue req/s ÷ static file req/s', f.throughput.ratio.toFixed(3));
	line(`p95 page ${f.deepPage.page} ÷ p95 page 1`, f.deepPage.ratio.toFixed(2));
	line(`p99 ÷ p50, catalogue at ${f.tail.connections} connections`, f.tail.ratio.toFixed(2));
	line('cart add-line req/s ÷ health req/s', f.cart.ratio.toFixed(3));
	line(
		'JavaScript gzipped: catalogue, listing page',
		`${kB(f.javascript.catalogue.gzipBytes)}, ${kB(f.javascript.listing.gzipBytes)} ` +
			`(listing ÷ catalogue ${f.javascript.listingToCatalogue.toFixed(2)})`
	);
	for (const viewport of f.vitals ? VITALS.viewports : []) {
		const at = (page: string) =>
			f.vitals?.pages.find((v) => v.page === page && v.viewport === viewport.label);
		const home = at('home');
		const shown = at('listing');
		if (!home || !shown) continue;
		line(
			`LCP ÷ 2.5 s, ${viewport.label}: home, listing`,
			`${home.lcpToGood.toFixed(2)}, ${shown.lcpToGood.toFixed(2)} ` +
				`(listing ÷ home ${ratio(shown.lcpMs, home.lcpMs).toFixed(2)})`
		);
		line(
			`CLS ÷ 0.1, ${viewport.label}: home, listing`,
			`${home.clsToGood.toFixed(2)}, ${shown.clsToGood.toFixed(2)}`
		);
	}
	console.log('');
}
