// Dead-on-arrival claims on a scratch copy of the demo: a customer files against their
// own delivered order inside the window, with photos stripped of metadata; late, foreign,
// over-counted and photo-less claims are refused with nothing written; a decline needs a
// reason; claim photos reach the owner and staff only.
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { isHttpError } from '@sveltejs/kit';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import type { SessionUser } from '../../src/lib/server/auth/guard';
import {
	claimWindowProblem,
	declineClaim,
	fileClaim,
	reshipClaim
} from '../../src/lib/server/claims/claims';
import { addDays, todayInZone } from '../../src/lib/format/dates';
import type { ForecastSource } from '../../src/lib/server/weather/source';
import { photoStorage } from '../../src/lib/server/uploads/storage';
import { GET as servePhoto } from '../../src/routes/photos/[file]/+server';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

// The photo route opens the app's database through getDb(); here that is the scratch copy.
const current = vi.hoisted(() => ({ db: undefined as unknown }));
vi.mock('$lib/server/db', () => ({ getDb: () => current.db }));

const HOUR = 3_600_000;

describe('the claim window', () => {
	// 15:00 UTC on 1 Dec 2026 is 10:00 in New York (EST, UTC−5; the US left DST on 1 Nov 2026).
	const delivered = new Date('2026-12-01T15:00:00Z');
	it('takes a claim up to the last millisecond of the window and refuses one after it', () => {
		expect(
			claimWindowProblem(delivered, new Date('2026-12-01T17:00:00Z'), 2, 'America/New_York')
		).toBeNull();
		expect(
			claimWindowProblem(delivered, new Date('2026-12-01T17:00:00.001Z'), 2, 'America/New_York')
		).toMatch(
			/^Claims are taken within 2 hours of delivery; this order was delivered at .*10:00.*\.$/
		);
		expect(
			claimWindowProblem(delivered, new Date('2026-12-01T15:30:00Z'), 1, 'America/New_York')
		).toBeNull();
		expect(
			claimWindowProblem(delivered, new Date('2026-12-01T16:30:00Z'), 1, 'America/New_York')
		).toContain('within 1 hour of delivery');
	});
});

