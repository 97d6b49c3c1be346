import { getDb } from '$lib/server/db';
import { loadShopFace } from '$lib/server/catalogue/home';
import { cartItemCount, findCartId } from '$lib/server/cart/cart';
import { cartOwner } from '$lib/server/cart/request';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async (event) => {
	// The frame must still render when PostgreSQL is down; the page below reports that itself.
	try {
		const db = getDb();
		// The first page after signing in also pours the guest cart into the account's.
		const owner = await cartOwner(event);
		const [shopFace, cartCount] = await Promise.all([
			loadShopFace(db),
			findCartId(db, owner).then((cartId) => cartItemCount(db, cartId))
		]);
		return { shopFace, cartCount };
	} catch {
		return { shopFace: null, cartCount: 0 };
	}
};
