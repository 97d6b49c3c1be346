// Payment settings from the environment, and the Stripe client built from them. Without
// STRIPE_API_HOST/PORT/PROTOCOL the client talks to api.stripe.com; with them, to the
// local stand-in (tests/fakes/stripe), with no other change in the code.
import Stripe from 'stripe';

/** The API version stripe@23.1.0 uses by default, pinned so an upgrade cannot change shapes unseen. */
export const STRIPE_API_VERSION = '2026-10-28.endive';

export interface StripeSettings {
	secretKey: string;
	webhookSecret: string;
	host?: string;
	port?: number;
	protocol?: 'http' | 'https';
}

export type StripeEnv = Partial<
	Record<
		| 'STRIPE_SECRET_KEY'
		| 'STRIPE_WEBHOOK_SECRET'
		| 'STRIPE_API_HOST'
		| 'STRIPE_API_PORT'
		| 'STRIPE_API_PROTOCOL',
		string
	>
>;

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '::1', '[::1]']);
const value = (text: string | undefined) => (text?.trim() ? text.trim() : undefined);

export function stripeSettingsFrom(env: StripeEnv): StripeSettings {
	const secretKey = value(env.STRIPE_SECRET_KEY);
	if (!secretKey || !/^(sk|rk)_(test|live)_/.test(secretKey)) {
		throw new Error('STRIPE_SECRET_KEY must be a Stripe secret key (sk_test_… or sk_live_…)');
	}
	const webhookSecret = value(env.STRIPE_WEBHOOK_SECRET);
	if (!webhookSecret || !webhookSecret.startsWith('whsec_')) {
		throw new Error(
			"STRIPE_WEBHOOK_SECRET must be the webhook endpoint's signing secret (whsec_…)"
		);
	}
	const settings: StripeSettings = { secretKey, webhookSecret };
	const host = value(env.STRIPE_API_HOST);
	const portText = value(env.STRIPE_API_PORT);
	const protocol = value(env.STRIPE_API_PROTOCOL);
	if (host) settings.host = host;
	if (portText) {
		const port = Number(portText);
		if (!Number.isInteger(port) || port < 1 || port > 65535) {
			throw new Error(`STRIPE_API_PORT must be a port number, got ${portText}`);
		}
		settings.port = port;
	}
	if (protocol) {
		if (protocol !== 'http' && protocol !== 'https') {
			throw new Error(`STRIPE_API_PROTOCOL must be http or https, got ${protocol}`);
		}
		settings.protocol = protocol;
	}
	// The secret key travels in every request: never in clear text off this machine.
	if (settings.protocol === 'http' && !LOOPBACK.has(settings.host ?? 'api.stripe.com')) {
		throw new Error('STRIPE_API_PROTOCOL=http is only for a stand-in on this machine (127.0.0.1)');
	}
	// A live key belongs with Stripe itself, never with a stand-in.
	if (/_live_/.test(secretKey) && settings.host && settings.host !== 'api.stripe.com') {
		throw new Error(
			'A live STRIPE_SECRET_KEY must not be sent to STRIPE_API_HOST other than api.stripe.com'
		);
	}
	return settings;
}

export function createStripeClient(settings: StripeSettings): Stripe {
	return new Stripe(settings.secretKey, {
		apiVersion: STRIPE_API_VERSION,
		...(settings.host ? { host: settings.host } : {}),
		...(settings.port ? { port: settings.port } : {}),
		...(settings.protocol ? { protocol: settings.protocol } : {}),
		appInfo: { name: 'Hatchlot' }
	});
}
