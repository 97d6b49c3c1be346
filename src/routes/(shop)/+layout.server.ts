import { getDb } from '$lib/server/db';
import { loadShopFace } from '$lib/server/catalogue/home';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async () => {
	// The frame must still render when PostgreSQL is down; the page below reports that itself.
	try {
		return { shopFace: await loadShopFace(getDb()) };
	} catch {
		return { shopFace: null };
	}
};
