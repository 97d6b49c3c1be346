// The guest cart's cookie: the cart id and an HMAC of it under the app's secret, so a
// visitor cannot point their cookie at someone else's cart by guessing or editing ids.
// A cookie that does not verify is treated as no cookie: a fresh cart, never an error.
import { createHmac, timingSafeEqual } from 'node:crypto';

export const CART_COOKIE = 'hatchlot.cart';
/** A guest cart is kept for 30 days after it was last changed. */
export const GUEST_CART_DAYS = 30;

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

function mac(cartId: string, secret: string): string {
	return createHmac('sha256', secret).update(`cart:${cartId}`).digest('base64url');
}

export function signCartId(cartId: string, secret: string): string {
	if (!UUID.test(cartId)) throw new Error('a cart id is a lower-case uuid');
	return `${cartId}.${mac(cartId, secret)}`;
}

/** The cart id a cookie vouches for, or null for a missing, malformed or forged one. */
export function verifyCartCookie(value: string | undefined, secret: string): string | null {
	if (!value) return null;
	const dot = value.indexOf('.');
	if (dot < 0) return null;
	const cartId = value.slice(0, dot);
	const given = Buffer.from(value.slice(dot + 1));
	if (!UUID.test(cartId)) return null;
	const expected = Buffer.from(mac(cartId, secret));
	if (given.length !== expected.length || !timingSafeEqual(given, expected)) return null;
	return cartId;
}

export function cartCookieOptions(secure: boolean) {
	return {
		path: '/',
		httpOnly: true,
		sameSite: 'lax' as const,
		secure,
		maxAge: GUEST_CART_DAYS * 86_400
	};
}
