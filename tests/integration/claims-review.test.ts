// The owner's claim pages on a scratch copy of the demo: the list puts open claims first
// (oldest filed first) and decided ones after (newest decision first) and filters by
// state; one claim's review picks the last ship check that said ship and reads the
// forecast for the delivery day (in the shop's zone) out of a hand-made stored snapshot;
// only the admin loads the pages or posts the decisions, which call the claims module.
//
// Time-zone facts used below: US daylight time ended on Sun 1 Nov 2026 (first Sunday in
// November, 15 U.S.C. 260a as amended in 2005), so New York is UTC−5 for the rest of
// November: 2026-11-20T03:30Z is 10:30 PM on Thu 19 Nov there. The shop's zone of the
// demo is America/New_York.
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { isActionFailure, isHttpError, isRedirect } from '@sveltejs/kit';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import { DECLINE_REASON_MIN } from '../../src/lib/claims/decision-form';
import { NO_FORECAST_FOR_DAY } from '../../src/lib/claims/delivery-weather';
import { addDays, todayInZone } from '../../src/lib/format/dates';
import type { SessionUser } from '../../src/lib/server/auth/guard';
import { fileClaim, MIN_DECLINE_REASON } from '../../src/lib/server/claims/claims';
import { claimForReview, listClaims } from '../../src/lib/server/claims/review';
import type { ForecastSource } from '../../src/lib/server/weather/source';
import { load as loadList } from '../../src/routes/admin/claims/+page.server';
import { actions, load as loadClaim } from '../../src/routes/admin/claims/[id]/+page.server';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

// The routes open the app's database and forecast source; here those are the scratch copy
// and a stub with mild days everywhere (inside every limit of the ship check).
const current = vi.hoisted(() => ({ db: undefined as unknown, weather: undefined as unknown }));
vi.mock('$lib/server/db', () => ({ getDb: () => current.db }));
vi.mock('$lib/server/weather', () => ({ forecastSource: () => current.weather }));

const ZONE = 'America/New_York';
const IP = '203.0.113.9';

type Persona = 'admin' | 'keeper' | 'customer';

