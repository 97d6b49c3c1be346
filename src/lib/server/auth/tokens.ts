// Random secrets for sessions and one-time links. Only a SHA-256 of a link
// token is stored, so a copy of the database cannot be used to sign in.
import { createHash, randomBytes } from 'node:crypto';

export function newSecret(): string {
	return randomBytes(32).toString('base64url');
}

export function hashSecret(secret: string): string {
	return createHash('sha256').update(secret).digest('hex');
}
