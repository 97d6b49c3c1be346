// Ship checks on orders against a real database: the moves between paid, scheduled and
// weather_hold, the daily re-check and its mail, keeper overrides, and the public
// estimate. Forecasts come from a stub, and every "today" is passed in explicitly.
//
// Calendar facts used below (checked with Python's datetime.date(...).strftime('%A')):
// 2026-12-01 is a Tuesday, 12-02 a Wednesday, 12-03 a Thursday, 12-04 a Friday and
// 12-05 a Saturday. Limits are the shop's defaults (PRODUCT.md, Computations 1):
// heat pack under 50 °F, hold under 25 °F, cold pack over 85 °F, hold over 95 °F,
// overnight ships Monday to Wednesday and two-day Monday and Tuesday.
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import { addDays } from '../../src/lib/format/dates';
import { createPool } from '../../src/lib/server/db/connect';
import {
	getBoss,
	SHIP_RECHECK_CRON,
	SHIP_RECHECK_QUEUE,
	startJobs
} from '../../src/lib/server/jobs';
import { jobSqlOn } from '../../src/lib/server/jobs/boss';
import type { OrderState, Service } from '../../src/lib/server/db/schema';
import { createEstimateLimiter, shipEstimate } from '../../src/lib/server/shipping/estimate';
import { RULE_VERSION, type ShipCheckSnapshot } from '../../src/lib/server/shipping/inputs';
import {
	checkOrder,
	latestShipCheck,
	overrideShipCheck,
	recheckOpenOrders
} from '../../src/lib/server/shipping/order-checks';
import type { ForecastSource } from '../../src/lib/server/weather/source';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const DAY1 = '2026-12-01';
const DAY2 = '2026-12-02';

const ORIGIN_ZIP = '37902'; // the demo shop, Knoxville TN
// Real ZIPs (in the zipcodes dataset), none of them a demo customer's.
const COLD_ZIP = '55401'; // Minneapolis MN
const HOT_ZIP = '85004'; // Phoenix AZ
const FAILING_ZIP = '04401'; // Bangor ME

type Weather = 'cold' | 'hot' | 'mild' | 'fail';
const READINGS: Record<Exclude<Weather, 'fail'>, { lowF: number; highF: number }> = {
	cold: { lowF: 10, highF: 20 }, // under the 25 °F hold limit
	hot: { lowF: 74, highF: 90 }, // over 85 °F (cold pack), not over 95 °F (hold)
	mild: { lowF: 55, highF: 70 } // inside every limit
};

/** Days from DAY1 for any ZIP, from a weather table the tests change between runs. */
function stubSource(weather: Map<string, Weather>): ForecastSource {
	return {
		async daily(zip, days) {
			const kind = weather.get(zip) ?? 'mild';
			if (kind === 'fail') return { ok: false, problem: 'stub: provider unreachable' };
			return {
				ok: true,
				from: 'service',
				days: Array.from({ length: days }, (_, i) => ({
					date: addDays(DAY1, i),
					...READINGS[kind]
				}))
			};
		}
	};
}

