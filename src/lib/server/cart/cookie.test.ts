import { createHmac } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { signCartId, verifyCartCookie } from './cookie';

const secret = 'a-test-secret-that-is-long-enough-0123456789';
const cartId = '3f2b8c1e-9d4a-4c6b-8e21-5a7f0c9d1b23';

describe('guest cart cookie', () => {
	it('round-trips a cart id', () => {
		expect(verifyCartCookie(signCartId(cartId, secret), secret)).toBe(cartId);
	});

	it('is HMAC-SHA256 of the id (RFC 2104 through node:crypto), base64url', () => {
		const expected = createHmac('sha256', secret).update(`cart:${cartId}`).digest('base64url');
		expect(signCartId(cartId, secret)).toBe(`${cartId}.${expected}`);
	});

	it('refuses forged, edited, foreign and malformed cookies', () => {
		const good = signCartId(cartId, secret);
		const otherId = '00000000-0000-4000-8000-000000000000';
		expect(verifyCartCookie(`${otherId}.${good.split('.')[1]}`, secret)).toBeNull();
		expect(verifyCartCookie(good.slice(0, -2) + 'xx', secret)).toBeNull();
		expect(
			verifyCartCookie(signCartId(cartId, 'another-secret-0123456789-abcdefghij'), secret)
		).toBeNull();
		for (const bad of [
			undefined,
			'',
			'nonsense',
			`${cartId}`,
			`${cartId}.`,
			'x.y',
			`'; drop table cart;--.abc`
		])
			expect(verifyCartCookie(bad, secret)).toBeNull();
	});
});
