// Photo uploads on a scratch database and a temporary storage folder: what is
// taken, what is refused (and that a refused batch leaves nothing behind), that
// no location survives in the stored files, and how the serving route answers.
import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { isHttpError, isRedirect } from '@sveltejs/kit';
import sharp from 'sharp';
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import type { Db } from '../../src/lib/server/db/connect';
import type { SessionUser } from '../../src/lib/server/auth/guard';
import type { PhotoTarget } from '../../src/lib/photos/urls';
import {
	deletePhoto,
	listPhotos,
	processPhoto,
	savePhotos,
	updateAlt
} from '../../src/lib/server/uploads/photos';
import { photoStorage } from '../../src/lib/server/uploads/storage';
import { GET as servePhoto } from '../../src/routes/photos/[file]/+server';
import { POST as uploadApi } from '../../src/routes/api/manage/photos/+server';
import { actions as photoActions } from '../../src/routes/manage/photos/+page.server';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

// The routes open the app's database through getDb(); here that is the scratch copy.
const current = vi.hoisted(() => ({ db: undefined as unknown }));
vi.mock('$lib/server/db', () => ({ getDb: () => current.db }));

// ---- fixtures, all made with sharp

const solid = (width: number, height: number, colour = '#5b7a3c') =>
	sharp({ create: { width, height, channels: 3, background: colour } });

async function photoFixtures() {
	return {
		jpeg: await solid(1000, 750).jpeg().toBuffer(),
		png: await solid(400, 300, '#7a5b3c').png().toBuffer(),
		webp: await solid(2400, 1600, '#3c5b7a').webp().toBuffer(),
		avif: await solid(640, 480, '#6c533b').avif().toBuffer()
	};
}

/**
 * Whether a TIFF-structured EXIF block (as sharp's metadata() hands it over, with or
 * without the "Exif\0\0" prefix) has a GPS IFD: tag 34853 (0x8825) in IFD0, per the
 * Exif standard (CIPA DC-008, "GPS Info IFD Pointer"). Read here by hand, not by our code.
 */
function exifHasGps(exif: Buffer): boolean {
	const tiff = exif.subarray(0, 6).toString('latin1') === 'Exif\0\0' ? exif.subarray(6) : exif;
	const little = tiff.subarray(0, 2).toString('latin1') === 'II';
	const u16 = (at: number) => (little ? tiff.readUInt16LE(at) : tiff.readUInt16BE(at));
	const u32 = (at: number) => (little ? tiff.readUInt32LE(at) : tiff.readUInt32BE(at));
	const ifd0 = u32(4);
	const entries = u16(ifd0);
	for (let i = 0; i < entries; i++) {
		if (u16(ifd0 + 2 + i * 12) === 0x8825) return true;
	}
	return false;
}

/** The chunk names of a WebP file (RIFF container, per Google's WebP container specification). */
function webpChunks(file: Buffer): string[] {
	expect(file.subarray(0, 4).toString('latin1')).toBe('RIFF');
	expect(file.subarray(8, 12).toString('latin1')).toBe('WEBP');
	const names: string[] = [];
	for (let at = 12; at + 8 <= file.length;) {
		const size = file.readUInt32LE(at + 4);
		names.push(file.subarray(at, at + 4).toString('latin1'));
		at += 8 + size + (size % 2);
	}
	return names;
}