describe('claims', () => {
	let scratch: ScratchDatabase;
	let storageDir: string;
	const staff = new Map<string, SessionUser>();
	let owner: SessionUser;
	let stranger: SessionUser;
	let order: { id: number; order_number: string };
	let lines: { id: number; quantity: number; unit_size: number }[];
	let jpegWithGps: Buffer;
	const now = new Date();
	const actorOf = (user: SessionUser) => ({ userId: user.id, ip: '127.0.0.1' });
	const claimsOf = () =>
		scratch.db.selectFrom('claim').selectAll().where('order_id', '=', order.id).execute();
	const mailOf = (kind: string) =>
		scratch.db
			.selectFrom('outgoing_mail')
			.select(['to_address', 'subject', 'text_body'])
			.where('kind', '=', kind)
			.orderBy('id')
			.execute();

	beforeAll(async () => {
		storageDir = await mkdtemp(path.join(os.tmpdir(), 'hatchlot-claims-'));
		process.env.PHOTO_STORAGE_DIR = storageDir;
		scratch = await scratchDatabase();
		current.db = scratch.db;
		await seedDemo(scratch.db, { today: '2026-12-01' });
		for (const role of ['admin', 'keeper'] as const) {
			const email = DEMO_ACCOUNTS.find((account) => account.role === role)!.email;
			const row = await scratch.db
				.selectFrom('User')
				.select(['id', 'name', 'email'])
				.where('email', '=', email)
				.executeTakeFirstOrThrow();
			staff.set(role, { ...row, role });
		}
		// A delivered order of a customer, with live lines and no claim of its own yet.
		const picked = await scratch.db
			.selectFrom('customer_order as o')
			.innerJoin('User as u', 'u.id', 'o.user_id')
			.select(['o.id', 'o.order_number', 'u.id as userId', 'u.name', 'u.email'])
			.where('o.state', '=', 'delivered')
			.where((eb) =>
				eb.not(
					eb.exists(
						eb.selectFrom('claim').select('claim.id').whereRef('claim.order_id', '=', 'o.id')
					)
				)
			)
			.where((eb) =>
				eb.exists(
					eb
						.selectFrom('order_line')
						.select('order_line.id')
						.whereRef('order_line.order_id', '=', 'o.id')
						.where('order_line.is_live', '=', true)
				)
			)
			.orderBy('o.id')
			.executeTakeFirstOrThrow();
		order = { id: picked.id, order_number: picked.order_number };
		owner = { id: picked.userId, name: picked.name, email: picked.email, role: 'customer' };
		const other = await scratch.db
			.selectFrom('User')
			.select(['id', 'name', 'email'])
			.where('id', 'not in', [owner.id, ...[...staff.values()].map((u) => u.id)])
			.executeTakeFirstOrThrow();
		stranger = { ...other, role: 'customer' };
		lines = await scratch.db
			.selectFrom('order_line')
			.select(['id', 'quantity', 'unit_size'])
			.where('order_id', '=', order.id)
			.where('is_live', '=', true)
			.orderBy('id')
			.execute();
		await scratch.db
			.updateTable('customer_order')
			.set({ delivered_at: new Date(now.getTime() - 30 * 60_000) })
			.where('id', '=', order.id)
			.execute();
		// A phone photo with a GPS position in its EXIF (sharp writes the IFD we give it).
		jpegWithGps = await sharp({
			create: { width: 800, height: 600, channels: 3, background: '#6b4f2a' }
		})
			.jpeg()
			.withExif({
				IFD0: { Make: 'Phone' },
				IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '44/1 30/1 0/1' }
			})
			.toBuffer();
	});
	afterAll(async () => {
		delete process.env.PHOTO_STORAGE_DIR;
		await scratch?.drop();
		if (storageDir) await rm(storageDir, { recursive: true, force: true });
	});

	const filing = (over: Partial<Parameters<typeof fileClaim>[2]> = {}) => ({
		orderNumber: order.order_number,
		lines: [{ orderLineId: lines[0]!.id, deadCount: 1 }],
		note: 'Two were curled up and still when the box was opened.',
		photos: [{ name: 'box.jpg', bytes: jpegWithGps }],
		...over
	});

	it('refuses a claim after the window, saying the window and when the order was delivered', async () => {
		const late = new Date(now.getTime() + 2 * HOUR); // 2 h 30 min after delivery
		const outcome = await fileClaim(scratch.db, actorOf(owner), filing(), late);
		expect(outcome.ok).toBe(false);
		if (outcome.ok) return;
		// The demo shop keeps the default 2-hour window (PRODUCT.md "Claim").
		expect(outcome.problem).toMatch(
			/^Claims are taken within 2 hours of delivery; this order was delivered at .+\.$/
		);
		// The delivery minute as the shop's zone shows it, by Intl rather than our formatter.
		const minute = new Intl.DateTimeFormat('en-US', {
			timeZone: 'America/New_York',
			minute: '2-digit'
		}).format(new Date(now.getTime() - 30 * 60_000));
		expect(outcome.problem).toContain(`:${minute.padStart(2, '0')}`);
		expect(await claimsOf()).toEqual([]);
	});

	it('answers not found for somebody else’s order', async () => {
		const outcome = await fileClaim(scratch.db, actorOf(stranger), filing(), now);
		expect(outcome).toMatchObject({ ok: false, status: 404 });
		expect(await claimsOf()).toEqual([]);
	});

	it('refuses more dead than the line holds, a claim with no photo, and a photo that is not one', async () => {
		const tooMany = await fileClaim(
			scratch.db,
			actorOf(owner),
			// Dead counts are animals: a line of groups sent quantity × unit size of them.
			filing({
				lines: [
					{ orderLineId: lines[0]!.id, deadCount: lines[0]!.quantity * lines[0]!.unit_size + 1 }
				]
			}),
			now
		);
		expect(tooMany).toMatchObject({ ok: false, status: 400, field: 'lines' });
		const sent = lines[0]!.quantity * lines[0]!.unit_size;
		if (!tooMany.ok) expect(tooMany.problem).toContain(`so at most ${sent} can be claimed`);
		const noPhoto = await fileClaim(scratch.db, actorOf(owner), filing({ photos: [] }), now);
		expect(noPhoto).toMatchObject({ ok: false, status: 400, field: 'photos' });
		const notImage = await fileClaim(
			scratch.db,
			actorOf(owner),
			filing({ photos: [{ name: 'box.jpg', bytes: new TextEncoder().encode('not a picture') }] }),
			now
		);
		expect(notImage).toMatchObject({ ok: false, status: 400, field: 'photos' });
		// The refused photo took its claim back out: nothing is left of any of the three.
		expect(await claimsOf()).toEqual([]);
		expect(
			await scratch.db.selectFrom('photo').select('id').where('claim_id', 'is not', null).execute()
		).toEqual([]);
	});

	it('files a claim inside the window with its lines, metadata-free photos and an audit entry; one open claim at a time', async () => {
		const outcome = await fileClaim(scratch.db, actorOf(owner), filing(), now);
		if (!outcome.ok) throw new Error(outcome.problem);
		const [claim] = await claimsOf();
		expect(claim).toMatchObject({ id: outcome.claimId, state: 'open', user_id: owner.id });
		expect(
			await scratch.db
				.selectFrom('claim_line')
				.selectAll()
				.where('claim_id', '=', outcome.claimId)
				.execute()
		).toEqual([{ claim_id: outcome.claimId, order_line_id: lines[0]!.id, dead_count: 1 }]);
		const photos = await scratch.db
			.selectFrom('photo')
			.selectAll()
			.where('claim_id', '=', outcome.claimId)
			.execute();
		expect(photos).toHaveLength(1);
		const stored = await photoStorage().open(photos[0]!.content_hash, photos[0]!.widths[0]!);
		const chunks: Buffer[] = [];
		for await (const chunk of stored!.stream()) chunks.push(chunk as Buffer);
		// sharp's own reader finds no EXIF in what we keep, though the upload had one.
		expect((await sharp(jpegWithGps).metadata()).exif).toBeDefined();
		expect((await sharp(Buffer.concat(chunks)).metadata()).exif).toBeUndefined();
		const audit = await scratch.db
			.selectFrom('audit_log')
			.selectAll()
			.where('action', '=', 'claim.file')
			.where('entity_id', '=', String(outcome.claimId))
			.execute();
		expect(audit).toHaveLength(1);
		// The buyer hears the claim is in; every admin is asked for a decision, once.
		const received = await mailOf('claim_received');
		expect(received.map((m) => m.to_address)).toEqual([owner.email]);
		expect(received[0]!.text_body).toContain(`/account/orders/${order.order_number}`);
		const filedMail = await mailOf('claim_filed');
		expect(filedMail.map((m) => m.to_address)).toEqual([staff.get('admin')!.email]);
		expect(filedMail[0]!.text_body).toContain(`/admin/claims/${outcome.claimId}`);

		const second = await fileClaim(scratch.db, actorOf(owner), filing(), now);
		expect(second).toMatchObject({ ok: false, status: 409 });
		expect(await claimsOf()).toHaveLength(1);
	});

	it('serves claim photos to the customer who filed and to staff, and 404 to anyone else', async () => {
		const [claim] = await claimsOf();
		const photo = await scratch.db
			.selectFrom('photo')
			.selectAll()
			.where('claim_id', '=', claim!.id)
			.executeTakeFirstOrThrow();
		const name = `${photo.content_hash}-${photo.widths[0]}.webp`;
		for (const viewer of [owner, staff.get('keeper')!, staff.get('admin')!]) {
			const response = await servePhoto(photoEvent(name, viewer));
			expect(response.status).toBe(200);
			expect(response.headers.get('cache-control')).toBe('private, max-age=31536000, immutable');
			expect(response.headers.get('vary')).toBe('Cookie');
		}
		for (const viewer of [stranger, null])
			await expectNotFound(servePhoto(photoEvent(name, viewer)));
	});

	it('declines only with a reason of ten characters or more, and records who decided', async () => {
		const [claim] = await claimsOf();
		const admin = staff.get('admin')!;
		const short = await declineClaim(scratch.db, actorOf(admin), {
			claimId: claim!.id,
			reason: 'No.'
		});
		expect(short).toMatchObject({ ok: false, field: 'reason' });
		expect((await claimsOf())[0]!.state).toBe('open');
		const reason =
			'The package was redirected to a pickup point, so the guarantee does not cover it.';
		const decided = await declineClaim(scratch.db, actorOf(admin), { claimId: claim!.id, reason });
		expect(decided).toEqual({ ok: true });
		expect((await claimsOf())[0]).toMatchObject({
			state: 'declined',
			decided_by: admin.id,
			decision_note: reason
		});
		const again = await declineClaim(scratch.db, actorOf(admin), { claimId: claim!.id, reason });
		expect(again).toMatchObject({ ok: false, status: 409 });
		// One decision mail with the reason, not one per attempt.
		const told = await mailOf('claim_decided');
		expect(told.map((m) => m.to_address)).toEqual([owner.email]);
		expect(told[0]!.text_body).toContain(`Why: ${reason}`);
	});

	it('reships as a linked no-charge order of the dead counts, which the ship check then schedules', async () => {
		// A decided claim no longer blocks a new one on the same order.
		const filed = await fileClaim(
			scratch.db,
			actorOf(owner),
			filing({ lines: [{ orderLineId: lines[0]!.id, deadCount: lines[0]!.quantity }] }),
			now
		);
		if (!filed.ok) throw new Error(filed.problem);
		const today = todayInZone('America/New_York');
		// Mild days everywhere (inside every limit of the ship check), as ship-checks.test.ts stubs them.
		const mild: ForecastSource = {
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
		};
		const admin = staff.get('admin')!;
		const outcome = await reshipClaim(
			scratch.db,
			actorOf(admin),
			{ claimId: filed.claimId, note: 'Sending replacements on the next safe day.' },
			mild,
			{ today }
		);
		if (!outcome.ok) throw new Error(outcome.problem);
		const reship = await scratch.db
			.selectFrom('customer_order')
			.selectAll()
			.where('id', '=', outcome.orderId)
			.executeTakeFirstOrThrow();
		const original = await scratch.db
			.selectFrom('customer_order')
			.selectAll()
			.where('id', '=', order.id)
			.executeTakeFirstOrThrow();
		expect(reship).toMatchObject({
			reship_of_claim_id: filed.claimId,
			user_id: owner.id,
			ship_zip: original.ship_zip,
			total_cents: 0,
			subtotal_cents: 0,
			shipping_cents: 0,
			state: 'scheduled'
		});
		expect(reship.ship_on).not.toBeNull();
		const reshipLines = await scratch.db
			.selectFrom('order_line')
			.select(['listing_id', 'quantity', 'line_total_cents'])
			.where('order_id', '=', outcome.orderId)
			.execute();
		const sold = await scratch.db
			.selectFrom('order_line')
			.select('listing_id')
			.where('id', '=', lines[0]!.id)
			.executeTakeFirstOrThrow();
		expect(reshipLines).toEqual([
			{ listing_id: sold.listing_id, quantity: lines[0]!.quantity, line_total_cents: 0 }
		]);
		// paid by the system, then scheduled by the ship check, with its stored check.
		const events = await scratch.db
			.selectFrom('order_event')
			.select(['from_state', 'to_state'])
			.where('order_id', '=', outcome.orderId)
			.orderBy('id')
			.execute();
		expect(events).toEqual([
			{ from_state: 'awaiting_payment', to_state: 'paid' },
			{ from_state: 'paid', to_state: 'scheduled' }
		]);
		const checks = await scratch.db
			.selectFrom('ship_check')
			.select('id')
			.where('order_id', '=', outcome.orderId)
			.execute();
		expect(checks).toHaveLength(1);
		const claim = await scratch.db
			.selectFrom('claim')
			.selectAll()
			.where('id', '=', filed.claimId)
			.executeTakeFirstOrThrow();
		expect(claim).toMatchObject({
			state: 'reshipped',
			reship_order_id: outcome.orderId,
			decided_by: admin.id
		});
		const told = await mailOf('claim_decided');
		expect(told).toHaveLength(2);
		expect(told[1]!.to_address).toBe(owner.email);
		expect(told[1]!.text_body).toContain(`at no charge, as order ${reship.order_number}.`);
		const again = await reshipClaim(
			scratch.db,
			actorOf(admin),
			{ claimId: filed.claimId, note: '' },
			mild,
			{ today }
		);
		expect(again).toMatchObject({ ok: false, status: 409 });
	});
});

function photoEvent(file: string, user: SessionUser | null): Parameters<typeof servePhoto>[0] {
	const url = new URL(`http://127.0.0.1/photos/${file}`);
	return {
		params: { file },
		url,
		request: new Request(url),
		locals: { user, sessionToken: null }
	} as unknown as Parameters<typeof servePhoto>[0];
}

async function expectNotFound(pending: Response | Promise<Response>) {
	try {
		const response = await pending;
		expect.fail(`expected 404, got ${response.status}`);
	} catch (failure) {
		if (!isHttpError(failure)) throw failure;
		expect(failure.status).toBe(404);
	}
}
