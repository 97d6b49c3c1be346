import { env } from '$env/dynamic/private';
import { requireUser } from '$lib/server/auth/guard';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { listOwnOrders } from '$lib/server/orders/customer';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	return {
		orders: await listOwnOrders(getDb(), user.id),
		timeZone: await resolveShopTimeZone(getDb(), env.SHOP_TIME_ZONE)
	};
};
