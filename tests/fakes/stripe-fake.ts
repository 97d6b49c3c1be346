// The local Stripe stand-in for `npm start` and the browser tests (see
// tests/fakes/stripe/server.ts for what it serves and its test controls).
//
//   node_modules/.bin/tsx tests/fakes/stripe-fake.ts
//
// env: STRIPE_FAKE_PORT (2595), STRIPE_WEBHOOK_URL (where events go), STRIPE_WEBHOOK_SECRET
// (signs them), STRIPE_SECRET_KEY (the one key it accepts); it listens on 127.0.0.1 only.
// STRIPE_FAKE_DEMO_DATABASE_URL: a shop database whose settled card payments (the seeded
// demo orders') the stand-in should know, so the admin can refund them as in real life.
import { sql } from 'kysely';
import { createDb } from '../../src/lib/server/db/connect';
import {
	DEFAULT_API_KEY,
	DEFAULT_WEBHOOK_SECRET,
	startStripeFake,
	type StripeFake
} from './stripe/server';
import { runFake, stopOnSignal } from './stop-on-signal';

/** Teaches the stand-in the shop's succeeded card payments, less their succeeded refunds. */
async function adoptShopPayments(fake: StripeFake, databaseUrl: string): Promise<number> {
	const db = createDb(databaseUrl, 1);
	try {
		const rows = await db
			.selectFrom('payment')
			.select([
				'payment.stripe_payment_intent_id',
				'payment.amount_cents',
				'payment.currency',
				sql<string>`coalesce((select sum(r.amount_cents) from refund r where r.payment_id = payment.id and r.status = 'succeeded'), 0)`.as(
					'refunded'
				)
			])
			.where('payment.status', '=', 'succeeded')
			.where('payment.stripe_payment_intent_id', 'is not', null)
			.execute();
		for (const row of rows)
			fake.adoptPayment({
				id: row.stripe_payment_intent_id as string,
				amount: row.amount_cents,
				currency: row.currency.toLowerCase(),
				amountRefunded: Math.min(Number(row.refunded), row.amount_cents)
			});
		return rows.length;
	} finally {
		await db.destroy();
	}
}

function portFrom(value: string | undefined, fallback: number): number {
	if (value === undefined || value.trim() === '') return fallback;
	const port = Number(value);
	if (!Number.isInteger(port) || port < 0 || port > 65535) {
		throw new RangeError(`STRIPE_FAKE_PORT must be a port number, got ${value}`);
	}
	return port;
}

const setting = (value: string | undefined) =>
	value === undefined || value.trim() === '' ? undefined : value.trim();

async function main(): Promise<void> {
	const apiKey = setting(process.env.STRIPE_SECRET_KEY) ?? DEFAULT_API_KEY;
	// The stand-in must never be handed a live key: it would only ever refuse it, and a
	// live key belongs with the real service.
	if (!apiKey.startsWith('sk_test_')) {
		throw new Error('STRIPE_SECRET_KEY for the local stand-in must be a test key (sk_test_…)');
	}
	const webhookUrl = setting(process.env.STRIPE_WEBHOOK_URL);
	const fake = await startStripeFake({
		port: portFrom(process.env.STRIPE_FAKE_PORT, 2595),
		apiKey,
		webhookSecret: setting(process.env.STRIPE_WEBHOOK_SECRET) ?? DEFAULT_WEBHOOK_SECRET,
		webhookUrl,
		log: (line) => console.log(line)
	});
	console.log(
		`[stripe-fake] API and pay pages on ${fake.url}; events to ${webhookUrl ?? '(no webhook URL set)'}`
	);
	const shopDatabase = setting(process.env.STRIPE_FAKE_DEMO_DATABASE_URL);
	if (shopDatabase) {
		const known = await adoptShopPayments(fake, shopDatabase);
		console.log(`[stripe-fake] knows ${known} card payment(s) already in the shop's database`);
	}
	stopOnSignal('stripe-fake', fake);
}

runFake('stripe-fake', main);
