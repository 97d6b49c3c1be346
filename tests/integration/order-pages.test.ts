// The order pages' read side against the demo on a real database: an order's history
// comes back whole and in order, a customer reaches only their own orders, the keeper's
// list filters match the demo counted by hand and a plain SQL query, and only staff
// load the keeper's list.
import { isHttpError } from '@sveltejs/kit';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import type { OrderListFilters } from '../../src/lib/orders/list-filters';
import type { SessionUser } from '../../src/lib/server/auth/guard';
import { ownOrder } from '../../src/lib/server/orders/customer';
import { orderTimeline } from '../../src/lib/server/orders/history';
import { keeperOrder, listOrders } from '../../src/lib/server/orders/keeper';
import { noteOrder } from '../../src/lib/server/orders/transitions';
import { load as loadOrderList } from '../../src/routes/manage/orders/+page.server';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

// The route opens the app's database through getDb(); here that is the scratch copy.
const current = vi.hoisted(() => ({ db: undefined as unknown }));
vi.mock('$lib/server/db', () => ({ getDb: () => current.db }));

const ZONE = 'America/New_York';

describe('order pages', () => {
	let scratch: ScratchDatabase;
	const users = new Map<string, SessionUser>();
	const userOf = (role: string) => users.get(role)!;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		current.db = scratch.db;
		await seedDemo(scratch.db, { today: '2026-12-01' });
		for (const role of ['admin', 'keeper', 'customer']) {
			const email = DEMO_ACCOUNTS.find((account) => account.role === role)!.email;
			const row = await scratch.db
				.selectFrom('User')
				.select(['id', 'name', 'email'])
				.where('email', '=', email)
				.executeTakeFirstOrThrow();
			users.set(role, { ...row, role: role as SessionUser['role'] });
		}
	});
	afterAll(async () => scratch?.drop());

	const orderId = async (number: string) =>
		(
			await scratch.db
				.selectFrom('customer_order')
				.select('id')
				.where('order_number', '=', number)
				.executeTakeFirstOrThrow()
		).id;

	describe('the timeline', () => {
		it('returns every order_event of each demo order, oldest first, as an unbroken chain', async () => {
			const orders = await scratch.db
				.selectFrom('customer_order')
				.select(['id', 'order_number', 'state'])
				.execute();
			expect(orders.length).toBe(15); // the demo's orders, counted by hand
			for (const order of orders) {
				const timeline = await orderTimeline(scratch.db, order.id);
				const { rows } = await sql<{ id: number }>`
					select id from order_event where order_id = ${order.id} order by created_at, id`.execute(
					scratch.db
				);
				expect(timeline.map((event) => event.id)).toEqual(rows.map((row) => row.id));
				// Each change starts where the one before ended, and the last ends in the order's state.
				expect(timeline[0]?.fromState).toBeNull();
				for (let i = 1; i < timeline.length; i++) {
					expect(timeline[i]!.fromState, order.order_number).toBe(timeline[i - 1]!.toState);
					expect(timeline[i]!.at.getTime()).toBeGreaterThanOrEqual(timeline[i - 1]!.at.getTime());
				}
				expect(timeline.at(-1)?.toState, order.order_number).toBe(order.state);
			}
		});

		it('includes a note added later, after the state changes', async () => {
			const id = await orderId('HL-10012');
			const before = await orderTimeline(scratch.db, id);
			await scratch.db
				.transaction()
				.execute((trx) =>
					noteOrder(
						trx,
						id,
						{ kind: 'user', userId: userOf('keeper').id, ip: '192.0.2.30' },
						'Ship date moved: cold snap at the destination.'
					)
				);
			const after = await orderTimeline(scratch.db, id);
			expect(after).toHaveLength(before.length + 1);
			expect(after.at(-1)).toMatchObject({
				fromState: 'weather_hold',
				toState: 'weather_hold',
				note: 'Ship date moved: cold snap at the destination.',
				actorName: userOf('keeper').name
			});
		});
	});

	describe("the customer's order page", () => {
		it("shows the customer their own order with who-did-what in the shop's words", async () => {
			const order = await ownOrder(scratch.db, userOf('customer').id, 'HL-10006');
			expect(order).not.toBeNull();
			// Placed by the customer, paid through the payment notice, held by the daily check,
			// refunded by the owner (demo data, read by hand).
			expect(order!.events.map((event) => [event.toState, event.by])).toEqual([
				['awaiting_payment', 'you'],
				['paid', 'payment'],
				['weather_hold', 'the shop'],
				['refunded', 'the shop']
			]);
			// No staff name or e-mail travels to the customer's page.
			expect(JSON.stringify(order)).not.toContain(userOf('admin').email);
			expect(order!.shipCheck?.decision).toBeDefined();
			expect(order).not.toHaveProperty('id');
		});

		it("finds nothing for another customer's order number", async () => {
			const marisols = await scratch.db
				.selectFrom('customer_order')
				.select('order_number')
				.where('email', '=', 'marisol.ocampo@example.com')
				.execute();
			expect(marisols.length).toBeGreaterThan(0);
			for (const { order_number } of marisols)
				expect(await ownOrder(scratch.db, userOf('customer').id, order_number)).toBeNull();
			expect(await ownOrder(scratch.db, userOf('customer').id, 'HL-99999')).toBeNull();
		});

		it('gives the latest of several ship checks', async () => {
			// HL-10006 has three ship checks in the demo; the newest decides what the page says.
			const id = await orderId('HL-10006');
			const newest = await scratch.db
				.selectFrom('ship_check')
				.select(['decision', 'checked_at'])
				.where('order_id', '=', id)
				.orderBy('checked_at', 'desc')
				.orderBy('id', 'desc')
				.executeTakeFirstOrThrow();
			const order = await ownOrder(scratch.db, userOf('customer').id, 'HL-10006');
			expect(order!.shipCheck).toMatchObject(
				newest.decision === 'ship' ? { decision: 'ship' } : { decision: 'hold' }
			);
			expect(order!.shipCheck!.checkedAt).toEqual(newest.checked_at);
		});
	});

	describe("the keeper's list", () => {
		const numbers = async (filters: Omit<OrderListFilters, 'page'>) =>
			(await listOrders(scratch.db, { ...filters, page: 1 }, ZONE)).rows.map((r) => r.order_number);
		const sqlNumbers = async (where: ReturnType<typeof sql>) =>
			(
				await sql<{ order_number: string }>`
					select order_number from customer_order where ${where}
					order by created_at desc, id desc`.execute(scratch.db)
			).rows.map((row) => row.order_number);

		it('lists every order newest first', async () => {
			const all = await numbers({});
			expect(all).toHaveLength(15);
			expect(all).toEqual(await sqlNumbers(sql`true`));
		});

		it('filters by state', async () => {
			const delivered = await numbers({ state: 'delivered' });
			expect(delivered).toHaveLength(5); // HL-10001..4 and HL-10008, counted by hand
			expect(delivered).toEqual(await sqlNumbers(sql`state = 'delivered'`));
			expect(await numbers({ state: 'weather_hold' })).toEqual(['HL-10012']);
		});

		it('filters by service, alone and with a state', async () => {
			const twoDay = await numbers({ service: 'two_day' });
			expect(twoDay).toHaveLength(5);
			expect(twoDay).toEqual(await sqlNumbers(sql`service = 'two_day'`));
			expect(await numbers({ service: 'overnight', state: 'delivered' })).toHaveLength(3);
		});

		it('finds by order number or e-mail, ignoring case, with wildcards taken literally', async () => {
			expect(await numbers({ q: 'DAGNY' })).toEqual(['HL-10012', 'HL-10006', 'HL-10002']);
			expect(await numbers({ q: 'hl-1001' })).toEqual(
				await sqlNumbers(sql`order_number ilike 'HL-1001%'`)
			);
			expect(await numbers({ q: 'hl-1001' })).toHaveLength(6);
			expect(await numbers({ q: 'example.test' })).toHaveLength(8);
			expect(await numbers({ q: '%' })).toEqual([]);
			expect(await numbers({ q: 'HL-1000_' })).toEqual([]);
		});

		it("filters by the shop's calendar days the orders were placed on", async () => {
			const from = '2026-11-01';
			const to = '2026-11-30';
			expect(await numbers({ from, to })).toEqual(
				await sqlNumbers(
					sql`(created_at at time zone ${ZONE})::date between ${from}::date and ${to}::date`
				)
			);
			expect((await numbers({ from, to })).length).toBeGreaterThan(0);
		});

		it('pages by fifty and counts all that match', async () => {
			const page = await listOrders(scratch.db, { page: 2 }, ZONE);
			expect(page).toMatchObject({ total: 15, pages: 1, page: 2, rows: [] });
		});

		it('shows one order in full to the keeper, and nothing for an unknown number', async () => {
			const order = await keeperOrder(scratch.db, 'HL-10011');
			expect(order?.email).toBe('marisol.ocampo@example.com');
			expect(order?.lines.length).toBeGreaterThan(0);
			expect(await keeperOrder(scratch.db, 'HL-00000')).toBeNull();
		});
	});

	describe('who loads the keeper list', () => {
		type LoadEvent = Parameters<typeof loadOrderList>[0];
		const event = (user: SessionUser | null) =>
			({
				url: new URL('http://127.0.0.1/manage/orders?state=delivered'),
				locals: { user, sessionToken: null }
			}) as unknown as LoadEvent;
		const status = async (pending: unknown) => {
			try {
				await pending;
				return 'loaded';
			} catch (cause) {
				if (isHttpError(cause)) return cause.status;
				throw cause;
			}
		};

		it('refuses a customer on the server', async () => {
			expect(await status(loadOrderList(event(userOf('customer'))))).toBe(403);
		});

		it('gives keepers the list without totals and the owner the totals', async () => {
			type Loaded = { list: { rows: { total_cents: number | null }[] } };
			const keeper = (await loadOrderList(event(userOf('keeper')))) as Loaded;
			expect(keeper.list.rows).toHaveLength(5);
			expect(keeper.list.rows.every((row) => row.total_cents === null)).toBe(true);
			const admin = (await loadOrderList(event(userOf('admin')))) as Loaded;
			expect(admin.list.rows.every((row) => typeof row.total_cents === 'number')).toBe(true);
		});
	});
});