describe('photos', () => {
	let scratch: ScratchDatabase;
	let storageDir: string;
	let keeper: SessionUser;
	let actor: { userId: string; ip: string };
	let colony: PhotoTarget;
	let species: PhotoTarget;
	let clutch: PhotoTarget;
	let fixtures: Awaited<ReturnType<typeof photoFixtures>>;

	const rowCount = async () =>
		Number(
			(
				await scratch.db
					.selectFrom('photo')
					.select((eb) => eb.fn.countAll().as('n'))
					.executeTakeFirstOrThrow()
			).n
		);
	const stored = async () => (existsSync(storageDir) ? (await readdir(storageDir)).sort() : []);
	const uploadAudits = () =>
		scratch.db.selectFrom('audit_log').selectAll().where('action', '=', 'photo.upload').execute();

	beforeAll(async () => {
		storageDir = await mkdtemp(path.join(os.tmpdir(), 'hatchlot-photos-'));
		process.env.PHOTO_STORAGE_DIR = storageDir;
		scratch = await scratchDatabase();
		current.db = scratch.db as Db;
		await seedDemo(scratch.db, { today: '2026-12-01' });
		const teo = DEMO_ACCOUNTS.find((a) => a.role === 'keeper')!;
		const user = await scratch.db
			.selectFrom('User')
			.select(['id', 'name', 'email'])
			.where('email', '=', teo.email)
			.executeTakeFirstOrThrow();
		keeper = { id: user.id, name: user.name, email: user.email, role: 'keeper' };
		actor = { userId: user.id, ip: '127.0.0.1' };
		const first = async (table: 'species' | 'colony' | 'clutch') =>
			(await scratch.db.selectFrom(table).select('id').orderBy('id').executeTakeFirstOrThrow()).id;
		colony = { kind: 'colony', id: await first('colony') };
		species = { kind: 'species', id: await first('species') };
		clutch = { kind: 'clutch', id: await first('clutch') };
		fixtures = await photoFixtures();
	});
	afterAll(async () => {
		delete process.env.PHOTO_STORAGE_DIR;
		await scratch?.drop();
		if (storageDir) await rm(storageDir, { recursive: true, force: true });
	});
	beforeEach(async () => {
		await scratch.db.deleteFrom('photo').execute();
		await rm(storageDir, { recursive: true, force: true });
	});

	it('takes JPEG, PNG, WebP and AVIF and stores WebP widths no wider than each original', async () => {
		const outcome = await savePhotos(
			scratch.db,
			actor,
			colony,
			[
				{ name: 'adults.jpg', bytes: fixtures.jpeg },
				{ name: 'substrate.png', bytes: fixtures.png },
				{ name: 'enclosure.webp', bytes: fixtures.webp },
				{ name: 'leaf-litter.avif', bytes: fixtures.avif }
			],
			{ altText: 'Adults on the substrate' }
		);
		if (!outcome.ok) throw new Error(JSON.stringify(outcome.refusals));
		expect(outcome.photos.map((p) => [p.width, p.height, p.widths])).toEqual([
			[1000, 750, [320, 640, 1000]],
			[400, 300, [320, 400]],
			[2400, 1600, [320, 640, 1280, 1920]],
			[640, 480, [320, 640]]
		]);
		const rows = await scratch.db.selectFrom('photo').selectAll().orderBy('position').execute();
		expect(rows.map((r) => r.source_format)).toEqual(['jpeg', 'png', 'webp', 'avif']);
		expect(rows.every((r) => r.colony_id === colony.id && r.uploaded_by === actor.userId)).toBe(
			true
		);
		expect(rows.map((r) => r.alt_text)).toEqual(Array(4).fill('Adults on the substrate'));
		expect(rows[0]!.byte_size).toBe(fixtures.jpeg.byteLength);

		// Every variant is on disk under its content-hash name, really WebP, at its width.
		const expected = outcome.photos
			.flatMap((p) => p.widths.map((w) => `${p.hash}-${w}.webp`))
			.sort();
		expect(await stored()).toEqual(expected);
		for (const photo of outcome.photos) {
			for (const width of photo.widths) {
				const meta = await sharp(path.join(storageDir, `${photo.hash}-${width}.webp`)).metadata();
				expect(meta.format).toBe('webp');
				expect(meta.width).toBe(width);
			}
		}
		expect(await listPhotos(scratch.db, colony)).toEqual(outcome.photos);
		expect(await listPhotos(scratch.db, species)).toEqual([]);
		const audits = await uploadAudits();
		expect(audits.at(-1)).toMatchObject({
			actor_user_id: actor.userId,
			entity: 'colony',
			entity_id: String(colony.id)
		});
	});

	it('refuses a text file named .jpg, an SVG, a 60-megapixel image and a file over 15 MB, saving nothing', async () => {
		const before = (await uploadAudits()).length;
		const text = Buffer.from('Substrate mix: 1 part compost, 1 part soaked hardwood pellets.\n');
		const textOutcome = await savePhotos(scratch.db, actor, colony, [
			{ name: 'notes.jpg', bytes: text }
		]);
		expect(textOutcome).toMatchObject({
			ok: false,
			status: 415,
			refusals: [{ file: 'notes.jpg', code: 'not_image' }]
		});

		// A drawing that can carry script: decoded, recognised as SVG, refused.
		const svg = Buffer.from(
			'<svg xmlns="http://www.w3.org/2000/svg" width="40" height="40"><script>alert(1)</script><rect width="40" height="40"/></svg>'
		);
		const svgOutcome = await savePhotos(scratch.db, actor, colony, [
			{ name: 'drawing.png', bytes: svg }
		]);
		expect(svgOutcome).toMatchObject({
			ok: false,
			status: 415,
			refusals: [{ file: 'drawing.png', code: 'wrong_format' }]
		});

		// 8000 × 7500 = 60 000 000 pixels, over the 50-megapixel limit (and small as a PNG).
		const huge = await solid(8000, 7500).png().toBuffer();
		expect(huge.byteLength).toBeLessThan(15 * 1024 * 1024);
		const hugeOutcome = await savePhotos(scratch.db, actor, colony, [
			{ name: 'wide-shot.png', bytes: huge }
		]);
		expect(hugeOutcome).toMatchObject({
			ok: false,
			status: 413,
			refusals: [{ file: 'wide-shot.png', code: 'too_many_pixels' }]
		});

		// 15 MiB and one byte of noise: refused by size before any decoding is tried.
		const heavy = randomBytes(15 * 1024 * 1024 + 1);
		const heavyOutcome = await savePhotos(scratch.db, actor, colony, [
			{ name: 'raw-dump.jpg', bytes: heavy }
		]);
		expect(heavyOutcome).toMatchObject({
			ok: false,
			status: 413,
			refusals: [{ file: 'raw-dump.jpg', code: 'too_large' }]
		});
		if (!heavyOutcome.ok) expect(heavyOutcome.refusals[0]!.reason).toMatch(/over 15 MB/i);

		expect(await rowCount()).toBe(0);
		expect(await stored()).toEqual([]);
		expect((await uploadAudits()).length).toBe(before);
	});

	it('saves nothing of a batch when one file is bad, and names only that file', async () => {
		const before = (await uploadAudits()).length;
		const outcome = await savePhotos(scratch.db, actor, colony, [
			{ name: 'good.jpg', bytes: fixtures.jpeg },
			{ name: 'cut-short.png', bytes: fixtures.png.subarray(0, 200) },
			{ name: 'also-good.webp', bytes: fixtures.webp }
		]);
		expect(outcome.ok).toBe(false);
		if (!outcome.ok) {
			expect(outcome.refusals.map((r) => r.file)).toEqual(['cut-short.png']);
			expect(outcome.refusals[0]!.code).toBe('damaged');
		}
		expect(await rowCount()).toBe(0);
		expect(await stored()).toEqual([]);
		expect((await uploadAudits()).length).toBe(before);
	});

	it('strips EXIF, GPS included, from a JPEG that has it, and turns it upright first', async () => {
		// A phone-style photo: GPS position (35°57′36″N 83°55′12″W), camera make, and
		// orientation 6 (stored on its side, to be turned 90° clockwise).
		const withGps = await solid(800, 600)
			.jpeg()
			.withExif({
				IFD0: { Make: 'Field camera' },
				IFD3: {
					GPSLatitudeRef: 'N',
					GPSLatitude: '35/1 57/1 36/1',
					GPSLongitudeRef: 'W',
					GPSLongitude: '83/1 55/1 12/1'
				}
			})
			.withMetadata({ orientation: 6 })
			.toBuffer();
		const fixtureMeta = await sharp(withGps).metadata();
		// The fixture really carries the location (so the check below can fail).
		expect(fixtureMeta.exif && exifHasGps(fixtureMeta.exif)).toBe(true);
		expect(fixtureMeta.orientation).toBe(6);

		const outcome = await savePhotos(scratch.db, actor, clutch, [
			{ name: 'IMG_0001.jpg', bytes: withGps }
		]);
		if (!outcome.ok) throw new Error(JSON.stringify(outcome.refusals));
		const [photo] = outcome.photos;
		// Turned upright: an 800 × 600 frame on its side is 600 wide and 800 tall.
		expect([photo!.width, photo!.height]).toEqual([600, 800]);
		expect(photo!.widths).toEqual([320, 600]);
		for (const width of photo!.widths) {
			const file = await readFile(path.join(storageDir, `${photo!.hash}-${width}.webp`));
			const meta = await sharp(file).metadata();
			expect(meta.exif === undefined || !exifHasGps(meta.exif)).toBe(true);
			expect(meta.exif).toBeUndefined();
			expect(meta.xmp).toBeUndefined();
			expect(meta.orientation).toBeUndefined();
			expect(meta.height! > meta.width!).toBe(true);
			// No EXIF or XMP chunk in the RIFF container, and no trace of the camera's make.
			expect(webpChunks(file).filter((c) => c === 'EXIF' || c === 'XMP ')).toEqual([]);
			expect(file.includes(Buffer.from('Field camera'))).toBe(false);
		}
	});

	it('serves a species photo to anyone with long cache headers and nosniff', async () => {
		const outcome = await savePhotos(scratch.db, actor, species, [
			{ name: 'adult.jpg', bytes: fixtures.jpeg }
		]);
		if (!outcome.ok) throw new Error('upload refused');
		const [photo] = outcome.photos;
		const response = await servePhoto(photoEvent(`${photo!.hash}-640.webp`, null));
		expect(response.status).toBe(200);
		expect(response.headers.get('cache-control')).toBe('public, max-age=31536000, immutable');
		expect(response.headers.get('content-type')).toBe('image/webp');
		expect(response.headers.get('x-content-type-options')).toBe('nosniff');
		const body = Buffer.from(await response.arrayBuffer());
		expect(body.equals(await readFile(path.join(storageDir, `${photo!.hash}-640.webp`)))).toBe(
			true
		);
		expect(Number(response.headers.get('content-length'))).toBe(body.length);

		const again = await servePhoto(
			photoEvent(`${photo!.hash}-640.webp`, null, {
				'if-none-match': response.headers.get('etag')!
			})
		);
		expect(again.status).toBe(304);
	});

	it('serves colony photos to keepers only, and answers 404 for anything not ours', async () => {
		const outcome = await savePhotos(scratch.db, actor, colony, [
			{ name: 'shelf.png', bytes: fixtures.png }
		]);
		if (!outcome.ok) throw new Error('upload refused');
		const name = `${outcome.photos[0]!.hash}-320.webp`;
		const customer: SessionUser = { ...keeper, role: 'customer' };

		await expectNotFound(servePhoto(photoEvent(name, null)));
		await expectNotFound(servePhoto(photoEvent(name, customer)));
		const forKeeper = await servePhoto(photoEvent(name, keeper));
		expect(forKeeper.status).toBe(200);
		// Only the keeper's browser may keep it, never a shared cache.
		expect(forKeeper.headers.get('cache-control')).toBe('private, max-age=31536000, immutable');
		expect(forKeeper.headers.get('x-content-type-options')).toBe('nosniff');

		const hash = outcome.photos[0]!.hash;
		for (const bad of [
			`${hash}-999.webp`, // a width that was never written
			`${hash}-320.png`,
			`${hash}.webp`,
			`../${hash}-320.webp`,
			`${'0'.repeat(64)}-320.webp`
		]) {
			await expectNotFound(servePhoto(photoEvent(bad, keeper)));
		}
	});

	it('serves a picture used only by a claim to staff, not to a customer who did not file it', async () => {
		const claim = await scratch.db
			.selectFrom('claim')
			.select('id')
			.orderBy('id')
			.executeTakeFirstOrThrow();
		const processed = await processPhoto(fixtures.png);
		if (!processed.ok) throw new Error('fixture refused');
		const { photo } = processed;
		for (const v of photo.variants) await photoStorage().write(photo.hash, v.width, v.bytes);
		await scratch.db
			.insertInto('photo')
			.values({
				content_hash: photo.hash,
				width: photo.width,
				height: photo.height,
				byte_size: photo.byteSize,
				claim_id: claim.id,
				widths: photo.variants.map((v) => v.width),
				source_format: photo.sourceFormat
			})
			.execute();
		const forKeeper = await servePhoto(photoEvent(`${photo.hash}-320.webp`, keeper));
		expect(forKeeper.status).toBe(200);
		const customer: SessionUser = { ...keeper, role: 'customer' };
		await expectNotFound(servePhoto(photoEvent(`${photo.hash}-320.webp`, customer)));
		await expectNotFound(servePhoto(photoEvent(`${photo.hash}-320.webp`, null)));
	});

	it('describes and removes photos with audit entries, keeping files another photo still uses', async () => {
		const onColony = await savePhotos(scratch.db, actor, colony, [
			{ name: 'same.jpg', bytes: fixtures.jpeg }
		]);
		const onSpecies = await savePhotos(scratch.db, actor, species, [
			{ name: 'same.jpg', bytes: fixtures.jpeg }
		]);
		if (!onColony.ok || !onSpecies.ok) throw new Error('upload refused');
		const colonyPhoto = onColony.photos[0]!;
		const speciesPhoto = onSpecies.photos[0]!;
		expect(colonyPhoto.hash).toBe(speciesPhoto.hash);

		const described = await updateAlt(scratch.db, actor, speciesPhoto.id, '  Adult on cork bark ');
		expect(described).toMatchObject({ ok: true, photo: { altText: 'Adult on cork bark' } });
		const tooLong = await updateAlt(scratch.db, actor, speciesPhoto.id, 'x'.repeat(301));
		expect(tooLong).toMatchObject({ ok: false, refusals: [{ code: 'alt_too_long' }] });

		const files = await stored();
		expect(files.length).toBe(3);
		expect(await deletePhoto(scratch.db, actor, colonyPhoto.id)).toMatchObject({
			ok: true,
			target: colony
		});
		expect(await stored()).toEqual(files);
		expect(await deletePhoto(scratch.db, actor, speciesPhoto.id)).toMatchObject({ ok: true });
		expect(await stored()).toEqual([]);
		expect(await deletePhoto(scratch.db, actor, speciesPhoto.id)).toMatchObject({
			ok: false,
			status: 404
		});

		const audit = await scratch.db
			.selectFrom('audit_log')
			.select(['action', 'entity_id', 'detail'])
			.where('action', 'in', ['photo.alt', 'photo.delete'])
			.orderBy('id')
			.execute();
		expect(audit.map((a) => [a.action, a.entity_id])).toEqual([
			['photo.alt', String(speciesPhoto.id)],
			['photo.delete', String(colonyPhoto.id)],
			['photo.delete', String(speciesPhoto.id)]
		]);
	});

	it('answers the upload API with JSON: the photos, or each refusal with its status', async () => {
		const good = new FormData();
		good.set('target_kind', 'species');
		good.set('target_id', String(species.id));
		good.append('files', new File([fixtures.webp], 'tank.webp', { type: 'image/webp' }));
		const saved = await uploadApi(apiEvent(good));
		expect(saved.status).toBe(201);
		const answer = (await saved.json()) as { photos: { widths: number[] }[] };
		expect(answer.photos.map((p) => p.widths)).toEqual([[320, 640, 1280, 1920]]);

		const bad = new FormData();
		bad.set('target_kind', 'species');
		bad.set('target_id', String(species.id));
		bad.append('files', new File([fixtures.jpeg], 'fine.jpg', { type: 'image/jpeg' }));
		bad.append('files', new File(['not a picture'], 'sneaky.jpg', { type: 'image/jpeg' }));
		const refused = await uploadApi(apiEvent(bad));
		expect(refused.status).toBe(415);
		expect(await refused.json()).toEqual({
			errors: [
				{
					file: 'sneaky.jpg',
					code: 'not_image',
					reason: 'Not a picture we can read. Use a JPEG, PNG, WebP or AVIF photo.'
				}
			]
		});
		expect(await rowCount()).toBe(1);
	});

	it('sends a form post without JavaScript back to its page, and never off the back office', async () => {
		const form = new FormData();
		form.set('target_kind', 'colony');
		form.set('target_id', String(colony.id));
		form.set('return_to', '/manage/colonies/sample');
		form.set('alt_text', 'Young under bark');
		form.append('files', new File(['plain text'], 'notes.jpg', { type: 'image/jpeg' }));
		const refusedTo = await redirectOf(photoActions.upload!(actionEvent(form)));
		const refusedUrl = new URL(refusedTo, 'http://127.0.0.1');
		expect(refusedUrl.pathname).toBe('/manage/colonies/sample');
		expect(refusedUrl.searchParams.get('photos')).toBe('refused');
		expect(refusedUrl.searchParams.getAll('photos_refused')).toEqual(['not_image:notes.jpg']);
		expect(refusedUrl.searchParams.get('photos_alt')).toBe('Young under bark');

		form.delete('files');
		form.append('files', new File([fixtures.png], 'young.png', { type: 'image/png' }));
		form.set('return_to', 'https://elsewhere.example.com/manage');
		const savedTo = await redirectOf(photoActions.upload!(actionEvent(form)));
		expect(savedTo).toBe(
			`/manage/photos?photos=saved&photos_for=colony%3A${colony.id}&photos_count=1`
		);
	});

	// ---- fake request events for the route handlers

	function photoEvent(
		file: string,
		user: SessionUser | null,
		headers: Record<string, string> = {}
	): Parameters<typeof servePhoto>[0] {
		const url = new URL(`http://127.0.0.1/photos/${file}`);
		return {
			params: { file },
			url,
			request: new Request(url, { headers }),
			locals: { user, sessionToken: null }
		} as unknown as Parameters<typeof servePhoto>[0];
	}

	function apiEvent(body: FormData): Parameters<typeof uploadApi>[0] {
		const url = new URL('http://127.0.0.1/api/manage/photos');
		return {
			url,
			request: new Request(url, { method: 'POST', body }),
			locals: { user: keeper, sessionToken: null },
			getClientAddress: () => '127.0.0.1'
		} as unknown as Parameters<typeof uploadApi>[0];
	}

	type ActionEvent = Parameters<NonNullable<typeof photoActions.upload>>[0];
	function actionEvent(body: FormData): ActionEvent {
		const url = new URL('http://127.0.0.1/manage/photos?/upload');
		return {
			url,
			request: new Request(url, { method: 'POST', body }),
			locals: { user: keeper, sessionToken: null },
			getClientAddress: () => '127.0.0.1'
		} as unknown as ActionEvent;
	}
});

async function expectNotFound(pending: Response | Promise<Response>) {
	try {
		const response = await pending;
		expect.fail(`expected 404, got ${response.status}`);
	} catch (failure) {
		if (!isHttpError(failure)) throw failure;
		expect(failure.status).toBe(404);
	}
}

async function redirectOf(pending: Promise<unknown> | unknown): Promise<string> {
	try {
		await pending;
	} catch (failure) {
		if (isRedirect(failure)) {
			expect(failure.status).toBe(303);
			return failure.location;
		}
		throw failure;
	}
	throw new Error('the action did not redirect');
}
