import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { getDb } from '$lib/server/db';
import { loadShopSpecies } from '$lib/server/catalogue/shop-pages';
import type { PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

export const load: PageServerLoad = async ({ params }) => {
	const found = await loadShopSpecies(getDb(), params.slug, {
		fallbackTimeZone: env.SHOP_TIME_ZONE
	}).catch((cause: unknown) => {
		logger.error({ err: cause }, '[species page] unavailable');
		error(503, 'This species page cannot be reached just now. Please try again in a few minutes.');
	});
	if (!found) error(404, 'The shop keeps no species by that name.');
	return found;
};
