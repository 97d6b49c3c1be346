import { env } from '$env/dynamic/private';
import { parseOrderListFilters } from '$lib/orders/list-filters';
import { requireRole } from '$lib/server/auth/guard';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { listOrders } from '$lib/server/orders/keeper';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'keeper');
	const db = getDb();
	const { filters, problems } = parseOrderListFilters(event.url.searchParams);
	const timeZone = await resolveShopTimeZone(db, env.SHOP_TIME_ZONE);
	const list = await listOrders(db, filters, timeZone);
	// Order totals are the owner's business; keepers see the list without them.
	const showMoney = me.role === 'admin';
	return {
		filters,
		problems,
		timeZone,
		showMoney,
		list: {
			...list,
			rows: list.rows.map(({ total_cents, ...row }) => ({
				...row,
				total_cents: showMoney ? total_cents : null
			}))
		}
	};
};
