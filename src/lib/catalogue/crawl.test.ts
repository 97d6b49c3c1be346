import { describe, expect, it } from 'vitest';
import { escapeXml, renderRobots, renderSitemap, siteOrigin, SITEMAP_URL_LIMIT } from './crawl';

describe('sitemap', () => {
	it('writes the sitemaps.org 0.9 shape: urlset, url, loc and a W3C datetime lastmod', () => {
		const xml = renderSitemap('https://shop.example.com', [
			{ path: '/' },
			{ path: '/species/narceus-americanus', lastModified: new Date('2026-11-17T13:30:00.250Z') }
		]);
		expect(xml).toBe(
			[
				'<?xml version="1.0" encoding="UTF-8"?>',
				'<urlset xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">',
				'<url><loc>https://shop.example.com/</loc></url>',
				'<url><loc>https://shop.example.com/species/narceus-americanus</loc><lastmod>2026-11-17T13:30:00Z</lastmod></url>',
				'</urlset>',
				''
			].join('\n')
		);
	});

	it('escapes the five XML entities (the protocol requires it in loc)', () => {
		// The entity list is XML 1.0 §4.6 "Predefined Entities".
		expect(escapeXml(`a&b<c>d'e"f`)).toBe('a&amp;b&lt;c&gt;d&apos;e&quot;f');
		const xml = renderSitemap('http://127.0.0.1:3000', [
			{ path: '/catalogue?group=isopod&stock=1' }
		]);
		expect(xml).toContain('<loc>http://127.0.0.1:3000/catalogue?group=isopod&amp;stock=1</loc>');
	});

	it('stops at the protocol’s 50,000 URLs per file', () => {
		const many = Array.from({ length: SITEMAP_URL_LIMIT + 3 }, (_, i) => ({
			path: `/listings/l-${i}`
		}));
		expect(renderSitemap('https://shop.example.com', many).match(/<url>/g)).toHaveLength(50_000);
	});
});

/**
 * Whether a crawler may fetch `path`, by RFC 9309 §2.2.2: the longest matching rule wins
 * ("*" matches any characters), Allow wins a tie, and no matching rule means allowed.
 */
function allowedByRobots(robots: string, path: string): boolean {
	let best: { length: number; allow: boolean } | null = null;
	for (const line of robots.split('\n')) {
		const match = /^(Allow|Disallow):\s*(\S*)$/.exec(line);
		if (!match || !match[2]) continue;
		const pattern = new RegExp(
			'^' + match[2].replace(/[.+?^${}()|[\]\\]/g, '\\$&').replace(/\*/g, '.*')
		);
		if (!pattern.test(path)) continue;
		const rule = { length: match[2].length, allow: match[1] === 'Allow' };
		if (!best || rule.length > best.length || (rule.length === best.length && rule.allow))
			best = rule;
	}
	return best?.allow ?? true;
}

describe('robots.txt', () => {
	const text = renderRobots('https://shop.example.com');

	it('applies to every crawler and names the sitemap', () => {
		expect(text.startsWith('User-agent: *\n')).toBe(true);
		expect(text).toContain('\nSitemap: https://shop.example.com/sitemap.xml\n');
	});

	it.each([
		'/',
		'/catalogue',
		'/catalogue?group=isopod',
		'/species/narceus-americanus',
		'/listings/narceus-juveniles',
		'/sitemap.xml'
	])('lets crawlers read %s', (path) => {
		expect(allowedByRobots(text, path)).toBe(true);
	});

	it.each([
		'/manage',
		'/manage/clutches',
		'/admin',
		'/account/orders',
		'/api/health',
		'/cart',
		'/signin',
		'/species/narceus-americanus/waitlist',
		'/waitlist/confirm/abc'
	])('keeps crawlers out of %s', (path) => {
		expect(allowedByRobots(text, path)).toBe(false);
	});
});

describe('siteOrigin', () => {
	const request = new URL('http://127.0.0.1:5172/sitemap.xml');
	it('prefers ORIGIN, else the request’s own origin', () => {
		expect(siteOrigin('https://shop.example.com/', request)).toBe('https://shop.example.com');
		expect(siteOrigin('', request)).toBe('http://127.0.0.1:5172');
		expect(siteOrigin(undefined, request)).toBe('http://127.0.0.1:5172');
		expect(siteOrigin('not a url', request)).toBe('http://127.0.0.1:5172');
	});
});
