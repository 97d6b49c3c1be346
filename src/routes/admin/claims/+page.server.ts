import { env } from '$env/dynamic/private';
import { parseClaimListFilters } from '$lib/claims/list-filters';
import { requireRole } from '$lib/server/auth/guard';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { listClaims } from '$lib/server/claims/review';
import { getDb } from '$lib/server/db';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'admin');
	const db = getDb();
	const { filters, problem } = parseClaimListFilters(event.url.searchParams);
	const [list, timeZone] = await Promise.all([
		listClaims(db, filters),
		resolveShopTimeZone(db, env.SHOP_TIME_ZONE)
	]);
	return { list, filters, problem, timeZone };
};
