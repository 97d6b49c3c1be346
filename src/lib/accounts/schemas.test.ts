import { describe, expect, it } from 'vitest';
import { linkSignInSchema, newPasswordSchema, safeNext } from './schemas';

describe('account form schemas', () => {
	it('reads an e-mail address, trimmed (RFC 5322 addr-spec, the common subset zod accepts)', () => {
		expect(linkSignInSchema.parse({ email: '  wren@mossback.example.com ' }).email).toBe(
			'wren@mossback.example.com'
		);
		expect(linkSignInSchema.safeParse({ email: 'wren at mossback' }).success).toBe(false);
		expect(linkSignInSchema.safeParse({ email: '' }).success).toBe(false);
	});
	it('needs the two new passwords to match', () => {
		expect(
			newPasswordSchema.safeParse({ password: 'a long passphrase', confirm: 'a long passphrase' })
				.success
		).toBe(true);
		const differ = newPasswordSchema.safeParse({
			password: 'a long passphrase',
			confirm: 'another one'
		});
		expect(differ.success).toBe(false);
	});
	it('only follows sign-in to a path on this site', () => {
		expect(safeNext('/manage')).toBe('/manage');
		expect(safeNext('//evil.example.com')).toBe('/');
		expect(safeNext('https://evil.example.com')).toBe('/');
		expect(safeNext('/\\evil.example.com')).toBe('/');
		expect(safeNext(undefined)).toBe('/');
	});
});
