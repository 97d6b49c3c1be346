// The cart of the request in hand: the account's when signed in, else the guest's from
// its signed cookie. The first request after signing in pours the guest cart into the
// account's (whichever way the buyer signed in) and drops the guest cookie.
import type { Cookies } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { authSettings } from '$lib/server/auth';
import type { SessionUser } from '$lib/server/auth/guard';
import type { Service } from '$lib/server/db/schema';
import { mergeGuestCart, type CartOwner } from './cart';
import { CART_COOKIE, cartCookieOptions, signCartId, verifyCartCookie } from './cookie';

type CartEvent = { cookies: Cookies; locals: { user: SessionUser | null } };

export async function cartOwner(event: CartEvent): Promise<CartOwner> {
	const { secret } = authSettings();
	const guestCartId = verifyCartCookie(event.cookies.get(CART_COOKIE), secret);
	const user = event.locals.user;
	if (user) {
		if (guestCartId) {
			await mergeGuestCart(getDb(), guestCartId, user.id);
			event.cookies.delete(CART_COOKIE, { path: '/' });
		} else if (event.cookies.get(CART_COOKIE)) {
			event.cookies.delete(CART_COOKIE, { path: '/' });
		}
		return { userId: user.id, guestCartId: null };
	}
	return { userId: null, guestCartId };
}

/** After a guest's first change: the new cart's id goes back in the signed cookie. */
export function rememberGuestCart(event: CartEvent, owner: CartOwner, cartId: string | null): void {
	if (owner.userId || !cartId || owner.guestCartId === cartId) return;
	const { secret, secure } = authSettings();
	event.cookies.set(CART_COOKIE, signCartId(cartId, secret), cartCookieOptions(secure));
}

/** The service the totals are worked out for; overnight unless two-day was chosen. */
export function chosenService(value: string | null | undefined): Service {
	return value === 'two_day' ? 'two_day' : 'overnight';
}
