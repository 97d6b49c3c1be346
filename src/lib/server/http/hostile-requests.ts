// Requests refused before any route sees them: state-changing ones a browser sends from
// another site; ones that carry a NUL character, which no field of ours holds and
// PostgreSQL refuses in text; and form bodies SvelteKit's actions cannot read (text/plain,
// broken multipart). Each would otherwise end as a failed query or parse and a 500.
import { json } from '@sveltejs/kit';

/** Routes whose callers sign the body instead of sending a browser's cookies. */
export const SIGNED_CALLBACKS: ReadonlySet<string> = new Set([
	'/api/stripe/webhook',
	'/api/shipments/tracking'
]);

/**
 * Bodies read here to look for a NUL: every form and JSON body the shop takes is far
 * smaller (hooks refuse more than 512 kB outside the photo routes); photo uploads above
 * it are not read twice, and their text fields drop a NUL in their own schemas.
 */
export const INSPECTED_BODY_BYTES = 1024 * 1024;

const READS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Whether a request changes state on behalf of a page from another site. SvelteKit
 * refuses cross-site form posts itself, but only for form content types: a script
 * elsewhere can still POST JSON sent as no type at all, which is a "simple" request
 * and reaches the server without asking first. Browsers name the caller in Origin
 * (and Sec-Fetch-Site); a request with neither did not come from a browser page.
 */
export function isCrossSiteWrite(request: Request, url: URL): boolean {
	if (READS.has(request.method) || SIGNED_CALLBACKS.has(url.pathname)) return false;
	const origin = request.headers.get('origin');
	// "null" is a sandboxed frame or a file: page, never this shop.
	if (origin !== null) return origin !== url.origin;
	const site = request.headers.get('sec-fetch-site');
	return site !== null && site !== 'same-origin' && site !== 'none';
}

/** A NUL in the address (%00, percent-encoding has no letters to vary in case). */
export function hasNulInAddress(url: URL): boolean {
	return /%00/.test(url.pathname + url.search);
}

function holdsNul(value: unknown): boolean {
	if (typeof value === 'string') return value.includes('\0');
	if (Array.isArray(value)) return value.some(holdsNul);
	if (value !== null && typeof value === 'object')
		return Object.entries(value).some(([key, inner]) => key.includes('\0') || holdsNul(inner));
	return false;
}

/** The media type of a request body, lower-cased, without its parameters. */
function bodyType(request: Request): string {
	return (request.headers.get('content-type') ?? '').split(';', 1)[0]!.trim().toLowerCase();
}

/**
 * What is wrong with a form or JSON body: a NUL in a name or a text value (file contents
 * are bytes and may hold one), or a multipart body that does not parse (SvelteKit's
 * actions would fail reading it). null when nothing is; a JSON body that does not parse
 * is left for the route to refuse in its own words.
 */
export async function bodyProblem(request: Request): Promise<'nul' | 'unreadable' | null> {
	if (READS.has(request.method)) return null;
	const type = bodyType(request);
	// An empty multipart body has no boundary line to read: nothing a browser sends.
	if (
		type === 'multipart/form-data' &&
		(request.body === null || request.headers.get('content-length') === '0')
	)
		return 'unreadable';
	if (request.body === null) return null;
	const length = Number(request.headers.get('content-length') ?? NaN);
	if (!(length > 0 && length <= INSPECTED_BODY_BYTES)) return null;
	if (type === 'multipart/form-data') {
		let form: FormData;
		try {
			form = await request.clone().formData();
		} catch {
			return 'unreadable';
		}
		const nul = [...form.entries()].some(
			([name, value]) => name.includes('\0') || (typeof value === 'string' && value.includes('\0'))
		);
		return nul ? 'nul' : null;
	}
	const text = await request.clone().text();
	if (type === 'application/x-www-form-urlencoded')
		return [...new URLSearchParams(text)].some(([name, value]) => holdsNul(name + value))
			? 'nul'
			: null;
	if (text.includes('\0')) return 'nul';
	if (!text.includes('\\u0000')) return null;
	try {
		// JSON arrives with its own type, or with none at all from a script.
		return holdsNul(JSON.parse(text)) ? 'nul' : null;
	} catch {
		return null;
	}
}

function refusal(url: URL, status: 400 | 403 | 415, message: string): Response {
	return url.pathname.startsWith('/api/')
		? json({ message }, { status })
		: new Response(message, { status, headers: { 'content-type': 'text/plain; charset=utf-8' } });
}

/** The refusal for a request no route should see, or null to let it through. */
export async function hostileRequestRefusal(request: Request, url: URL): Promise<Response | null> {
	if (isCrossSiteWrite(request, url))
		return refusal(
			url,
			403,
			'Requests from another site are not accepted. Use the shop’s own pages.'
		);
	if (SIGNED_CALLBACKS.has(url.pathname)) return null;
	if (hasNulInAddress(url)) return refusal(url, 400, 'That address is not one of ours.');
	// The type a <form> can send across sites unasked; none of the shop's pages or scripts
	// send it, and SvelteKit's actions cannot read it (they would fail with a 500).
	if (!READS.has(request.method) && bodyType(request) === 'text/plain')
		return refusal(url, 415, 'Send the form as the shop’s own pages do. Nothing was saved.');
	const problem = await bodyProblem(request);
	if (problem === 'nul')
		return refusal(url, 400, 'The form held a character no field takes (NUL). Nothing was saved.');
	if (problem === 'unreadable')
		return refusal(url, 400, 'The form arrived broken; reload the page and try again.');
	return null;
}
