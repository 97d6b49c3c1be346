// Checkout starts here: POST holds every line of the cart for the shop's reservation
// time (all or nothing), DELETE lets the holds go. Public: guests check out too.
import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { clientAddress } from '$lib/server/auth/requests';
import { holdCart, releaseCartHolds, readCart, findCartId } from '$lib/server/cart/cart';
import { cartOwner, chosenService } from '$lib/server/cart/request';
import type { RequestHandler } from './$types';

const noStore = { 'cache-control': 'no-store' };

export const POST: RequestHandler = async (event) => {
	const db = getDb();
	const owner = await cartOwner(event);
	const service = chosenService(event.url.searchParams.get('service'));
	const outcome = await holdCart(db, owner, clientAddress(event), service);
	if (!outcome.ok)
		return json(
			{ message: outcome.problem, lines: outcome.lines, cart: outcome.cart },
			{ status: 409, headers: noStore }
		);
	return json(outcome.cart, { headers: noStore });
};

export const DELETE: RequestHandler = async (event) => {
	const db = getDb();
	const owner = await cartOwner(event);
	await releaseCartHolds(db, owner);
	const service = chosenService(event.url.searchParams.get('service'));
	return json(await readCart(db, await findCartId(db, owner), service), { headers: noStore });
};
