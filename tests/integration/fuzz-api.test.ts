// Every endpoint (+server.ts) and every form action, found from the file tree so a route
// added later is fuzzed without editing this file, sent random and boundary values by
// fast-check through the built app, as the role that may use it. Every answer must be a
// considered one: no 5xx, nothing of the server's insides in the body, and a refused
// request leaves every table as it was (fingerprinted before and after each request).
// FUZZ_SEED=<n> repeats a run's inputs; FUZZ_VERBOSE=1 prints the runs and time per target.
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { requiredRoleForPath } from '../../src/lib/server/auth/roles';
import {
	changedTables,
	demoUserId,
	leaksIn,
	sessionCookies,
	startHostileShop,
	tableFingerprints,
	type HostileShop,
	type Persona
} from './support/hostile';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const ROUTES = path.resolve(import.meta.dirname, '../../src/routes');
const LIB = path.resolve(import.meta.dirname, '../../src/lib');

/** Inputs drawn per endpoint method or action; as many are sent as the time share allows. */
const RUNS = 20;
/**
 * The whole fuzz gets this long, shared out among the targets still to go, so a busy
 * machine makes fewer runs per target rather than a longer file (each target runs once
 * at least).
 */
const BUDGET_MS = 45_000;

type Target =
	| { kind: 'endpoint'; route: string; method: string }
	| { kind: 'action'; route: string; action: string };

function walk(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((entry) =>
		entry.isDirectory() ? walk(path.join(dir, entry.name)) : [path.join(dir, entry.name)]
	);
}

/** The route id without groups: `/manage/clutches/[code]`. */
function routeOf(file: string): string {
	const segments = path
		.relative(ROUTES, path.dirname(file))
		.split(path.sep)
		.filter((s) => s && !/^\(.*\)$/.test(s));
	return '/' + segments.join('/');
}

function actionNames(source: string): string[] {
	const start = source.search(/export const actions\b/);
	if (start < 0) return [];
	const block = source.slice(start);
	const end = block.search(/^\};?\s*$/m);
	return [...(end < 0 ? block : block.slice(0, end)).matchAll(/^\t(\w+)\s*[:(,]/gm)].map(
		(m) => m[1]!
	);
}

function findTargets(): Target[] {
	const targets: Target[] = [];
	for (const file of walk(ROUTES)) {
		const base = path.basename(file);
		const route = routeOf(file);
		if (base === '+server.ts') {
			const source = readFileSync(file, 'utf8');
			for (const m of source.matchAll(
				/export (?:const|async function|function) (GET|POST|PUT|PATCH|DELETE)\b/g
			))
				targets.push({ kind: 'endpoint', route, method: m[1]! });
		} else if (base === '+page.server.ts') {
			for (const action of actionNames(readFileSync(file, 'utf8')))
				targets.push({ kind: 'action', route, action });
		}
	}
	return targets.sort((a, b) => label(a).localeCompare(label(b)));
}

function label(target: Target): string {
	return target.kind === 'endpoint'
		? `${target.method} ${target.route}`
		: `POST ${target.route}?/${target.action}`;
}

