// The app-edge wiring of accounts: settings from the environment, built once.
import { env } from '$env/dynamic/private';
import { getDb, getPool } from '../db';
import type { AuthConfig } from '@auth/core';
import { authConfig, type AuthSettings } from './authjs';
import { createAccountLimits, limitsFromEnv, type AccountLimits } from './limits';
import { cookiesMustBeSecure } from './sessions';

let settings: AuthSettings | undefined;
let limits: AccountLimits | undefined;
let authJs: AuthConfig | undefined;

export function origin(): string {
	return (env.ORIGIN ?? 'http://127.0.0.1:3000').replace(/\/$/, '');
}

export function authSettings(): AuthSettings {
	if (!settings) {
		const secret = env.AUTH_SECRET;
		if (!secret || secret.length < 32) {
			throw new Error(
				'AUTH_SECRET must be set to at least 32 random characters (see .env.example).'
			);
		}
		settings = {
			db: getDb(),
			secret,
			origin: origin(),
			secure: cookiesMustBeSecure(origin()),
			smtpUrl: env.SMTP_URL ?? 'smtp://127.0.0.1:2525',
			mailFrom: env.MAIL_FROM ?? 'Mossback Hollow Inverts <shop@mossback.example.com>'
		};
	}
	return settings;
}

/** Auth.js's configuration, built once: the hooks ask for it on every request. */
export function authJsConfig(): AuthConfig {
	authJs ??= authConfig(authSettings());
	return authJs;
}

export function accountLimits(): AccountLimits {
	limits ??= createAccountLimits(getPool(), limitsFromEnv(env));
	return limits;
}
