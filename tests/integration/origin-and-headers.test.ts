// Another site's page against the shop, through the built app: SvelteKit's origin check
// on form posts (whatever the case of the content type), the shop's own refusal of
// cross-site writes to its JSON and file routes, the page policy and the usual headers on
// pages, API answers and errors, and text that holds HTML shown as text.
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { checkoutAddress } from './support/payments';
import { startApp, type RunningApp } from './support/app';
import {
	sessionCookies,
	startHostileShop,
	type HostileShop,
	type Persona
} from './support/hostile';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const ROUTES = path.resolve(import.meta.dirname, '../../src/routes');
const EVIL = 'https://evil.test';
/** Routes whose callers sign the body; the signature, not the origin, is their check. */
const SIGNED = new Set(['/api/stripe/webhook', '/api/shipments/tracking']);
/** How a script on another site can call: with its Origin, or only with Sec-Fetch-Site. */
const CROSS_SITE_CALLS: Record<string, string>[] = [
	{ origin: EVIL, 'content-type': 'application/json' },
	// No type at all: a "simple" request that no preflight stops (Fetch standard, CORS).
	{ origin: EVIL },
	// A sandboxed frame or a file: page.
	{ origin: 'null' },
	// A browser that sent no Origin still says where the call came from.
	{ 'sec-fetch-site': 'cross-site' },
	{ 'sec-fetch-site': 'same-site' }
];
/** Markup a customer or keeper might type, which must come back as text. */
const SCRIPT = '<script>window.hatchlotOwned=1</script>';
const IMAGE = '<img src=x onerror="window.hatchlotOwned=1">';

function walk(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((entry) =>
		entry.isDirectory() ? walk(path.join(dir, entry.name)) : [path.join(dir, entry.name)]
	);
}

/** Every state-changing handler of a +server.ts, found from the file tree. */
function writingEndpoints(): { route: string; method: string }[] {
	const found: { route: string; method: string }[] = [];
	for (const file of walk(ROUTES)) {
		if (path.basename(file) !== '+server.ts') continue;
		const route =
			'/' +
			path
				.relative(ROUTES, path.dirname(file))
				.split(path.sep)
				.filter((s) => s && !/^\(.*\)$/.test(s))
				.join('/');
		for (const m of readFileSync(file, 'utf8').matchAll(
			/export (?:const|async function|function) (POST|PUT|PATCH|DELETE)\b/g
		))
			found.push({ route, method: m[1]! });
	}
	return found;
}

/** The directives of a Content-Security-Policy header, by name. */
function directives(policy: string): Map<string, string[]> {
	return new Map(
		policy
			.split(';')
			.map((part) => part.trim().split(/\s+/))
			.filter((words) => words[0])
			.map((words) => [words[0]!.toLowerCase(), words.slice(1)])
	);
}

const escapeHtml = (text: string) =>
	text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/"/g, '&quot;');

