// Packing slips on a scratch copy of the demo, read back with tools from outside the
// project: pdfjs-dist finds the order number, every line and the packs in the text;
// pdftoppm (poppler) draws the page and jsQR reads its QR code back to the claim URL.
// Refusals say why; a 200-box day goes through the pg-boss job with progress.
import { isHttpError, isRedirect } from '@sveltejs/kit';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import type { SessionUser } from '../../src/lib/server/auth/guard';
import type { Db } from '../../src/lib/server/db/connect';
import { readSlipBatch, runSlipBatch } from '../../src/lib/server/fulfilment/slip-batches';
import { startJobs, type JobRunner } from '../../src/lib/server/jobs';
import { GET as dayGet, POST as dayPost } from '../../src/routes/manage/ship-day/slips/+server';
import { GET as orderGet } from '../../src/routes/manage/ship-day/slips/[number]/+server';
import { GET as batchGet } from '../../src/routes/manage/ship-day/slips/batches/[id]/+server';
import { scratchDatabase, type ScratchDatabase } from './support/databases';
import { decodeQr, rasterizePage, readPdf } from './support/pdf';

// The routes open the app's database through getDb(); here that is the scratch copy.
const current = vi.hoisted(() => ({ db: undefined as unknown }));
vi.mock('$lib/server/db', () => ({ getDb: () => current.db }));
// The shop's public origin, which the claim links on the slips point at.
const ORIGIN = 'https://shop.example.com';
vi.mock('$env/dynamic/private', () => ({ env: { ORIGIN: 'https://shop.example.com' } }));

/** Days of the demo's calendar no demo order ships on. */
const BIG_DAY = '2026-12-15';
const SMALL_DAY = '2026-12-14';

type Persona = 'keeper' | 'customer' | 'admin';

