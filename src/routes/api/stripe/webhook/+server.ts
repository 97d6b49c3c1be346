// Stripe's events about Checkout Sessions. Public (Stripe signs, it does not sign in):
// the signature over the raw body is the only credential, checked in the handler.
import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { origin } from '$lib/server/auth';
import { stripeClient, stripeWebhookSecret } from '$lib/server/payments/stripe';
import { handleStripeWebhook } from '$lib/server/payments/webhook';
import { checkOrder } from '$lib/server/shipping/order-checks';
import { forecastSource } from '$lib/server/weather';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ request }) => {
	const db = getDb();
	// The exact bytes Stripe signed: parsing first would change them.
	const raw = await request.text();
	const answer = await handleStripeWebhook(
		{
			db,
			stripe: stripeClient(),
			secret: stripeWebhookSecret(),
			origin: origin(),
			afterPaid: async (orderId) => {
				await checkOrder(db, forecastSource(db), orderId, { kind: 'system' });
			}
		},
		raw,
		request.headers.get('stripe-signature')
	);
	return json(answer.body, { status: answer.status, headers: { 'cache-control': 'no-store' } });
};