describe('origin check, page policy and headers', () => {
	let scratch: ScratchDatabase;
	let shop: HostileShop;
	let secureApp: RunningApp;
	let cookies: Record<Persona, string | null>;
	let colonyCode: string;
	let listingSlug: string;
	let claimId: number;
	let orderNumber: string;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		const db = scratch.db;
		colonyCode = (
			await db.selectFrom('colony').select('code').orderBy('id').executeTakeFirstOrThrow()
		).code;
		const listing = await db
			.selectFrom('listing')
			.select(['id', 'slug'])
			.where('state', '=', 'live')
			.orderBy('id')
			.executeTakeFirstOrThrow();
		listingSlug = listing.slug;
		// Markup in what customers and keepers type, shown on public and back-office pages.
		await db
			.updateTable('listing')
			.set({ description: `Well fed. ${SCRIPT} ${IMAGE}` })
			.where('id', '=', listing.id)
			.execute();
		const claim = await db
			.selectFrom('claim as c')
			.innerJoin('customer_order as o', 'o.id', 'c.order_id')
			.select(['c.id', 'o.order_number', 'o.user_id'])
			.orderBy('c.id')
			.executeTakeFirstOrThrow();
		claimId = claim.id;
		orderNumber = claim.order_number;
		await db
			.updateTable('claim')
			.set({ note: `Two dead. ${SCRIPT}` })
			.where('id', '=', claimId)
			.execute();
		await db
			.updateTable('customer_order')
			.set({ ship_name: `Ada ${IMAGE}` })
			.where('order_number', '=', orderNumber)
			.execute();
		await db
			.updateTable('User')
			.set({ name: `Ada ${SCRIPT}` })
			.where('id', '=', claim.user_id!)
			.execute();
		[shop, secureApp] = await Promise.all([
			startHostileShop(scratch.url),
			// The same build told its public origin is https, as behind a TLS-terminating proxy.
			startApp({ DATABASE_URL: scratch.url, ORIGIN: 'https://shop.example.com' })
		]);
		cookies = await sessionCookies(db);
	}, 120_000);
	afterAll(async () => {
		await shop?.stop();
		await secureApp?.stop();
		await scratch?.drop();
	});

	async function ask(
		url: string,
		init: {
			method?: string;
			persona?: Persona;
			headers?: Record<string, string>;
			body?: BodyInit;
		} = {}
	) {
		const headers: Record<string, string> = { ...init.headers };
		const cookie = cookies[init.persona ?? 'anonymous'];
		if (cookie) headers.cookie = cookie;
		const response = await fetch(`${shop.app.origin}${url}`, {
			method: init.method ?? 'GET',
			headers,
			body: init.body,
			redirect: 'manual'
		});
		return { response, text: await response.text() };
	}

	const cartLines = async () =>
		Number(
			(
				await scratch.db
					.selectFrom('cart_line')
					.select((eb) => eb.fn.countAll().as('n'))
					.executeTakeFirstOrThrow()
			).n
		);

	describe('form posts from another origin', () => {
		// A <form> can send these three types across sites without asking first (HTML
		// Living Standard, form submission; Fetch standard, CORS-safelisted request headers).
		const types = [
			'application/x-www-form-urlencoded',
			'multipart/form-data; boundary=x',
			'text/plain',
			'TEXT/PLAIN',
			'Text/Plain; charset=UTF-8',
			'APPLICATION/X-WWW-FORM-URLENCODED'
		];

		it('are refused by SvelteKit whatever the case of the content type, and add nothing', async () => {
			const before = await cartLines();
			for (const type of types)
				for (const origin of [EVIL, 'null', `${shop.app.origin}.evil.test`]) {
					const { response, text } = await ask('/cart?/add', {
						method: 'POST',
						persona: 'customer',
						headers: { origin, 'content-type': type },
						body: 'listingId=1&quantity=1'
					});
					expect(response.status, `${type} from ${origin}`).toBe(403);
					expect(text).toMatch(/Cross-site POST form submissions are forbidden/);
				}
			expect(await cartLines()).toBe(before);
		});

		it('are refused without any Origin at all, to actions and file routes alike', async () => {
			for (const url of ['/cart?/add', '/manage/photos?/upload', '/api/manage/photos']) {
				const { response } = await ask(url, {
					method: 'POST',
					persona: 'keeper',
					headers: { 'content-type': 'TEXT/PLAIN' },
					body: 'x=1'
				});
				expect(response.status, url).toBe(403);
			}
		});

		it('from the shop’s own origin but in a shape no page sends are refused in words, not a 500', async () => {
			for (const [type, body, status] of [
				['TEXT/PLAIN', 'listingId=1&quantity=1', 415],
				['text/plain; charset=utf-8', 'listingId=1&quantity=1', 415],
				['multipart/form-data; boundary=zzz', 'listingId=1&quantity=1', 400]
			] as const) {
				const { response, text } = await ask('/cart?/add', {
					method: 'POST',
					persona: 'customer',
					headers: { origin: shop.app.origin, 'content-type': type, accept: 'text/html' },
					body
				});
				expect(response.status, type).toBe(status);
				expect(text, type).toMatch(/Nothing was saved|arrived broken/);
			}
		});

		it('go through from the shop’s own pages', async () => {
			const { response } = await ask('/cart?/add', {
				method: 'POST',
				persona: 'customer',
				headers: {
					origin: shop.app.origin,
					'content-type': 'application/x-www-form-urlencoded',
					accept: 'application/json',
					'x-sveltekit-action': 'true'
				},
				body: 'listingId=0&quantity=1'
			});
			expect(response.status).toBe(200);
		});
	});

	describe('writes to JSON and file routes from another site', () => {
		it('are refused on every state-changing endpoint, whatever type the script sends', async () => {
			const endpoints = writingEndpoints().filter((e) => !SIGNED.has(e.route));
			expect(endpoints.map((e) => `${e.method} ${e.route}`)).toEqual(
				expect.arrayContaining([
					'POST /api/cart',
					'DELETE /api/cart/hold',
					'POST /manage/ship-day/slips'
				])
			);
			const before = await cartLines();
			for (const { route, method } of endpoints)
				for (const persona of ['anonymous', 'customer', 'keeper'] as const)
					for (const headers of CROSS_SITE_CALLS) {
						const { response, text } = await ask(route, {
							method,
							persona,
							headers: { accept: 'application/json', ...headers },
							body: JSON.stringify({ listingId: 1, quantity: 1 })
						});
						const label = `${persona} ${method} ${route} ${JSON.stringify(headers)}`;
						expect(response.status, label).toBe(403);
						// A write of a form-like type (fetch labels a bare string text/plain) meets
						// SvelteKit's own origin check first, which words its refusal itself.
						expect(text, label).toMatch(/another site|Cross-site \w+ form submissions/);
					}
			expect(await cartLines()).toBe(before);
		});

		it('go through from the shop itself and from callers that are not browsers', async () => {
			const own = await ask('/api/cart', {
				method: 'POST',
				headers: { origin: shop.app.origin, 'content-type': 'application/json' },
				body: JSON.stringify({ listingId: 0, quantity: 1 })
			});
			expect(own.response.status).toBe(400);
			// A server-to-server call sends neither Origin nor Sec-Fetch-Site.
			const script = await ask('/api/cart', {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify({ listingId: 0, quantity: 1 })
			});
			expect(script.response.status).toBe(400);
		});

		it('leave the signed callbacks to their signature check', async () => {
			for (const route of SIGNED) {
				const { response } = await ask(route, {
					method: 'POST',
					headers: { origin: EVIL, 'content-type': 'application/json' },
					body: '{}'
				});
				expect(response.status, route).toBe(400);
			}
		});
	});

	describe('headers', () => {
		const usual = (headers: Headers, label: string) => {
			expect(headers.get('x-content-type-options'), label).toBe('nosniff');
			expect(headers.get('referrer-policy'), label).toBe('same-origin');
			expect(headers.get('x-frame-options'), label).toBe('DENY');
			expect(headers.get('permissions-policy'), label).toMatch(/camera=\(\)/);
			expect(headers.get('permissions-policy'), label).toMatch(/geolocation=\(\)/);
			expect(headers.get('cross-origin-opener-policy'), label).toBe('same-origin');
			// Served over plain http here: telling browsers "https only" would lock them out.
			expect(headers.has('strict-transport-security'), label).toBe(false);
		};

		it('come with every page, API answer and error', async () => {
			const cases: [string, Persona, number][] = [
				['/', 'anonymous', 200],
				['/catalogue', 'anonymous', 200],
				[`/listings/${listingSlug}`, 'anonymous', 200],
				['/manage', 'keeper', 200],
				['/manage/reports/sales', 'keeper', 200],
				['/api/health', 'anonymous', 200],
				['/api/cart', 'anonymous', 200],
				['/no-such-page', 'anonymous', 404],
				['/listings/no-such-listing', 'anonymous', 404],
				['/admin', 'keeper', 403],
				['/api/manage/clutches', 'anonymous', 401],
				['/api/manage/clutches', 'customer', 403],
				['/catalogue?q=a%00b', 'anonymous', 400],
				['/robots.txt', 'anonymous', 200]
			];
			for (const [url, persona, status] of cases) {
				const { response } = await ask(url, { persona, headers: { accept: 'text/html' } });
				const label = `${persona} ${url}`;
				expect(response.status, label).toBe(status);
				usual(response.headers, label);
				expect(response.headers.get('content-security-policy'), label).toBeTruthy();
			}
			// A refusal another handle returns carries them too: a form post before signing in.
			const refused = await ask('/manage/clutches/new', {
				method: 'POST',
				headers: { origin: shop.app.origin, 'content-type': 'application/x-www-form-urlencoded' },
				body: 'x=1'
			});
			expect(refused.response.status).toBe(401);
			usual(refused.response.headers, 'form post before signing in');
		});

		it('lock a JSON answer down to nothing', async () => {
			const { response } = await ask('/api/health');
			const policy = directives(response.headers.get('content-security-policy')!);
			expect(policy.get('default-src')).toEqual(["'none'"]);
			expect(policy.get('frame-ancestors')).toEqual(["'none'"]);
		});

		it('add HSTS when the shop is served over https', async () => {
			const response = await fetch(`${secureApp.origin}/api/health`);
			expect(response.status).toBe(200);
			expect(response.headers.get('strict-transport-security')).toMatch(/^max-age=\d{7,}/);
		});
	});

	describe('the page policy', () => {
		const pages: [string, Persona][] = [
			['/', 'anonymous'],
			['/catalogue', 'anonymous'],
			[`/listings/${listingSlug}`, 'anonymous'],
			['/checkout', 'anonymous'],
			['/signin', 'anonymous'],
			// Charts: chart.js draws these from the shop's own bundle.
			['/manage/reports/sales', 'keeper'],
			['/manage/pipeline', 'keeper'],
			[`/manage/colonies/${colonyCode}`, 'keeper'],
			['/no-such-page', 'anonymous']
		];

		it('runs only scripts with the response’s nonce or from the shop, and frames nothing', async () => {
			for (const [url, persona] of pages) {
				const { response, text } = await ask(url, { persona });
				const header = response.headers.get('content-security-policy');
				expect(header, url).toBeTruthy();
				const policy = directives(header!);
				const scripts = policy.get('script-src')!;
				expect(scripts, url).toContain("'self'");
				expect(scripts, url).not.toContain("'unsafe-inline'");
				expect(scripts, url).not.toContain("'unsafe-eval'");
				const nonce = scripts.find((s) => s.startsWith("'nonce-"))?.slice(7, -1);
				expect(nonce, url).toBeTruthy();
				expect(policy.get('object-src'), url).toEqual(["'none'"]);
				expect(policy.get('base-uri'), url).toEqual(["'self'"]);
				expect(policy.get('frame-ancestors'), url).toEqual(["'none'"]);
				// Left open so checkout without JavaScript can be redirected to the pay page.
				expect(policy.has('form-action'), url).toBe(false);

				// Every inline script is SvelteKit's, with this response's nonce.
				for (const tag of text.matchAll(/<script\b([^>]*)>/g)) {
					const attributes = tag[1]!;
					if (/\ssrc=/.test(attributes)) {
						const src = attributes.match(/\ssrc="([^"]+)"/)![1]!;
						expect(new URL(src, shop.app.origin).origin, `${url} ${src}`).toBe(shop.app.origin);
					} else if (!/type="application\/(?:ld\+)?json"/.test(attributes))
						expect(attributes, `${url} inline script`).toContain(`nonce="${nonce}"`);
				}
				// No handler attributes or script URLs for the policy to have to refuse.
				expect(text, url).not.toMatch(/<[a-z][^>]*\son[a-z]+=/i);
				expect(text, url).not.toMatch(/(?:href|src|action)="\s*javascript:/i);
				// Styles, fonts, icons, modules and photos come from the shop (or are inline data).
				for (const link of text.matchAll(
					/<(?:link|img|source)\b[^>]*\s(?:href|src|srcset)="([^"]+)"/g
				)) {
					const first = link[1]!.split(/[\s,]+/)[0]!;
					if (first.startsWith('data:')) continue;
					expect(new URL(first, shop.app.origin).origin, `${url} ${first}`).toBe(shop.app.origin);
				}
			}
		});

		it('lets the stylesheets reach their fonts on the shop’s own origin', async () => {
			const { text } = await ask('/');
			const sheets = [...text.matchAll(/<link\b([^>]*)>/g)]
				.map((m) => m[1]!)
				.filter((attributes) => /\srel="stylesheet"/.test(attributes))
				.map((attributes) => attributes.match(/\shref="([^"]+)"/)![1]!);
			expect(sheets.length).toBeGreaterThan(0);
			let fonts = 0;
			for (const sheet of sheets) {
				const css = await (await fetch(new URL(sheet, shop.app.origin))).text();
				for (const m of css.matchAll(/url\(\s*['"]?([^'")]+)['"]?\s*\)/g)) {
					if (m[1]!.startsWith('data:')) continue;
					const target = new URL(m[1]!, new URL(sheet, shop.app.origin));
					expect(target.origin, m[1]).toBe(shop.app.origin);
					if (/\.woff2?$/.test(target.pathname)) fonts += 1;
				}
			}
			// Source Sans 3 is bundled with the app (ARCHITECTURE.md: no font CDN).
			expect(fonts).toBeGreaterThan(0);
		});

		it('still lets checkout without JavaScript hand the buyer to the pay page', async () => {
			// A guest's cart with one live listing in it, then the checkout form posted as a
			// browser without JavaScript does.
			const listings = await scratch.db
				.selectFrom('listing')
				.select('id')
				.where('state', '=', 'live')
				.orderBy('id')
				.execute();
			let cartCookie: string | null = null;
			for (const { id } of listings) {
				const added = await fetch(`${shop.app.origin}/api/cart`, {
					method: 'POST',
					headers: { origin: shop.app.origin, 'content-type': 'application/json' },
					body: JSON.stringify({ listingId: id, quantity: 1 })
				});
				if (added.status === 200) {
					cartCookie = added.headers.getSetCookie().find((c) => c.startsWith('hatchlot.cart='))!;
					break;
				}
			}
			expect(cartCookie).toBeTruthy();
			const address = checkoutAddress('guest@example.test');
			const form = new URLSearchParams({ ...address, terms: 'on' } as Record<string, string>);
			const response = await fetch(`${shop.app.origin}/checkout`, {
				method: 'POST',
				headers: {
					origin: shop.app.origin,
					cookie: cartCookie!.split(';')[0]!,
					'content-type': 'application/x-www-form-urlencoded',
					accept: 'text/html'
				},
				body: form,
				redirect: 'manual'
			});
			expect(response.status).toBe(303);
			expect(response.headers.get('location')).toMatch(
				new RegExp(`^${shop.stripe.url.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}/pay/`)
			);
		});
	});

	describe('text that holds markup', () => {
		it('is shown as text wherever the shop shows it', async () => {
			// A keeper's care-log note, posted the way the colony page posts it.
			const logged = await ask(`/manage/colonies/${colonyCode}?/log`, {
				method: 'POST',
				persona: 'keeper',
				headers: {
					origin: shop.app.origin,
					'content-type': 'application/x-www-form-urlencoded',
					accept: 'application/json',
					'x-sveltekit-action': 'true'
				},
				body: new URLSearchParams({
					kind: 'pest_note',
					loggedOn: '2026-12-01',
					note: `Mites on the lid. ${SCRIPT} ${IMAGE}`
				}).toString()
			});
			expect(logged.response.status).toBe(200);
			const pages: [string, Persona, string[]][] = [
				[`/manage/colonies/${colonyCode}`, 'keeper', [SCRIPT, IMAGE]],
				[`/listings/${listingSlug}`, 'anonymous', [SCRIPT, IMAGE]],
				[`/admin/claims/${claimId}`, 'admin', [SCRIPT]],
				[`/manage/orders/${encodeURIComponent(orderNumber)}`, 'keeper', [IMAGE]],
				['/admin/users', 'admin', [SCRIPT]]
			];
			for (const [url, persona, payloads] of pages) {
				const { response, text } = await ask(url, { persona });
				expect(response.status, url).toBe(200);
				for (const payload of payloads) {
					// Not as markup anywhere, the page's data for the browser included…
					expect(text.includes(payload), `${url} holds ${payload} as markup`).toBe(false);
					// …but as the words the keeper or customer typed.
					expect(
						text.includes(escapeHtml(payload)) || text.includes(payload.replace(/</g, '&lt;')),
						`${url} shows ${payload}`
					).toBe(true);
				}
			}
		});
	});
});