describe('ship checks on orders', () => {
	let scratch: ScratchDatabase;
	let teoId: string;
	let listingId: number;
	let orderSeq = 20000;
	const weather = new Map<string, Weather>([
		[ORIGIN_ZIP, 'mild'],
		[COLD_ZIP, 'cold'],
		[HOT_ZIP, 'hot'],
		[FAILING_ZIP, 'fail']
	]);
	const source = stubSource(weather);
	const system = { kind: 'system' as const };

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: DAY1 });
		const teo = DEMO_ACCOUNTS.find((account) => account.role === 'keeper')!;
		teoId = (
			await scratch.db
				.selectFrom('User')
				.select('id')
				.where('email', '=', teo.email)
				.executeTakeFirstOrThrow()
		).id;
		listingId = (
			await scratch.db
				.selectFrom('listing')
				.select('id')
				.where('kind', '=', 'animal')
				.orderBy('id')
				.executeTakeFirstOrThrow()
		).id;
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	/** A paid (or otherwise placed) order of live animals to `zip`. */
	async function placeOrder(
		zip: string,
		options: { state?: OrderState; shipOn?: string | null; service?: Service } = {}
	): Promise<{ id: number; email: string; orderNumber: string }> {
		orderSeq++;
		const email = `buyer-${orderSeq}@example.test`;
		const orderNumber = `HL-${orderSeq}`;
		const order = await scratch.db
			.insertInto('customer_order')
			.values({
				order_number: orderNumber,
				email,
				ship_name: 'Sample Buyer',
				ship_line1: '1 Sample Row',
				ship_city: 'Sampleton',
				ship_state: 'MN',
				ship_zip: zip,
				service: options.service ?? 'overnight',
				state: options.state ?? 'paid',
				subtotal_cents: 3000,
				shipping_cents: 4500,
				total_cents: 7500,
				paid_cents: 7500,
				ship_on: options.shipOn ?? null
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await scratch.db
			.insertInto('order_line')
			.values({
				order_id: order.id,
				listing_id: listingId,
				description: 'Sample live animals',
				quantity: 1,
				line_total_cents: 3000,
				is_live: true
			})
			.execute();
		return { id: order.id, email, orderNumber };
	}

	const orderRow = (id: number) =>
		scratch.db
			.selectFrom('customer_order')
			.select(['state', 'ship_on'])
			.where('id', '=', id)
			.executeTakeFirstOrThrow();
	const eventsOf = (id: number) =>
		scratch.db
			.selectFrom('order_event')
			.selectAll()
			.where('order_id', '=', id)
			.orderBy('id')
			.execute();
	const mailTo = (email: string) =>
		scratch.db
			.selectFrom('outgoing_mail')
			.select(['kind', 'subject', 'text_body'])
			.where('to_address', '=', email)
			.orderBy('id')
			.execute();

	it('schedules a paid order to a hot ZIP on the first safe day, with a cold pack', async () => {
		const order = await placeOrder(HOT_ZIP);
		const outcome = await checkOrder(scratch.db, source, order.id, system, { today: DAY1 });
		expect(outcome).toMatchObject({
			outcome: 'checked',
			fromState: 'paid',
			toState: 'scheduled',
			// Tuesday is an overnight ship weekday and Wednesday a business day.
			shipOn: DAY1,
			moved: true,
			mailed: null
		});
		expect(await orderRow(order.id)).toEqual({ state: 'scheduled', ship_on: DAY1 });

		const check = await latestShipCheck(scratch.db, order.id);
		expect(check).toMatchObject({
			decision: 'ship',
			shipDate: DAY1,
			deliveryDate: DAY2,
			packs: ['cold'],
			// 90 °F at the destination is between the pack and hold limits: facility pickup.
			facilityPickup: true,
			firstDate: DAY1,
			ruleVersion: RULE_VERSION,
			overrideReason: null
		});
		expect(check!.reasons.map((reason) => reason.rule)).toContain('cold_pack');
		const inputs = check!.inputs as ShipCheckSnapshot;
		expect(inputs).toMatchObject({
			today: DAY1,
			service: 'overnight',
			shipWeekdays: [1, 2, 3],
			thresholds: { heatPackBelowF: 50, holdBelowF: 25, coldPackAboveF: 85, holdAboveF: 95 },
			originZip: ORIGIN_ZIP,
			destinationZip: HOT_ZIP,
			forecastProblems: {}
		});
		// The shop's default horizon is 10 days (shop_setting.forecast_horizon_days).
		expect(inputs.destination).toHaveLength(10);

		const events = await eventsOf(order.id);
		expect(events).toHaveLength(1);
		expect(events[0]).toMatchObject({
			from_state: 'paid',
			to_state: 'scheduled',
			actor_kind: 'system',
			actor_user_id: null
		});
		expect(events[0]!.note).toContain('cold pack');
		// Paid to scheduled: the customer has had no date yet, so nothing was lost or moved.
		expect(await mailTo(order.email)).toEqual([]);
	});

	let heldOrder: { id: number; email: string; orderNumber: string };

	it('holds a paid order to a cold ZIP, with the reasons', async () => {
		heldOrder = await placeOrder(COLD_ZIP);
		const outcome = await checkOrder(scratch.db, source, heldOrder.id, system, { today: DAY1 });
		expect(outcome).toMatchObject({ outcome: 'checked', toState: 'weather_hold', shipOn: null });
		expect(await orderRow(heldOrder.id)).toEqual({ state: 'weather_hold', ship_on: null });
		const check = await latestShipCheck(scratch.db, heldOrder.id);
		expect(check).toMatchObject({ decision: 'hold', shipDate: null, recheckDate: DAY2 });
		expect(check!.reasons).toContainEqual({
			rule: 'hold_below',
			date: DAY2,
			place: 'destination',
			valueF: 10,
			limitF: 25
		});
		expect((await eventsOf(heldOrder.id)).map((event) => event.to_state)).toEqual(['weather_hold']);
	});

	let failingOrder: { id: number; email: string; orderNumber: string };

	it('holds, never ships, when the forecast cannot be had', async () => {
		failingOrder = await placeOrder(FAILING_ZIP);
		const outcome = await checkOrder(scratch.db, source, failingOrder.id, system, {
			today: DAY1
		});
		expect(outcome).toMatchObject({ outcome: 'checked', toState: 'weather_hold' });
		const check = await latestShipCheck(scratch.db, failingOrder.id);
		expect(check!.decision).toBe('hold');
		expect(new Set(check!.reasons.map((reason) => reason.rule))).toEqual(new Set(['no_forecast']));
		expect((check!.inputs as ShipCheckSnapshot).forecastProblems).toEqual({
			destination: 'stub: provider unreachable'
		});
	});

	it('takes a scheduled date away when the forecast fails, and tells the customer once', async () => {
		const order = await placeOrder(ORIGIN_ZIP, { state: 'scheduled', shipOn: DAY2 });
		const nothingWorks: ForecastSource = {
			daily: async () => ({ ok: false, problem: 'stub: everything is down' })
		};
		const first = await checkOrder(scratch.db, nothingWorks, order.id, system, { today: DAY1 });
		expect(first).toMatchObject({
			toState: 'weather_hold',
			previousShipOn: DAY2,
			mailed: 'ship_date_lost'
		});
		const again = await checkOrder(scratch.db, nothingWorks, order.id, system, { today: DAY1 });
		expect(again).toMatchObject({ toState: 'weather_hold', moved: false, mailed: null });
		const mail = await mailTo(order.email);
		expect(mail.map((row) => row.kind)).toEqual(['ship_date_lost']);
		expect(mail[0]!.text_body).toContain('was due to ship on Wed, Dec 2, 2026');
		expect(mail[0]!.text_body).toContain('There is no forecast yet');
	});

	it('leaves a scheduled date alone while it is still safe, even if an earlier day opens', async () => {
		const order = await placeOrder(ORIGIN_ZIP, { state: 'scheduled', shipOn: DAY2 });
		const outcome = await checkOrder(scratch.db, source, order.id, system, { today: DAY1 });
		expect(outcome).toMatchObject({ toState: 'scheduled', shipOn: DAY2, moved: false });
		expect(await eventsOf(order.id)).toEqual([]);
	});

	it('schedules a held order on the next daily run and sends one e-mail, however often it runs', async () => {
		const untouched = await scratch.db
			.selectFrom('customer_order')
			.select(['id', 'state', 'ship_on', 'updated_at'])
			.where('state', 'in', ['packed', 'shipped', 'delivered'])
			.orderBy('id')
			.execute();
		expect(untouched.length).toBeGreaterThan(0);
		const checksBefore = await scratch.db
			.selectFrom('ship_check')
			.select(sql<number>`count(*)::int`.as('count'))
			.where(
				'order_id',
				'in',
				untouched.map((order) => order.id)
			)
			.executeTakeFirstOrThrow();

		weather.set(COLD_ZIP, 'mild');
		const log: string[] = [];
		const firstRun = await recheckOpenOrders(scratch.db, source, DAY2, {
			log: (line) => log.push(line)
		});
		expect(firstRun.failed).toBe(0);
		expect(firstRun.mailed).toBeGreaterThanOrEqual(1);
		// Wednesday is an overnight ship weekday and Thursday a business day.
		expect(await orderRow(heldOrder.id)).toEqual({ state: 'scheduled', ship_on: DAY2 });

		const secondRun = await recheckOpenOrders(scratch.db, source, DAY2);
		expect(secondRun).toMatchObject({ moved: 0, mailed: 0, failed: 0 });

		const mail = await mailTo(heldOrder.email);
		expect(mail.map((row) => row.kind)).toEqual(['ship_date_set']);
		expect(mail[0]!.subject).toContain('ships Wed, Dec 2, 2026');
		expect(mail[0]!.text_body).toContain('should arrive on Thu, Dec 3, 2026');
		expect(mail[0]!.text_body).toContain('USDA APHIS');
		expect(log).toEqual([]);

		// Packed, shipped and delivered orders: not one field or ship check changed.
		const after = await scratch.db
			.selectFrom('customer_order')
			.select(['id', 'state', 'ship_on', 'updated_at'])
			.where(
				'id',
				'in',
				untouched.map((order) => order.id)
			)
			.orderBy('id')
			.execute();
		expect(after).toEqual(untouched);
		const checksAfter = await scratch.db
			.selectFrom('ship_check')
			.select(sql<number>`count(*)::int`.as('count'))
			.where(
				'order_id',
				'in',
				untouched.map((order) => order.id)
			)
			.executeTakeFirstOrThrow();
		expect(checksAfter.count).toBe(checksBefore.count);
	});

	it('logs one order that fails and goes on with the rest', async () => {
		const refusedOrder = await placeOrder(HOT_ZIP);
		const goodOrder = await placeOrder(HOT_ZIP);
		// The database refuses this one order's ship check, as a lost connection would.
		await sql`create function refuse_one_check() returns trigger language plpgsql as $$
			begin
				if new.order_id = ${sql.lit(refusedOrder.id)} then raise exception 'refused for the test'; end if;
				return new;
			end $$`.execute(scratch.db);
		await sql`create trigger refuse_one_check before insert on ship_check
			for each row execute function refuse_one_check()`.execute(scratch.db);
		try {
			const log: string[] = [];
			const counts = await recheckOpenOrders(scratch.db, source, DAY2, {
				log: (line) => log.push(line)
			});
			expect(counts.failed).toBe(1);
			expect(log).toEqual([`[ship-recheck] ${refusedOrder.orderNumber}: refused for the test`]);
			expect(await orderRow(refusedOrder.id)).toEqual({ state: 'paid', ship_on: null });
			expect(await orderRow(goodOrder.id)).toEqual({ state: 'scheduled', ship_on: DAY2 });
		} finally {
			await sql`drop trigger refuse_one_check on ship_check`.execute(scratch.db);
			await sql`drop function refuse_one_check()`.execute(scratch.db);
		}
	});

	describe('keeper overrides', () => {
		const keeper = () => ({ userId: teoId, ip: '192.0.2.7' });
		const checkCount = async (orderId: number) =>
			(
				await scratch.db
					.selectFrom('ship_check')
					.select(sql<number>`count(*)::int`.as('count'))
					.where('order_id', '=', orderId)
					.executeTakeFirstOrThrow()
			).count;

		it('refuses a short reason, a weekend day and a past day, writing nothing', async () => {
			const before = await checkCount(failingOrder.id);
			const short = await overrideShipCheck(
				scratch.db,
				keeper(),
				failingOrder.id,
				{ decision: 'ship', shipDate: '2026-12-03', reason: 'ok' },
				{ today: DAY1 }
			);
			expect(short).toMatchObject({ ok: false, field: 'reason' });
			const weekend = await overrideShipCheck(
				scratch.db,
				keeper(),
				failingOrder.id,
				{ decision: 'ship', shipDate: '2026-12-05', reason: 'Buyer asked for the weekend.' },
				{ today: DAY1 }
			);
			expect(weekend).toMatchObject({ ok: false, field: 'shipDate' });
			if (!weekend.ok) expect(weekend.problem).toMatch(/weekend/);
			const past = await overrideShipCheck(
				scratch.db,
				keeper(),
				failingOrder.id,
				{ decision: 'ship', shipDate: '2026-11-30', reason: 'Should have gone Monday.' },
				{ today: DAY1 }
			);
			expect(past).toMatchObject({ ok: false, field: 'shipDate' });
			expect(await checkCount(failingOrder.id)).toBe(before);
			expect(await orderRow(failingOrder.id)).toEqual({ state: 'weather_hold', ship_on: null });
		});

		it('ships on the keeper’s day with the reason recorded, audited and mailed', async () => {
			const previous = await latestShipCheck(scratch.db, failingOrder.id);
			const reason = 'Forecast service is down; local forecast for Bangor is mild all week.';
			const outcome = await overrideShipCheck(
				scratch.db,
				keeper(),
				failingOrder.id,
				{ decision: 'ship', shipDate: '2026-12-03', reason },
				{ today: DAY1 }
			);
			expect(outcome).toMatchObject({
				ok: true,
				fromState: 'weather_hold',
				toState: 'scheduled',
				shipOn: '2026-12-03',
				mailed: 'ship_date_set'
			});
			expect(await orderRow(failingOrder.id)).toEqual({
				state: 'scheduled',
				ship_on: '2026-12-03'
			});
			const check = await latestShipCheck(scratch.db, failingOrder.id);
			expect(check).toMatchObject({
				decision: 'ship',
				shipDate: '2026-12-03',
				// Thursday overnight arrives Friday, a business day.
				deliveryDate: '2026-12-04',
				packs: [],
				overrideReason: reason,
				overriddenBy: teoId
			});
			expect(check!.inputs).toEqual(previous!.inputs);

			const event = (await eventsOf(failingOrder.id)).at(-1);
			expect(event).toMatchObject({
				from_state: 'weather_hold',
				to_state: 'scheduled',
				actor_kind: 'user',
				actor_user_id: teoId,
				note: reason
			});
			const audit = await scratch.db
				.selectFrom('audit_log')
				.selectAll()
				.where('action', '=', 'ship_check.override')
				.where('entity_id', '=', String(failingOrder.id))
				.execute();
			expect(audit).toHaveLength(1);
			expect(audit[0]).toMatchObject({ actor_user_id: teoId, actor_ip: '192.0.2.7' });
			expect(audit[0]!.detail).toMatchObject({ decision: 'ship', shipDate: '2026-12-03', reason });
			expect((await mailTo(failingOrder.email)).map((row) => row.kind)).toEqual(['ship_date_set']);
		});

		it('is left standing by the daily job, and replaced by a keeper’s own check', async () => {
			const bySystem = await checkOrder(scratch.db, source, failingOrder.id, system, {
				today: DAY1
			});
			expect(bySystem).toMatchObject({ outcome: 'skipped', why: 'override_stands' });
			expect(await orderRow(failingOrder.id)).toEqual({
				state: 'scheduled',
				ship_on: '2026-12-03'
			});

			const byKeeper = await checkOrder(
				scratch.db,
				source,
				failingOrder.id,
				{ kind: 'user', userId: teoId, ip: '192.0.2.7' },
				{ today: DAY1 }
			);
			expect(byKeeper).toMatchObject({
				outcome: 'checked',
				toState: 'weather_hold',
				mailed: 'ship_date_lost'
			});
			const audit = await scratch.db
				.selectFrom('audit_log')
				.select(['actor_user_id', 'actor_ip'])
				.where('action', '=', 'ship_check.run')
				.where('entity_id', '=', String(failingOrder.id))
				.execute();
			expect(audit).toEqual([{ actor_user_id: teoId, actor_ip: '192.0.2.7' }]);
		});

		it('holds on the keeper’s word and refuses an order that is already packed', async () => {
			const order = await placeOrder(HOT_ZIP, { state: 'scheduled', shipOn: DAY2 });
			const held = await overrideShipCheck(
				scratch.db,
				keeper(),
				order.id,
				{ decision: 'hold', reason: 'Animals are molting; wait until they harden.' },
				{ today: DAY1 }
			);
			expect(held).toMatchObject({ ok: true, toState: 'weather_hold', mailed: 'ship_date_lost' });
			expect(await orderRow(order.id)).toEqual({ state: 'weather_hold', ship_on: null });
			const mail = await mailTo(order.email);
			expect(mail.map((row) => row.kind)).toEqual(['ship_date_lost']);
			// The keeper's reason stays in the back office; the weather is not blamed for it.
			expect(mail[0]!.text_body).toContain('the shop has put it on hold');
			expect(mail[0]!.text_body).not.toContain('molting');

			const packed = await placeOrder(HOT_ZIP, { state: 'packed', shipOn: DAY1 });
			const refused = await overrideShipCheck(
				scratch.db,
				keeper(),
				packed.id,
				{ decision: 'hold', reason: 'Trying to hold a packed box.' },
				{ today: DAY1 }
			);
			expect(refused).toMatchObject({ ok: false, field: '' });
		});
	});

	describe('the public estimate', () => {
		it('refuses an unknown ZIP, a malformed ZIP and an unknown service with 400', async () => {
			const ask = (zip: string | null, service: string | null) =>
				shipEstimate(scratch.db, source, { zip, service, today: DAY1 });
			// 00000 is not a ZIP the USPS assigns (and not in the zipcodes dataset).
			const unknown = await ask('00000', 'overnight');
			expect(unknown.status).toBe(400);
			expect(unknown.body).toEqual({ message: 'ZIP code 00000 does not exist.' });
			expect((await ask('8500', 'overnight')).status).toBe(400);
			expect((await ask(null, 'overnight')).status).toBe(400);
			expect((await ask(HOT_ZIP, 'ground')).status).toBe(400);
			expect((await ask(HOT_ZIP, null)).status).toBe(400);
		});

		it('estimates a hot ZIP with a cold pack, sentences and the cautions', async () => {
			const answer = await shipEstimate(scratch.db, source, {
				zip: HOT_ZIP,
				service: 'two_day',
				today: DAY1
			});
			expect(answer.status).toBe(200);
			if (answer.status !== 200) return;
			// Two-day ships Monday and Tuesday: Tuesday Dec 1 arrives Thursday Dec 3.
			expect(answer.body).toMatchObject({
				decision: 'ship',
				shipDate: DAY1,
				deliveryDate: '2026-12-03',
				packs: ['cold'],
				facilityPickup: true
			});
			expect(answer.body.reasons.length).toBeGreaterThan(0);
			for (const reason of answer.body.reasons) expect(reason.text.length).toBeGreaterThan(20);
			expect(answer.body.cautions.map((caution) => caution.title)).toContain("Your state's rules");
		});

		it('limits each address on PostgreSQL and says when to come back', async () => {
			const pool = createPool(scratch.url, 2);
			try {
				const limiter = createEstimateLimiter(pool, { points: 2, seconds: 60 });
				expect(await limiter.consume('203.0.113.9')).toEqual({ allowed: true });
				expect(await limiter.consume('203.0.113.9')).toEqual({ allowed: true });
				const refused = await limiter.consume('203.0.113.9');
				expect(refused).toMatchObject({ allowed: false, firstRefusal: true });
				if (!refused.allowed) {
					expect(refused.retryAfterSeconds).toBeGreaterThanOrEqual(1);
					expect(refused.retryAfterSeconds).toBeLessThanOrEqual(60);
				}
				expect(await limiter.consume('203.0.113.10')).toEqual({ allowed: true });
			} finally {
				await pool.end();
			}
		});
	});

	it('has the daily re-check queue installed beside the mail queues', async () => {
		const queue = await sql<{ name: string; policy: string }>`
			select name, policy from pgboss.queue where name = 'ship-recheck'`.execute(scratch.db);
		expect(queue.rows).toEqual([{ name: 'ship-recheck', policy: 'stately' }]);
	});

	it('schedules the re-check in the shop’s time zone and runs it for the shop’s date', async () => {
		// A job already waiting is picked up by the worker's first fetch.
		await getBoss().send(SHIP_RECHECK_QUEUE, {}, { db: jobSqlOn(scratch.db) });
		let ranFor: (today: string) => void = () => undefined;
		const ran = new Promise<string>((resolve) => (ranFor = resolve));
		const log: string[] = [];
		const runner = await startJobs({
			connectionString: scratch.url,
			smtpUrl: 'smtp://127.0.0.1:9',
			mailFrom: 'Mossback Hollow Inverts <shop@mossback.example.com>',
			log: (line) => log.push(line),
			shipRecheck: {
				run: async (_db, today) => {
					ranFor(today);
					return 'stub run';
				}
			}
		});
		try {
			await runner.ready;
			const today = await ran;
			expect(today).toMatch(/^\d{4}-\d{2}-\d{2}$/);
			const schedule = await sql<{ cron: string; timezone: string | null }>`
				select cron, timezone from pgboss.schedule where name = 'ship-recheck'`.execute(scratch.db);
			// The demo shop is in Knoxville, TN: America/New_York (seed/sales.ts DEMO_SHOP).
			expect(schedule.rows).toEqual([{ cron: SHIP_RECHECK_CRON, timezone: 'America/New_York' }]);
		} finally {
			await runner.stop();
		}
	});
});
