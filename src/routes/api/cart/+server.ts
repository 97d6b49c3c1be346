// The cart's JSON routes, used by the cart drawer, the cart page and "add to cart" when
// JavaScript runs (the same changes work as form posts to /cart without it). Public: a
// guest's cart is found by its signed cookie. Every answer carries the whole cart as the
// server priced it, so the browser never works out money itself.
import { json, type RequestEvent } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { changeLine, findCartId, readCart, removeLine } from '$lib/server/cart/cart';
import { cartOwner, chosenService, rememberGuestCart } from '$lib/server/cart/request';
import { cartLineSchema, cartRemoveSchema, fieldProblems } from '$lib/cart/schemas';
import type { RequestHandler } from './$types';

const noStore = { 'cache-control': 'no-store' };

async function body(event: RequestEvent): Promise<unknown> {
	try {
		return await event.request.json();
	} catch {
		return null;
	}
}

export const GET: RequestHandler = async (event) => {
	const db = getDb();
	const owner = await cartOwner(event);
	const service = chosenService(event.url.searchParams.get('service'));
	return json(await readCart(db, await findCartId(db, owner), service), { headers: noStore });
};

async function change(event: RequestEvent, mode: 'add' | 'set') {
	const db = getDb();
	const owner = await cartOwner(event);
	const service = chosenService(event.url.searchParams.get('service'));
	const parsed = cartLineSchema.safeParse(await body(event));
	if (!parsed.success) {
		return json(
			{
				message: 'That change could not be made.',
				fields: fieldProblems(parsed.error),
				cart: await readCart(db, await findCartId(db, owner), service)
			},
			{ status: 400, headers: noStore }
		);
	}
	const outcome = await changeLine(db, owner, { ...parsed.data, mode }, service);
	rememberGuestCart(event, owner, outcome.cartId);
	if (!outcome.ok) {
		return json(
			{
				message: outcome.problem,
				fields: { [outcome.field]: outcome.problem },
				cart: outcome.cart
			},
			{ status: outcome.status, headers: noStore }
		);
	}
	return json(outcome.cart, { headers: noStore });
}

/** Add `quantity` of a listing to the cart. */
export const POST: RequestHandler = (event) => change(event, 'add');

/** Set a line to `quantity`. */
export const PATCH: RequestHandler = (event) => change(event, 'set');

/** Remove a line: `?listingId=`. */
export const DELETE: RequestHandler = async (event) => {
	const db = getDb();
	const owner = await cartOwner(event);
	const service = chosenService(event.url.searchParams.get('service'));
	const parsed = cartRemoveSchema.safeParse({
		listingId: event.url.searchParams.get('listingId')
	});
	if (!parsed.success)
		return json(
			{ message: 'Choose a line to remove.', fields: fieldProblems(parsed.error) },
			{ status: 400, headers: noStore }
		);
	return json(await removeLine(db, owner, parsed.data.listingId, service), { headers: noStore });
};
