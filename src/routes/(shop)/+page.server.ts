import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { getDb } from '$lib/server/db';
import { loadShopHome } from '$lib/server/catalogue/home';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	try {
		return await loadShopHome(getDb(), { fallbackTimeZone: env.SHOP_TIME_ZONE });
	} catch (cause) {
		console.error('[shop home] stock list unavailable', cause);
		error(503, 'The stock list cannot be reached just now. Please try again in a few minutes.');
	}
};
