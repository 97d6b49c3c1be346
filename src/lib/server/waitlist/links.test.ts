import { describe, expect, it } from 'vitest';
import {
	confirmUrl,
	hmacSha256Hex,
	leaveToken,
	leaveTokenEntryId,
	leaveTokenMatches,
	leaveUrl,
	listingUrl
} from './links';

const secret = 'unit-tests-only-secret-0123456789abcdef';
const links = { origin: 'https://shop.example.com/', secret };

describe('leave links', () => {
	it('are HMAC-SHA-256', () => {
		// RFC 4231, test case 2: key "Jefe", data "what do ya want for nothing?".
		expect(hmacSha256Hex('Jefe', 'what do ya want for nothing?')).toBe(
			'5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843'
		);
	});

	it('name their entry and match only that entry and address under that secret', () => {
		const token = leaveToken(secret, 42, 'ada@example.com');
		expect(token).toMatch(/^42\.[A-Za-z0-9_-]{43}$/);
		expect(leaveTokenEntryId(token)).toBe(42);
		expect(leaveTokenMatches(secret, token, { id: 42, email: 'ada@example.com' })).toBe(true);
		expect(leaveTokenMatches(secret, token, { id: 43, email: 'ada@example.com' })).toBe(false);
		expect(leaveTokenMatches(secret, token, { id: 42, email: 'eve@example.com' })).toBe(false);
		const other = 'another-secret-of-enough-length-0123456789';
		expect(leaveTokenMatches(other, token, { id: 42, email: 'ada@example.com' })).toBe(false);
	});

	it('refuse a tampered or misshapen token', () => {
		const token = leaveToken(secret, 42, 'ada@example.com');
		const flipped = token.slice(0, -1) + (token.endsWith('A') ? 'B' : 'A');
		expect(leaveTokenMatches(secret, flipped, { id: 42, email: 'ada@example.com' })).toBe(false);
		for (const bad of [
			'',
			'42',
			'42.',
			'x.y',
			'0.' + 'a'.repeat(43),
			'99999999999.' + 'a'.repeat(43)
		])
			expect(leaveTokenEntryId(bad)).toBeNull();
	});

	it('need a secret of 32 characters or more', () => {
		expect(() => leaveToken('short', 1, 'a@example.com')).toThrow();
	});
});

describe('link addresses', () => {
	it('hang off the origin without a doubled slash', () => {
		expect(confirmUrl(links, 'abc_DEF-1')).toBe(
			'https://shop.example.com/waitlist/confirm/abc_DEF-1'
		);
		expect(listingUrl(links, 'orthoporus-ornatus-sub-adult')).toBe(
			'https://shop.example.com/listings/orthoporus-ornatus-sub-adult'
		);
		expect(leaveUrl(links, { id: 7, email: 'a@example.com' })).toMatch(
			/^https:\/\/shop\.example\.com\/waitlist\/leave\/7\.[A-Za-z0-9_-]{43}$/
		);
	});
});
