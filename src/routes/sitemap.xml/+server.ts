// The sitemap: the home page, the catalogue, every species page and every listing a
// visitor can see now. Public, like the pages it lists.
import { error } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { env } from '$env/dynamic/private';
import { renderSitemap, siteOrigin } from '$lib/catalogue/crawl';
import { crawlablePages } from '$lib/server/catalogue/catalogue';
import { getDb } from '$lib/server/db';
import type { RequestHandler } from './$types';
import { logger } from '$lib/server/log';

export const GET: RequestHandler = async ({ url }) => {
	const pages = await crawlablePages(getDb()).catch((cause: unknown) => {
		logger.error({ err: cause }, '[sitemap] unavailable');
		error(503, 'The sitemap cannot be made just now.');
	});
	const xml = renderSitemap(siteOrigin(env.ORIGIN, url), [
		{ path: resolve('/') },
		{ path: resolve('/catalogue') },
		...pages.species.map((species) => ({
			path: resolve('/(shop)/species/[slug]', { slug: species.slug }),
			lastModified: species.updatedAt
		})),
		...pages.listings.map((listing) => ({
			path: resolve('/(shop)/listings/[slug]', { slug: listing.slug }),
			lastModified: listing.updatedAt
		}))
	]);
	return new Response(xml, {
		headers: {
			'Content-Type': 'application/xml; charset=utf-8',
			'Cache-Control': 'public, max-age=3600'
		}
	});
};
