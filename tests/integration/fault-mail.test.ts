// The SMTP relay gone while the built app takes sign-ups, sign-in links and paid orders:
// every request succeeds (mail is queued in the same transaction, never sent inline), the
// mail jobs keep retrying with the relay's refusal written down, and once the relay is back
// on its port each message is delivered exactly once.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import type { CaughtSummary } from '../../src/lib/server/mail/catcher';
import { startMailCatcher, type MailCatcher } from '../fakes/mail-catcher';
import { startStripeFake, TEST_CARDS, type StripeFake } from '../fakes/stripe/server';
import { freePort, startApp, type RunningApp } from './support/app';
import { scratchDatabase, type ScratchDatabase } from './support/databases';
import { knoxvilleBuyer, ShopClient, waitFor } from './support/shop-client';
import { insertListedClutch, speciesIdBySlug } from './support/stock';

const API_KEY = 'sk_test_local_fake_fault_mail';
const WEBHOOK_SECRET = 'whsec_local_fake_fault_mail';
const form = { accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded' };

describe('the SMTP relay down while shop mail is queued', () => {
	let scratch: ScratchDatabase;
	let app: RunningApp;
	let stripe: StripeFake;
	let catcher: MailCatcher | undefined;
	let smtpPort: number;
	let listingId: number;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		const speciesId = await speciesIdBySlug(scratch.db, 'cubaris-murina');
		({ listingId } = await insertListedClutch(scratch.db, {
			speciesId,
			code: 'ML-01',
			slug: 'mail-test-isopods',
			title: 'Mail-test isopods',
			alive: 10,
			tiers: [{ minQuantity: 1, priceCents: 1800 }]
		}));
		// The relay's port, with nothing listening on it yet: every connection is refused.
		smtpPort = await freePort();
		stripe = await startStripeFake({
			port: 0,
			apiKey: API_KEY,
			webhookSecret: WEBHOOK_SECRET,
			retryDelaysMs: [200, 500, 1_000],
			log: () => {}
		});
		const stripeApi = new URL(stripe.url);
		app = await startApp({
			DATABASE_URL: scratch.url,
			SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
			STRIPE_SECRET_KEY: API_KEY,
			STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET,
			STRIPE_API_HOST: stripeApi.hostname,
			STRIPE_API_PORT: stripeApi.port,
			STRIPE_API_PROTOCOL: 'http',
			WEATHER_API_URL: 'http://127.0.0.1:9',
			WEATHER_TIMEOUT_MS: '1000'
		});
		stripe.setWebhook({ url: `${app.origin}/api/stripe/webhook` });
	}, 60_000);

	afterAll(async () => {
		await stripe?.stop();
		await app?.stop();
		await catcher?.close();
		await scratch?.drop();
	});

	it('takes every request, retries the mail, and delivers each message once the relay is back', async () => {
		const visitor = new ShopClient(app.origin);
		// A sign-up: its confirmation mail is queued with the account.
		const signUp = await visitor.request('/signup', {
			method: 'POST',
			headers: form,
			body: new URLSearchParams({
				name: 'Relay Test',
				email: 'relay-signup@example.com',
				password: 'moss-cricket-lantern-77'
			}).toString()
		});
		expect(signUp.status, signUp.body.slice(0, 300)).toBe(303);
		expect(signUp.location).toBe('/signin/check-email?for=signup');

		// A sign-in link for a demo customer.
		const customer = DEMO_ACCOUNTS.find((account) => account.role === 'customer')!;
		const link = await visitor.request('/signin?/link', {
			method: 'POST',
			headers: form,
			body: new URLSearchParams({ email: customer.email, next: '/' }).toString()
		});
		expect(link.status, link.body.slice(0, 300)).toBe(303);

		// A paid order: the webhook queues its receipt and answers Stripe 200.
		const buyer = new ShopClient(app.origin);
		expect((await buyer.addToCart(listingId, 1)).status).toBe(200);
		const checkout = await buyer.checkout(knoxvilleBuyer('relay-buyer@example.com'));
		expect(checkout.status, checkout.body.slice(0, 300)).toBe(303);
		expect(stripe.pay(checkout.sessionId!, TEST_CARDS.paid).paid).toBe(true);
		await stripe.idle();
		const delivery = stripe.events().find((e) => e.type === 'checkout.session.completed');
		expect(delivery?.deliveries.map((d) => d.status)).toEqual([200]);

		const expected = [
			{ kind: 'verify_email', to: 'relay-signup@example.com' },
			{ kind: 'sign_in_link', to: customer.email },
			{ kind: 'order_receipt', to: 'relay-buyer@example.com' }
		];
		const rows = () =>
			scratch.db
				.selectFrom('outgoing_mail')
				.select(['id', 'kind', 'to_address', 'subject', 'status', 'attempts', 'last_error'])
				.where(
					'to_address',
					'in',
					expected.map((mail) => mail.to)
				)
				.orderBy('id')
				.execute();
		expect((await rows()).map((row) => ({ kind: row.kind, to: row.to_address }))).toEqual(expected);

		// The worker tries, is refused, and is given another go: nothing is marked failed.
		const refused = await waitFor(
			rows,
			(mail) => mail.every((row) => row.attempts >= 2),
			30_000,
			'two refused attempts at each mail'
		);
		for (const row of refused) {
			expect(row.status, row.kind).toBe('queued');
			expect(row.last_error, row.kind).toMatch(/ECONNREFUSED/);
		}

		// The relay comes back on its port.
		catcher = await startMailCatcher({ smtpPort, httpPort: 0 });
		const sent = await waitFor(
			rows,
			(mail) => mail.every((row) => row.status === 'sent'),
			45_000,
			'every mail to be sent'
		);
		for (const row of sent) {
			expect(row.last_error, row.kind).toBeNull();
			expect(row.attempts, row.kind).toBeGreaterThanOrEqual(3);
		}
		const caught = (await (
			await fetch(`http://127.0.0.1:${catcher.httpPort}/messages`)
		).json()) as CaughtSummary[];
		for (const row of sent) {
			const copies = caught.filter(
				(message) => message.to.includes(row.to_address) && message.subject === row.subject
			);
			expect(copies, row.kind).toHaveLength(1);
		}
		expect(caught).toHaveLength(expected.length);
	}, 90_000);
});
