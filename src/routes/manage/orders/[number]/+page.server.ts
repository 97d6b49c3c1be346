import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { keeperActorWords } from '$lib/orders/timeline';
import { requireRole } from '$lib/server/auth/guard';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { keeperOrder } from '$lib/server/orders/keeper';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'keeper');
	const db = getDb();
	const [order, timeZone] = await Promise.all([
		keeperOrder(db, event.params.number.slice(0, 20)),
		resolveShopTimeZone(db, env.SHOP_TIME_ZONE)
	]);
	if (!order) error(404, 'No order has that number.');
	const { id: _id, user_id, events, ...visible } = order;
	return {
		order: {
			...visible,
			guest: user_id === null,
			events: events.map((e) => ({
				id: e.id,
				fromState: e.fromState,
				toState: e.toState,
				by: keeperActorWords({ ...e, name: e.actorName, email: e.actorEmail }),
				note: e.note,
				at: e.at
			}))
		},
		showMoney: me.role === 'admin',
		timeZone
	};
};
