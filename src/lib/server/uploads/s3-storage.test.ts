// The bucket store against the local S3 stand-in (tests/fakes/s3), which checks every
// request's Signature Version 4 with its own code, and the same contract run on the
// folder store, so the two stay interchangeable.
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { text } from 'node:stream/consumers';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { startS3Fake, type S3Fake } from '../../../../tests/fakes/s3/server';
import { PhotoStoreError, s3ConfigFrom, s3PhotoStorage, type S3PhotoConfig } from './s3-storage';
import { folderPhotoStorage, photoStorage, type PhotoStorage } from './storage';

const hash = 'a'.repeat(64);
const other = 'b'.repeat(64);
const KEY_ID = 'HATCHLOTTESTKEY0001';
const SECRET = 'stand-in-secret-access-key-0123456789';

let fake: S3Fake;
beforeAll(async () => {
	fake = await startS3Fake({
		port: 0,
		bucket: 'hatchlot-photos',
		accessKeyId: KEY_ID,
		secretAccessKey: SECRET,
		region: 'us-east-1',
		// Two keys a page: removing three widths has to follow a continuation token.
		pageSize: 2
	});
});
afterAll(async () => {
	await fake?.stop();
});

function bucketConfig(overrides: Partial<S3PhotoConfig> = {}): S3PhotoConfig {
	return {
		bucketUrl: fake.bucketUrl,
		region: 'us-east-1',
		accessKeyId: KEY_ID,
		secretAccessKey: SECRET,
		prefix: 'photos/',
		timeoutMs: 5_000,
		...overrides
	};
}

const stores: [string, () => Promise<{ storage: PhotoStorage; done: () => Promise<void> }>][] = [
	[
		'folder',
		async () => {
			const root = await mkdtemp(path.join(os.tmpdir(), 'hatchlot-contract-'));
			return {
				storage: folderPhotoStorage(path.join(root, 'photos')),
				done: () => rm(root, { recursive: true, force: true })
			};
		}
	],
	[
		'bucket',
		async () => ({
			storage: s3PhotoStorage(bucketConfig()),
			done: async () => fake.objects().clear()
		})
	]
];

describe.each(stores)('the %s store', (_name, make) => {
	let storage: PhotoStorage;
	let done: () => Promise<void>;
	beforeEach(async () => {
		({ storage, done } = await make());
	});
	afterEach(async () => {
		await done();
	});

	it('writes a variant once and reads it back', async () => {
		expect(await storage.exists(hash, 320)).toBe(false);
		expect(await storage.open(hash, 320)).toBeNull();
		expect(await storage.write(hash, 320, Buffer.from('first'))).toBe(true);
		expect(await storage.write(hash, 320, Buffer.from('second'))).toBe(false);
		expect(await storage.exists(hash, 320)).toBe(true);
		const opened = await storage.open(hash, 320);
		expect(opened?.size).toBe(5);
		expect(await text(opened!.stream())).toBe('first');
	});

	it("removes every width of one hash and leaves other hashes' variants", async () => {
		for (const width of [320, 640, 1280]) await storage.write(hash, width, Buffer.from('x'));
		await storage.write(other, 320, Buffer.from('y'));
		expect(await storage.removeAll(hash)).toBe(3);
		expect(await storage.exists(hash, 640)).toBe(false);
		expect(await storage.exists(other, 320)).toBe(true);
		expect(await storage.removeAll(hash)).toBe(0);
		await expect(storage.removeAll('../etc')).rejects.toThrow(RangeError);
	});

	it('refuses names that are not a hash and a width', async () => {
		await expect(storage.write('../../etc/passwd', 320, Buffer.from('x'))).rejects.toThrow(
			RangeError
		);
		await expect(storage.exists(hash, -1)).rejects.toThrow(RangeError);
	});
});

describe('the bucket store', () => {
	afterEach(() => {
		fake.objects().clear();
		fake.setDown(false);
		vi.unstubAllEnvs();
	});

	it('keeps objects under the prefix as WebP', async () => {
		await s3PhotoStorage(bucketConfig()).write(hash, 640, Buffer.from('webp bytes'));
		const stored = fake.objects().get(`photos/${hash}-640.webp`);
		expect(stored?.contentType).toBe('image/webp');
		expect(stored?.body.toString()).toBe('webp bytes');
	});

	it('is refused with a wrong secret, and says so', async () => {
		const wrong = s3PhotoStorage(bucketConfig({ secretAccessKey: 'not-the-secret-0000000000' }));
		const failure = await wrong.write(hash, 320, Buffer.from('x')).catch((error: unknown) => error);
		expect(failure).toBeInstanceOf(PhotoStoreError);
		expect(failure).toMatchObject({ status: 403, code: 'SignatureDoesNotMatch' });
		expect(fake.objects().size).toBe(0);
	});

	it('fails, after a few tries, while the store is down', async () => {
		fake.setDown(true);
		const before = fake.requests().length;
		await expect(
			s3PhotoStorage(bucketConfig()).write(hash, 320, Buffer.from('x'))
		).rejects.toMatchObject({ status: 503, code: 'SlowDown' });
		// The first try and two retries.
		expect(fake.requests().length - before).toBe(3);
	});

	it('is what photoStorage() gives when PHOTO_S3_URL is set', async () => {
		vi.stubEnv('PHOTO_S3_URL', fake.bucketUrl);
		vi.stubEnv('PHOTO_S3_ACCESS_KEY_ID', KEY_ID);
		vi.stubEnv('PHOTO_S3_SECRET_ACCESS_KEY', SECRET);
		vi.stubEnv('PHOTO_S3_PREFIX', 'shop/');
		await photoStorage().write(other, 320, Buffer.from('z'));
		expect([...fake.objects().keys()]).toEqual([`shop/${other}-320.webp`]);
	});
});

describe('s3ConfigFrom', () => {
	it('is null without PHOTO_S3_URL: the folder is used', () => {
		expect(s3ConfigFrom({})).toBeNull();
		expect(s3ConfigFrom({ PHOTO_S3_URL: '  ' })).toBeNull();
	});

	it('reads the bucket, region, keys, prefix and timeout', () => {
		expect(
			s3ConfigFrom({
				PHOTO_S3_URL: 'https://hatchlot-photos.s3.us-east-2.amazonaws.com/',
				PHOTO_S3_REGION: 'us-east-2',
				PHOTO_S3_ACCESS_KEY_ID: 'AKIA0000',
				PHOTO_S3_SECRET_ACCESS_KEY: 'secret',
				PHOTO_S3_PREFIX: 'photos/',
				PHOTO_S3_TIMEOUT_MS: '8000'
			})
		).toEqual({
			bucketUrl: 'https://hatchlot-photos.s3.us-east-2.amazonaws.com',
			region: 'us-east-2',
			accessKeyId: 'AKIA0000',
			secretAccessKey: 'secret',
			prefix: 'photos/',
			timeoutMs: 8000
		});
	});

	it('refuses a bucket without keys, or a URL that is not http(s)', () => {
		expect(() => s3ConfigFrom({ PHOTO_S3_URL: 'https://example.com/b' })).toThrow(
			/PHOTO_S3_ACCESS_KEY_ID/
		);
		expect(() =>
			s3ConfigFrom({
				PHOTO_S3_URL: 'ftp://example.com/b',
				PHOTO_S3_ACCESS_KEY_ID: 'a',
				PHOTO_S3_SECRET_ACCESS_KEY: 'b'
			})
		).toThrow(/http/);
	});
});
