// The shop's answer to hostile pages and requests, in one handle: what ./hostile-requests
// refuses never reaches a route, and every response carries the headers that keep a
// browser from sniffing, framing, leaking or sharing it. The page policy itself (scripts
// only with the request's nonce) is SvelteKit's `kit.csp` in svelte.config.js; this adds
// what a page policy cannot reach.
import type { Handle } from '@sveltejs/kit';
import { hostileRequestRefusal } from './hostile-requests';

/** Headers for every response, whatever its kind. */
export const ALWAYS: Readonly<Record<string, string>> = {
	'x-content-type-options': 'nosniff',
	// Full addresses stay on this site: sign-in, reset and waitlist links carry tokens.
	'referrer-policy': 'same-origin',
	// For browsers that predate frame-ancestors; the page policy says the same.
	'x-frame-options': 'DENY',
	// Nothing here uses these; a script that got in cannot ask for them either.
	'permissions-policy':
		'accelerometer=(), camera=(), geolocation=(), gyroscope=(), magnetometer=(), microphone=(), payment=(), usb=()',
	// Stripe's pay page is reached by navigation, never a popup, so no window needs our handle.
	'cross-origin-opener-policy': 'same-origin'
};

/**
 * A policy for a data answer that brought none (JSON, text, CSV): it loads nothing and
 * may not be framed, so an answer opened as a document, or sniffed as one, is inert.
 */
export const DATA_POLICY =
	"default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/** HTML that did not come from a SvelteKit page (Auth.js's own screens): not framed, at least. */
export const OTHER_HTML_POLICY = "frame-ancestors 'none'";

/** One year, without subdomains: the shop may share its domain with sites it does not run. */
export const HSTS = 'max-age=31536000';

/**
 * Seconds a caller is asked to wait after a 503 (the database restarting): RFC 9110
 * §10.2.3's Retry-After, so scripts and load balancers back off rather than hammer.
 */
export const RETRY_AFTER_SECONDS = 5;

/** The headers this response still lacks; ones a route set on purpose are kept. */
export function missingSecurityHeaders(
	url: URL,
	headers: Headers,
	status = 200
): [string, string][] {
	const wanted: [string, string][] = Object.entries(ALWAYS);
	if (url.protocol === 'https:') wanted.push(['strict-transport-security', HSTS]);
	if (status === 503) wanted.push(['retry-after', String(RETRY_AFTER_SECONDS)]);
	const type = headers.get('content-type')?.toLowerCase() ?? '';
	if (type.startsWith('text/html')) wanted.push(['content-security-policy', OTHER_HTML_POLICY]);
	// Images and PDFs are shown by the browser's own viewer; a policy adds nothing there.
	else if (!type.startsWith('image/') && !type.startsWith('application/pdf'))
		wanted.push(['content-security-policy', DATA_POLICY]);
	return wanted.filter(([name]) => !headers.has(name));
}

/**
 * Put it first in the hooks' sequence, so refusals from the handles after it (too large,
 * sign in first) carry the headers too. SvelteKit's own cross-site form refusal and the
 * static files adapter-node serves are answered before any hook runs.
 */
export const securityHeaders: Handle = async ({ event, resolve }) => {
	let response = (await hostileRequestRefusal(event.request, event.url)) ?? (await resolve(event));
	const missing = missingSecurityHeaders(event.url, response.headers, response.status);
	if (missing.length === 0) return response;
	try {
		for (const [name, value] of missing) response.headers.set(name, value);
	} catch {
		// A response passed through from fetch() has read-only headers: copy it once.
		response = new Response(response.body, response);
		for (const [name, value] of missing) response.headers.set(name, value);
	}
	return response;
};