/** Field names the app reads anywhere: zod object keys and query parameters. */
function namesReadBySource(): string[] {
	const names = new Set<string>();
	for (const file of [...walk(LIB), ...walk(ROUTES)]) {
		if (!/\.(ts|svelte)$/.test(file)) continue;
		const source = readFileSync(file, 'utf8');
		for (const m of source.matchAll(/^\s*(\w+)\s*:\s*z\s*\./gm)) names.add(m[1]!);
		for (const m of source.matchAll(/searchParams\.get(?:All)?\(\s*'([^']+)'/g)) names.add(m[1]!);
	}
	return [...names].sort();
}

// ---- the forms a page renders, read from its HTML

type FormField = { name: string; value: string; file: boolean };

const decode = (text: string) =>
	text
		.replace(/&quot;/g, '"')
		.replace(/&#39;/g, "'")
		.replace(/&lt;/g, '<')
		.replace(/&gt;/g, '>')
		.replace(/&amp;/g, '&');
const attr = (tag: string, name: string) =>
	tag.match(new RegExp(`\\s${name}="([^"]*)"`))?.[1] ?? null;

/** action name → the fields of the forms that post to it (their rendered values as the base). */
function formsIn(html: string): Map<string, FormField[]> {
	const forms = new Map<string, FormField[]>();
	for (const form of html.matchAll(/<form\b([^>]*)>([\s\S]*?)<\/form>/g)) {
		if ((attr(form[1]!, 'method') ?? 'get').toLowerCase() !== 'post') continue;
		const action = decode(attr(form[1]!, 'action') ?? '').match(/\?\/(\w+)/)?.[1] ?? 'default';
		// One form per action: a page of boxes has a pack form for each, alike.
		if (forms.has(action)) continue;
		const fields: FormField[] = [];
		const body = form[2]!;
		const radios = new Map<string, string>();
		for (const input of body.matchAll(/<(input|button)\b([^>]*)>/g)) {
			const name = attr(input[2]!, 'name');
			if (!name) continue;
			const type = (attr(input[2]!, 'type') ?? 'text').toLowerCase();
			const checked = /\schecked(?:[\s=>]|$)/.test(input[2]!);
			// As a browser sends it: a ticked box, one button of a radio group.
			if (type === 'checkbox' && !checked) continue;
			if (type === 'radio') {
				if (checked || !radios.has(name)) radios.set(name, attr(input[2]!, 'value') ?? 'on');
				continue;
			}
			fields.push({
				name: decode(name),
				value: decode(attr(input[2]!, 'value') ?? (type === 'checkbox' ? 'on' : '')),
				file: type === 'file'
			});
		}
		for (const [name, value] of radios)
			fields.push({ name: decode(name), value: decode(value), file: false });
		for (const select of body.matchAll(/<select\b([^>]*)>([\s\S]*?)<\/select>/g)) {
			const name = attr(select[1]!, 'name');
			const option = select[2]!.match(/<option\b[^>]*\svalue="([^"]*)"/);
			if (name) fields.push({ name: decode(name), value: decode(option?.[1] ?? ''), file: false });
		}
		for (const area of body.matchAll(/<textarea\b([^>]*)>([\s\S]*?)<\/textarea>/g)) {
			const name = attr(area[1]!, 'name');
			if (name) fields.push({ name: decode(name), value: decode(area[2]!), file: false });
		}
		forms.set(action, fields);
	}
	return forms;
}

// ---- values

/** Boundary and hostile values for any field, as a browser or a script could send them. */
const HOSTILE = [
	'',
	' ',
	'0',
	'-0',
	'-1',
	'1',
	'1.5',
	'0.005',
	'2147483647',
	'2147483648',
	'-2147483649',
	'9007199254740993',
	'99999999999999999999999',
	'1e308',
	'-1e308',
	'NaN',
	'Infinity',
	'0x1F',
	'true',
	'false',
	'on',
	'null',
	'undefined',
	'[]',
	'{}',
	'{"__proto__":{"polluted":1}}',
	'__proto__',
	'constructor',
	'2026-02-30',
	'2026-13-01',
	'0000-01-01',
	'9999-12-31',
	'275760-09-13',
	'2026-12-01T25:61:00Z',
	"' or '1'='1",
	'1; drop table clutch; --',
	'\\',
	'%',
	'_',
	'a\u0000b',
	'\u0000',
	'\u202e\u0041',
	'<script>alert(1)</script>',
	'<img src=x onerror=alert(1)>',
	'javascript:alert(1)',
	'//evil.test/',
	'https://evil.test/',
	'../../etc/passwd',
	'${7*7}{{7*7}}',
	'x'.repeat(10_000),
	'é'.repeat(400),
	'🦗'.repeat(200),
	'00000000-0000-0000-0000-000000000000',
	'not-a-uuid',
	'00000',
	'55401',
	'99999',
	'MN',
	'ZZ',
	'overnight',
	'two_day',
	'admin',
	'keeper',
	'customer'
];

const textValue = fc.oneof(
	{ weight: 4, arbitrary: fc.constantFrom(...HOSTILE) },
	// The values most likely to reach PostgreSQL unchecked, drawn more often.
	{ weight: 1, arbitrary: fc.constantFrom('a\u0000b', '2147483648', '-1', '1e308', '2026-02-30') },
	{ weight: 2, arbitrary: fc.string({ maxLength: 40 }) },
	{ weight: 1, arbitrary: fc.string({ unit: 'binary', maxLength: 40 }) },
	{ weight: 2, arbitrary: fc.integer({ min: -1_000_000, max: 1_000_000 }).map(String) },
	{ weight: 1, arbitrary: fc.bigInt({ min: -(2n ** 70n), max: 2n ** 70n }).map(String) },
	{ weight: 1, arbitrary: fc.double().map(String) },
	{
		weight: 1,
		arbitrary: fc
			.date({ min: new Date('1900-01-01'), max: new Date('2200-01-01'), noInvalidDate: true })
			.map((d) => d.toISOString().slice(0, 10))
	}
);

/** A path segment in place of a real code, slug, number or id. */
const hostileSegment = fc.constantFrom(
	'0',
	'-1',
	'99999999999999999999',
	'%00',
	'%25',
	'%2e%2e%2f%2e%2e%2f',
	'%E2%80%AE',
	'a'.repeat(300),
	'%3Cscript%3E',
	"'%20or%201=1",
	'NaN'
);

/** Mostly the real record, so the action gets past its lookup; now and then something else. */
const sometimesHostileSegment = fc.oneof(
	{ weight: 5, arbitrary: fc.constant(null) },
	{ weight: 1, arbitrary: hostileSegment }
);

/** What an arbitrary draws. */
type Drawn<A> = A extends fc.Arbitrary<infer T> ? T : never;

describe('fuzz: every endpoint and form action', () => {
	let scratch: ScratchDatabase;
	let shop: HostileShop;
	let cookies: Record<Persona, string | null>;
	let samples: Map<string, string>;
	let dictionary: string[];
	let tinyPng: Uint8Array;
	const pages = new Map<string, Map<string, FormField[]>>();

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		shop = await startHostileShop(scratch.url);
		const db = scratch.db;
		const customer = await demoUserId(db, 'customer');
		const colony = await db
			.selectFrom('colony')
			.select('code')
			.orderBy('id')
			.executeTakeFirstOrThrow();
		const clutch = await db
			.selectFrom('clutch')
			.select('code')
			.orderBy('id')
			.executeTakeFirstOrThrow();
		const tub = await db
			.selectFrom('resting_tub')
			.select('code')
			.orderBy('id')
			.executeTakeFirstOrThrow();
		const species = await db
			.selectFrom('species')
			.select('slug')
			.orderBy('id')
			.executeTakeFirstOrThrow();
		const listing = await db
			.selectFrom('listing')
			.select('slug')
			.where('state', '=', 'live')
			.orderBy('id')
			.executeTakeFirstOrThrow();
		const claim = await db.selectFrom('claim').select('id').orderBy('id').executeTakeFirstOrThrow();
		const recipe = await db
			.selectFrom('substrate_recipe')
			.select('id')
			.orderBy('id')
			.executeTakeFirstOrThrow();
		const own = await db
			.selectFrom('customer_order')
			.select('order_number')
			.where('user_id', '=', customer)
			.orderBy('delivered_at', (ob) => ob.desc().nullsLast())
			.executeTakeFirstOrThrow();
		const anyOrder = await db
			.selectFrom('customer_order')
			.select('order_number')
			.orderBy('id')
			.executeTakeFirstOrThrow();
		// A segment's sample depends on the folder it sits in.
		samples = new Map([
			['colonies/code', colony.code],
			['clutches/code', clutch.code],
			['tubs/code', tub.code],
			['species/slug', species.slug],
			['listings/slug', listing.slug],
			['orders/number', own.order_number],
			['slips/number', anyOrder.order_number],
			// Not the customer whose session the fuzz uses: role changes land on someone else.
			['users/id', await demoUserId(db, 'customer', 1)],
			['claims/id', String(claim.id)],
			['recipes/id', String(recipe.id)],
			['reports/report', 'sales'],
			['photos/file', `${'0'.repeat(64)}-320.webp`]
		]);
		// The shop's own order page for a keeper lives under manage/; any order is theirs.
		samples.set('manage/orders/number', anyOrder.order_number);
		dictionary = namesReadBySource();
		tinyPng = new Uint8Array(
			await sharp({ create: { width: 8, height: 8, channels: 3, background: '#5b7a3c' } })
				.png()
				.toBuffer()
		);
	});
	afterAll(async () => {
		await shop?.stop();
		await scratch?.drop();
	});

	function personaFor(route: string): fc.Arbitrary<Persona> {
		const need = requiredRoleForPath(route);
		if (need === 'admin' || need === 'keeper') return fc.constant(need);
		if (need === 'signed_in') return fc.constant('customer');
		// Public: a guest and a signed-in customer take different branches.
		return fc.constantFrom('anonymous', 'customer');
	}

	function urlFor(route: string, hostile: string | null): string {
		const parts = route.split('/');
		return parts
			.map((segment, i) => {
				const param = segment.match(/^\[(\w+)\]$/)?.[1];
				if (!param) return segment;
				if (hostile !== null) return hostile;
				const folder = parts[i - 1] ?? '';
				const key = `${folder}/${param}`;
				if (route.startsWith('/manage/orders/')) return samples.get('manage/orders/number')!;
				if (param === 'token') return 'no-such-token-0123456789';
				return encodeURIComponent(samples.get(key) ?? 'sample');
			})
			.join('/');
	}

	async function send(
		persona: Persona,
		method: string,
		url: string,
		init: { body?: BodyInit; headers?: Record<string, string> } = {}
	) {
		const headers: Record<string, string> = { origin: shop.app.origin, ...init.headers };
		if (cookies[persona]) headers.cookie = cookies[persona]!;
		const response = await fetch(`${shop.app.origin}${url}`, {
			method,
			headers,
			body: init.body,
			redirect: 'manual',
			signal: AbortSignal.timeout(15_000)
		});
		return { status: response.status, text: await response.text(), headers: response.headers };
	}

	/** The page's forms as each persona sees them, fetched once. */
	async function formsFor(persona: Persona, url: string) {
		const key = `${persona} ${url}`;
		if (!pages.has(key)) {
			const page = await send(persona, 'GET', url, { headers: { accept: 'text/html' } });
			pages.set(key, page.status === 200 ? formsIn(page.text) : new Map());
			tables = null;
		}
		return pages.get(key)!;
	}

	/** The fingerprints as they stand, when nothing has been sent since they were taken. */
	let tables: Map<string, string> | null = null;
	const fingerprints = async () => (tables ??= await tableFingerprints(scratch.db));

	/** Sends one request and applies the checks every answer passes; a problem's description, or null. */
	async function judged(
		what: string,
		exchange: () => Promise<{ status: number; text: string; refused: boolean }>
	): Promise<string | null> {
		const before = await fingerprints();
		const logged = shop.app.output().length;
		const answer = await exchange();
		tables = null;
		if (answer.status >= 500) {
			const log = shop.app.output().slice(logged, logged + 800);
			return `${what} → ${answer.status}: ${answer.text.slice(0, 200)}\nserver said: ${log}`;
		}
		const leaks = leaksIn(answer.text);
		if (leaks.length) return `${what} → ${answer.status} leaks ${leaks.join('; ')}`;
		if (answer.refused) {
			tables = await tableFingerprints(scratch.db);
			const changed = changedTables(before, tables);
			if (changed.length)
				return `${what} → refused (${answer.status}) but changed ${changed.join(', ')}`;
		}
		return null;
	}

	const keyArb = () => fc.constantFrom(...dictionary);

	/** One random request to an endpoint: who, where, what query and what body. */
	function endpointInputs(target: Extract<Target, { kind: 'endpoint' }>) {
		return fc.record({
			persona: personaFor(target.route),
			segment: sometimesHostileSegment,
			query: fc.array(fc.tuple(keyArb(), textValue), { maxLength: 4 }),
			body: fc.oneof(
				fc.constant(undefined),
				fc.json({ maxDepth: 2 }),
				fc
					.dictionary(keyArb(), fc.oneof(textValue, fc.jsonValue({ maxDepth: 1 })), { maxKeys: 5 })
					.map((o) => JSON.stringify(o)),
				textValue
			),
			type: fc.constantFrom(
				'application/json',
				'application/json; charset=utf-8',
				'APPLICATION/JSON',
				'text/json',
				'text/plain',
				undefined
			)
		});
	}

	async function sendToEndpoint(
		target: Extract<Target, { kind: 'endpoint' }>,
		input: Drawn<ReturnType<typeof endpointInputs>>
	): Promise<string | null> {
		const search = new URLSearchParams(input.query).toString();
		const url = `${urlFor(target.route, input.segment)}${search ? `?${search}` : ''}`;
		const reads = target.method === 'GET';
		const headers: Record<string, string> = { accept: 'application/json' };
		if (!reads && input.type) headers['content-type'] = input.type;
		return judged(
			`${input.persona} ${target.method} ${url.slice(0, 200)} body ${String(input.body).slice(0, 120)}`,
			async () => {
				const answer = await send(input.persona, target.method, url, {
					headers,
					body: reads ? undefined : input.body
				});
				return { ...answer, refused: answer.status >= 400 };
			}
		);
	}

	/**
	 * One random post to an action: the fields its page renders (found there), some of them
	 * replaced by hostile values or dropped, names it never asked for, either encoding, and
	 * the answer asked for as the enhanced form's JSON or as the page drawn again.
	 */
	function actionInputs(target: Extract<Target, { kind: 'action' }>) {
		return fc.record({
			persona: personaFor(target.route),
			segment: sometimesHostileSegment,
			// Which base fields to replace (by index), with what, and which to drop.
			replaced: fc.array(fc.tuple(fc.nat(40), textValue), { maxLength: 6 }),
			dropped: fc.array(fc.nat(40), { maxLength: 2 }),
			extra: fc.array(fc.tuple(keyArb(), textValue), { maxLength: 3 }),
			encoding: fc.oneof(
				{ weight: 3, arbitrary: fc.constantFrom('urlencoded', 'multipart') },
				// What a script, not a page, sends: a text/plain form, a multipart one cut wrong.
				{ weight: 1, arbitrary: fc.constantFrom('plain', 'broken multipart') }
			),
			accept: fc.constantFrom('json', 'html'),
			file: fc.record({
				name: fc.constantFrom('photo.png', '../../x', 'a'.repeat(300) + '.jpg', '', 'x.svg'),
				bytes: fc.oneof(fc.constant(tinyPng), fc.uint8Array({ maxLength: 2048 }))
			})
		});
	}

	async function postToAction(
		target: Extract<Target, { kind: 'action' }>,
		input: Drawn<ReturnType<typeof actionInputs>>
	): Promise<string | null> {
		const pageUrl = urlFor(target.route, input.segment);
		const forms = input.segment === null ? await formsFor(input.persona, pageUrl) : new Map();
		const fields: FormField[] = (forms.get(target.action) ?? []).map((f: FormField) => ({ ...f }));
		for (const [index, value] of input.replaced) {
			const field = fields[index % Math.max(1, fields.length)];
			if (field && !field.file) field.value = value;
		}
		const kept = fields.filter((_, i) => !input.dropped.includes(i));
		const pairs: [string, string][] = [
			...kept.filter((f) => !f.file).map((f): [string, string] => [f.name, f.value]),
			...input.extra
		];
		const files = kept.filter((f) => f.file).map((f) => f.name);
		let body: BodyInit;
		const headers: Record<string, string> = {};
		if (input.encoding === 'plain' || input.encoding === 'broken multipart') {
			body = new URLSearchParams(pairs).toString();
			headers['content-type'] =
				input.encoding === 'plain' ? 'text/plain' : 'multipart/form-data; boundary=fuzz';
		} else if (input.encoding === 'multipart' || files.length) {
			const form = new FormData();
			for (const [name, value] of pairs) form.append(name, value);
			const { name, bytes } = input.file;
			for (const field of files)
				form.append(field, new File([new Uint8Array(bytes)], name, { type: 'image/png' }));
			body = form;
		} else {
			body = new URLSearchParams(pairs).toString();
			headers['content-type'] = 'application/x-www-form-urlencoded';
		}
		if (input.accept === 'json') {
			headers.accept = 'application/json';
			headers['x-sveltekit-action'] = 'true';
		} else headers.accept = 'text/html';
		const url = `${pageUrl}${target.action === 'default' ? '' : `?/${target.action}`}`;
		const shown = pairs.map(([k, v]) => `${k}=${v.slice(0, 40)}`).join('&');
		return judged(
			`${input.persona} POST ${url.slice(0, 200)} (${input.encoding}, ${input.accept}) ${shown.slice(0, 400)}`,
			async () => {
				const answer = await send(input.persona, 'POST', url, { body, headers });
				if (input.accept === 'html' || answer.status >= 400)
					return { ...answer, refused: answer.status >= 400 };
				// SvelteKit answers an action's JSON with 200 and the outcome inside.
				const result = JSON.parse(answer.text) as { type: string };
				return { ...answer, refused: result.type === 'failure' || result.type === 'error' };
			}
		);
	}

	it('finds the endpoints and actions of every area', () => {
		const labels = findTargets().map(label);
		expect(labels).toContain('POST /api/cart');
		expect(labels).toContain('POST /manage/clutches/[code]?/loss');
		expect(labels).toContain('POST /admin/users/[id]?/role');
		expect(labels).toContain('POST /account/orders/[number]/claim?/default');
		expect(labels.length).toBeGreaterThan(80);
	});

	it('answers random and boundary input without a 5xx, a leak, or a write when it refuses', async () => {
		const seed = Number(process.env.FUZZ_SEED ?? Date.now() % 2 ** 31);
		const failures: string[] = [];
		const targets = findTargets();
		const deadline = Date.now() + BUDGET_MS;
		for (const [index, target] of targets.entries()) {
			// Fresh sessions: a sign-out or a role change in one target must not blind the next.
			cookies = await sessionCookies(scratch.db);
			tables = null;
			const started = Date.now();
			const share = started + (deadline - started) / (targets.length - index);
			// The same seed gives each target the same inputs again: a failure can be replayed.
			const sample = { numRuns: RUNS, seed: seed + index };
			const runs =
				target.kind === 'endpoint'
					? fc
							.sample(endpointInputs(target), sample)
							.map((input) => () => sendToEndpoint(target, input))
					: fc
							.sample(actionInputs(target), sample)
							.map((input) => () => postToAction(target, input));
			let made = 0;
			for (const run of runs) {
				if (made > 0 && Date.now() > share) break;
				made += 1;
				const problem = await run();
				if (problem) {
					failures.push(`${label(target)} (run ${made}): ${problem}`);
					break;
				}
			}
			if (process.env.FUZZ_VERBOSE)
				console.log(`${label(target)}: ${made} runs in ${Date.now() - started} ms`);
		}
		// Still answering after all of it.
		expect((await fetch(`${shop.app.origin}/api/health`)).status).toBe(200);
		expect(failures, `seed ${seed} (FUZZ_SEED=${seed} repeats it)`).toEqual([]);
	}, 150_000);
});
