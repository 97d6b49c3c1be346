import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { readShopSetting } from '$lib/server/backoffice/settings';
import { requireRole } from '$lib/server/auth/guard';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'admin');
	try {
		return { setting: (await readShopSetting(getDb())) ?? null };
	} catch (cause) {
		console.error('[admin] shop settings unavailable', cause);
		error(503, 'The shop settings cannot be read just now. Check that PostgreSQL is running.');
	}
};
