// The shipping report's SQL on a hand-made ledger whose figures are worked out below.
//
// Time-zone facts: US daylight time ended on Sun 1 Nov 2026 (first Sunday in November,
// 15 U.S.C. 260a as amended in 2005), so the shop's zone, America/New_York, is EST
// (UTC−5) for all of the range. The range is Mon 2 Nov to Sun 22 Nov 2026: three ISO
// weeks starting Mon 2, 9 and 16 Nov. Its first instant is 2026-11-02T05:00Z, its end
// (exclusive) 2026-11-23T05:00Z. "Today" is Wed 25 Nov 2026.
//
// The ledger (o/n = overnight, 2d = two-day; live animals = (quantity − restocked) × unit):
//   A HL-20001 o/n MN  lines 5 × 1 and 1 × 10 live, plus a supply: 15 animals.
//     Shipped 2026-11-02T15:00Z (Mon 2 Nov 10:00), heat pack.
//     Claim filed 2026-11-03T14:00Z (week 2 Nov), refunded: dead 2 + 3 = 5, refund 1500 ¢
//     succeeded.
//   B HL-20002 o/n AZ  2 × 10 live: 20 animals. Shipped 2026-11-09T03:00Z = Sun 8 Nov
//     22:00 (week 2 Nov in the shop's zone, though Monday 9 Nov in UTC), cold pack.
//     Claim filed 2026-11-10T15:00Z (week 9 Nov), declined: dead 4 (not counted as DOA).
//   C HL-20003 2d OR   6 × 1 live, 1 restocked: 5 animals. Shipped
//     2026-11-10T14:00Z (week 9 Nov), heat pack. Claim filed 2026-11-23T04:30Z = Sun 22
//     Nov 23:30 (in, week 16 Nov), reshipped (to R), dead 1; its refund failed (900 ¢,
//     not counted).
//     Held: paid→weather_hold 2026-11-03T13:00Z (Tue 3 Nov), a note while held on 4 Nov
//     (does not end it), weather_hold→scheduled 2026-11-06T20:00Z (Fri 6 Nov): 3 days,
//     week 2 Nov.
//   D HL-20004 2d TX  4 × 1 live. Shipped 2026-11-23T04:30Z = Sun 22 Nov 23:30 (in, week
//     16 Nov), no packs. Claim filed 2026-11-23T05:30Z = Mon 23 Nov 00:30 (out of the
//     claim figures), open, dead 1: it still counts as DOA for the box shipped in range.
//   E HL-20005 o/n OR  3 live. Shipped 2026-11-23T05:30Z = Mon 23 Nov 00:30: out.
//   F HL-20006 o/n HI  a supply only. Shipped 2026-11-17T15:00Z (week 16 Nov): 0 animals.
//   G HL-20007 o/n MN  2 live. Shipped 2026-11-02T04:30Z = Sun 1 Nov 23:30: out.
//   H HL-20008 o/n MN  not shipped. Held 2026-11-16T04:30Z = Sun 15 Nov 23:30 (week 9
//     Nov; UTC would say week 16), lifted 2026-11-17T04:30Z = Mon 16 Nov 23:30: 1 day.
//     Held again 2026-11-20T15:00Z (Fri 20 Nov, week 16 Nov), still held: to today 25
//     Nov, 5 days.
//   A also had a hold from 2026-11-01T12:00Z (Sun 1 Nov): began before the range, out.
//   I HL-20009 2d MN  held 2026-11-23T05:30Z = Mon 23 Nov 00:30: out.
//   R HL-20010 o/n OR  C's reship, paid, not shipped: in no figure.
//
// Weekly (all services):
//   2 Nov: boxes A, B = 2; heat A = 1; cold B = 1; held C 3; claims A = 1
//   9 Nov: boxes C = 1;   heat C = 1; cold 0;     held H 1; claims B = 1
//  16 Nov: boxes D, F = 2; heat 0;   cold 0;     held H 5; claims C = 1
//   total: 5, 2, 1, 9, 3
// Weekly, overnight only (A, B, F, H):
//   2 Nov: 2, 1, 1, 0, 1   9 Nov: 0, 0, 0, 1, 1   16 Nov: 1, 0, 0, 5, 0   total 3, 1, 1, 6, 2
// Claims filed in range (A, B, C) by outcome: open 0; refunded 1 claim, 5 dead, 1500 ¢;
//   reshipped 1, 1, 0; declined 1, 4, 0; all 3, 10, 1500.
//   Overnight only (A, B): refunded 1, 5, 1500; declined 1, 4, 0; all 2, 9, 1500.
// DOA by service, boxes shipped in range A B C D F; dead on claims not declined (A 5,
//   C 1, D 1; B's 4 declined):
//   Overnight A B F: 3 boxes, 15 + 20 + 0 = 35 animals, 5 dead, 5/35 = 0.142857 → 0.1429
//   Two-day C D:     2 boxes, 5 + 4 = 9 animals,        2 dead, 2/9 = 0.2222
//   All:             5 boxes, 44 animals, 7 dead, 7/44 = 0.159090… → 0.1591
// DOA by NCEI climate region (in the module's order): Upper Midwest A 1, 15, 5, 0.3333;
//   South D 1, 4, 1, 0.25; Southwest B 1, 20, 0, 0; Northwest C 1, 5, 1, 0.2; outside the
//   contiguous US F 1, 0, 0, none; all 5, 44, 7, 0.1591.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ReportSection } from '../../src/lib/reports/report';
import type { ClaimState, OrderState, Pack, Service } from '../../src/lib/server/db/schema';
import type { ReportContext } from '../../src/lib/server/reports/context';
import { shippingReport } from '../../src/lib/server/reports/shipping';
import { scratchDatabase, type ScratchDatabase } from './support/databases';
import { insertListedClutch } from './support/stock';

