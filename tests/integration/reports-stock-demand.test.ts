// The stock-and-demand report on a scratch database: hand-made clutches, a paid order, a
// cart hold and waitlist entries whose expected figures are worked out in the comments.
// The report is "as of today": clutches go by the day passed in, waitlist links by the
// database's clock (a guest's link works for 7 days after it was sent).
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ClutchState, NewClutch } from '../../src/lib/server/db/schema';
import type { ReportContext } from '../../src/lib/server/reports/context';
import { stockDemandReport } from '../../src/lib/server/reports/stock-demand';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const TODAY = '2026-12-01';

function found<T>(items: readonly T[], match: (item: T) => boolean): T {
	const item = items.find(match);
	if (item === undefined) throw new Error('a row the test set up is missing');
	return item;
}

describe('stock-demand report', () => {
	let scratch: ScratchDatabase;

	function run(params: Record<string, string> = {}, money = true) {
		const context: ReportContext = {
			db: scratch.db,
			// The range does not apply; any range gives the same report.
			from: '2026-01-01',
			to: '2026-03-31',
			timeZone: 'America/New_York',
			today: TODAY,
			money,
			params: new URLSearchParams(params)
		};
		return stockDemandReport(context);
	}

	beforeAll(async () => {
		scratch = await scratchDatabase();
		const { db } = scratch;
		const base = {
			temp_low_f: 62,
			temp_ideal_low_f: 70,
			temp_ideal_high_f: 78,
			temp_high_f: 86,
			moisture_level: 'moist' as const,
			adult_length_mm: 40,
			grow_out_weeks: 12
		};
		const species = await db
			.insertInto('species')
			.values([
				{
					...base,
					slug: 'narceus-americanus',
					scientific_name: 'Narceus americanus',
					common_name: 'American giant millipede',
					animal_group: 'millipede'
				},
				{
					...base,
					slug: 'armadillidium-vulgare',
					scientific_name: 'Armadillidium vulgare',
					common_name: 'Common pill bug',
					animal_group: 'isopod'
				},
				{
					...base,
					slug: 'porcellio-laevis',
					scientific_name: 'Porcellio laevis',
					common_name: 'Dairy cow isopod',
					animal_group: 'isopod'
				},
				{
					...base,
					slug: 'folsomia-candida',
					scientific_name: 'Folsomia candida',
					common_name: 'White springtail',
					animal_group: 'springtail'
				},
				{
					...base,
					slug: 'zophobas-morio',
					scientific_name: 'Zophobas morio',
					common_name: 'Zophobas beetle',
					animal_group: 'beetle'
				}
			])
			.returning(['id', 'slug'])
			.execute();
		const speciesId = (slug: string) => found(species, (s) => s.slug === slug).id;

		let codeNumber = 0;
		const clutch = (
			slug: string,
			state: ClutchState,
			saleReadyOn: string,
			countAlive: number
		): NewClutch => ({
			code: `SD-${String(++codeNumber).padStart(3, '0')}`,
			species_id: speciesId(slug),
			origin: 'bought_in',
			generation: 1,
			found_on: '2026-08-01',
			stage: 'juvenile',
			size_class: 'small',
			count_found: countAlive,
			count_alive: countAlive,
			state,
			paused_reason: state === 'paused' ? 'molting' : null,
			sale_ready_on: saleReadyOn
		});
		// Days from 2026-12-01 by the calendar: 12-20 is day 19, 2027-01-20 day 50,
		// 02-23 day 84 (the 12-week window's last day), 03-30 day 119.
		const clutches = await db
			.insertInto('clutch')
			.values([
				clutch('narceus-americanus', 'ready', '2026-11-10', 12),
				clutch('narceus-americanus', 'growing', '2026-12-20', 9),
				clutch('narceus-americanus', 'growing', '2027-01-20', 5),
				clutch('narceus-americanus', 'growing', '2027-03-30', 11),
				clutch('narceus-americanus', 'paused', '2026-12-03', 7),
				clutch('narceus-americanus', 'listed', '2026-10-01', 20), // SD-006
				clutch('narceus-americanus', 'listed', '2026-10-01', 2), // SD-007: oversold
				clutch('armadillidium-vulgare', 'growing', '2027-02-23', 40),
				clutch('porcellio-laevis', 'listed', '2026-10-15', 30), // SD-009
				clutch('zophobas-morio', 'sold_out', '2026-09-01', 0)
			])
			.returning(['id', 'code'])
			.execute();
		const clutchId = (code: string) => found(clutches, (c) => c.code === code).id;

		const listings = await db
			.insertInto('listing')
			.values(
				[
					['SD-006', 'narceus-americanus', 2], // sold in pairs
					['SD-007', 'narceus-americanus', 1],
					['SD-009', 'porcellio-laevis', 1]
				].map(([code, slug, unitSize]) => ({
					slug: `listing-${String(code).toLowerCase()}`,
					kind: 'animal' as const,
					species_id: speciesId(String(slug)),
					clutch_id: clutchId(String(code)),
					title: `Listing of ${code}`,
					unit_size: Number(unitSize),
					state: 'live' as const,
					published_at: new Date()
				}))
			)
			.returning(['id', 'clutch_id'])
			.execute();
		const listingOf = (code: string) => found(listings, (l) => l.clutch_id === clutchId(code)).id;

		const order = (number: string, state: 'paid' | 'cancelled') => ({
			order_number: number,
			email: 'buyer@example.com',
			ship_name: 'A Buyer',
			ship_line1: '1 Elm St',
			ship_city: 'Portland',
			ship_state: 'OR',
			ship_zip: '97201',
			service: 'overnight' as const,
			state,
			subtotal_cents: 6000,
			shipping_cents: 0,
			total_cents: 6000,
			paid_cents: state === 'paid' ? 6000 : 0
		});
		const orders = await db
			.insertInto('customer_order')
			.values([order('HL-90001', 'paid'), order('HL-90002', 'cancelled')])
			.returning(['id', 'state'])
			.execute();
		const paid = found(orders, (o) => o.state === 'paid');
		const cancelled = found(orders, (o) => o.state === 'cancelled');
		const line = (orderId: number, code: string, unitSize: number, quantity: number) => ({
			order_id: orderId,
			listing_id: listingOf(code),
			clutch_id: clutchId(code),
			species_id: speciesId('narceus-americanus'),
			description: `Line of ${code}`,
			unit_size: unitSize,
			quantity,
			line_total_cents: 2000,
			is_live: true
		});
		await db
			.insertInto('order_line')
			.values([
				line(paid.id, 'SD-006', 2, 3), // 3 pairs: 6 animals sold
				line(paid.id, 'SD-007', 1, 3), // 3 sold of 2 alive (a loss after the sale)
				line(cancelled.id, 'SD-006', 2, 5) // cancelled: takes nothing
			])
			.execute();
		const cart = await db
			.insertInto('cart')
			.defaultValues()
			.returning('id')
			.executeTakeFirstOrThrow();
		await db
			.insertInto('reservation')
			.values([
				// 2 pairs held in a cart: 4 animals.
				{
					cart_id: cart.id,
					listing_id: listingOf('SD-006'),
					quantity: 2,
					expires_at: sql<Date>`now() + interval '20 minutes'`
				},
				// A hold that ran out holds nothing.
				{
					cart_id: cart.id,
					listing_id: listingOf('SD-009'),
					quantity: 5,
					expires_at: sql<Date>`now() - interval '1 minute'`
				}
			])
			.execute();

		const entry = (
			slug: string,
			email: string,
			confirmed: boolean,
			notified: boolean,
			sentDaysAgo = 1
		) => ({
			species_id: speciesId(slug),
			email,
			confirmed_at: confirmed ? sql<Date>`now() - interval '1 day'` : null,
			notified_at: notified ? sql<Date>`now()` : null,
			created_at: sql<Date>`now() - make_interval(days => ${sentDaysAgo})`
		});
		await db
			.insertInto('waitlist_entry')
			.values([
				entry('narceus-americanus', 'ana@example.com', true, false),
				entry('armadillidium-vulgare', 'ben@example.com', true, false),
				entry('armadillidium-vulgare', 'cai@example.com', true, false),
				entry('armadillidium-vulgare', 'dee@example.com', true, false),
				entry('armadillidium-vulgare', 'eli@example.com', true, true), // told: not waiting
				entry('armadillidium-vulgare', 'fay@example.com', false, false, 2), // link works
				entry('armadillidium-vulgare', 'gus@example.com', false, false, 8), // link lapsed
				entry('folsomia-candida', 'hal@example.com', true, false),
				entry('folsomia-candida', 'ivy@example.com', true, false)
			])
			.execute();
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	async function onlySection(params: Record<string, string> = {}) {
		const body = await run(params);
		expect(body.sections).toHaveLength(1);
		return found(body.sections, () => true);
	}

	const zero = {
		ready_now: 0,
		within_4: 0,
		within_8: 0,
		within_12: 0,
		later: 0,
		paused: 0,
		coming: 0,
		in_shop: 0,
		waiting: 0,
		unconfirmed: 0
	};

	it('puts each species’ animals coming up beside the people waiting', async () => {
		const section = await onlySection();
		expect(section.id).toBe('pipeline-demand');
		// Millipede: ready 12; 9 (day 19) within 4 weeks, + 5 (day 50) within 8 and 12;
		// 11 later (day 119); 7 paused; coming = 12 + 14 = 26. In the shop: SD-006 has
		// 20 − 6 sold − 4 held = 10 (the cancelled order takes nothing); SD-007 is oversold
		// (2 − 3 = −1) and counts 0. One person waiting.
		// Pill bug: 40 on day 84, the 12-week window's last day; 3 waiting (eli was told),
		// 1 guest whose link still works (gus's lapsed after 7 days).
		// Dairy cow: 30 listed, the lapsed cart hold holds nothing; nobody waits.
		// Springtail: nothing coming, 2 waiting. Zophobas: only a sold-out clutch: no row.
		expect(section.table.rows).toEqual([
			{
				species: 'American giant millipede',
				ready_now: 12,
				within_4: 9,
				within_8: 14,
				within_12: 14,
				later: 11,
				paused: 7,
				coming: 26,
				in_shop: 10,
				waiting: 1,
				unconfirmed: 0
			},
			{
				...zero,
				species: 'Common pill bug',
				within_12: 40,
				coming: 40,
				waiting: 3,
				unconfirmed: 1
			},
			{ ...zero, species: 'Dairy cow isopod', in_shop: 30 },
			{ ...zero, species: 'White springtail', waiting: 2 }
		]);
		expect(section.table.totals).toEqual({
			species: 'All species',
			ready_now: 12,
			within_4: 9,
			within_8: 14,
			within_12: 54,
			later: 11,
			paused: 7,
			coming: 66,
			in_shop: 40,
			waiting: 6,
			unconfirmed: 1
		});
		expect(section.chart).toMatchObject({
			kind: 'bar',
			horizontal: true,
			labelKey: 'species',
			series: [{ key: 'coming' }, { key: 'waiting' }]
		});
	});

	it('free in the shop is clutch_free_animals() summed over the listed clutches', async () => {
		// The report sums set-based; the shop's own function, clutch by clutch, must agree.
		const bySpecies = await scratch.db
			.selectFrom('clutch as c')
			.innerJoin('species as s', 's.id', 'c.species_id')
			.where('c.state', '=', 'listed')
			.select([
				's.common_name',
				sql<number>`sum(greatest(0, clutch_free_animals(c.id)))`.as('free')
			])
			.groupBy('s.common_name')
			.orderBy('s.common_name')
			.execute();
		expect(bySpecies.map((r) => [r.common_name, Number(r.free)])).toEqual([
			['American giant millipede', 10],
			['Dairy cow isopod', 30]
		]);
		const section = await onlySection();
		for (const row of bySpecies)
			expect(found(section.table.rows, (r) => r.species === row.common_name).in_shop).toBe(
				Number(row.free)
			);
	});

	it('filters by animal group', async () => {
		const body = await run({ group: 'isopod' });
		expect(body.filters).toEqual([
			{
				key: 'group',
				label: 'Animal group',
				value: 'isopod',
				options: [
					{ value: '', label: 'All animals' },
					{ value: 'millipede', label: 'Millipedes' },
					{ value: 'isopod', label: 'Isopods' },
					{ value: 'springtail', label: 'Springtails' },
					{ value: 'beetle', label: 'Beetles' }
				]
			}
		]);
		const section = found(body.sections, (s) => s.id === 'pipeline-demand');
		expect(section.table.rows.map((r) => r.species)).toEqual([
			'Common pill bug',
			'Dairy cow isopod'
		]);
		expect(section.table.totals).toEqual({
			...zero,
			species: 'All species',
			within_12: 40,
			coming: 40,
			in_shop: 30,
			waiting: 3,
			unconfirmed: 1
		});
		// No roach species: not an option, so the value reads as all.
		expect((await run({ group: 'roach' })).filters.map((f) => f.value)).toEqual(['']);
	});

	it('a group with nothing coming and nobody waiting says so', async () => {
		const section = await onlySection({ group: 'beetle' });
		expect(section.table.rows).toEqual([]);
		expect(section.table.totals).toBeUndefined();
		expect(section.empty).toBe(
			'No beetles are coming up or in the shop, and nobody is waiting for any.'
		);
	});

	it('has no money: a keeper gets the same report', async () => {
		const admin = await run();
		expect(await run({}, false)).toEqual(admin);
		expect(admin.sections.flatMap((s) => s.table.columns).some((c) => c.money)).toBe(false);
	});
});
