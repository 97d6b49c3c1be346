import { describe, expect, it } from 'vitest';
import {
	bodyProblem,
	hasNulInAddress,
	hostileRequestRefusal,
	INSPECTED_BODY_BYTES,
	isCrossSiteWrite
} from './hostile-requests';

const SHOP = 'http://127.0.0.1:3000';

function request(
	method: string,
	path: string,
	headers: Record<string, string> = {},
	body?: BodyInit
) {
	return new Request(`${SHOP}${path}`, { method, headers, body });
}

/** A body as a browser or script sends it, with the length header they send. */
function post(
	path: string,
	type: string | null,
	body: string,
	headers: Record<string, string> = {}
) {
	const length = String(new TextEncoder().encode(body).byteLength);
	return request(
		'POST',
		path,
		{ ...(type ? { 'content-type': type } : {}), 'content-length': length, ...headers },
		body
	);
}

describe('isCrossSiteWrite', () => {
	// Origin is sent by browsers on every POST, PUT, PATCH and DELETE (WHATWG Fetch
	// standard, "append a request Origin header"); Sec-Fetch-Site takes one of
	// cross-site, same-site, same-origin or none (W3C Fetch Metadata Request Headers).
	const url = (path: string) => new URL(path, SHOP);

	it('lets reads through from anywhere', () => {
		for (const method of ['GET', 'HEAD', 'OPTIONS'])
			expect(
				isCrossSiteWrite(
					request(method, '/api/cart', { origin: 'https://evil.test' }),
					url('/api/cart')
				)
			).toBe(false);
	});

	it('refuses writes whose Origin is another site, a sibling origin or "null"', () => {
		for (const method of ['POST', 'PUT', 'PATCH', 'DELETE'])
			for (const origin of ['https://evil.test', 'http://127.0.0.1:3001', 'null'])
				expect(
					isCrossSiteWrite(request(method, '/api/cart', { origin }), url('/api/cart')),
					`${method} from ${origin}`
				).toBe(true);
	});

	it('takes writes from its own origin', () => {
		expect(isCrossSiteWrite(request('POST', '/api/cart', { origin: SHOP }), url('/api/cart'))).toBe(
			false
		);
	});

	it('reads Sec-Fetch-Site when a browser sent no Origin', () => {
		const post = (site: string) =>
			isCrossSiteWrite(
				request('POST', '/manage/ship-day/slips', { 'sec-fetch-site': site }),
				url('/manage/ship-day/slips')
			);
		expect(post('cross-site')).toBe(true);
		expect(post('same-site')).toBe(true);
		expect(post('same-origin')).toBe(false);
		// A user typing the address or following a bookmark.
		expect(post('none')).toBe(false);
	});

	it('leaves callers that are not browsers alone: no Origin, no Sec-Fetch-Site', () => {
		expect(isCrossSiteWrite(request('POST', '/api/cart'), url('/api/cart'))).toBe(false);
	});

	it('never refuses the signed callbacks, whoever claims to send them', () => {
		for (const path of ['/api/stripe/webhook', '/api/shipments/tracking'])
			expect(
				isCrossSiteWrite(request('POST', path, { origin: 'https://evil.test' }), url(path))
			).toBe(false);
	});
});

describe('hasNulInAddress', () => {
	it('finds a percent-encoded NUL in the path or the query', () => {
		// %00 is NUL in percent-encoding (RFC 3986, section 2.1): hex digits, no case to vary.
		expect(hasNulInAddress(new URL(`${SHOP}/manage/listings/%00`))).toBe(true);
		expect(hasNulInAddress(new URL(`${SHOP}/catalogue?q=a%00b`))).toBe(true);
		expect(hasNulInAddress(new URL(`${SHOP}/catalogue?q=100%25`))).toBe(false);
		expect(hasNulInAddress(new URL(`${SHOP}/listings/nar-2026-100`))).toBe(false);
	});
});

