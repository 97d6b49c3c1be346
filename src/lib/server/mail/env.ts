// The app's mail settings from its environment. Only code that runs inside SvelteKit
// imports this file; everything else takes the values through ./config.ts.
import { env } from '$env/dynamic/private';
import { error } from '@sveltejs/kit';
import { DEFAULT_SHOP_TIME_ZONE, isKnownTimeZone } from '../backoffice/settings';
import { catcherBaseUrl } from './catcher';
import { mailConfigFrom, type MailConfig } from './config';

/** SMTP_URL and MAIL_FROM (see .env.example). */
export function mailConfigFromEnv(): MailConfig {
	return mailConfigFrom({ SMTP_URL: env.SMTP_URL, MAIL_FROM: env.MAIL_FROM });
}

/**
 * The local mail catcher's HTTP address from MAIL_CATCHER_URL, or null when the
 * outbox must not exist. MAIL_CATCHER_URL is for a developer's machine and the test
 * run only; it is never set in a real deployment.
 */
export function mailCatcherUrlFromEnv(): URL | null {
	return catcherBaseUrl(env.MAIL_CATCHER_URL);
}

/**
 * For the /outbox pages: the catcher's address, or a plain 404 as if the pages did
 * not exist, which is what a deployment without MAIL_CATCHER_URL sees.
 */
export function requireMailCatcher(): URL {
	const base = mailCatcherUrlFromEnv();
	if (!base) error(404, 'Not found.');
	return base;
}

/** The zone caught mail is shown in: SHOP_TIME_ZONE when it is a known zone. */
export function outboxTimeZone(): string {
	const zone = env.SHOP_TIME_ZONE?.trim();
	return zone && isKnownTimeZone(zone) ? zone : DEFAULT_SHOP_TIME_ZONE;
}
