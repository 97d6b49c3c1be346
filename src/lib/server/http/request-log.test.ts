import { redirect, type RequestEvent, type ResolveOptions } from '@sveltejs/kit';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { currentLogContext, logger, withLogContext } from '../log';
import { loggedPath, requestIdOf, requestLog } from './request-log';

function eventFor(
	url: string,
	options: {
		headers?: Record<string, string>;
		route?: string | null;
		params?: Record<string, string>;
		isSubRequest?: boolean;
	} = {}
): RequestEvent {
	// Only the fields the handle reads; the rest of RequestEvent is never touched here.
	return {
		request: new Request(url, { headers: options.headers }),
		url: new URL(url),
		params: options.params ?? {},
		route: { id: options.route ?? null },
		isSubRequest: options.isSubRequest ?? false
	} as unknown as RequestEvent;
}

type Resolve = (event: RequestEvent, opts?: ResolveOptions) => Promise<Response>;

afterEach(() => vi.restoreAllMocks());

describe('loggedPath', () => {
	it('masks route parameters that hold a one-time token and drops the query string', () => {
		const event = eventFor('http://shop.test/reset/Zm9vYmFyLXNlY3JldA?next=/account', {
			route: '/(shop)/reset/[token]',
			params: { token: 'Zm9vYmFyLXNlY3JldA' }
		});
		expect(loggedPath(event)).toBe('/reset/[token]');
	});

	it('keeps ordinary parameters', () => {
		const event = eventFor('http://shop.test/listings/grammostola-pulchra-slings?page=2', {
			params: { slug: 'grammostola-pulchra-slings' }
		});
		expect(loggedPath(event)).toBe('/listings/grammostola-pulchra-slings');
	});
});

describe('requestLog', () => {
	it('answers with a fresh id and serves the request inside its context', async () => {
		const info = vi.spyOn(logger, 'info').mockImplementation(() => undefined);
		const event = eventFor('http://shop.test/api/health', { route: '/api/health' });
		let seen: unknown;
		const resolve: Resolve = async () => {
			seen = currentLogContext();
			return new Response('ok', { status: 200 });
		};
		const response = await requestLog({ event, resolve });
		const id = response.headers.get('x-request-id');
		expect(id).toMatch(/^[0-9a-f-]{36}$/);
		expect(seen).toEqual({ requestId: id });
		expect(requestIdOf(event)).toBe(id);
		expect(info).toHaveBeenCalledTimes(1);
		expect(info.mock.calls[0]![0]).toMatchObject({
			method: 'GET',
			path: '/api/health',
			route: '/api/health',
			status: 200
		});
	});

	it("keeps a load balancer's safe id and replaces an unsafe one", async () => {
		vi.spyOn(logger, 'info').mockImplementation(() => undefined);
		const resolve: Resolve = async () => new Response('ok');
		const kept = await requestLog({
			event: eventFor('http://shop.test/', { headers: { 'x-request-id': 'lb-0a1b2c3d4e' } }),
			resolve
		});
		expect(kept.headers.get('x-request-id')).toBe('lb-0a1b2c3d4e');
		const replaced = await requestLog({
			event: eventFor('http://shop.test/', { headers: { 'x-request-id': 'a b"}\\n{"x":1' } }),
			resolve
		});
		expect(replaced.headers.get('x-request-id')).toMatch(/^[0-9a-f-]{36}$/);
	});

	it("gives a load's fetch to our own routes the page's id", async () => {
		vi.spyOn(logger, 'info').mockImplementation(() => undefined);
		const inner = eventFor('http://shop.test/api/cart', { isSubRequest: true });
		const response = await withLogContext({ requestId: 'page-req-0001' }, () =>
			requestLog({ event: inner, resolve: async () => new Response('{}') })
		);
		expect(response.headers.get('x-request-id')).toBe('page-req-0001');
	});

	it('sets the header on a response whose headers cannot change', async () => {
		vi.spyOn(logger, 'info').mockImplementation(() => undefined);
		const frozen = Response.redirect('http://shop.test/elsewhere', 302);
		expect(() => frozen.headers.set('x-test', '1')).toThrow(TypeError);
		const response = await requestLog({
			event: eventFor('http://shop.test/old'),
			resolve: async () => frozen
		});
		expect(response.status).toBe(302);
		expect(response.headers.get('location')).toBe('http://shop.test/elsewhere');
		expect(response.headers.get('x-request-id')).toMatch(/^[0-9a-f-]{36}$/);
	});

	it('logs and passes on a redirect a later handle throws', async () => {
		const info = vi.spyOn(logger, 'info').mockImplementation(() => undefined);
		const event = eventFor('http://shop.test/manage', { route: '/manage' });
		await expect(
			requestLog({
				event,
				resolve: async () => redirect(303, '/signin?next=%2Fmanage')
			})
		).rejects.toMatchObject({ status: 303, location: '/signin?next=%2Fmanage' });
		expect(info.mock.calls[0]![0]).toMatchObject({ path: '/manage', status: 303 });
	});
});
