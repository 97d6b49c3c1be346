import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { requireUser } from '$lib/server/auth/guard';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { ownOrder } from '$lib/server/orders/customer';
import { claimWindowHours } from '$lib/server/orders/history';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	const order = await ownOrder(getDb(), user.id, event.params.number.slice(0, 20));
	// Another customer's order is "not found", never "forbidden": its number tells nothing.
	if (!order) error(404, 'No order of yours has that number.');
	const [timeZone, windowHours] = await Promise.all([
		resolveShopTimeZone(getDb(), env.SHOP_TIME_ZONE),
		claimWindowHours(getDb())
	]);
	return { order, timeZone, claimWindowHours: windowHours };
};
