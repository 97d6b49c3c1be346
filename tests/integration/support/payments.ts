// The payments setting a test file needs: the local Stripe stand-in started in-process,
// the real `stripe` package pointed at it, and a small HTTP receiver that hands each
// delivered event to the app's webhook handler exactly as the route does (raw body and
// signature header), so the stand-in's retries and signatures are the real ones.
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { handleStripeWebhook, type WebhookDeps } from '../../../src/lib/server/payments/webhook';
import type { Db } from '../../../src/lib/server/db/connect';
import { startStripeFake, type StripeFake } from '../../fakes/stripe/server';
import type { CheckoutForm } from '../../../src/lib/checkout/schema';

/** A checkout form for a buyer in Minneapolis (ZIP 55401), overnight, terms ticked. */
export function checkoutAddress(email: string): CheckoutForm {
	return {
		email,
		ship_name: 'Ada Buyer',
		ship_line1: '100 Example Ave',
		ship_line2: '',
		ship_city: 'Minneapolis',
		ship_state: 'MN',
		ship_zip: '55401',
		service: 'overnight',
		terms: true
	};
}

export interface PaymentsHarness {
	fake: StripeFake;
	stripe: Stripe;
	deps: WebhookDeps;
	stop(): Promise<void>;
}

export async function startPaymentsHarness(
	db: Db,
	options: {
		apiKey: string;
		secret: string;
		origin: string;
		/** Statuses to answer the next deliveries with instead of the handler's (a failing app). */
		forcedAnswers?: number[];
	}
): Promise<PaymentsHarness> {
	// The handler's dependencies exist once the client does; deliveries only start after that.
	const ready: { deps?: WebhookDeps } = {};
	const receiver = createServer((request, response) => {
		const chunks: Buffer[] = [];
		request.on('data', (chunk: Buffer) => chunks.push(chunk));
		request.on('end', () => {
			const forced = options.forcedAnswers?.shift();
			if (forced) return void response.writeHead(forced).end();
			const header = request.headers['stripe-signature'];
			void handleStripeWebhook(
				ready.deps!,
				Buffer.concat(chunks).toString('utf8'),
				typeof header === 'string' ? header : null
			).then((answer) => response.writeHead(answer.status).end(JSON.stringify(answer.body)));
		});
	});
	await new Promise<void>((resolve) => receiver.listen(0, '127.0.0.1', () => resolve()));
	const port = (receiver.address() as AddressInfo).port;
	const fake = await startStripeFake({
		port: 0,
		apiKey: options.apiKey,
		webhookSecret: options.secret,
		webhookUrl: `http://127.0.0.1:${port}/api/stripe/webhook`,
		retryDelaysMs: [50, 100, 200],
		log: () => {}
	});
	const api = new URL(fake.url);
	const stripe = new Stripe(options.apiKey, {
		host: api.hostname,
		port: Number(api.port),
		protocol: 'http',
		maxNetworkRetries: 0
	});
	const deps: WebhookDeps = {
		db,
		stripe,
		secret: options.secret,
		origin: options.origin,
		log: () => {}
	};
	ready.deps = deps;
	return {
		fake,
		stripe,
		deps,
		stop: async () => {
			await fake.stop();
			await new Promise<void>((resolve) => receiver.close(() => resolve()));
		}
	};
}
