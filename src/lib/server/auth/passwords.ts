// Password hashing (argon2id) and the strength rule: long enough, and not a
// password that shows up in breach lists (zxcvbn's common-password dictionary).
import { hash, verify } from '@node-rs/argon2';
import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import * as zxcvbnCommon from '@zxcvbn-ts/language-common';
import * as zxcvbnEn from '@zxcvbn-ts/language-en';

export const PASSWORD_MIN = 10;
export const PASSWORD_MAX = 200;

const strength = new ZxcvbnFactory({
	dictionary: { ...zxcvbnCommon.dictionary, ...zxcvbnEn.dictionary },
	graphs: zxcvbnCommon.adjacencyGraphs,
	translations: zxcvbnEn.translations
});

// OWASP's password storage guidance for argon2id: 19 MiB, 2 iterations, 1 lane (from memory).
const ARGON2 = { memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
	return hash(password, ARGON2);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
	try {
		return await verify(passwordHash, password);
	} catch {
		return false;
	}
}

/** A hash of nothing anyone knows, verified against when the e-mail is unknown so timing says nothing. */
let decoy: Promise<string> | undefined;
export function decoyHash(): Promise<string> {
	decoy ??= hashPassword('decoy-password-that-no-account-has');
	return decoy;
}

/** Why a password is refused, or null when it will do. */
export function passwordProblem(password: string, context: string[] = []): string | null {
	if (password.length < PASSWORD_MIN) return `Use at least ${PASSWORD_MIN} characters.`;
	if (password.length > PASSWORD_MAX) return `Use at most ${PASSWORD_MAX} characters.`;
	const verdict = strength.check(password, context.filter(Boolean));
	const breached = verdict.sequence.some(
		(match) =>
			match.pattern === 'dictionary' &&
			match.dictionaryName === 'passwords' &&
			match.token.length >= password.length - 2
	);
	if (breached) return 'That password appears in lists of leaked passwords; choose another.';
	if (verdict.score < 3) return 'That password is easy to guess; add words or length.';
	return null;
}
