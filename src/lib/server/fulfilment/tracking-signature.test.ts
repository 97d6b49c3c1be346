import { describe, expect, it } from 'vitest';
import {
	hmacSha256Hex,
	trackingSignatureHeader,
	verifyTrackingSignature
} from './tracking-signature';

describe('hmacSha256Hex', () => {
	// RFC 4231 test cases 2 and 1 (HMAC-SHA-256); the values were recalled from memory and
	// confirmed with `openssl dgst -sha256 -mac HMAC` and Python's hmac module.
	it('matches the published HMAC-SHA256 test vectors (RFC 4231, test cases 2 and 1)', () => {
		expect(hmacSha256Hex('Jefe', 'what do ya want for nothing?')).toBe(
			'5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843'
		);
		expect(hmacSha256Hex('\x0b'.repeat(20), 'Hi There')).toBe(
			'b0344c61d8db38535ca8afceaf0bf12b881dc200c9833da726e9376c2e32cff7'
		);
	});
});

describe('verifyTrackingSignature', () => {
	const secret = 'tracking_test_secret';
	const body = '{"carrier":"UPS","trackingNumber":"1Z5R89390357567127","status":"delivered"}';
	const t = 1_796_000_000;
	const header = trackingSignatureHeader(secret, body, t);

	it('signs "t.body", as the header says', () => {
		expect(header).toBe(`t=${t},v1=${hmacSha256Hex(secret, `${t}.${body}`)}`);
	});

	it('takes a fresh signature, up to the tolerance either way', () => {
		expect(verifyTrackingSignature(body, header, secret, t)).toEqual({ ok: true, timestamp: t });
		expect(verifyTrackingSignature(body, header, secret, t + 300).ok).toBe(true);
		expect(verifyTrackingSignature(body, header, secret, t - 300).ok).toBe(true);
	});

	it('refuses an old or future timestamp', () => {
		expect(verifyTrackingSignature(body, header, secret, t + 301)).toMatchObject({
			ok: false,
			problem: expect.stringMatching(/too old/)
		});
		expect(verifyTrackingSignature(body, header, secret, t - 301).ok).toBe(false);
	});

	it('refuses a tampered body, another secret, a moved timestamp and a missing header', () => {
		expect(
			verifyTrackingSignature(body.replace('delivered', 'exception'), header, secret, t).ok
		).toBe(false);
		expect(verifyTrackingSignature(body, header, 'someone_else', t).ok).toBe(false);
		expect(
			verifyTrackingSignature(body, header.replace(`t=${t}`, `t=${t + 1}`), secret, t).ok
		).toBe(false);
		expect(verifyTrackingSignature(body, null, secret, t).ok).toBe(false);
		expect(verifyTrackingSignature(body, 'v1=abc', secret, t).ok).toBe(false);
		expect(verifyTrackingSignature(body, `t=${t}`, secret, t).ok).toBe(false);
		expect(verifyTrackingSignature(body, header, '', t).ok).toBe(false);
	});

	it('takes any one matching v1 of several (a secret being changed)', () => {
		const old = trackingSignatureHeader('old_secret', body, t).split(',')[1];
		expect(
			verifyTrackingSignature(body, `t=${t},${old},${header.split(',')[1]}`, secret, t).ok
		).toBe(true);
		expect(verifyTrackingSignature(body, `t=${t},${old}`, secret, t).ok).toBe(false);
	});
});
