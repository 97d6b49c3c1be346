// Every route under src/routes, found from the file tree (so a route added later
// is covered without editing this file), asked for by each kind of visitor.
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { createSession } from '../../src/lib/server/auth/sessions';
import { startApp, type RunningApp } from './support/app';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const ROUTES = path.resolve(import.meta.dirname, '../../src/routes');
/** API endpoints anyone may call; every other /api route needs a signed-in user at least. */
const PUBLIC_API = new Set([
	'/api/health',
	'/api/ship-estimate',
	// A guest fills a cart and starts checkout before signing in.
	'/api/cart',
	'/api/cart/hold',
	// Stripe signs its events; it has no account here.
	'/api/stripe/webhook',
	// So does a carrier's tracking update.
	'/api/shipments/tracking'
]);

type Persona = 'anonymous' | 'customer' | 'keeper' | 'admin';
type Need = 'public' | 'signed_in' | 'keeper' | 'admin';
type RouteCase = { url: string; kind: 'page' | 'api'; methods: string[]; hasActions: boolean };

function walk(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((entry) =>
		entry.isDirectory() ? walk(path.join(dir, entry.name)) : [path.join(dir, entry.name)]
	);
}

function routeCases(samples: Record<string, string>): RouteCase[] {
	const byUrl = new Map<string, RouteCase>();
	for (const file of walk(ROUTES)) {
		const base = path.basename(file);
		if (!['+page.svelte', '+page.server.ts', '+server.ts'].includes(base)) continue;
		const segments = path
			.relative(ROUTES, path.dirname(file))
			.split(path.sep)
			.filter((s) => s && !/^\(.*\)$/.test(s))
			.map((s) => s.replace(/^\[(\w+)\]$/, (_, name: string) => samples[name] ?? 'sample'));
		const url = '/' + segments.join('/');
		const kind = base === '+server.ts' ? 'api' : 'page';
		const found = byUrl.get(`${kind}:${url}`) ?? { url, kind, methods: [], hasActions: false };
		const source = base.endsWith('.ts') ? readFileSync(file, 'utf8') : '';
		if (kind === 'api') {
			for (const m of source.matchAll(
				/export (?:const|async function|function) (GET|POST|PUT|PATCH|DELETE)\b/g
			)) {
				found.methods.push(m[1]!);
			}
		} else {
			found.methods = ['GET'];
			found.hasActions ||= /export const actions\b/.test(source);
		}
		byUrl.set(`${kind}:${url}`, found);
	}
	return [...byUrl.values()].sort((a, b) => a.url.localeCompare(b.url));
}

function need(url: string): Need {
	if (url === '/manage' || url.startsWith('/manage/') || url.startsWith('/api/manage/'))
		return 'keeper';
	if (url === '/admin' || url.startsWith('/admin/') || url.startsWith('/api/admin/'))
		return 'admin';
	if (url.startsWith('/api/')) return PUBLIC_API.has(url) ? 'public' : 'signed_in';
	if (url === '/account' || url.startsWith('/account/')) return 'signed_in';
	return 'public';
}

const RANK: Record<Persona, number> = { anonymous: 0, customer: 1, keeper: 2, admin: 3 };
function allowed(persona: Persona, required: Need): boolean {
	if (required === 'public') return true;
	if (persona === 'anonymous') return false;
	if (required === 'signed_in') return true;
	return RANK[persona] >= RANK[required];
}

describe('access matrix', () => {
	let scratch: ScratchDatabase;
	let app: RunningApp;
	const cookies: Partial<Record<Persona, string>> = {};
	let samples: Record<string, string> = {};

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		for (const persona of ['customer', 'keeper', 'admin'] as const) {
			const account = DEMO_ACCOUNTS.find((a) => a.role === persona)!;
			const user = await scratch.db
				.selectFrom('User')
				.select('id')
				.where('email', '=', account.email)
				.executeTakeFirstOrThrow();
			cookies[persona] = `hatchlot.session=${await createSession(scratch.db, user.id)}`;
			if (persona === 'customer') samples = { id: user.id, token: 'no-such-token' };
		}
		app = await startApp({ DATABASE_URL: scratch.url });
	});
	afterAll(async () => {
		await app?.stop();
		await scratch?.drop();
	});

	async function ask(persona: Persona, method: string, url: string, accept: string) {
		const headers: Record<string, string> = { accept, origin: app.origin };
		if (cookies[persona]) headers.cookie = cookies[persona]!;
		if (method !== 'GET') headers['content-type'] = 'application/x-www-form-urlencoded';
		return fetch(`${app.origin}${url}`, {
			method,
			headers,
			redirect: 'manual',
			body: method === 'GET' ? undefined : ''
		});
	}

	it('finds the routes of every area', () => {
		const urls = routeCases(samples).map((r) => r.url);
		expect(urls).toContain('/manage');
		expect(urls).toContain('/admin');
		expect(urls).toContain('/admin/users');
		expect(urls).toContain('/admin/claims');
		expect(urls).toContain('/api/health');
	});

	it('lets each visitor through exactly where their role allows', async () => {
		const failures: string[] = [];
		for (const route of routeCases(samples)) {
			const required = need(route.url);
			for (const persona of ['anonymous', 'customer', 'keeper', 'admin'] as const) {
				const ok = allowed(persona, required);
				const requests: Array<[string, 'read' | 'write']> = route.methods.map((m) => [
					m,
					m === 'GET' ? 'read' : 'write'
				]);
				if (route.hasActions) requests.push(['POST', 'write']);
				for (const [method] of requests) {
					const accept = route.kind === 'api' ? 'application/json' : 'text/html';
					const response = await ask(persona, method, route.url, accept);
					const where = response.headers.get('location') ?? '';
					const label = `${persona} ${method} ${route.url} → ${response.status} ${where}`;
					if (ok) {
						if (response.status === 401 || response.status === 403 || where.startsWith('/signin'))
							failures.push(`refused: ${label}`);
					} else if (persona === 'anonymous') {
						// A file route outside /api (a packing slip's PDF) is opened in a tab like a page.
						const pageRead =
							(route.kind === 'page' || !route.url.startsWith('/api/')) && method === 'GET';
						const expected = pageRead
							? response.status === 303 && where.startsWith('/signin?next=')
							: response.status === 401;
						if (!expected) failures.push(`anonymous not stopped: ${label}`);
					} else if (response.status !== 403) {
						failures.push(`not refused with 403: ${label}`);
					}
				}
			}
		}
		expect(failures).toEqual([]);
	});
});