describe('the owner’s claim pages', () => {
	let scratch: ScratchDatabase;
	let storageDir: string;
	const people = new Map<Persona, SessionUser>();
	/** Delivered demo orders without a claim, by the letter the tests give them. */
	const orders: Record<'A' | 'B' | 'C', { id: number; number: string; userId: string }> =
		{} as never;
	const claimIds: Record<'A' | 'B' | 'C' | 'HL-10005' | 'HL-10008', number> = {} as never;
	const shipCheckIds: Record<'early' | 'released' | 'held', number> = {} as never;

	beforeAll(async () => {
		storageDir = await mkdtemp(path.join(os.tmpdir(), 'hatchlot-claims-review-'));
		process.env.PHOTO_STORAGE_DIR = storageDir;
		scratch = await scratchDatabase();
		current.db = scratch.db;
		const today = todayInZone(ZONE);
		current.weather = {
			async daily(_zip, days) {
				return {
					ok: true,
					from: 'service',
					days: Array.from({ length: days }, (_, i) => ({
						date: addDays(today, i),
						lowF: 55,
						highF: 70
					}))
				};
			}
		} satisfies ForecastSource;
		await seedDemo(scratch.db, { today: '2026-12-01' });
		for (const role of ['admin', 'keeper', 'customer'] as const) {
			const email = DEMO_ACCOUNTS.find((account) => account.role === role)!.email;
			const row = await scratch.db
				.selectFrom('User')
				.select(['id', 'name', 'email'])
				.where('email', '=', email)
				.executeTakeFirstOrThrow();
			people.set(role, { ...row, role });
		}
		for (const number of ['HL-10005', 'HL-10008'] as const) {
			claimIds[number] = (
				await scratch.db
					.selectFrom('claim')
					.innerJoin('customer_order as o', 'o.id', 'claim.order_id')
					.select('claim.id')
					.where('o.order_number', '=', number)
					.executeTakeFirstOrThrow()
			).id;
		}

		const delivered = await scratch.db
			.selectFrom('customer_order as o')
			.select(['o.id', 'o.order_number', 'o.user_id'])
			.where('o.state', '=', 'delivered')
			.where('o.user_id', 'is not', null)
			.where((eb) =>
				eb.not(
					eb.exists(eb.selectFrom('claim').select('id').whereRef('claim.order_id', '=', 'o.id'))
				)
			)
			.where((eb) =>
				eb.exists(
					eb
						.selectFrom('order_line')
						.select('id')
						.whereRef('order_line.order_id', '=', 'o.id')
						.where('order_line.is_live', '=', true)
				)
			)
			.orderBy('o.id')
			.limit(3)
			.execute();
		expect(delivered).toHaveLength(3);
		(['A', 'B', 'C'] as const).forEach((letter, i) => {
			const row = delivered[i]!;
			orders[letter] = { id: row.id, number: row.order_number, userId: row.user_id! };
		});
		const firstLiveLine = async (orderId: number) =>
			scratch.db
				.selectFrom('order_line')
				.select(['id', 'quantity'])
				.where('order_id', '=', orderId)
				.where('is_live', '=', true)
				.orderBy('id')
				.executeTakeFirstOrThrow();

		// A: filed by its customer through the claims module, with a photo, 45 minutes after
		// delivery; the claim takes the database's clock, so A is delivered 45 minutes ago.
		const now = new Date();
		await scratch.db
			.updateTable('customer_order')
			.set({ delivered_at: new Date(now.getTime() - 45 * 60_000) })
			.where('id', '=', orders.A.id)
			.execute();
		const photo = await sharp({
			create: { width: 800, height: 600, channels: 3, background: '#6b4f2a' }
		})
			.jpeg()
			.toBuffer();
		const lineA = await firstLiveLine(orders.A.id);
		const filed = await fileClaim(
			scratch.db,
			{ userId: orders.A.userId, ip: IP },
			{
				orderNumber: orders.A.number,
				lines: [{ orderLineId: lineA.id, deadCount: 1 }],
				note: 'One was curled up and still when the box was opened.',
				photos: [{ name: 'box.jpg', bytes: photo }]
			},
			now
		);
		if (!filed.ok) throw new Error(filed.problem);
		claimIds.A = filed.claimId;

		// B: open, filed earliest of all, its customer's name blanked so the ship-to name stands in.
		await scratch.db
			.updateTable('customer_order')
			.set({ delivered_at: new Date('2026-11-20T03:30:00Z') })
			.where('id', '=', orders.B.id)
			.execute();
		await scratch.db
			.updateTable('User')
			.set({ name: null })
			.where('id', '=', orders.B.userId)
			.execute();
		const linesB = await scratch.db
			.selectFrom('order_line')
			.select(['id', 'quantity'])
			.where('order_id', '=', orders.B.id)
			.orderBy('id')
			.execute();
		claimIds.B = (
			await scratch.db
				.insertInto('claim')
				.values({
					order_id: orders.B.id,
					user_id: orders.B.userId,
					note: 'Two arrived dead.',
					filed_at: new Date('2026-11-20T04:10:00Z')
				})
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
		// Every line of B has a dead count: the list sums them.
		await scratch.db
			.insertInto('claim_line')
			.values(
				linesB.map((line) => ({ claim_id: claimIds.B, order_line_id: line.id, dead_count: 1 }))
			)
			.execute();

		// C: declined after HL-10005 was refunded, so it lists first of the decided.
		const lineC = await firstLiveLine(orders.C.id);
		claimIds.C = (
			await scratch.db
				.insertInto('claim')
				.values({
					order_id: orders.C.id,
					user_id: orders.C.userId,
					state: 'declined',
					filed_at: new Date('2026-11-27T18:00:00Z'),
					decided_at: new Date('2026-11-30T14:00:00Z'),
					decided_by: people.get('admin')!.id,
					decision_note: 'The parcel was redirected to another address.'
				})
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
		await scratch.db
			.insertInto('claim_line')
			.values({ claim_id: claimIds.C, order_line_id: lineC.id, dead_count: 1 })
			.execute();

		// B's ship checks: an early one that said ship, the one the box went on, and a later hold
		// (a hold written after the box left must not be taken for the check that let it go).
		const snapshot = (destination: object[], origin: object[], deliveryDate: string) => ({
			today: '2026-11-16',
			service: 'overnight',
			originZip: '37902',
			destinationZip: '55805',
			thresholds: { heatPackBelowF: 50, holdBelowF: 25, coldPackAboveF: 85, holdAboveF: 95 },
			origin,
			destination,
			plannedFor: deliveryDate
		});
		const insertCheck = (values: {
			decision: 'ship' | 'hold';
			ship_date: string | null;
			delivery_date: string | null;
			recheck_date: string | null;
			inputs: object;
		}) =>
			scratch.db
				.insertInto('ship_check')
				.values({
					order_id: orders.B.id,
					first_date: '2026-11-16',
					service: 'overnight',
					packs: [],
					reasons: JSON.stringify([]),
					rule_version: 'ship-check/1',
					...values,
					inputs: JSON.stringify(values.inputs)
				})
				.returning('id')
				.executeTakeFirstOrThrow();
		shipCheckIds.early = (
			await insertCheck({
				decision: 'ship',
				ship_date: '2026-11-16',
				delivery_date: '2026-11-17',
				recheck_date: null,
				inputs: snapshot(
					[{ date: '2026-11-19', lowF: 60, highF: 70 }],
					[{ date: '2026-11-19', lowF: 61, highF: 71 }],
					'2026-11-17'
				)
			})
		).id;
		shipCheckIds.released = (
			await insertCheck({
				decision: 'ship',
				ship_date: '2026-11-18',
				delivery_date: '2026-11-19',
				recheck_date: null,
				inputs: snapshot(
					[
						{ date: '2026-11-18', lowF: 22, highF: 30 },
						{ date: '2026-11-19', lowF: 27, highF: 36 },
						{ date: '2026-11-20', lowF: 31, highF: 40 }
					],
					[
						{ date: '2026-11-18', lowF: 40, highF: 57 },
						{ date: '2026-11-19', lowF: 44, highF: 60 },
						{ date: '2026-11-20', lowF: 48, highF: 62 }
					],
					'2026-11-19'
				)
			})
		).id;
		shipCheckIds.held = (
			await insertCheck({
				decision: 'hold',
				ship_date: null,
				delivery_date: null,
				recheck_date: '2026-11-21',
				inputs: snapshot(
					[{ date: '2026-11-19', lowF: 5, highF: 10 }],
					[{ date: '2026-11-19', lowF: 5, highF: 10 }],
					'2026-11-19'
				)
			})
		).id;
	});
	afterAll(async () => {
		delete process.env.PHOTO_STORAGE_DIR;
		await scratch?.drop();
		if (storageDir) await rm(storageDir, { recursive: true, force: true });
	});

	const filedAt = async (claimId: number) =>
		(
			await scratch.db
				.selectFrom('claim')
				.select('filed_at')
				.where('id', '=', claimId)
				.executeTakeFirstOrThrow()
		).filed_at;

	describe('listClaims', () => {
		it('puts open claims first, oldest filed first, then decided ones, newest decision first', async () => {
			// The fixtures' times bracket the demo's open claim (filed 40 min after a November delivery).
			const demoFiled = await filedAt(claimIds['HL-10008']);
			expect(demoFiled.getTime()).toBeGreaterThan(new Date('2026-11-20T04:10:00Z').getTime());
			expect(demoFiled.getTime()).toBeLessThan((await filedAt(claimIds.A)).getTime());

			const list = await listClaims(scratch.db);
			expect(list.rows.map((row) => row.id)).toEqual([
				claimIds.B,
				claimIds['HL-10008'],
				claimIds.A,
				claimIds.C,
				claimIds['HL-10005']
			]);
			expect(list).toMatchObject({
				total: 5,
				openCount: 3,
				countsByState: { open: 3, refunded: 1, reshipped: 0, declined: 1 }
			});
		});

		it('gives each row its order, customer, dead count and time after delivery', async () => {
			const rows = new Map((await listClaims(scratch.db)).rows.map((row) => [row.id, row]));
			// The demo's HL-10008 claim: one dead, filed 40 minutes after delivery (seed/sales.ts).
			expect(rows.get(claimIds['HL-10008'])).toMatchObject({
				orderNumber: 'HL-10008',
				customerName: 'Marisol Ocampo',
				email: 'marisol.ocampo@example.com',
				deadCount: 1,
				state: 'open'
			});
			expect(rows.get(claimIds['HL-10008'])!.hoursAfterDelivery).toBeCloseTo(40 / 60, 9);
			// A: filed 45 minutes after delivery (give or take the database's clock against ours).
			expect(rows.get(claimIds.A)!.hoursAfterDelivery).toBeCloseTo(0.75, 2);
			// B sums a dead animal on each of its lines; its customer has no name, so the ship-to name shows.
			const b = rows.get(claimIds.B)!;
			const linesOfB = await scratch.db
				.selectFrom('order_line')
				.select('id')
				.where('order_id', '=', orders.B.id)
				.execute();
			expect(b.deadCount).toBe(linesOfB.length);
			const shipName = await scratch.db
				.selectFrom('customer_order')
				.select('ship_name')
				.where('id', '=', orders.B.id)
				.executeTakeFirstOrThrow();
			expect(b.customerName).toBe(shipName.ship_name);
			expect(b.hoursAfterDelivery).toBeCloseTo(40 / 60, 9);
		});

		it('filters by state, counts the open ones whatever the filter, and stops at the limit', async () => {
			const open = await listClaims(scratch.db, { state: 'open' });
			expect(open.rows.map((row) => row.state)).toEqual(['open', 'open', 'open']);
			expect(open.total).toBe(3);
			const declined = await listClaims(scratch.db, { state: 'declined' });
			expect(declined.rows.map((row) => row.id)).toEqual([claimIds.C]);
			expect(declined).toMatchObject({ total: 1, openCount: 3 });
			expect((await listClaims(scratch.db, { state: 'reshipped' })).rows).toEqual([]);
			const firstTwo = await listClaims(scratch.db, {}, { limit: 2 });
			expect(firstTwo.rows.map((row) => row.id)).toEqual([claimIds.B, claimIds['HL-10008']]);
			expect(firstTwo.total).toBe(5);
		});
	});

	describe('claimForReview', () => {
		it('picks the last check that said ship and the forecast for the delivery day in the shop’s zone', async () => {
			const review = await claimForReview(scratch.db, claimIds.B, { timeZone: ZONE });
			expect(review?.shipCheck?.id).toBe(shipCheckIds.released);
			expect(review?.shipCheck).toMatchObject({
				decision: 'ship',
				shipDate: '2026-11-18',
				deliveryDate: '2026-11-19'
			});
			// Delivered 03:30 UTC on the 20th = 10:30 PM on the 19th in New York: the 19th's readings.
			expect(review?.deliveredOn).toBe('2026-11-19');
			expect(review?.weather).toEqual({
				found: true,
				day: '2026-11-19',
				basis: 'delivered',
				destination: { date: '2026-11-19', lowF: 27, highF: 36 },
				origin: { date: '2026-11-19', lowF: 44, highF: 60 },
				destinationZip: '55805',
				originZip: '37902',
				thresholds: { heatPackBelowF: 50, holdBelowF: 25, coldPackAboveF: 85, holdAboveF: 95 }
			});
			expect(review?.hoursAfterDelivery).toBeCloseTo(40 / 60, 9);
			expect(review?.windowHours).toBe(2); // the demo keeps PRODUCT.md's default window
			expect(review?.filedInsideWindow).toBe(true);
		});

		it('falls back to the planned delivery date, then says no forecast was stored for the day', async () => {
			await scratch.db
				.updateTable('customer_order')
				.set({ delivered_at: new Date('2026-11-21T15:00:00Z') })
				.where('id', '=', orders.B.id)
				.execute();
			const planned = await claimForReview(scratch.db, claimIds.B, { timeZone: ZONE });
			// Now "delivered" a day after it was reported: not inside the window.
			expect(planned?.filedInsideWindow).toBe(false);
			expect(planned?.weather).toMatchObject({
				found: true,
				day: '2026-11-19',
				basis: 'planned',
				destination: { lowF: 27, highF: 36 }
			});
			await scratch.db
				.updateTable('ship_check')
				.set({ delivery_date: '2026-11-22' })
				.where('id', '=', shipCheckIds.released)
				.execute();
			const none = await claimForReview(scratch.db, claimIds.B, { timeZone: ZONE });
			expect(none?.weather).toEqual({
				found: false,
				day: '2026-11-21',
				problem: NO_FORECAST_FOR_DAY
			});
			// Put B back as the other tests expect it.
			await scratch.db
				.updateTable('ship_check')
				.set({ delivery_date: '2026-11-19' })
				.where('id', '=', shipCheckIds.released)
				.execute();
			await scratch.db
				.updateTable('customer_order')
				.set({ delivered_at: new Date('2026-11-20T03:30:00Z') })
				.where('id', '=', orders.B.id)
				.execute();
		});

		it('reads the demo’s stored snapshot: a hot destination and a mild origin on the day it arrived', async () => {
			const review = await claimForReview(scratch.db, claimIds['HL-10008'], { timeZone: ZONE });
			const delivered = review!.order.deliveredAt!;
			// The day in New York by Intl's own formatter ('en-CA' writes YYYY-MM-DD), not our helper.
			const day = new Intl.DateTimeFormat('en-CA', { timeZone: ZONE }).format(delivered);
			// seed/sales.ts: the hot (Tucson) forecast is 74–92 °F, Knoxville's 52–70 °F.
			expect(review?.weather).toMatchObject({
				found: true,
				day,
				basis: 'delivered',
				destination: { lowF: 74, highF: 92 },
				origin: { lowF: 52, highF: 70 }
			});
			expect(review?.deadLines).toHaveLength(1);
			const [dead] = review!.deadLines;
			expect(dead!.deadCount).toBe(1);
			// One of five juveniles sold singly: a fifth of the line total, to the cent.
			expect(dead!.animals).toBe(5);
			expect(dead!.deadShareCents).toBe(Math.round(dead!.lineTotalCents / 5));
			expect(review?.order.shippedAt).toBeInstanceOf(Date);
			const shipped = await scratch.db
				.selectFrom('order_event')
				.select('created_at')
				.where('order_id', '=', review!.order.id)
				.where('to_state', '=', 'shipped')
				.executeTakeFirstOrThrow();
			expect(review?.order.shippedAt).toEqual(shipped.created_at);
		});

		it('shows the decided claim’s decider, note and refund', async () => {
			const review = await claimForReview(scratch.db, claimIds['HL-10005'], { timeZone: ZONE });
			expect(review?.claim).toMatchObject({
				state: 'refunded',
				decidedByName: 'Wren Calloway'
			});
			// Two dead of three groups of 5 sold for $90.00: 9000 × 2 / 15 = 1200 cents, by hand, and
			// the same $12.00 the demo's owner refunded (seed/sales.ts prices the animal, not the group).
			expect(review?.deadLines).toEqual([
				expect.objectContaining({ deadCount: 2, quantity: 3, animals: 15, lineTotalCents: 9000 })
			]);
			expect(review?.deadLines[0]!.deadShareCents).toBe(1200);
			expect(review?.claim.refund).toMatchObject({ amountCents: 1200, status: 'succeeded' });
			expect(await claimForReview(scratch.db, 2_000_000_000)).toBeNull();
		});
	});

	// ---- the routes

	type ListEvent = Parameters<typeof loadList>[0];
	type ClaimEvent = Parameters<typeof loadClaim>[0];
	type ActionEvent = Parameters<NonNullable<(typeof actions)['decline']>>[0];
	const userOf = (persona: Persona | null) => (persona ? people.get(persona)! : null);
	const listEvent = (persona: Persona | null, query = '') =>
		({
			url: new URL(`http://127.0.0.1/admin/claims${query}`),
			locals: { user: userOf(persona), sessionToken: null }
		}) as unknown as ListEvent;
	const claimEvent = (persona: Persona | null, id: string) =>
		({
			url: new URL(`http://127.0.0.1/admin/claims/${id}`),
			params: { id },
			locals: { user: userOf(persona), sessionToken: null }
		}) as unknown as ClaimEvent;
	const actionEvent = (persona: Persona | null, id: number, name: string, fields: object) => {
		const url = new URL(`http://127.0.0.1/admin/claims/${id}?/${name}`);
		const body = new FormData();
		for (const [key, value] of Object.entries(fields)) body.append(key, String(value));
		return {
			url,
			params: { id: String(id) },
			request: new Request(url, { method: 'POST', body }),
			locals: { user: userOf(persona), sessionToken: null },
			getClientAddress: () => IP
		} as unknown as ActionEvent;
	};
	async function stopped(pending: unknown): Promise<number | string> {
		try {
			await pending;
		} catch (failure) {
			if (isHttpError(failure)) return failure.status;
			if (isRedirect(failure)) return failure.location;
			throw failure;
		}
		return 'let through';
	}
	type Answered = {
		status: number;
		form: {
			valid: boolean;
			errors: Record<string, string[] | undefined>;
			message?: { ok: boolean; text: string };
		};
	};
	async function answer(pending: unknown): Promise<Answered> {
		const result: unknown = await pending;
		// A refusal comes as fail()'s ActionFailure; a success as the plain { form } object.
		const [status, body]: [number, unknown] = isActionFailure(result)
			? [result.status, result.data]
			: [200, result];
		return { status, ...(body as object) } as Answered;
	}
	const stateOf = async (claimId: number) =>
		(
			await scratch.db
				.selectFrom('claim')
				.select('state')
				.where('id', '=', claimId)
				.executeTakeFirstOrThrow()
		).state;

	describe('who loads the pages', () => {
		it('refuses keepers and customers with 403 and sends a visitor to sign in', async () => {
			for (const persona of ['keeper', 'customer'] as const) {
				expect(await stopped(loadList(listEvent(persona)))).toBe(403);
				expect(await stopped(loadClaim(claimEvent(persona, String(claimIds.A))))).toBe(403);
			}
			expect(await stopped(loadList(listEvent(null)))).toMatch(/^\/signin\?next=/);
			expect(await stopped(loadClaim(claimEvent(null, String(claimIds.A))))).toMatch(
				/^\/signin\?next=/
			);
		});

		it('gives the admin the list with its filter from the address, and a note for a bad one', async () => {
			type Loaded = { list: { rows: unknown[]; openCount: number }; problem: string | null };
			const open = (await loadList(listEvent('admin', '?state=open'))) as Loaded;
			expect(open.list.rows).toHaveLength(3);
			expect(open.problem).toBeNull();
			const unknown = (await loadList(listEvent('admin', '?state=lost'))) as Loaded;
			expect(unknown.list.rows).toHaveLength(5);
			expect(unknown.problem).toMatch(/every claim is shown/);
		});

		it('gives the admin one claim with its photos and the suggested refund; 404 for no such claim', async () => {
			type Loaded = {
				photos: { hash: string }[];
				money: { suggestedCents: number; refundableCents: number };
				forms: { refund: { data: { amount: string } } };
			};
			const loaded = (await loadClaim(claimEvent('admin', String(claimIds.A)))) as Loaded;
			expect(loaded.photos).toHaveLength(1);
			const review = await claimForReview(scratch.db, claimIds.A);
			const expected = review!.deadLines.reduce((sum, line) => sum + line.deadShareCents, 0);
			expect(loaded.money.suggestedCents).toBe(expected);
			// The amount box starts at the suggestion in dollars (two decimals, ISO 4217 for USD).
			expect(loaded.forms.refund.data.amount).toBe(
				`${Math.floor(expected / 100)}.${String(expected % 100).padStart(2, '0')}`
			);
			for (const id of ['abc', '0', '2000000000', '99999999999'])
				expect(await stopped(loadClaim(claimEvent('admin', id))), id).toBe(404);
		});
	});

	describe('the decisions', () => {
		it('keeps the decline reason’s minimum in step with the claims module', () => {
			expect(DECLINE_REASON_MIN).toBe(MIN_DECLINE_REASON);
		});

		it('refuses every decision from a keeper or a customer with 403, changing nothing', async () => {
			const posts = {
				refund: { amount: '1.00', note: 'Refund.' },
				reship: { note: '' },
				decline: { reason: 'Outside the guarantee terms.' }
			} as const;
			for (const persona of ['keeper', 'customer'] as const)
				for (const [name, fields] of Object.entries(posts)) {
					const action = actions[name as keyof typeof posts]!;
					expect(
						await stopped(action(actionEvent(persona, claimIds.A, name, fields))),
						`${persona} ${name}`
					).toBe(403);
				}
			expect(await stateOf(claimIds.A)).toBe('open');
			expect(
				await scratch.db
					.selectFrom('refund')
					.select('id')
					.where('order_id', '=', orders.A.id)
					.execute()
			).toEqual([]);
		});

		it('says a short decline reason beside the field, then declines with the reason and audits it', async () => {
			const short = await answer(
				actions.decline!(actionEvent('admin', claimIds.B, 'decline', { reason: 'No.' }))
			);
			expect(short.status).toBe(400);
			expect(short.form.errors.reason?.[0]).toMatch(/at least 10 characters/);
			expect(await stateOf(claimIds.B)).toBe('open');

			const reason = 'The parcel waited two days at a pickup point before it was collected.';
			const done = await answer(
				actions.decline!(actionEvent('admin', claimIds.B, 'decline', { reason }))
			);
			expect(done.status).toBe(200);
			expect(done.form.message).toEqual({
				ok: true,
				text: 'Claim declined; the customer is e-mailed your reason.'
			});
			const claim = await scratch.db
				.selectFrom('claim')
				.selectAll()
				.where('id', '=', claimIds.B)
				.executeTakeFirstOrThrow();
			expect(claim).toMatchObject({
				state: 'declined',
				decision_note: reason,
				decided_by: people.get('admin')!.id
			});
			const audit = await scratch.db
				.selectFrom('audit_log')
				.selectAll()
				.where('action', '=', 'claim.decline')
				.where('entity_id', '=', String(claimIds.B))
				.execute();
			expect(audit).toHaveLength(1);
			expect(audit[0]).toMatchObject({ actor_user_id: people.get('admin')!.id, actor_ip: IP });
		});

		it('refuses a refund above what is left beside the amount, and one on a decided claim, before Stripe', async () => {
			const tooMuch = await answer(
				actions.refund!(
					actionEvent('admin', claimIds.A, 'refund', { amount: '99999.00', note: 'Refund.' })
				)
			);
			expect(tooMuch.status).toBe(400);
			expect(tooMuch.form.errors.amount?.[0]).toMatch(
				/^At most \$[\d,]+\.\d{2} can still be refunded/
			);
			const decided = await answer(
				actions.refund!(actionEvent('admin', claimIds.B, 'refund', { amount: '', note: 'Refund.' }))
			);
			expect(decided.status).toBe(409);
			expect(decided.form.message).toEqual({ ok: false, text: 'This claim is not open any more.' });
			expect(
				await scratch.db
					.selectFrom('refund')
					.select('id')
					.where('order_id', 'in', [orders.A.id, orders.B.id])
					.execute()
			).toEqual([]);
		});

		it('reships at no charge through the ship check and names the new order', async () => {
			const done = await answer(
				actions.reship!(
					actionEvent('admin', claimIds.A, 'reship', { note: 'Replacements on the next safe day.' })
				)
			);
			expect(done.status).toBe(200);
			const claim = await scratch.db
				.selectFrom('claim')
				.innerJoin('customer_order as o', 'o.id', 'claim.reship_order_id')
				.select(['claim.state', 'o.order_number', 'o.state as order_state', 'o.total_cents'])
				.where('claim.id', '=', claimIds.A)
				.executeTakeFirstOrThrow();
			expect(claim).toMatchObject({ state: 'reshipped', order_state: 'scheduled', total_cents: 0 });
			expect(done.form.message?.ok).toBe(true);
			expect(done.form.message?.text).toContain(`Reship ${claim.order_number} made at no charge.`);
			const review = await claimForReview(scratch.db, claimIds.A);
			expect(review?.claim.reshipOrder).toMatchObject({
				number: claim.order_number,
				state: 'scheduled'
			});
			expect(review?.claim.reshipOrder?.shipOn).not.toBeNull();

			const again = await answer(
				actions.decline!(
					actionEvent('admin', claimIds.A, 'decline', { reason: 'Outside the guarantee terms.' })
				)
			);
			expect(again.status).toBe(409);
			expect(await stateOf(claimIds.A)).toBe('reshipped');
		});
	});

	describe('a claim no ship check cleared', () => {
		it('says so, and has no forecast to show', async () => {
			await scratch.db.deleteFrom('ship_check').where('order_id', '=', orders.B.id).execute();
			const review = await claimForReview(scratch.db, claimIds.B, { timeZone: ZONE });
			expect(review?.shipCheck).toBeNull();
			expect(review?.weather).toMatchObject({ found: false, day: '2026-11-19' });
		});
	});
});