const ZONE = 'America/New_York';
/** A ZIP code of each ship-to state used (Minneapolis, Tucson, Astoria, Austin, Honolulu). */
const ZIPS: Record<string, string> = {
	MN: '55401',
	AZ: '85719',
	OR: '97103',
	TX: '73301',
	HI: '96813'
};

describe('shipping report', () => {
	let scratch: ScratchDatabase;
	const listings = { single: 0, group: 0, supply: 0 };
	const clutches = { single: 0, group: 0 };
	let speciesId = 0;

	function context(
		from: string,
		to: string,
		params: Record<string, string> = {},
		money = true
	): ReportContext {
		return {
			db: scratch.db,
			from,
			to,
			timeZone: ZONE,
			today: '2026-11-25',
			money,
			params: new URLSearchParams(params)
		};
	}

	const section = (sections: ReportSection[], id: string) => {
		const found = sections.find((s) => s.id === id);
		if (!found) throw new Error(`no section ${id}`);
		return found;
	};

	type LineKind = keyof typeof listings;
	interface LineSpec {
		kind: LineKind;
		quantity: number;
		restocked?: number;
	}

	/** An order with its lines (each line 1000 ¢ a unit), paid in full; returns ids. */
	async function order(
		number: string,
		service: Service,
		shipState: string,
		state: OrderState,
		lines: LineSpec[]
	): Promise<{ id: number; lineIds: number[] }> {
		const subtotal = lines.reduce((sum, line) => sum + line.quantity * 1000, 0);
		const row = await scratch.db
			.insertInto('customer_order')
			.values({
				order_number: number,
				email: 'buyer@example.com',
				ship_name: 'A Buyer',
				ship_line1: '1 Test Lane',
				ship_city: 'Testville',
				ship_state: shipState,
				ship_zip: ZIPS[shipState]!,
				service,
				state,
				subtotal_cents: subtotal,
				shipping_cents: 4500,
				total_cents: subtotal + 4500,
				paid_cents: subtotal + 4500
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const lineIds: number[] = [];
		for (const line of lines) {
			const live = line.kind !== 'supply';
			const inserted = await scratch.db
				.insertInto('order_line')
				.values({
					order_id: row.id,
					listing_id: listings[line.kind],
					clutch_id: live ? clutches[line.kind as 'single' | 'group'] : null,
					species_id: live ? speciesId : null,
					description: `Test ${line.kind}`,
					stage: live ? 'juvenile' : null,
					unit_size: line.kind === 'group' ? 10 : 1,
					quantity: line.quantity,
					restocked_quantity: line.restocked ?? 0,
					line_total_cents: line.quantity * 1000,
					is_live: live
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			lineIds.push(inserted.id);
		}
		return { id: row.id, lineIds };
	}

	async function ship(orderId: number, shippedAt: string, packs: Pack[]) {
		await scratch.db
			.insertInto('shipment')
			.values({
				order_id: orderId,
				carrier: 'ups',
				tracking_number: `1Z${orderId}`,
				packs,
				packed_at: new Date(new Date(shippedAt).getTime() - 3_600_000),
				shipped_at: new Date(shippedAt)
			})
			.execute();
	}

	async function event(
		orderId: number,
		from: OrderState | null,
		to: OrderState,
		at: string,
		note = ''
	) {
		await scratch.db
			.insertInto('order_event')
			.values({
				order_id: orderId,
				from_state: from,
				to_state: to,
				actor_kind: 'system',
				note,
				created_at: new Date(at)
			})
			.execute();
	}

	async function paymentOf(orderId: number): Promise<number> {
		const row = await scratch.db
			.insertInto('payment')
			.values({
				order_id: orderId,
				stripe_checkout_session_id: `cs_test_${orderId}`,
				amount_cents: 10_000,
				status: 'succeeded'
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		return row.id;
	}

	async function refund(orderId: number, cents: number, status: 'succeeded' | 'failed') {
		const row = await scratch.db
			.insertInto('refund')
			.values({
				order_id: orderId,
				payment_id: await paymentOf(orderId),
				idempotency_key: `refund-${orderId}`,
				amount_cents: cents,
				reason: 'Dead on arrival',
				status
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		return row.id;
	}

	async function claim(
		orderId: number,
		filedAt: string,
		state: ClaimState,
		lines: { lineId: number; dead: number }[],
		extra: { refundId?: number; reshipOrderId?: number } = {}
	) {
		const row = await scratch.db
			.insertInto('claim')
			.values({
				order_id: orderId,
				state,
				filed_at: new Date(filedAt),
				decided_at: state === 'open' ? null : new Date('2026-11-24T15:00:00Z'),
				refund_id: extra.refundId ?? null,
				reship_order_id: extra.reshipOrderId ?? null
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await scratch.db
			.insertInto('claim_line')
			.values(lines.map((l) => ({ claim_id: row.id, order_line_id: l.lineId, dead_count: l.dead })))
			.execute();
	}

	beforeAll(async () => {
		scratch = await scratchDatabase();
		speciesId = (
			await scratch.db
				.insertInto('species')
				.values({
					slug: 'narceus-americanus',
					scientific_name: 'Narceus americanus',
					common_name: 'American giant millipede',
					animal_group: 'millipede',
					temp_low_f: 62,
					temp_ideal_low_f: 70,
					temp_ideal_high_f: 78,
					temp_high_f: 86,
					moisture_level: 'moist',
					adult_length_mm: 100,
					grow_out_weeks: 20
				})
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
		const single = await insertListedClutch(scratch.db, {
			speciesId,
			code: 'NAR-C1',
			slug: 'narceus-single',
			title: 'Narceus, one',
			alive: 200,
			tiers: [{ minQuantity: 1, priceCents: 1000 }]
		});
		const group = await insertListedClutch(scratch.db, {
			speciesId,
			code: 'NAR-C2',
			slug: 'narceus-ten',
			title: 'Narceus, group of 10',
			alive: 500,
			unitSize: 10,
			tiers: [{ minQuantity: 1, priceCents: 1000 }]
		});
		const supply = await scratch.db
			.insertInto('listing')
			.values({
				slug: 'leaf-litter',
				kind: 'supply',
				title: 'Oak leaf litter',
				is_live: false,
				state: 'live',
				supply_stock: 50
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		Object.assign(listings, {
			single: single.listingId,
			group: group.listingId,
			supply: supply.id
		});
		Object.assign(clutches, { single: single.clutchId, group: group.clutchId });

		const A = await order('HL-20001', 'overnight', 'MN', 'delivered', [
			{ kind: 'single', quantity: 5 },
			{ kind: 'group', quantity: 1 },
			{ kind: 'supply', quantity: 2 }
		]);
		await ship(A.id, '2026-11-02T15:00:00Z', ['heat']);
		await claim(
			A.id,
			'2026-11-03T14:00:00Z',
			'refunded',
			[
				{ lineId: A.lineIds[0]!, dead: 2 },
				{ lineId: A.lineIds[1]!, dead: 3 }
			],
			{ refundId: await refund(A.id, 1500, 'succeeded') }
		);
		await event(A.id, 'paid', 'weather_hold', '2026-11-01T12:00:00Z');
		await event(A.id, 'weather_hold', 'scheduled', '2026-11-02T12:00:00Z');

		const B = await order('HL-20002', 'overnight', 'AZ', 'delivered', [
			{ kind: 'group', quantity: 2 }
		]);
		await ship(B.id, '2026-11-09T03:00:00Z', ['cold']);
		await claim(B.id, '2026-11-10T15:00:00Z', 'declined', [{ lineId: B.lineIds[0]!, dead: 4 }]);

		const C = await order('HL-20003', 'two_day', 'OR', 'delivered', [
			{ kind: 'single', quantity: 6, restocked: 1 }
		]);
		await event(C.id, 'paid', 'weather_hold', '2026-11-03T13:00:00Z');
		await event(C.id, 'weather_hold', 'weather_hold', '2026-11-04T13:00:00Z', 'Still too cold.');
		await event(C.id, 'weather_hold', 'scheduled', '2026-11-06T20:00:00Z');
		await ship(C.id, '2026-11-10T14:00:00Z', ['heat']);
		const R = await order('HL-20010', 'overnight', 'OR', 'paid', [{ kind: 'single', quantity: 1 }]);
		await claim(C.id, '2026-11-23T04:30:00Z', 'reshipped', [{ lineId: C.lineIds[0]!, dead: 1 }], {
			refundId: await refund(C.id, 900, 'failed'),
			reshipOrderId: R.id
		});

		const D = await order('HL-20004', 'two_day', 'TX', 'delivered', [
			{ kind: 'single', quantity: 4 }
		]);
		await ship(D.id, '2026-11-23T04:30:00Z', []);
		await claim(D.id, '2026-11-23T05:30:00Z', 'open', [{ lineId: D.lineIds[0]!, dead: 1 }]);

		const E = await order('HL-20005', 'overnight', 'OR', 'shipped', [
			{ kind: 'single', quantity: 3 }
		]);
		await ship(E.id, '2026-11-23T05:30:00Z', ['heat']);

		const F = await order('HL-20006', 'overnight', 'HI', 'delivered', [
			{ kind: 'supply', quantity: 1 }
		]);
		await ship(F.id, '2026-11-17T15:00:00Z', []);

		const G = await order('HL-20007', 'overnight', 'MN', 'delivered', [
			{ kind: 'single', quantity: 2 }
		]);
		await ship(G.id, '2026-11-02T04:30:00Z', ['heat']);

		const H = await order('HL-20008', 'overnight', 'MN', 'weather_hold', [
			{ kind: 'single', quantity: 2 }
		]);
		await event(H.id, 'paid', 'weather_hold', '2026-11-16T04:30:00Z');
		await event(H.id, 'weather_hold', 'scheduled', '2026-11-17T04:30:00Z');
		await event(H.id, 'scheduled', 'weather_hold', '2026-11-20T15:00:00Z');

		const I = await order('HL-20009', 'two_day', 'MN', 'weather_hold', [
			{ kind: 'single', quantity: 1 }
		]);
		await event(I.id, 'paid', 'weather_hold', '2026-11-23T05:30:00Z');
	});

	afterAll(async () => {
		await scratch?.drop();
	});

	it('counts boxes, packs, held days and claims per shop-zone week, every week shown', async () => {
		const body = await shippingReport(context('2026-11-02', '2026-11-22'));
		const weekly = section(body.sections, 'weekly');
		expect(weekly.table.rows).toEqual([
			{ week: '2026-11-02', boxes: 2, heat: 1, cold: 1, held_days: 3, claims: 1 },
			{ week: '2026-11-09', boxes: 1, heat: 1, cold: 0, held_days: 1, claims: 1 },
			{ week: '2026-11-16', boxes: 2, heat: 0, cold: 0, held_days: 5, claims: 1 }
		]);
		expect(weekly.table.totals).toEqual({
			week: 'All weeks',
			boxes: 5,
			heat: 2,
			cold: 1,
			held_days: 9,
			claims: 3
		});
		expect(weekly.chart?.series.map((s) => s.key)).toEqual(['boxes', 'held_days']);
		for (const s of weekly.chart!.series) {
			expect(weekly.table.columns.map((c) => c.key)).toContain(s.key);
		}
	});

	it('shows quiet weeks as zero rows', async () => {
		// 26 Oct – 15 Nov. Week of 26 Oct: G shipped Sun 1 Nov 23:30 (heat); A's hold began
		// Sun 1 Nov 07:00 and was lifted Mon 2 Nov 07:00: 1 day. Week of 9 Nov: H's hold at
		// Sun 15 Nov 23:30 is on the last day, so in; H's second hold and C's claim are out.
		const body = await shippingReport(context('2026-10-26', '2026-11-15'));
		expect(section(body.sections, 'weekly').table.rows).toEqual([
			{ week: '2026-10-26', boxes: 1, heat: 1, cold: 0, held_days: 1, claims: 0 },
			{ week: '2026-11-02', boxes: 2, heat: 1, cold: 1, held_days: 3, claims: 1 },
			{ week: '2026-11-09', boxes: 1, heat: 1, cold: 0, held_days: 1, claims: 1 }
		]);
		const quiet = await shippingReport(context('2026-10-12', '2026-10-25'));
		expect(section(quiet.sections, 'weekly').table.rows).toEqual([]);
	});

	it('groups claims filed in the range by outcome, with the refunds that went through', async () => {
		const body = await shippingReport(context('2026-11-02', '2026-11-22'));
		const claims = section(body.sections, 'claims');
		expect(claims.table.rows).toEqual([
			{ outcome: 'Open', claims: 0, dead: 0, refunded_cents: 0 },
			{ outcome: 'Refunded', claims: 1, dead: 5, refunded_cents: 1500 },
			{ outcome: 'Reshipped', claims: 1, dead: 1, refunded_cents: 0 },
			{ outcome: 'Declined', claims: 1, dead: 4, refunded_cents: 0 }
		]);
		expect(claims.table.totals).toEqual({
			outcome: 'All claims',
			claims: 3,
			dead: 10,
			refunded_cents: 1500
		});
		expect(claims.table.columns.find((c) => c.key === 'refunded_cents')?.money).toBe(true);
	});

	it('gives DOA rates by service over the live animals packed', async () => {
		const body = await shippingReport(context('2026-11-02', '2026-11-22'));
		const doa = section(body.sections, 'doa-service');
		expect(doa.table.rows).toEqual([
			{ service: 'Overnight', boxes: 3, animals: 35, dead: 5, rate: 0.1429 },
			{ service: 'Two-day', boxes: 2, animals: 9, dead: 2, rate: 0.2222 }
		]);
		expect(doa.table.totals).toEqual({
			service: 'All services',
			boxes: 5,
			animals: 44,
			dead: 7,
			rate: 0.1591
		});
	});

	it('gives DOA rates by NCEI climate region of the ship-to state', async () => {
		const body = await shippingReport(context('2026-11-02', '2026-11-22'));
		const doa = section(body.sections, 'doa-climate');
		expect(doa.table.rows).toEqual([
			{ region: 'Upper Midwest', boxes: 1, animals: 15, dead: 5, rate: 0.3333 },
			{ region: 'South', boxes: 1, animals: 4, dead: 1, rate: 0.25 },
			{ region: 'Southwest', boxes: 1, animals: 20, dead: 0, rate: 0 },
			{ region: 'Northwest', boxes: 1, animals: 5, dead: 1, rate: 0.2 },
			{ region: 'Outside the contiguous US', boxes: 1, animals: 0, dead: 0, rate: null }
		]);
		expect(doa.table.totals).toMatchObject({ boxes: 5, animals: 44, dead: 7, rate: 0.1591 });
		expect(doa.chart).toMatchObject({ labelKey: 'region', unit: 'percent', horizontal: true });
	});

	it('filters every section by service', async () => {
		const body = await shippingReport(
			context('2026-11-02', '2026-11-22', { service: 'overnight' })
		);
		expect(body.filters).toEqual([
			{
				key: 'service',
				label: 'Service',
				value: 'overnight',
				options: [
					{ value: '', label: 'Overnight and two-day' },
					{ value: 'overnight', label: 'Overnight' },
					{ value: 'two_day', label: 'Two-day' }
				]
			}
		]);
		const weekly = section(body.sections, 'weekly');
		expect(weekly.table.rows).toEqual([
			{ week: '2026-11-02', boxes: 2, heat: 1, cold: 1, held_days: 0, claims: 1 },
			{ week: '2026-11-09', boxes: 0, heat: 0, cold: 0, held_days: 1, claims: 1 },
			{ week: '2026-11-16', boxes: 1, heat: 0, cold: 0, held_days: 5, claims: 0 }
		]);
		expect(weekly.table.totals).toMatchObject({
			boxes: 3,
			heat: 1,
			cold: 1,
			held_days: 6,
			claims: 2
		});
		expect(section(body.sections, 'claims').table.rows).toEqual([
			{ outcome: 'Open', claims: 0, dead: 0, refunded_cents: 0 },
			{ outcome: 'Refunded', claims: 1, dead: 5, refunded_cents: 1500 },
			{ outcome: 'Reshipped', claims: 0, dead: 0, refunded_cents: 0 },
			{ outcome: 'Declined', claims: 1, dead: 4, refunded_cents: 0 }
		]);
		expect(section(body.sections, 'doa-service').table.rows).toEqual([
			{ service: 'Overnight', boxes: 3, animals: 35, dead: 5, rate: 0.1429 }
		]);
		expect(section(body.sections, 'doa-climate').table.rows.map((r) => r.region)).toEqual([
			'Upper Midwest',
			'Southwest',
			'Outside the contiguous US'
		]);

		// A value that is not a service means all.
		const bad = await shippingReport(context('2026-11-02', '2026-11-22', { service: 'ground' }));
		expect(bad.filters[0]!.value).toBe('');
		expect(section(bad.sections, 'weekly').table.totals).toMatchObject({ boxes: 5 });
	});

	it('says what is missing for an empty range', async () => {
		const body = await shippingReport(context('2026-10-05', '2026-10-18', { service: 'two_day' }));
		for (const s of body.sections) {
			expect(s.table.rows, s.id).toEqual([]);
			expect(s.table.totals, s.id).toBeUndefined();
		}
		expect(section(body.sections, 'weekly').empty).toBe(
			'No two-day box was shipped, held for weather or claimed from 2026-10-05 to 2026-10-18.'
		);
		expect(section(body.sections, 'claims').empty).toBe(
			'No claim was filed on any two-day box from 2026-10-05 to 2026-10-18.'
		);
		expect(section(body.sections, 'doa-service').empty).toBe(
			'No two-day box was shipped from 2026-10-05 to 2026-10-18.'
		);
	});

	it('leaves the refunded money out for keepers', async () => {
		const body = await shippingReport(context('2026-11-02', '2026-11-22', {}, false));
		const claims = section(body.sections, 'claims');
		expect(claims.table.columns.map((c) => c.key)).toEqual(['outcome', 'claims', 'dead']);
		expect(claims.table.rows[1]).toEqual({ outcome: 'Refunded', claims: 1, dead: 5 });
		expect(claims.table.totals).toEqual({ outcome: 'All claims', claims: 3, dead: 10 });
		for (const s of body.sections) {
			expect(s.table.columns.some((c) => c.money)).toBe(false);
			expect(s.chart).not.toBeNull();
		}
	});
});