describe('bodyProblem', () => {
	const form = 'application/x-www-form-urlencoded';

	it('finds a NUL in a urlencoded value or name, and passes the same form without it', async () => {
		expect(await bodyProblem(post('/manage/clutches/NAR-C1?/note', form, 'note=a%00b'))).toBe(
			'nul'
		);
		expect(await bodyProblem(post('/x', form, 'no%00te=a'))).toBe('nul');
		expect(await bodyProblem(post('/x', form, 'note=100%25+sure'))).toBeNull();
	});

	it('finds a NUL in a multipart text field, never in a file', async () => {
		const withNote = new FormData();
		withNote.append('note', 'mites\0here');
		const withFile = new FormData();
		withFile.append('note', 'mites here');
		withFile.append('photos', new File([new Uint8Array([0, 0, 0, 1])], 'a.png'));
		const sized = async (body: FormData) => {
			const probe = new Request(SHOP, { method: 'POST', body });
			const bytes = await probe.arrayBuffer();
			return request(
				'POST',
				'/x',
				{
					'content-type': probe.headers.get('content-type')!,
					'content-length': String(bytes.byteLength)
				},
				bytes
			);
		};
		expect(await bodyProblem(await sized(withNote))).toBe('nul');
		expect(await bodyProblem(await sized(withFile))).toBeNull();
	});

	it('finds an escaped NUL in a JSON string or key, whatever type the script claims', async () => {
		// "\u0000" is NUL written in JSON (RFC 8259, section 7); "\\u0000" is six characters of text.
		const json = JSON.stringify({ listingId: 'a\u0000' });
		expect(await bodyProblem(post('/api/cart', 'application/json', json))).toBe('nul');
		expect(await bodyProblem(post('/api/cart', null, json))).toBe('nul');
		expect(await bodyProblem(post('/api/cart', 'text/plain', '{"k\\u0000":1}'))).toBe('nul');
		expect(
			await bodyProblem(post('/api/cart', 'application/json', '{"note":"\\\\u0000"}'))
		).toBeNull();
		expect(await bodyProblem(post('/api/cart', 'application/json', '{"broken":'))).toBeNull();
	});

	it('calls a multipart body that does not parse unreadable', async () => {
		const broken = 'no boundary here';
		expect(await bodyProblem(post('/cart?/add', 'multipart/form-data; boundary=zzz', broken))).toBe(
			'unreadable'
		);
		expect(await bodyProblem(post('/cart?/add', 'multipart/form-data', broken))).toBe('unreadable');
		expect(await bodyProblem(post('/cart?/add', 'multipart/form-data; boundary=zzz', ''))).toBe(
			'unreadable'
		);
		expect(
			await bodyProblem(
				request('POST', '/cart?/add', {
					'content-type': 'multipart/form-data; boundary=zzz',
					'content-length': '0'
				})
			)
		).toBe('unreadable');
	});

	it('leaves the body for the route to read', async () => {
		const sent = post('/x', form, 'note=a');
		await bodyProblem(sent);
		expect(await sent.text()).toBe('note=a');
	});

	it('reads no body it has no length for, nor one larger than any form', async () => {
		const chunked = request('POST', '/x', { 'content-type': form }, 'note=a%00b');
		expect(await bodyProblem(chunked)).toBeNull();
		const large = request(
			'POST',
			'/x',
			{ 'content-type': form, 'content-length': String(INSPECTED_BODY_BYTES + 1) },
			'note=a%00b'
		);
		expect(await bodyProblem(large)).toBeNull();
	});
});

describe('hostileRequestRefusal', () => {
	it('refuses with 403 across sites and 400 for a NUL, as JSON under /api and text elsewhere', async () => {
		const crossSite = await hostileRequestRefusal(
			post('/api/cart', 'application/json', '{}', { origin: 'https://evil.test' }),
			new URL('/api/cart', SHOP)
		);
		expect(crossSite?.status).toBe(403);
		expect(((await crossSite!.json()) as { message: string }).message).toMatch(/another site/);

		const nul = await hostileRequestRefusal(
			post('/manage/clutches/NAR-C1?/note', 'application/x-www-form-urlencoded', 'note=%00', {
				origin: SHOP
			}),
			new URL('/manage/clutches/NAR-C1?/note', SHOP)
		);
		expect(nul?.status).toBe(400);
		expect(nul?.headers.get('content-type')).toMatch(/^text\/plain/);
		expect(await nul!.text()).toMatch(/NUL/);
	});

	it('refuses text/plain, which only a form from elsewhere sends, and a broken multipart body', async () => {
		for (const type of ['text/plain', 'TEXT/PLAIN; charset=utf-8']) {
			const path = '/cart?/add';
			const answer = await hostileRequestRefusal(
				post(path, type, 'listingId=1', { origin: SHOP }),
				new URL(path, SHOP)
			);
			expect(answer?.status, type).toBe(415);
		}
		const broken = await hostileRequestRefusal(
			post('/cart?/add', 'multipart/form-data; boundary=zzz', 'garbage', { origin: SHOP }),
			new URL('/cart?/add', SHOP)
		);
		expect(broken?.status).toBe(400);
		expect(await broken!.text()).toMatch(/arrived broken/);
	});

	it('lets the signed callbacks through untouched: their signature covers the raw body', async () => {
		const path = '/api/stripe/webhook';
		expect(
			await hostileRequestRefusal(
				post(path, 'application/json', '{"id":"evt_\\u0000"}'),
				new URL(path, SHOP)
			)
		).toBeNull();
	});

	it('lets an ordinary same-origin form through', async () => {
		const path = '/manage/clutches/NAR-C1?/note';
		expect(
			await hostileRequestRefusal(
				post(path, 'application/x-www-form-urlencoded', 'note=Molting', { origin: SHOP }),
				new URL(path, SHOP)
			)
		).toBeNull();
	});
});