describe('packing slips', () => {
	let scratch: ScratchDatabase;
	const people: Partial<Record<Persona, SessionUser>> = {};
	let jobs: JobRunner | undefined;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		current.db = scratch.db as Db;
		await seedDemo(scratch.db, { today: '2026-12-01' });
		for (const role of ['keeper', 'customer', 'admin'] as const) {
			const account = DEMO_ACCOUNTS.find((a) => a.role === role)!;
			const user = await scratch.db
				.selectFrom('User')
				.select(['id', 'name', 'email'])
				.where('email', '=', account.email)
				.executeTakeFirstOrThrow();
			people[role] = { ...user, role };
		}
	});
	afterAll(async () => {
		await jobs?.stop();
		await scratch?.drop();
	});

	function event(
		path: string,
		persona: Persona | null,
		options: { method?: string; accept?: string; params?: Record<string, string> } = {}
	) {
		const url = new URL(`${ORIGIN}${path}`);
		return {
			url,
			params: options.params ?? {},
			request: new Request(url, {
				method: options.method ?? 'GET',
				headers: { accept: options.accept ?? 'application/pdf' }
			}),
			locals: { user: persona ? people[persona]! : null, sessionToken: null },
			getClientAddress: () => '127.0.0.1'
		} as unknown as Parameters<typeof dayGet>[0];
	}

	const orderSlip = (number: string, persona: Persona | null = 'keeper', accept?: string) =>
		orderGet(
			event(`/manage/ship-day/slips/${number}`, persona, { params: { number }, accept }) as never
		);

	async function pdfOf(response: Response): Promise<Uint8Array> {
		expect(response.status).toBe(200);
		expect(response.headers.get('content-type')).toBe('application/pdf');
		return new Uint8Array(await response.arrayBuffer());
	}

	/** What the database says goes in an order's box: lines and the packs of its ship check. */
	async function boxOf(number: string) {
		const order = await scratch.db
			.selectFrom('customer_order')
			.select(['id', 'ship_name', 'ship_city', 'ship_state', 'ship_zip'])
			.where('order_number', '=', number)
			.executeTakeFirstOrThrow();
		const lines = await scratch.db
			.selectFrom('order_line as l')
			.leftJoin('species as s', 's.id', 'l.species_id')
			.leftJoin('clutch as c', 'c.id', 'l.clutch_id')
			.select([
				'l.description',
				'l.quantity',
				'l.unit_size',
				'l.sex',
				's.common_name',
				's.scientific_name',
				'c.code as clutch_code'
			])
			.where('l.order_id', '=', order.id)
			.execute();
		const check = await scratch.db
			.selectFrom('ship_check')
			.select(['packs', 'facility_pickup'])
			.where('order_id', '=', order.id)
			.where('decision', '=', 'ship')
			.orderBy('id', 'desc')
			.executeTakeFirstOrThrow();
		return { order, lines, check };
	}

	it('prints one order: its number, address, every line and its packs, then a care card per species', async () => {
		const { order, lines, check } = await boxOf('HL-10011');
		const pages = await readPdf(await pdfOf(await orderSlip('HL-10011')));
		const slip = pages[0]!.text;
		expect(slip).toContain('PACKING SLIP');
		expect(slip).toContain('HL-10011');
		expect(slip).toContain(order.ship_name);
		expect(slip).toContain(`${order.ship_city}, ${order.ship_state} ${order.ship_zip}`);
		expect(slip).toContain('LIVE ANIMALS');
		expect(lines.length).toBeGreaterThan(0);
		for (const line of lines) {
			// Each line by its species' names, its units as bought and its animals.
			expect(slip).toContain(`${line.common_name} ${line.scientific_name}`);
			const units =
				line.sex === 'pair'
					? `${line.quantity} × pair`
					: `${line.quantity} × group of ${line.unit_size}`;
			expect(slip).toContain(units);
			expect(slip).toContain(`${line.clutch_code}`);
		}
		const animals = lines.reduce((sum, line) => sum + line.quantity * line.unit_size, 0);
		expect(slip).toContain(`In the box: ${animals} animals`);
		expect(check.packs.length).toBeGreaterThan(0);
		for (const pack of check.packs) expect(slip).toContain(`Add a ${pack} pack`);
		if (check.facility_pickup) expect(slip).toContain('Hold at a carrier facility');
		expect(slip).toContain(`${ORIGIN}/account/orders/HL-10011/claim`);

		// Then one care card per species in the box, with its cautions and the local rules.
		const species = [...new Set(lines.map((line) => line.common_name))];
		const cards = pages.slice(1);
		expect(cards).toHaveLength(species.length);
		for (const [index, name] of species.entries()) {
			expect(cards[index]!.text).toContain('CARE CARD');
			expect(cards[index]!.text).toContain(name!);
			expect(cards[index]!.text).toContain('Cautions');
			expect(cards[index]!.text).toContain('Wash your hands after every handling.');
			expect(cards[index]!.text).toContain('USDA APHIS');
		}
	});

	it('draws a QR code that a general-purpose decoder (jsQR) reads back as the claim URL', async () => {
		const pdf = await pdfOf(await orderSlip('HL-10011'));
		const page = await rasterizePage(pdf, 1, 150);
		// US Letter at 150 dpi: 8.5 × 11 in.
		expect([page.width, page.height]).toEqual([1275, 1650]);
		expect(decodeQr(page)).toBe(`${ORIGIN}/account/orders/HL-10011/claim`);
	});

	it('prints on A4 when the shop says so, with the code still readable', async () => {
		await scratch.db.updateTable('shop_setting').set({ slip_paper: 'a4' }).execute();
		try {
			const pdf = await pdfOf(await orderSlip('HL-10009'));
			const [first] = await readPdf(pdf);
			// ISO 216 A4, 210 × 297 mm, in points of 1/72 in.
			expect(first!.width).toBeCloseTo((210 / 25.4) * 72, 0);
			expect(first!.height).toBeCloseTo((297 / 25.4) * 72, 0);
			expect(decodeQr(await rasterizePage(pdf, 1, 150))).toBe(
				`${ORIGIN}/account/orders/HL-10009/claim`
			);
		} finally {
			await scratch.db.updateTable('shop_setting').set({ slip_paper: 'letter' }).execute();
		}
	});

	it('gives a box of supplies only no live-animal panel, guarantee or care card', async () => {
		const pages = await readPdf(await pdfOf(await orderSlip('HL-10010')));
		expect(pages).toHaveLength(1);
		expect(pages[0]!.text).toContain('KEEPING SUPPLIES');
		expect(pages[0]!.text).not.toContain('LIVE ANIMALS');
		expect(pages[0]!.text).toContain('Nothing live in this box');
		expect(pages[0]!.text).toContain('House substrate mix, 4 quarts');
	});

	it('sets names outside Latin-1 in the embedded font', async () => {
		await scratch.db
			.updateTable('customer_order')
			.set({ ship_name: 'Antonín Dvořák' })
			.where('order_number', '=', 'HL-10011')
			.execute();
		const [slip] = await readPdf(await pdfOf(await orderSlip('HL-10011')));
		// pdfjs reads the runs of two faces as separate items, so compare without spaces.
		expect(slip!.text.replace(/ /g, '')).toContain('AntonínDvořák');
	});

	it('refuses unpaid, cancelled, refunded and held orders with the reason, as text or a page', async () => {
		const cases: [string, RegExp][] = [];
		for (const [state, reason] of [
			['awaiting_payment', /is not paid yet/],
			['cancelled', /was cancelled/],
			['refunded', /was refunded in full/],
			['weather_hold', /is on weather hold/]
		] as const) {
			const order = await scratch.db
				.selectFrom('customer_order')
				.select('order_number')
				.where('state', '=', state)
				.orderBy('id')
				.executeTakeFirstOrThrow();
			cases.push([order.order_number, reason]);
		}
		for (const [number, reason] of cases) {
			const response = await orderSlip(number, 'keeper', 'text/plain');
			expect(response.status, number).toBe(409);
			const text = await response.text();
			expect(text).toContain(number);
			expect(text).toMatch(reason);
		}
		const page = await orderSlip(cases[0]![0], 'keeper', 'text/html');
		expect(page.status).toBe(409);
		expect(page.headers.get('content-type')).toContain('text/html');
		expect(await page.text()).toContain('Not printed');

		const missing = await orderSlip('HL-99999', 'keeper', 'text/plain');
		expect(missing.status).toBe(404);
	});

	it('is for keepers: a customer is refused and a visitor sent to sign in', async () => {
		for (const persona of ['customer', null] as const) {
			try {
				await orderSlip('HL-10011', persona);
				expect.fail('expected a refusal');
			} catch (failure) {
				if (persona === 'customer') expect(isHttpError(failure) && failure.status).toBe(403);
				else expect(isRedirect(failure) && failure.location).toMatch(/^\/signin\?next=/);
			}
		}
		expect((await orderSlip('HL-10011', 'admin')).status).toBe(200);
	});

	describe('a ship day', () => {
		/** Order numbers of the big day, as the slips must come: overnight first, then by number. */
		let expectedOrder: string[] = [];

		/** Copies of a demo box for `day`, one per number (every third number two-day); their ship order. */
		async function boxesForDay(day: string, numbers: readonly string[]): Promise<string[]> {
			const source = await scratch.db
				.selectFrom('customer_order')
				.selectAll()
				.where('order_number', '=', 'HL-10011')
				.executeTakeFirstOrThrow();
			const { id: _id, order_number: _n, created_at: _c, updated_at: _u, ...rest } = source;
			const inserted = await scratch.db
				.insertInto('customer_order')
				.values(
					numbers.map((number) => ({
						...rest,
						order_number: number,
						state: 'scheduled' as const,
						service:
							Number(number.slice(3)) % 3 === 0 ? ('two_day' as const) : ('overnight' as const),
						ship_on: day
					}))
				)
				.returning(['id', 'order_number', 'service'])
				.execute();
			await sql`
				insert into order_line (order_id, listing_id, clutch_id, species_id, description, stage, sex,
					unit_size, quantity, line_total_cents, is_live)
				select o.id, l.listing_id, l.clutch_id, l.species_id, l.description, l.stage, l.sex,
					l.unit_size, l.quantity, l.line_total_cents, l.is_live
				from customer_order o
				cross join order_line l
				where o.ship_on = ${day} and l.order_id = ${source.id}
			`.execute(scratch.db);
			await sql`
				insert into ship_check (order_id, first_date, service, decision, ship_date, delivery_date,
					packs, facility_pickup, reasons, inputs, rule_version)
				select o.id, o.ship_on, o.service, 'ship', o.ship_on,
					o.ship_on + case when o.service = 'overnight' then 1 else 2 end,
					c.packs, c.facility_pickup, c.reasons, c.inputs, c.rule_version
				from customer_order o
				cross join (select * from ship_check where order_id = ${source.id} order by id desc limit 1) c
				where o.ship_on = ${day}
			`.execute(scratch.db);
			const rank = (service: string) => (service === 'overnight' ? 0 : 1);
			return inserted
				.sort(
					(a, b) =>
						rank(a.service) - rank(b.service) ||
						Number(a.order_number.slice(3)) - Number(b.order_number.slice(3))
				)
				.map((row) => row.order_number);
		}

		/** The order number on each slip page of a PDF, in page order. */
		const slipNumbers = (pages: { text: string }[]) =>
			pages
				.filter((page) => page.text.includes('PACKING SLIP'))
				.map((page) => /PACKING SLIP (HL-\d+)/.exec(page.text)?.[1]);

		beforeAll(async () => {
			// 200 boxes for one day, numbered with five and six digits so that a text sort
			// would put HL-100100 before HL-90001; inserted out of order, so the database's
			// own order gives nothing away.
			const numbers = Array.from({ length: 200 }, (_, i) =>
				i < 99 ? `HL-${90001 + i}` : `HL-${100100 + i}`
			);
			expectedOrder = await boxesForDay(
				BIG_DAY,
				[...numbers].sort((a, b) => (a.slice(-2) < b.slice(-2) ? -1 : 1))
			);
		});

		it('prints a small day at once, in ship order', async () => {
			const expected = await boxesForDay(SMALL_DAY, [
				'HL-80010',
				'HL-80001',
				'HL-80009',
				'HL-80002'
			]);
			// Two-day HL-80001 and HL-80010 (numbers divisible by 3) go after the overnight boxes.
			expect(expected).toEqual(['HL-80002', 'HL-80009', 'HL-80001', 'HL-80010']);
			const response = await dayGet(
				event(`/manage/ship-day/slips?date=${SMALL_DAY}`, 'keeper') as never
			);
			expect(response.headers.get('content-disposition')).toContain(`slips-${SMALL_DAY}.pdf`);
			expect(slipNumbers(await readPdf(await pdfOf(response)))).toEqual(expected);
		});

		it('refuses a bad date, and an empty day, with the reason', async () => {
			const bad = await dayGet(
				event('/manage/ship-day/slips?date=2026-02-30', 'keeper', { accept: 'text/plain' }) as never
			);
			expect(bad.status).toBe(400);
			const empty = await dayGet(
				event('/manage/ship-day/slips?date=2026-12-25', 'keeper', { accept: 'text/plain' }) as never
			);
			expect(empty.status).toBe(404);
			expect(await empty.text()).toContain(
				'No boxes are scheduled or packed for Fri, Dec 25, 2026.'
			);
		});

		it('sends a day of more than 50 boxes to the batch job', async () => {
			const response = await dayGet(
				event(`/manage/ship-day/slips?date=${BIG_DAY}`, 'keeper', { accept: 'text/plain' }) as never
			);
			expect(response.status).toBe(409);
			expect(await response.text()).toContain('200 boxes');
		});

		it(
			'draws 200 boxes in the background, counting as it goes, into one PDF in ship order',
			{ timeout: 300_000 },
			async () => {
				jobs = await startJobs({
					connectionString: scratch.url,
					smtpUrl: 'smtp://127.0.0.1:9',
					mailFrom: 'Mossback Hollow Inverts <shop@mossback.example.com>',
					pollingIntervalSeconds: 0.5,
					log: () => undefined
				});
				await jobs.ready;

				// The browser's script asks for JSON; a form without script is sent to the progress page.
				const started = await dayPost(
					event(`/manage/ship-day/slips?date=${BIG_DAY}`, 'keeper', {
						method: 'POST',
						accept: 'application/json'
					}) as never
				);
				expect(started.status).toBe(202);
				const view = (await started.json()) as { id: number; total: number; progressUrl: string };
				expect(view.total).toBe(200);
				const audit = await scratch.db
					.selectFrom('audit_log')
					.select(['action', 'actor_user_id', 'detail'])
					.where('entity', '=', 'slip_batch')
					.where('entity_id', '=', String(view.id))
					.executeTakeFirstOrThrow();
				expect(audit).toMatchObject({
					action: 'slips.batch_start',
					actor_user_id: people.keeper!.id,
					detail: { shipOn: BIG_DAY, orders: 200, paper: 'letter' }
				});

				const seen: number[] = [];
				for (;;) {
					const batch = await readSlipBatch(scratch.db, view.id);
					seen.push(batch!.doneCount);
					if (batch!.state === 'done' || batch!.state === 'failed') {
						expect(batch!.state).toBe('done');
						break;
					}
					await new Promise((resolve) => setTimeout(resolve, 50));
				}
				// It counted on the way, never backwards, and ended with every box.
				expect(seen.some((count) => count > 0 && count < 200)).toBe(true);
				expect(seen).toEqual([...seen].sort((a, b) => a - b));
				expect(seen.at(-1)).toBe(200);

				const progress = await batchGet(
					event(`/manage/ship-day/slips/batches/${view.id}`, 'keeper', {
						params: { id: String(view.id) },
						accept: 'application/json'
					}) as never
				);
				expect(await progress.json()).toMatchObject({ state: 'done', doneCount: 200, total: 200 });

				const download = await batchGet(
					event(`/manage/ship-day/slips/batches/${view.id}?download=1`, 'keeper', {
						params: { id: String(view.id) }
					}) as never
				);
				expect(download.headers.get('content-disposition')).toContain('attachment');
				const pages = await readPdf(await pdfOf(download));
				expect(slipNumbers(pages)).toEqual(expectedOrder);
				// Each slip is followed by its one care card (the source box holds one species).
				expect(pages.length).toBe(400);
			}
		);

		it('fails a batch whose boxes changed before it ran, and says which', async () => {
			// The worker is stopped, so the batch waits while a box is cancelled.
			await jobs?.stop();
			jobs = undefined;
			try {
				await dayPost(
					event(`/manage/ship-day/slips?date=${BIG_DAY}`, 'keeper', {
						method: 'POST',
						accept: 'text/html'
					}) as never
				);
				expect.fail('a form post without script is sent on to the progress page');
			} catch (failure) {
				if (!isRedirect(failure)) throw failure;
				expect(failure.status).toBe(303);
				expect(failure.location).toMatch(/^\/manage\/ship-day\/slips\/batches\/\d+\/progress$/);
			}
			const id = Number(/batches\/(\d+)/.exec((await latestBatch())!)![1]);
			await scratch.db
				.updateTable('customer_order')
				.set({ state: 'cancelled' })
				.where('order_number', '=', expectedOrder[0]!)
				.execute();
			const run = await runSlipBatch(scratch.db, id, { origin: ORIGIN });
			expect(run.outcome).toBe('failed');
			const batch = await readSlipBatch(scratch.db, id);
			expect(batch).toMatchObject({ state: 'failed', doneCount: 0 });
			expect(batch!.error).toContain(`${expectedOrder[0]} was cancelled`);
			const download = await batchGet(
				event(`/manage/ship-day/slips/batches/${id}?download=1`, 'keeper', {
					params: { id: String(id) },
					accept: 'text/plain'
				}) as never
			);
			expect(download.status).toBe(409);
			expect(await download.text()).toContain('were not made');
			// A new batch takes the day as it is now: one box fewer.
			const again = await dayPost(
				event(`/manage/ship-day/slips?date=${BIG_DAY}`, 'keeper', {
					method: 'POST',
					accept: 'application/json'
				}) as never
			);
			expect(((await again.json()) as { total: number }).total).toBe(199);
		});

		async function latestBatch(): Promise<string | null> {
			const row = await scratch.db
				.selectFrom('slip_batch')
				.select('id')
				.orderBy('id', 'desc')
				.executeTakeFirst();
			return row ? `/manage/ship-day/slips/batches/${row.id}` : null;
		}
	});
});
