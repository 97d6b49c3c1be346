// A claim settled with money, on a real PostgreSQL with the local Stripe stand-in in
// this process (as checkout.test.ts and refunds.test.ts run it): the refund is the dead
// animals' share of their line, shipping stays with the carrier, and the claim keeps
// the refund's id. USD has two minor units (ISO 4217), so $30.00 is 3000.
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Actor } from '../../src/lib/server/audit';
import { changeLine, ensureCartId } from '../../src/lib/server/cart/cart';
import { fileClaim } from '../../src/lib/server/claims/claims';
import { refundClaim, suggestedClaimRefundCents } from '../../src/lib/server/claims/refund';
import type { Db } from '../../src/lib/server/db/connect';
import { startCheckout } from '../../src/lib/server/payments/checkout';
import { seedDemo } from '../../seed/demo';
import type { StripeFake } from '../fakes/stripe/server';
import { checkoutAddress, startPaymentsHarness, type PaymentsHarness } from './support/payments';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const API_KEY = 'sk_test_local_fake_claims';
const SECRET = 'whsec_local_fake_claims';
const ORIGIN = 'http://127.0.0.1:5997';

const address = checkoutAddress('claim.buyer@example.com');

describe('refunding a claim', () => {
	let scratch: ScratchDatabase;
	let db: Db;
	let fake: StripeFake;
	let stripe: Stripe;
	let payments: PaymentsHarness;
	let storageDir: string;
	let admin: Actor;
	let buyer: Actor;

	beforeAll(async () => {
		storageDir = await mkdtemp(path.join(os.tmpdir(), 'hatchlot-claim-refunds-'));
		process.env.PHOTO_STORAGE_DIR = storageDir;
		scratch = await scratchDatabase();
		db = scratch.db;
		await seedDemo(db, { today: '2026-12-01' });
		const userOf = async (email: string): Promise<Actor> => ({
			userId: (
				await db
					.selectFrom('User')
					.select('id')
					.where('email', '=', email)
					.executeTakeFirstOrThrow()
			).id,
			ip: '127.0.0.1'
		});
		admin = await userOf('wren@mossback.example.com');
		buyer = await userOf('dagny.halvorsen@example.com');
		payments = await startPaymentsHarness(db, { apiKey: API_KEY, secret: SECRET, origin: ORIGIN });
		({ fake, stripe } = payments);
	});
	afterAll(async () => {
		delete process.env.PHOTO_STORAGE_DIR;
		await payments?.stop();
		await scratch?.drop();
		if (storageDir) await rm(storageDir, { recursive: true, force: true });
	});

	it('refunds the dead animals’ share of their line, not the shipping, and records the refund on the claim', async () => {
		// Three animals at $10.00 each, paid by card through the stand-in.
		const species = await db
			.selectFrom('species')
			.select('id')
			.where('slug', '=', 'cubaris-murina')
			.executeTakeFirstOrThrow();
		const clutch = await db
			.insertInto('clutch')
			.values({
				code: 'CLM-T1',
				species_id: species.id,
				origin: 'bought_in',
				generation: 1,
				found_on: '2026-06-01',
				stage: 'juvenile',
				size_class: 'small',
				count_found: 6,
				count_alive: 6,
				state: 'listed',
				sale_ready_on: '2026-11-01'
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const listing = await db
			.insertInto('listing')
			.values({
				slug: 'claim-refund-test-listing',
				kind: 'animal',
				species_id: species.id,
				clutch_id: clutch.id,
				title: 'Claim isopods',
				unit_size: 1,
				state: 'live',
				published_at: new Date()
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await db
			.insertInto('price_tier')
			.values({ listing_id: listing.id, min_quantity: 1, price_cents: 1000 })
			.execute();
		const cartId = await ensureCartId(db, { userId: null, guestCartId: null });
		const owner = { userId: null, guestCartId: cartId };
		expect(
			(await changeLine(db, owner, { listingId: listing.id, quantity: 3, mode: 'set' })).ok
		).toBe(true);
		const started = await startCheckout(db, stripe, owner, address, {
			origin: ORIGIN,
			clientIp: null
		});
		if (!started.ok) throw new Error('checkout refused');
		expect(fake.pay(started.sessionId, '4242 4242 4242 4242').paid).toBe(true);
		await fake.idle();
		// The box arrived half an hour ago at the buyer's account (set here rather than walked
		// through packing and shipping, which order-transitions.test.ts covers).
		await db
			.updateTable('customer_order')
			.set({
				user_id: buyer.userId,
				state: 'delivered',
				delivered_at: new Date(Date.now() - 30 * 60_000)
			})
			.where('id', '=', started.orderId)
			.execute();
		const order = await db
			.selectFrom('customer_order')
			.selectAll()
			.where('id', '=', started.orderId)
			.executeTakeFirstOrThrow();
		expect(order.paid_cents).toBe(3000 + order.shipping_cents);
		const line = await db
			.selectFrom('order_line')
			.select('id')
			.where('order_id', '=', order.id)
			.executeTakeFirstOrThrow();

		const photo = await sharp({
			create: { width: 400, height: 300, channels: 3, background: '#6b4f2a' }
		})
			.png()
			.toBuffer();
		const filed = await fileClaim(db, buyer, {
			orderNumber: order.order_number,
			lines: [{ orderLineId: line.id, deadCount: 2 }],
			note: 'Two did not move when the cup was opened.',
			photos: [{ name: 'cup.png', bytes: photo }]
		});
		if (!filed.ok) throw new Error(filed.problem);

		// 2 of 3 animals of a $30.00 line: $20.00; the shipping is not part of it.
		expect(await suggestedClaimRefundCents(db, filed.claimId)).toBe(2000);
		const outcome = await refundClaim(
			db,
			admin,
			{ claimId: filed.claimId, note: 'Sorry about the two: the money for them is on its way.' },
			{ stripe }
		);
		if (!outcome.ok) throw new Error(outcome.problem);
		expect(outcome.amountCents).toBe(2000);
		await fake.idle();
		const claim = await db
			.selectFrom('claim')
			.selectAll()
			.where('id', '=', filed.claimId)
			.executeTakeFirstOrThrow();
		expect(claim).toMatchObject({
			state: 'refunded',
			refund_id: outcome.refundId,
			decided_by: admin.userId
		});
		const refund = await db
			.selectFrom('refund')
			.select(['amount_cents', 'order_id'])
			.where('id', '=', outcome.refundId)
			.executeTakeFirstOrThrow();
		expect(refund).toEqual({ amount_cents: 2000, order_id: order.id });
		// The buyer gets one refund mail that says their claim is decided.
		const told = await db
			.selectFrom('outgoing_mail')
			.select(['to_address', 'text_body'])
			.where('kind', '=', 'refund_issued')
			.where('text_body', 'like', `%${order.order_number}%`)
			.execute();
		expect(told).toHaveLength(1);
		expect(told[0]!.text_body).toContain(
			`We have looked at your claim on order ${order.order_number}`
		);
		// 2000 cents is $20.00: USD has two minor units (ISO 4217).
		expect(told[0]!.text_body).toContain('We have sent $20.00 back');
		// A decided claim is not refunded twice.
		const again = await refundClaim(db, admin, { claimId: filed.claimId, note: '' }, { stripe });
		expect(again).toMatchObject({ ok: false, status: 409 });
	});
});
