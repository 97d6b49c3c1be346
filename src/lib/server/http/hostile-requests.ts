// Requests refused before any route sees them: state-changing ones a browser sends from
// another site, and ones that carry a NUL character, which no field of ours holds and
// PostgreSQL refuses in text (so it could only end as a failed query and a 500).
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

/**
 * Whether a form or JSON body carries a NUL in a name or a text value (file contents are
 * bytes and may). A body that does not parse is left for the route to refuse.
 */
export async function bodyHasNul(request: Request): Promise<boolean> {
	if (READS.has(request.method) || request.body === null) return false;
	const length = Number(request.headers.get('content-length') ?? NaN);
	if (!(length > 0 && length <= INSPECTED_BODY_BYTES)) return false;
	const type = (request.headers.get('content-type') ?? '').split(';', 1)[0]!.trim().toLowerCase();
	try {
		if (type === 'multipart/form-data') {
			const form = await request.clone().formData();
			return [...form.entries()].some(
				([name, value]) =>
					name.includes('\0') || (typeof value === 'string' && value.includes('\0'))
			);
		}
		const text = await request.clone().text();
		if (type === 'application/x-www-form-urlencoded')
			return [...new URLSearchParams(text)].some(([name, value]) => holdsNul(name + value));
		// JSON arrives with its own type, or as text or no type at all from a script.
		return text.includes('\0') || (text.includes('\\u0000') && holdsNul(JSON.parse(text)));
	} catch {
		return false;
	}
}

function refusal(url: URL, status: 400 | 403, message: string): Response {
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
	if (await bodyHasNul(request))
		return refusal(url, 400, 'The form held a character no field takes (NUL). Nothing was saved.');
	return null;
}
