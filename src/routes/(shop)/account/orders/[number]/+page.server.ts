import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { requireUser } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import { ownOrderWithClaimWindow } from '$lib/server/orders/customer';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	const found = await ownOrderWithClaimWindow(
		getDb(),
		user.id,
		event.params.number.slice(0, 20),
		env.SHOP_TIME_ZONE
	);
	// Another customer's order is "not found", never "forbidden": its number tells nothing.
	if (!found) error(404, 'No order of yours has that number.');
	return {
		order: found.order,
		timeZone: found.timeZone,
		claimWindowHours: found.windowHours,
		claimNow: found.availability,
		claimFiled: event.url.searchParams.get('claim') === 'filed'
	};
};
