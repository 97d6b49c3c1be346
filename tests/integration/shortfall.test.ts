// A shortfall on a scratch copy of the demo: a clutch that loses animals after the sale
// is short by exactly the gap, and names the unshipped orders it touches.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import { recordLoss } from '../../src/lib/server/clutches/clutches';
import { clutchShortfalls, shortfallsForOrders } from '../../src/lib/server/fulfilment/shortfall';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

describe('shortfalls', () => {
	let scratch: ScratchDatabase;
	let keeper: { userId: string; ip: string };

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		const email = DEMO_ACCOUNTS.find((a) => a.role === 'keeper')!.email;
		const row = await scratch.db
			.selectFrom('User')
			.select('id')
			.where('email', '=', email)
			.executeTakeFirstOrThrow();
		keeper = { userId: row.id, ip: '127.0.0.1' };
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	const orderId = async (number: string) =>
		(
			await scratch.db
				.selectFrom('customer_order')
				.select('id')
				.where('order_number', '=', number)
				.executeTakeFirstOrThrow()
		).id;

	it('finds none in the demo as seeded', async () => {
		expect(await clutchShortfalls(scratch.db)).toEqual([]);
	});

	it('shows the gap when a clutch loses more than its free animals after a sale', async () => {
		// ARM-C1: 66 alive, 10 of them sold to HL-10013 (paid, not yet packed) in the demo.
		const clutch = await scratch.db
			.selectFrom('clutch')
			.select(['id', 'count_alive'])
			.where('code', '=', 'ARM-C1')
			.executeTakeFirstOrThrow();
		expect(clutch.count_alive).toBe(66);
		const lost = await recordLoss(
			scratch.db,
			keeper,
			'ARM-C1',
			{ count: 60, reason: 'Substrate went sour over a weekend.', happenedOn: '2026-12-01' },
			'2026-12-01'
		);
		expect(lost.ok).toBe(true);
		const [shortfall, ...others] = await clutchShortfalls(scratch.db);
		expect(others).toEqual([]);
		// 6 alive against 10 sold: 4 short.
		expect(shortfall).toMatchObject({
			clutchCode: 'ARM-C1',
			alive: 6,
			sold: 10,
			short: 4,
			orders: [{ orderNumber: 'HL-10013', animals: 10 }]
		});
		const byOrder = await shortfallsForOrders(scratch.db, [
			await orderId('HL-10013'),
			await orderId('HL-10011')
		]);
		expect([...byOrder.keys()]).toEqual([await orderId('HL-10013')]);
	});
});
