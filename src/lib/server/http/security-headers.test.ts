import type { RequestEvent, ResolveOptions } from '@sveltejs/kit';
import { describe, expect, it, vi } from 'vitest';
import {
	ALWAYS,
	DATA_POLICY,
	HSTS,
	OTHER_HTML_POLICY,
	RETRY_AFTER_SECONDS,
	securityHeaders
} from './security-headers';

const SHOP = 'http://127.0.0.1:3000';

function request(method: string, path: string, headers: Record<string, string> = {}) {
	return new Request(`${SHOP}${path}`, { method, headers });
}

/** Only url and request are read by the handle; the rest of a RequestEvent is not needed. */
function eventFor(req: Request, origin = SHOP): RequestEvent {
	const url = new URL(new URL(req.url).pathname, origin);
	return { request: req, url } as unknown as RequestEvent;
}

async function run(req: Request, answer: Response, origin = SHOP) {
	const resolve = vi.fn(async (_event: RequestEvent, _options?: ResolveOptions) => answer);
	const response = await securityHeaders({ event: eventFor(req, origin), resolve });
	return { response, resolve };
}

describe('securityHeaders', () => {
	const page = () =>
		new Response('<!doctype html><p>Shop</p>', {
			headers: {
				'content-type': 'text/html',
				'content-security-policy': "script-src 'self' 'nonce-abc'"
			}
		});

	it('adds every usual header to a page and keeps the page policy SvelteKit wrote', async () => {
		const { response } = await run(request('GET', '/catalogue'), page());
		for (const [name, value] of Object.entries(ALWAYS))
			expect(response.headers.get(name)).toBe(value);
		expect(response.headers.get('content-security-policy')).toBe("script-src 'self' 'nonce-abc'");
		expect(response.headers.get('x-content-type-options')).toBe('nosniff');
		expect(response.headers.get('x-frame-options')).toBe('DENY');
		expect(response.headers.get('cross-origin-opener-policy')).toBe('same-origin');
	});

	it('sends HSTS only when the shop is served over https', async () => {
		const plain = await run(request('GET', '/'), page());
		expect(plain.response.headers.has('strict-transport-security')).toBe(false);
		const secure = await run(request('GET', '/'), page(), 'https://shop.example.com');
		expect(secure.response.headers.get('strict-transport-security')).toBe(HSTS);
	});

	it('locks down JSON and other data answers, and frames no HTML that lacks a policy', async () => {
		const data = await run(request('GET', '/api/health'), Response.json({ ok: true }));
		expect(data.response.headers.get('content-security-policy')).toBe(DATA_POLICY);
		const html = await run(
			request('GET', '/auth/signout'),
			new Response('<p>Sign out?</p>', { headers: { 'content-type': 'text/html; charset=utf-8' } })
		);
		expect(html.response.headers.get('content-security-policy')).toBe(OTHER_HTML_POLICY);
	});

	it('puts no policy on photos and PDFs, which the browser shows in its own viewer', async () => {
		for (const type of ['image/webp', 'application/pdf']) {
			const { response } = await run(
				request('GET', '/photos/x'),
				new Response('x', { headers: { 'content-type': type } })
			);
			expect(response.headers.has('content-security-policy'), type).toBe(false);
			expect(response.headers.get('x-content-type-options'), type).toBe('nosniff');
		}
	});

	it('asks a caller of a 503 to come back in a few seconds (RFC 9110 §10.2.3 Retry-After)', async () => {
		const unavailable = new Response('{"message":"down"}', {
			status: 503,
			headers: { 'content-type': 'application/json' }
		});
		const { response } = await run(request('GET', '/api/health'), unavailable);
		expect(response.headers.get('retry-after')).toBe(String(RETRY_AFTER_SECONDS));
		const { response: fine } = await run(request('GET', '/'), page());
		expect(fine.headers.has('retry-after')).toBe(false);
	});

	it('keeps a header a route chose for itself', async () => {
		const { response } = await run(
			request('GET', '/reset/token'),
			new Response('', {
				headers: { 'content-type': 'text/html', 'referrer-policy': 'no-referrer' }
			})
		);
		expect(response.headers.get('referrer-policy')).toBe('no-referrer');
	});

	it('copies a response whose headers cannot be changed', async () => {
		// Response.redirect's headers are immutable (WHATWG Fetch standard, "Response.redirect").
		const { response } = await run(request('GET', '/old'), Response.redirect(`${SHOP}/new`, 303));
		expect(response.status).toBe(303);
		expect(response.headers.get('location')).toBe(`${SHOP}/new`);
		expect(response.headers.get('x-frame-options')).toBe('DENY');
	});

	it('refuses a cross-site write before the route runs, with the headers on the refusal', async () => {
		const api = await run(
			request('POST', '/api/cart/hold', { origin: 'https://evil.test' }),
			Response.json({})
		);
		expect(api.resolve).not.toHaveBeenCalled();
		expect(api.response.status).toBe(403);
		expect(((await api.response.json()) as { message: string }).message).toMatch(/another site/);
		expect(api.response.headers.get('x-content-type-options')).toBe('nosniff');

		const slips = await run(
			request('POST', '/manage/ship-day/slips', { 'sec-fetch-site': 'cross-site' }),
			new Response('')
		);
		expect(slips.resolve).not.toHaveBeenCalled();
		expect(slips.response.status).toBe(403);
		expect(await slips.response.text()).toMatch(/another site/);
	});

	it('refuses an address with a NUL in it before any route looks it up', async () => {
		const { response, resolve } = await run(
			request('GET', '/api/manage/reports/sales%00'),
			Response.json({})
		);
		expect(resolve).not.toHaveBeenCalled();
		expect(response.status).toBe(400);
		expect(response.headers.get('x-frame-options')).toBe('DENY');
	});

	it('passes same-origin writes to the route', async () => {
		const { response, resolve } = await run(
			request('POST', '/api/cart', { origin: SHOP }),
			Response.json({ lines: [] })
		);
		expect(resolve).toHaveBeenCalledOnce();
		expect(response.status).toBe(200);
	});
});
