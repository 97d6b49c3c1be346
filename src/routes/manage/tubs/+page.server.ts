import { env } from '$env/dynamic/private';
import { requireRole } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import { todayInZone } from '$lib/format/dates';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { tablePageData } from '$lib/server/backoffice/table-routes';
import { tableFilterOptions } from '$lib/server/backoffice/tables';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const db = getDb();
	const [table, options, timeZone] = await Promise.all([
		tablePageData(event, 'tubs'),
		tableFilterOptions(db),
		resolveShopTimeZone(db, env.SHOP_TIME_ZONE)
	]);
	// "Today" in the shop's zone marks resting tubs whose hold has ended.
	return { ...table, colonies: options.colonies, today: todayInZone(timeZone) };
};
