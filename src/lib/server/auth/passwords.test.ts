import { describe, expect, it } from 'vitest';
import { hashPassword, passwordProblem, verifyPassword } from './passwords';

describe('passwords', () => {
	it('hashes with argon2id and verifies', async () => {
		const stored = await hashPassword('slow moss under oak leaves');
		// PHC string format for argon2id (RFC 9106 names the variant; the $argon2id$ prefix is the PHC convention).
		expect(stored.startsWith('$argon2id$')).toBe(true);
		expect(await verifyPassword(stored, 'slow moss under oak leaves')).toBe(true);
		expect(await verifyPassword(stored, 'slow moss under oak leaf')).toBe(false);
		expect(await verifyPassword('not a hash', 'x')).toBe(false);
	});

	it('refuses short, leaked and guessable passwords', () => {
		expect(passwordProblem('short')).toMatch(/at least 10/);
		// "password123" and "qwertyuiop" sit near the top of every published leaked-password list (from memory).
		expect(passwordProblem('password123')).toMatch(/leaked|guess/);
		expect(passwordProblem('qwertyuiop')).toMatch(/leaked|guess/);
		expect(
			passwordProblem('wren.calloway', ['wren.calloway@mossback.example.com', 'wren.calloway'])
		).not.toBeNull();
	});

	it('accepts a long passphrase', () => {
		expect(passwordProblem('slow moss under oak leaves')).toBeNull();
	});
});
