// The files search engines read: the sitemap (sitemaps.org protocol 0.9) and robots.txt
// (RFC 9309). Pure: the routes hand in the origin and the pages, this writes the text.

/** The protocol's limit per sitemap file. */
export const SITEMAP_URL_LIMIT = 50_000;

export interface SitemapEntry {
	/** Path from the site root, e.g. "/species/narceus-americanus". */
	path: string;
	lastModified?: Date | null;
}

/** XML's five predefined entities, so any text is safe inside an element. */
export function escapeXml(text: string): string {
	return text.replace(/[<>&'"]/g, (char) => {
		switch (char) {
			case '<':
				return '&lt;';
			case '>':
				return '&gt;';
			case '&':
				return '&amp;';
			case "'":
				return '&apos;';
			default:
				return '&quot;';
		}
	});
}

/** The origin without a trailing slash, from ORIGIN when it is set, else the request's. */
export function siteOrigin(configured: string | undefined, requestUrl: URL): string {
	const candidate = configured?.trim();
	if (candidate) {
		try {
			return new URL(candidate).origin;
		} catch {
			// A malformed ORIGIN is ignored here; the request still knows where it arrived.
		}
	}
	return requestUrl.origin;
}

export function renderSitemap(origin: string, entries: readonly SitemapEntry[]): string {
	const urls = entries.slice(0, SITEMAP_URL_LIMIT).map((entry) => {
		const loc = `<loc>${escapeXml(new URL(entry.path, origin).href)}</loc>`;
		// W3C Datetime, as the protocol asks; to the second in UTC.
		const lastmod = entry.lastModified
			? `<lastmod>${entry.lastModified.toISOString().replace(/\.\d{3}Z$/, 'Z')}</lastmod>`
			: '';
		return `<url>${loc}${lastmod}</url>`;
	});
	return [
		'<?xml version="1.0" encoding="UTF-8"?>',
		'<urlset xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">',
		...urls,
		'</urlset>',
		''
	].join('\n');
}

/** Paths no crawler needs: the back office, accounts, carts and the JSON routes. */
export const CRAWL_DISALLOWED = [
	'/manage',
	'/admin',
	'/account',
	'/api/',
	'/cart',
	'/checkout',
	'/signin',
	'/signup',
	'/signout',
	'/reset',
	'/verify',
	'/waitlist/',
	'/species/*/waitlist',
	'/outbox'
] as const;

export function renderRobots(origin: string): string {
	return [
		'User-agent: *',
		...CRAWL_DISALLOWED.map((path) => `Disallow: ${path}`),
		'Allow: /',
		'',
		`Sitemap: ${new URL('/sitemap.xml', origin).href}`,
		''
	].join('\n');
}
