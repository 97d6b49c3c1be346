// robots.txt: crawlers may read the shop, not the back office, accounts or carts.
import { env } from '$env/dynamic/private';
import { renderRobots, siteOrigin } from '$lib/catalogue/crawl';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = ({ url }) =>
	new Response(renderRobots(siteOrigin(env.ORIGIN, url)), {
		headers: {
			'Content-Type': 'text/plain; charset=utf-8',
			'Cache-Control': 'public, max-age=86400'
		}
	});
