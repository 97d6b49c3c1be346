import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { STRIPE_API_VERSION, createStripeClient, stripeSettingsFrom } from './config';

const local = {
	STRIPE_SECRET_KEY: 'sk_test_local_fake_hatchlot',
	STRIPE_WEBHOOK_SECRET: 'whsec_local_fake_hatchlot',
	STRIPE_API_HOST: '127.0.0.1',
	STRIPE_API_PORT: '2595',
	STRIPE_API_PROTOCOL: 'http'
};

describe('stripeSettingsFrom', () => {
	it('reads the local stand-in settings', () => {
		expect(stripeSettingsFrom(local)).toEqual({
			secretKey: 'sk_test_local_fake_hatchlot',
			webhookSecret: 'whsec_local_fake_hatchlot',
			host: '127.0.0.1',
			port: 2595,
			protocol: 'http'
		});
	});

	it('leaves host, port and protocol out when empty, for api.stripe.com', () => {
		expect(
			stripeSettingsFrom({
				...local,
				STRIPE_SECRET_KEY: 'sk_live_abc',
				STRIPE_API_HOST: '',
				STRIPE_API_PORT: ' ',
				STRIPE_API_PROTOCOL: undefined
			})
		).toEqual({ secretKey: 'sk_live_abc', webhookSecret: 'whsec_local_fake_hatchlot' });
	});

	it('refuses missing or malformed values', () => {
		expect(() => stripeSettingsFrom({ ...local, STRIPE_SECRET_KEY: '' })).toThrow(
			/STRIPE_SECRET_KEY/
		);
		expect(() => stripeSettingsFrom({ ...local, STRIPE_SECRET_KEY: 'pk_test_x' })).toThrow(
			/STRIPE_SECRET_KEY/
		);
		expect(() => stripeSettingsFrom({ ...local, STRIPE_WEBHOOK_SECRET: 'secret' })).toThrow(
			/STRIPE_WEBHOOK_SECRET/
		);
		expect(() => stripeSettingsFrom({ ...local, STRIPE_API_PORT: '70000' })).toThrow(/PORT/);
		expect(() => stripeSettingsFrom({ ...local, STRIPE_API_PROTOCOL: 'ftp' })).toThrow(/PROTOCOL/);
	});

	it('never sends the key in clear text off the machine, nor a live key to a stand-in', () => {
		expect(() => stripeSettingsFrom({ ...local, STRIPE_API_HOST: 'stripe.example.com' })).toThrow(
			/only for a stand-in/
		);
		expect(() => stripeSettingsFrom({ ...local, STRIPE_SECRET_KEY: 'sk_live_abc' })).toThrow(
			/live/
		);
	});
});

describe('createStripeClient', () => {
	it('pins the API version the stripe package defaults to', () => {
		// The package's own constant is the reference.
		expect(STRIPE_API_VERSION).toBe(Stripe.API_VERSION);
		const client = createStripeClient(stripeSettingsFrom(local));
		expect(client.getApiField('version')).toBe(Stripe.API_VERSION);
		expect(client.getApiField('host')).toBe('127.0.0.1');
		expect(client.getApiField('port')).toBe(2595);
		expect(client.getApiField('protocol')).toBe('http');
	});
});
