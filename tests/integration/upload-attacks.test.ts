// Crafted files against the three ways a picture reaches the shop, through the built app:
// the back office's upload route (PhotoPanel's script), its form post without JavaScript,
// and a customer's dead-on-arrival claim. Each is refused with a 4xx and a sentence (the
// form post by the page it returns to), nothing is stored, nothing leaks, and the server
// is still answering afterwards.
import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { crc32 } from 'node:zlib';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { createSession } from '../../src/lib/server/auth/sessions';
import {
	MAX_PHOTO_BYTES,
	MAX_PHOTO_PIXELS,
	PHOTO_ACCEPT,
	refusalReason,
	type PhotoRefusalCode
} from '../../src/lib/photos/limits';
import { leaksIn, sessionCookies, startHostileShop, type HostileShop } from './support/hostile';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

type Attack = {
	name: string;
	file: string;
	type: string;
	bytes: Uint8Array;
	/** The refusal the upload module gives; any of these when the decoder's build decides. */
	codes: PhotoRefusalCode[];
	status: 400 | 413 | 415;
};

/** A PNG chunk: length, type, data, CRC-32 over type and data (PNG specification, section 5.3). */
function pngChunk(type: string, data: Buffer): Buffer {
	const length = Buffer.alloc(4);
	length.writeUInt32BE(data.length);
	const body = Buffer.concat([Buffer.from(type, 'latin1'), data]);
	const crc = Buffer.alloc(4);
	crc.writeUInt32BE(crc32(body));
	return Buffer.concat([length, body, crc]);
}

