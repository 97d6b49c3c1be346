// The app's Stripe client, configured from its environment (STRIPE_SECRET_KEY,
// STRIPE_WEBHOOK_SECRET, STRIPE_API_HOST/PORT/PROTOCOL; see .env.example). Only code
// that runs inside SvelteKit imports this file; tests build theirs with ./config.ts.
import { env } from '$env/dynamic/private';
import type Stripe from 'stripe';
import { createStripeClient, stripeSettingsFrom, type StripeSettings } from './config';

export { STRIPE_API_VERSION } from './config';

let cached: { settings: StripeSettings; client: Stripe } | undefined;

function configured() {
	if (!cached) {
		// Read on first use, so a missing key fails the payment step with a clear message
		// rather than the whole app at start-up.
		const settings = stripeSettingsFrom({
			STRIPE_SECRET_KEY: env.STRIPE_SECRET_KEY,
			STRIPE_WEBHOOK_SECRET: env.STRIPE_WEBHOOK_SECRET,
			STRIPE_API_HOST: env.STRIPE_API_HOST,
			STRIPE_API_PORT: env.STRIPE_API_PORT,
			STRIPE_API_PROTOCOL: env.STRIPE_API_PROTOCOL
		});
		cached = { settings, client: createStripeClient(settings) };
	}
	return cached;
}

/** The one Stripe client of this process. */
export function stripeClient(): Stripe {
	return configured().client;
}

/** The signing secret webhook requests are verified with. */
export function stripeWebhookSecret(): string {
	return configured().settings.webhookSecret;
}
