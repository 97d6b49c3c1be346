// The outside reference is Stripe's own npm package: its webhooks.constructEvent verifies
// Stripe's published scheme, and generateTestHeaderString signs by it.
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { stripeSignatureHeader } from './signature';

const secret = 'whsec_unit_test_secret';
const stripe = new Stripe('sk_test_unit');
const payload = JSON.stringify({
	id: 'evt_1',
	object: 'event',
	type: 'checkout.session.completed'
});

describe('stripeSignatureHeader', () => {
	it('matches the header the stripe package builds for the same timestamp', () => {
		const timestamp = 1_796_000_000;
		expect(stripeSignatureHeader(payload, secret, timestamp)).toBe(
			stripe.webhooks.generateTestHeaderString({ payload, secret, timestamp })
		);
	});

	it('passes constructEvent now and fails it for another secret, body or an old time', () => {
		const now = Math.floor(Date.now() / 1000);
		const header = stripeSignatureHeader(payload, secret, now);
		expect(stripe.webhooks.constructEvent(payload, header, secret).id).toBe('evt_1');
		expect(() => stripe.webhooks.constructEvent(payload, header, 'whsec_other')).toThrow();
		expect(() =>
			stripe.webhooks.constructEvent(payload.replace('evt_1', 'evt_2'), header, secret)
		).toThrow();
		// constructEvent's default tolerance is 300 s.
		const old = stripeSignatureHeader(payload, secret, now - 301);
		expect(() => stripe.webhooks.constructEvent(payload, old, secret)).toThrow(/tolerance/i);
	});

	it('refuses a timestamp that is not whole seconds', () => {
		expect(() => stripeSignatureHeader(payload, secret, 1.5)).toThrow(RangeError);
	});
});
