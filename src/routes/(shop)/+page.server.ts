import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { getDb } from '$lib/server/db';
import { loadShopHome } from '$lib/server/catalogue/home';
import type { PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

export const load: PageServerLoad = async () => {
	try {
		return await loadShopHome(getDb(), { fallbackTimeZone: env.SHOP_TIME_ZONE });
	} catch (cause) {
		logger.error({ err: cause }, '[shop home] stock list unavailable');
		error(503, 'The stock list cannot be reached just now. Please try again in a few minutes.');
	}
};
