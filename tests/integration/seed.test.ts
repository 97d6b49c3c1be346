import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const TODAY = '2026-12-01';

describe('demo seed', () => {
	let scratch: ScratchDatabase;
	let firstRun: Record<string, number>;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		firstRun = await seedDemo(scratch.db, { today: TODAY });
	});
	afterAll(async () => {
		await scratch.drop();
	});

	it('fills the shop', () => {
		expect(firstRun.species).toBeGreaterThanOrEqual(7);
		expect(firstRun.colony).toBeGreaterThan(0);
		expect(firstRun.customer_order).toBeGreaterThan(0);
	});

	it('inserts nothing on a second run', async () => {
		const secondRun = await seedDemo(scratch.db, { today: TODAY });
		expect(Object.values(secondRun).every((n) => n === 0)).toBe(true);
	});

	it('has resting tubs, clutches and orders in every state', async () => {
		const distinct = async (table: 'resting_tub' | 'clutch' | 'customer_order') =>
			(await scratch.db.selectFrom(table).select('state').distinct().execute())
				.map((r) => r.state)
				.sort();
		expect(await distinct('resting_tub')).toEqual(['cleared', 'resting', 'yielded']);
		expect(await distinct('clutch')).toEqual(['growing', 'listed', 'paused', 'ready', 'sold_out']);
		expect(await distinct('customer_order')).toEqual(
			[
				'awaiting_payment',
				'cancelled',
				'delivered',
				'packed',
				'paid',
				'part_refunded',
				'refunded',
				'scheduled',
				'shipped',
				'weather_hold'
			].sort()
		);
		const stages = (await scratch.db.selectFrom('clutch').select('stage').distinct().execute()).map(
			(r) => r.stage
		);
		expect(stages.sort()).toEqual(['adult', 'hatchling', 'juvenile', 'sub_adult']);
	});

	it('is deterministic: a second database seeded for the same day holds the same rows', async () => {
		const other = await scratchDatabase();
		try {
			await seedDemo(other.db, { today: TODAY });
			const snapshot = (db: ScratchDatabase['db']) =>
				db
					.selectFrom('clutch')
					.select(['code', 'found_on', 'count_found', 'count_alive', 'state', 'sale_ready_on'])
					.orderBy('code')
					.execute();
			expect(await snapshot(other.db)).toEqual(await snapshot(scratch.db));
		} finally {
			await other.drop();
		}
	});
});
