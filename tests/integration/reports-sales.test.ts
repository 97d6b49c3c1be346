// The sales report's SQL on a hand-made ledger whose figures are worked out below. The
// shop's zone is America/New_York: EST (UTC−5) until 8 Mar 2026, EDT (UTC−4) after, so
// the payments at the month edges test which month a late-evening sale counts in.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { salesReport } from '../../src/lib/server/reports/sales';
import type { ReportContext } from '../../src/lib/server/reports/context';
import type { ReportSection } from '../../src/lib/reports/report';
import { insertListedClutch } from './support/stock';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const ZONE = 'America/New_York';

describe('sales report', () => {
	let scratch: ScratchDatabase;
	let orderNumber = 10000;

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
			today: '2026-12-01',
			money,
			params: new URLSearchParams(params)
		};
	}

	const section = (sections: ReportSection[], id: string) => {
		const found = sections.find((s) => s.id === id);
		if (!found) throw new Error(`no section ${id}`);
		return found;
	};

	interface LineSpec {
		listingId: number;
		speciesId: number | null;
		quantity: number;
		unitSize?: number;
		lineTotal: number;
		isLive: boolean;
		restocked?: number;
	}

	/** An order with its lines and one payment; returns the ids. */
	async function order(
		lines: LineSpec[],
		shipping: number,
		payment: { status: 'succeeded' | 'pending'; at: string }
	) {
		const subtotal = lines.reduce((sum, line) => sum + line.lineTotal, 0);
		orderNumber++;
		const row = await scratch.db
			.insertInto('customer_order')
			.values({
				order_number: `HL-${orderNumber}`,
				email: 'buyer@example.com',
				ship_name: 'A Buyer',
				ship_line1: '1 Test Lane',
				ship_city: 'Testville',
				ship_state: 'OR',
				ship_zip: '97201',
				service: 'overnight',
				state: payment.status === 'succeeded' ? 'paid' : 'awaiting_payment',
				subtotal_cents: subtotal,
				shipping_cents: shipping,
				total_cents: subtotal + shipping,
				paid_cents: payment.status === 'succeeded' ? subtotal + shipping : 0
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const lineIds = [];
		for (const line of lines) {
			const inserted = await scratch.db
				.insertInto('order_line')
				.values({
					order_id: row.id,
					listing_id: line.listingId,
					species_id: line.speciesId,
					description: 'test line',
					quantity: line.quantity,
					unit_size: line.unitSize ?? 1,
					line_total_cents: line.lineTotal,
					is_live: line.isLive,
					restocked_quantity: line.restocked ?? 0
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			lineIds.push(inserted.id);
		}
		const paid = await scratch.db
			.insertInto('payment')
			.values({
				order_id: row.id,
				stripe_checkout_session_id: `cs_test_${orderNumber}`,
				amount_cents: subtotal + shipping,
				status: payment.status,
				created_at: payment.at,
				updated_at: payment.at
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		return { orderId: row.id, paymentId: paid.id, lineIds };
	}

	let refundNumber = 0;
	async function refund(
		placed: { orderId: number; paymentId: number },
		amount: number,
		at: string,
		status: 'succeeded' | 'failed',
		lines: { lineId: number; quantity: number }[] = []
	) {
		refundNumber++;
		const row = await scratch.db
			.insertInto('refund')
			.values({
				order_id: placed.orderId,
				payment_id: placed.paymentId,
				idempotency_key: `refund-test-${refundNumber}`,
				amount_cents: amount,
				reason: 'test',
				status,
				created_at: at,
				updated_at: at
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		if (lines.length > 0)
			await scratch.db
				.insertInto('refund_line')
				.values(
					lines.map((l) => ({ refund_id: row.id, order_line_id: l.lineId, quantity: l.quantity }))
				)
				.execute();
	}

	beforeAll(async () => {
		scratch = await scratchDatabase();
		const base = {
			temp_low_f: 62,
			temp_ideal_low_f: 70,
			temp_ideal_high_f: 78,
			temp_high_f: 86,
			moisture_level: 'moist' as const,
			adult_length_mm: 40,
			grow_out_weeks: 12
		};
		const [narceus, porcellio] = await scratch.db
			.insertInto('species')
			.values([
				{
					...base,
					slug: 'test-narceus',
					scientific_name: 'Narceus testus',
					common_name: 'Test millipede',
					animal_group: 'millipede'
				},
				{
					...base,
					slug: 'test-porcellio',
					scientific_name: 'Porcellio testus',
					common_name: 'Test isopod',
					animal_group: 'isopod'
				}
			])
			.returning('id')
			.execute();
		const n = await insertListedClutch(scratch.db, {
			speciesId: narceus!.id,
			code: 'TN-C1',
			slug: 'test-narceus-juveniles',
			title: 'Test millipede juveniles',
			alive: 50,
			tiers: [{ minQuantity: 1, priceCents: 1500 }]
		});
		const p = await insertListedClutch(scratch.db, {
			speciesId: porcellio!.id,
			code: 'TP-C1',
			slug: 'test-porcellio-tens',
			title: 'Test isopods, ten',
			alive: 300,
			unitSize: 10,
			tiers: [{ minQuantity: 1, priceCents: 1600 }]
		});
		const supply = await scratch.db
			.insertInto('listing')
			.values({
				slug: 'test-leaf-litter',
				kind: 'supply',
				title: 'Leaf litter',
				is_live: false,
				state: 'live',
				supply_stock: 20
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const nLine = (quantity: number, lineTotal: number, restocked = 0): LineSpec => ({
			listingId: n.listingId,
			speciesId: narceus!.id,
			quantity,
			lineTotal,
			isLive: true,
			restocked
		});

		// o1, January: 2 millipedes $30 (one later refunded and restocked), leaf litter
		// $15, shipping $25 → paid $70.00.
		const o1 = await order(
			[
				nLine(2, 3000, 1),
				{ listingId: supply.id, speciesId: null, quantity: 1, lineTotal: 1500, isLive: false }
			],
			2500,
			{ status: 'succeeded', at: '2026-01-10T15:00:00Z' }
		);
		// o2: 23:30 EST on 31 Jan counts in January. 3 groups of 10 isopods $48, shipping
		// $20 → $68.00.
		const o2 = await order(
			[
				{
					listingId: p.listingId,
					speciesId: porcellio!.id,
					quantity: 3,
					unitSize: 10,
					lineTotal: 4800,
					isLive: true
				}
			],
			2000,
			{ status: 'succeeded', at: '2026-02-01T04:30:00Z' }
		);
		// o3: 23:30 EDT on 31 Mar counts in March: 1 millipede $15 + $25 → $40.00.
		const o3 = await order([nLine(1, 1500)], 2500, {
			status: 'succeeded',
			at: '2026-04-01T03:30:00Z'
		});
		// o4: 00:30 EDT on 1 Apr is after the range.
		await order([nLine(1, 1500)], 2500, { status: 'succeeded', at: '2026-04-01T04:30:00Z' });
		// o5: never paid.
		await order([nLine(3, 4500)], 2500, { status: 'pending', at: '2026-02-10T12:00:00Z' });
		// o6: paid before the range; its refund falls inside it.
		const o6 = await order([nLine(1, 1500)], 1500, {
			status: 'succeeded',
			at: '2025-12-31T12:00:00Z'
		});

		// R1, 5 Feb: o1's second millipede, $15 (its full share).
		await refund(o1, 1500, '2026-02-05T12:00:00Z', 'succeeded', [
			{ lineId: o1.lineIds[0]!, quantity: 1 }
		]);
		// R2, 10 Mar: $10 for one group of isopods, whose share is $16 → all $10 on isopods.
		await refund(o2, 1000, '2026-03-10T12:00:00Z', 'succeeded', [
			{ lineId: o2.lineIds[0]!, quantity: 1 }
		]);
		// R3, 15 Feb: $10 on o6 for nothing in particular → shipping and other.
		await refund(o6, 1000, '2026-02-15T12:00:00Z', 'succeeded');
		// A failed refund and one just after the range change nothing.
		await refund(o1, 500, '2026-02-20T12:00:00Z', 'failed');
		await refund(o3, 700, '2026-04-01T04:30:00Z', 'succeeded');
	});

	afterAll(async () => {
		await scratch?.drop();
	});

	it('counts each month in the shop zone, with refunds in the month issued', async () => {
		const report = await salesReport(context('2026-01-01', '2026-03-31'));
		const byMonth = section(report.sections, 'by-month');
		// Jan: o1 $70 + o2 $68 = $138; animals 1 millipede (2 less 1 restocked) + 30 isopods.
		// Feb: refunds R1 $15 + R3 $10. Mar: o3 $40, refund R2 $10.
		expect(byMonth.table.rows).toEqual([
			{ month: '2026-01', orders: 2, animals: 31, revenue: 13800, refunds: 0, net: 13800 },
			{ month: '2026-02', orders: 0, animals: 0, revenue: 0, refunds: 2500, net: -2500 },
			{ month: '2026-03', orders: 1, animals: 1, revenue: 4000, refunds: 1000, net: 3000 }
		]);
		expect(byMonth.table.totals).toEqual({
			month: 'All months',
			orders: 3,
			animals: 32,
			revenue: 17800,
			refunds: 3500,
			net: 14300
		});
	});

	it('nets to the payments less the succeeded refunds in the payment tables', async () => {
		const ctx = context('2026-01-01', '2026-03-31');
		const report = await salesReport(ctx);
		const start = sql`('2026-01-01'::date)::timestamp at time zone ${ZONE}`;
		const end = sql`('2026-04-01'::date)::timestamp at time zone ${ZONE}`;
		const { rows } = await sql<{ paid: string; refunded: string }>`
			select
				(select coalesce(sum(amount_cents), 0) from payment
					where status = 'succeeded' and updated_at >= ${start} and updated_at < ${end}) as paid,
				(select coalesce(sum(amount_cents), 0) from refund
					where status = 'succeeded' and created_at >= ${start} and created_at < ${end}) as refunded
		`.execute(scratch.db);
		const ledgerNet = Number(rows[0]!.paid) - Number(rows[0]!.refunded);
		expect(ledgerNet).toBe(14300);
		expect(section(report.sections, 'by-month').table.totals?.net).toBe(ledgerNet);
		expect(section(report.sections, 'by-species').table.totals?.net).toBe(ledgerNet);
	});

	it('splits revenue and refunds over species, supplies and shipping', async () => {
		const report = await salesReport(context('2026-01-01', '2026-03-31'));
		const bySpecies = section(report.sections, 'by-species');
		// Shipping and other: o1 $70 − $45 lines, o2 $68 − $48, o3 $40 − $15 = $70;
		// refunds $35 in all less R1 $15 and R2 $10 tied to lines = $10.
		expect(bySpecies.table.rows).toEqual([
			{ name: 'Test isopod', orders: 1, animals: 30, revenue: 4800, refunds: 1000, net: 3800 },
			{ name: 'Test millipede', orders: 2, animals: 2, revenue: 4500, refunds: 1500, net: 3000 },
			{ name: 'Supplies', orders: 1, animals: 0, revenue: 1500, refunds: 0, net: 1500 },
			{
				name: 'Shipping and other',
				orders: 3,
				animals: 0,
				revenue: 7000,
				refunds: 1000,
				net: 6000
			}
		]);
		const grid = section(report.sections, 'animals-by-month-and-species');
		expect(grid.table.rows).toEqual([
			{ month: '2026-01', 'species:test-narceus': 1, 'species:test-porcellio': 30 },
			{ month: '2026-02', 'species:test-narceus': 0, 'species:test-porcellio': 0 },
			{ month: '2026-03', 'species:test-narceus': 1, 'species:test-porcellio': 0 }
		]);
	});

	it('filters to one species', async () => {
		const report = await salesReport(
			context('2026-01-01', '2026-03-31', { species: 'test-narceus' })
		);
		expect(report.filters[0]?.value).toBe('test-narceus');
		// Its lines only: o1 $30, o3 $15; R1's $15 in February.
		expect(section(report.sections, 'by-month').table.rows).toEqual([
			{ month: '2026-01', orders: 1, animals: 1, revenue: 3000, refunds: 0, net: 3000 },
			{ month: '2026-02', orders: 0, animals: 0, revenue: 0, refunds: 1500, net: -1500 },
			{ month: '2026-03', orders: 1, animals: 1, revenue: 1500, refunds: 0, net: 1500 }
		]);
		expect(section(report.sections, 'by-species').table.rows).toEqual([
			{ name: 'Test millipede', orders: 2, animals: 2, revenue: 4500, refunds: 1500, net: 3000 }
		]);
		// A species that is not in the shop is no filter at all.
		const unknown = await salesReport(context('2026-01-01', '2026-03-31', { species: 'nope' }));
		expect(unknown.filters[0]?.value).toBe('');
	});

	it('says nothing happened in a quiet range, and draws animals for keepers', async () => {
		const quiet = await salesReport(context('2025-06-01', '2025-06-30'));
		for (const part of quiet.sections) {
			expect(part.table.rows).toEqual([]);
			expect(part.empty).toMatch(/Jun 1, 2025 to Jun 30, 2025/);
		}
		const keeper = await salesReport(context('2026-01-01', '2026-03-31', {}, false));
		expect(section(keeper.sections, 'by-month').chart?.series).toEqual([
			{ key: 'animals', label: 'Animals sold' }
		]);
	});
});
