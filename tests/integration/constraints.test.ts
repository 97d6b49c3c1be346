// The database itself refuses impossible stock and money, whatever the code does.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

describe('database constraints', () => {
	let scratch: ScratchDatabase;
	let speciesId: number;
	let listingId: number;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		const species = await scratch.db
			.insertInto('species')
			.values({
				slug: 'porcellio-laevis',
				scientific_name: 'Porcellio laevis',
				common_name: 'Dairy cow isopod',
				animal_group: 'isopod',
				temp_low_f: 62,
				temp_ideal_low_f: 70,
				temp_ideal_high_f: 78,
				temp_high_f: 86,
				moisture_level: 'moist',
				adult_length_mm: 20,
				grow_out_weeks: 10
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		speciesId = species.id;
		const clutch = await scratch.db
			.insertInto('clutch')
			.values(clutchRow({ code: 'C-OK' }))
			.returning('id')
			.executeTakeFirstOrThrow();
		const listing = await scratch.db
			.insertInto('listing')
			.values({
				slug: 'dairy-cows',
				kind: 'animal',
				species_id: speciesId,
				clutch_id: clutch.id,
				title: 'Dairy cows'
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		listingId = listing.id;
	});
	afterAll(async () => {
		await scratch.drop();
	});

	function clutchRow(
		overrides: Partial<{
			code: string;
			count_found: number;
			count_alive: number;
			count_lost: number;
		}>
	) {
		return {
			code: 'C-1',
			species_id: speciesId,
			origin: 'bought_in' as const,
			generation: 1,
			found_on: '2026-10-01',
			stage: 'juvenile' as const,
			size_class: 'small' as const,
			count_found: 20,
			count_alive: 18,
			count_lost: 2,
			sale_ready_on: '2026-12-10',
			...overrides
		};
	}

	it('rejects a negative alive count', async () => {
		await expect(
			scratch.db
				.insertInto('clutch')
				.values(clutchRow({ code: 'C-NEG', count_alive: -1 }))
				.execute()
		).rejects.toThrow(/clutch_count_alive_check/);
	});

	it('rejects more alive and lost than were found', async () => {
		await expect(
			scratch.db
				.insertInto('clutch')
				.values(clutchRow({ code: 'C-MANY', count_alive: 20, count_lost: 1 }))
				.execute()
		).rejects.toThrow(/violates check constraint/);
	});

	it('rejects a negative price', async () => {
		await expect(
			scratch.db
				.insertInto('price_tier')
				.values({ listing_id: listingId, min_quantity: 1, price_cents: -1400 })
				.execute()
		).rejects.toThrow(/price_tier_price_cents_check/);
	});

	it('accepts a zero price (a free add-on) and refuses a second tier at the same quantity', async () => {
		await scratch.db
			.insertInto('price_tier')
			.values({ listing_id: listingId, min_quantity: 1, price_cents: 0 })
			.execute();
		await expect(
			scratch.db
				.insertInto('price_tier')
				.values({ listing_id: listingId, min_quantity: 1, price_cents: 1400 })
				.execute()
		).rejects.toThrow(/duplicate key/);
	});

	it('rejects an order whose total is not subtotal plus shipping, or refunds above payment', async () => {
		const order = {
			order_number: 'HL-20001',
			email: 'fern@keepers.example.com',
			ship_name: 'Fern Ode',
			ship_line1: '1 Loam Lane',
			ship_city: 'Duluth',
			ship_state: 'MN',
			ship_zip: '55802',
			service: 'overnight' as const,
			subtotal_cents: 6000,
			shipping_cents: 4500,
			total_cents: 10500
		};
		await expect(
			scratch.db
				.insertInto('customer_order')
				.values({ ...order, total_cents: 9999 })
				.execute()
		).rejects.toThrow(/violates check constraint/);
		await expect(
			scratch.db
				.insertInto('customer_order')
				.values({ ...order, order_number: 'HL-20002', paid_cents: 10500, refunded_cents: 10501 })
				.execute()
		).rejects.toThrow(/violates check constraint/);
		await scratch.db.insertInto('customer_order').values(order).execute();
	});

	it('rejects a resting tub whose hold ends before it started', async () => {
		const colony = await scratch.db
			.insertInto('colony')
			.values({
				code: 'POR-01',
				species_id: speciesId,
				name: 'Dairy cow bin',
				enclosure_length_in: '16.0',
				enclosure_width_in: '11.0',
				substrate_depth_in: '3.0',
				started_on: '2026-01-05'
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await expect(
			scratch.db
				.insertInto('resting_tub')
				.values({
					code: 'T-1',
					colony_id: colony.id,
					started_on: '2026-11-01',
					hold_until: '2026-10-01'
				})
				.execute()
		).rejects.toThrow(/resting_tub_check/);
	});

	it('keeps dates as YYYY-MM-DD text and numerics as exact decimal text', async () => {
		const colony = await scratch.db
			.selectFrom('colony')
			.select(['started_on', 'enclosure_length_in'])
			.where('code', '=', 'POR-01')
			.executeTakeFirstOrThrow();
		expect(colony.started_on).toBe('2026-01-05');
		expect(colony.enclosure_length_in).toBe('16.0');
	});
});