async function attacks(): Promise<Attack[]> {
	// A photo with detail in it, so cutting it short cuts into the picture data.
	const noisy = await sharp({
		create: {
			width: 1200,
			height: 900,
			channels: 3,
			background: '#5b7a3c',
			noise: { type: 'gaussian', mean: 120, sigma: 40 }
		}
	})
		.jpeg({ quality: 80 })
		.toBuffer();
	const script = '<script>alert(document.cookie)</script>';
	const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="64" height="64" onload="alert(1)">${script}<rect width="64" height="64" fill="#5b7a3c"/></svg>`;
	// GIF with a Comment Extension (0x21 0xFE, GIF89a specification, section 24) holding
	// a script, placed before the trailer (0x3B): a real GIF that also carries HTML.
	const gif = await sharp({ create: { width: 16, height: 16, channels: 3, background: '#333' } })
		.gif()
		.toBuffer();
	const comment = Buffer.from(script, 'latin1');
	const gifPolyglot = Buffer.concat([
		gif.subarray(0, gif.length - 1),
		Buffer.from([0x21, 0xfe, comment.length]),
		comment,
		Buffer.from([0x00, 0x3b])
	]);
	// An HTML page with a JPEG after it: a browser sniffing it sees a page.
	const htmlFirst = Buffer.concat([
		Buffer.from(`<!doctype html><html><body>${script}</body></html>\n`, 'latin1'),
		noisy
	]);
	// A decompression bomb: 8,000 × 8,000 = 64 megapixels of one grey (over the 50-megapixel
	// limit), deflated by PNG to a few tens of kilobytes.
	const side = 8000;
	expect(side * side).toBeGreaterThan(MAX_PHOTO_PIXELS);
	const bomb = await sharp({
		create: { width: side, height: side, channels: 3, background: '#808080' }
	})
		.greyscale()
		.png({ compressionLevel: 9 })
		.toBuffer();
	// A header-only bomb: a 1 × 1 PNG whose IHDR claims 100,000 × 100,000 (10 gigapixels).
	const tiny = await sharp({ create: { width: 1, height: 1, channels: 3, background: '#000' } })
		.png()
		.toBuffer();
	const ihdr = Buffer.from(tiny.subarray(16, 29));
	ihdr.writeUInt32BE(100_000, 0);
	ihdr.writeUInt32BE(100_000, 4);
	const claimedHuge = Buffer.concat([
		tiny.subarray(0, 8),
		pngChunk('IHDR', ihdr),
		tiny.subarray(33)
	]);
	return [
		{
			name: 'an SVG with a script',
			file: 'evil.svg',
			type: 'image/svg+xml',
			bytes: Buffer.from(svg),
			codes: ['wrong_format', 'not_image'],
			status: 415
		},
		{
			name: 'the same SVG named and typed as a JPEG',
			file: 'photo.jpg',
			type: 'image/jpeg',
			bytes: Buffer.from(svg),
			codes: ['wrong_format', 'not_image'],
			status: 415
		},
		{
			name: 'a GIF carrying a script (polyglot)',
			file: 'culture.jpg',
			type: 'image/jpeg',
			bytes: gifPolyglot,
			codes: ['wrong_format'],
			status: 415
		},
		{
			name: 'an HTML page with a JPEG behind it (polyglot)',
			file: 'arrival.jpg',
			type: 'image/jpeg',
			bytes: htmlFirst,
			codes: ['not_image'],
			status: 415
		},
		{
			name: 'a JPEG cut short',
			file: 'cut.jpg',
			type: 'image/jpeg',
			bytes: noisy.subarray(0, Math.floor(noisy.length * 0.6)),
			codes: ['damaged'],
			status: 400
		},
		{
			name: 'a 64-megapixel decompression bomb',
			file: 'bomb.png',
			type: 'image/png',
			bytes: bomb,
			codes: ['too_many_pixels'],
			status: 413
		},
		{
			name: 'a PNG header claiming 10 gigapixels',
			file: 'huge.png',
			type: 'image/png',
			bytes: claimedHuge,
			codes: ['too_many_pixels'],
			status: 413
		},
		{
			name: 'a file named ../../x',
			file: '../../x',
			type: 'application/octet-stream',
			bytes: Buffer.from('#!/bin/sh\necho owned\n'),
			codes: ['not_image'],
			status: 415
		},
		{
			name: 'a 20 MB file',
			file: 'huge.jpg',
			type: 'image/jpeg',
			bytes: Buffer.concat([noisy.subarray(0, 2), randomBytes(20 * 1024 * 1024)]),
			codes: ['too_large'],
			status: 413
		}
	];
}

describe('upload attacks', () => {
	let scratch: ScratchDatabase;
	let shop: HostileShop;
	let keeper: string;
	let owner: string;
	let species: { id: number; slug: string };
	let claimable: { id: number; number: string; lineIds: number[] };
	let all: Attack[];
	let jpeg: Buffer;

	const photoRows = async () =>
		Number(
			(
				await scratch.db
					.selectFrom('photo')
					.select((eb) => eb.fn.countAll().as('n'))
					.executeTakeFirstOrThrow()
			).n
		);
	const claimRows = async () =>
		(
			await scratch.db
				.selectFrom('claim')
				.select('id')
				.where('order_id', '=', claimable.id)
				.execute()
		).length;
	const storedFiles = async () =>
		existsSync(shop.photoDir) ? (await readdir(shop.photoDir)).sort() : [];

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		shop = await startHostileShop(scratch.url);
		keeper = (await sessionCookies(scratch.db)).keeper!;
		species = await scratch.db
			.selectFrom('species')
			.select(['id', 'slug'])
			.orderBy('id')
			.executeTakeFirstOrThrow();
		// A delivered order with live lines and no claim, delivered ten minutes ago: inside
		// the claim window, so the claim route gets as far as the photos.
		const order = await scratch.db
			.selectFrom('customer_order as o')
			.select(['o.id', 'o.order_number', 'o.user_id'])
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
		await scratch.db
			.updateTable('customer_order')
			.set({ delivered_at: new Date(Date.now() - 10 * 60_000) })
			.where('id', '=', order.id)
			.execute();
		const lines = await scratch.db
			.selectFrom('order_line')
			.select('id')
			.where('order_id', '=', order.id)
			.where('is_live', '=', true)
			.orderBy('id')
			.execute();
		claimable = { id: order.id, number: order.order_number, lineIds: lines.map((l) => l.id) };
		owner = `hatchlot.session=${await createSession(scratch.db, order.user_id!)}`;
		all = await attacks();
		jpeg = await sharp({
			create: {
				width: 1600,
				height: 1200,
				channels: 3,
				background: '#6b4f2a',
				noise: { type: 'gaussian', mean: 110, sigma: 45 }
			}
		})
			.jpeg({ quality: 92 })
			.toBuffer();
	}, 120_000);
	afterAll(async () => {
		await shop?.stop();
		await scratch?.drop();
	});

	function photoForm(file: { file: string; type: string; bytes: Uint8Array }, extra = {}) {
		const form = new FormData();
		form.set('target_kind', 'species');
		form.set('target_id', String(species.id));
		form.set('alt_text', 'Adults on leaf litter');
		for (const [name, value] of Object.entries(extra)) form.set(name, String(value));
		form.append('files', new File([new Uint8Array(file.bytes)], file.file, { type: file.type }));
		return form;
	}

	function claimForm(file: { file: string; type: string; bytes: Uint8Array }) {
		const form = new FormData();
		for (const id of claimable.lineIds) {
			form.append('lineId', String(id));
			form.append('deadCount', id === claimable.lineIds[0] ? '1' : '');
		}
		form.append('photos', new File([new Uint8Array(file.bytes)], file.file, { type: file.type }));
		form.set('note', 'Found curled in the cup when the box was opened.');
		return form;
	}

	async function post(url: string, cookie: string, body: FormData, accept = 'application/json') {
		const response = await fetch(`${shop.app.origin}${url}`, {
			method: 'POST',
			headers: {
				origin: shop.app.origin,
				cookie,
				accept,
				...(accept === 'application/json' && !url.startsWith('/api/')
					? { 'x-sveltekit-action': 'true' }
					: {})
			},
			body,
			redirect: 'manual',
			signal: AbortSignal.timeout(60_000)
		});
		const text = await response.text();
		expect(leaksIn(text), `${url}: ${text.slice(0, 200)}`).toEqual([]);
		return { status: response.status, text, location: response.headers.get('location') };
	}

	async function expectNothingStored() {
		expect(await photoRows()).toBe(0);
		expect(await claimRows()).toBe(0);
		expect(await storedFiles()).toEqual([]);
	}

	it('refuses each crafted file on the upload route with its status and sentence', async () => {
		for (const attack of all) {
			const answer = await post('/api/manage/photos', keeper, photoForm(attack));
			expect(answer.status, attack.name).toBe(attack.status);
			const { errors } = JSON.parse(answer.text) as {
				errors: { file: string; code: PhotoRefusalCode; reason: string }[];
			};
			expect(errors, attack.name).toHaveLength(1);
			expect(attack.codes, attack.name).toContain(errors[0]!.code);
			expect(errors[0]!.reason).toBe(refusalReason(errors[0]!.code));
			expect(errors[0]!.file).toBe(attack.file);
			await expectNothingStored();
		}
	}, 120_000);

	it('sends the form post without JavaScript back to its page, which says why', async () => {
		const returnTo = `/manage/species/${species.slug}`;
		for (const attack of all) {
			const answer = await post(
				'/manage/photos?/upload',
				keeper,
				photoForm(attack, { return_to: returnTo }),
				'text/html'
			);
			// Post, redirect, get: the refusal travels in the address of the page it returns to.
			expect(answer.status, attack.name).toBe(303);
			const back = new URL(answer.location!, shop.app.origin);
			expect(back.pathname).toBe(returnTo);
			expect(back.searchParams.get('photos')).toBe('refused');
			const [code] = back.searchParams.get('photos_refused')!.split(':') as [PhotoRefusalCode];
			expect(attack.codes, attack.name).toContain(code);
			const page = await fetch(back, { headers: { cookie: keeper } });
			expect(page.status).toBe(200);
			const html = await page.text();
			// Svelte escapes text: the sentence as the page writes it.
			const sentence = refusalReason(code).replace(/&/g, '&amp;').replace(/</g, '&lt;');
			expect(html, attack.name).toContain(sentence);
			await expectNothingStored();
		}
	}, 120_000);

	it('refuses each crafted file on a claim, filing nothing', async () => {
		const url = `/account/orders/${encodeURIComponent(claimable.number)}/claim`;
		for (const attack of all) {
			const answer = await post(url, owner, claimForm(attack));
			if (answer.status === 413) {
				// Larger than any photo the claim takes, refused as a whole request before the form
				// is read: only for a body over the photo limit.
				expect(attack.bytes.byteLength, attack.name).toBeGreaterThan(MAX_PHOTO_BYTES);
				expect(answer.text).toMatch(/too large/i);
			} else {
				expect(answer.status, attack.name).toBe(200);
				// SvelteKit's action answer: the refusal and the form with the sentence beside photos.
				const result = JSON.parse(answer.text) as { type: string; status: number; data: string };
				expect(result.type, attack.name).toBe('failure');
				expect(result.status, attack.name).toBeGreaterThanOrEqual(400);
				expect(result.status, attack.name).toBeLessThan(500);
				// The claim form turns away a type no photo has before decoding anything.
				const typed = PHOTO_ACCEPT.split(',').includes(attack.type);
				const codes: PhotoRefusalCode[] = typed ? attack.codes : ['wrong_format'];
				const sentences = codes.map((code) => refusalReason(code));
				expect(
					sentences.some((s) => result.data.includes(s)),
					`${attack.name}: ${result.data.slice(0, 300)}`
				).toBe(true);
			}
			await expectNothingStored();
		}
	}, 120_000);

	it('takes a phone-sized photo on each route, so the refusals are the files’ own', async () => {
		// About 1 MB: larger than any form post, far under the 15 MB a photo may be.
		expect(jpeg.byteLength).toBeGreaterThan(512 * 1024);
		const photo = { file: 'arrival.jpg', type: 'image/jpeg', bytes: jpeg };
		const api = await post('/api/manage/photos', keeper, photoForm(photo));
		expect(api.status).toBe(201);
		const claim = await post(
			`/account/orders/${encodeURIComponent(claimable.number)}/claim`,
			owner,
			claimForm(photo)
		);
		expect(claim.status, claim.text.slice(0, 200)).toBe(200);
		expect((JSON.parse(claim.text) as { type: string }).type).toBe('redirect');
		expect(await claimRows()).toBe(1);
	}, 60_000);

	it('stores a real photo named ../../x under its content hash, inside the photo folder only', async () => {
		const before = new Set(await storedFiles());
		// Not the photo stored above: the same bytes would find their files already there.
		const another = await sharp(jpeg).negate().jpeg().toBuffer();
		const answer = await post(
			'/api/manage/photos',
			keeper,
			photoForm({ file: '../../x', type: 'image/jpeg', bytes: another })
		);
		expect(answer.status).toBe(201);
		const added = (await storedFiles()).filter((name) => !before.has(name));
		expect(added.length).toBeGreaterThan(0);
		for (const name of added) expect(name).toMatch(/^[0-9a-f]{64}-\d+\.webp$/);
		// Nothing called x beside the folder or above it.
		for (const dir of [
			shop.photoDir,
			path.dirname(shop.photoDir),
			path.resolve(shop.photoDir, '../..')
		])
			expect(existsSync(path.join(dir, 'x')), dir).toBe(false);
	}, 60_000);

	it('is still answering after all of it', async () => {
		const health = await fetch(`${shop.app.origin}/api/health`);
		expect(health.status).toBe(200);
		expect(shop.app.output()).not.toMatch(/FATAL|out of memory|Segmentation fault/i);
	});
});
