import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { photoStorage, photoStorageDir } from './storage';

const hash = 'a'.repeat(64);
const other = 'b'.repeat(64);

describe('photoStorageDir', () => {
	it('is .data/photos under the project root unless PHOTO_STORAGE_DIR says otherwise', () => {
		expect(photoStorageDir({})).toBe(path.resolve(process.cwd(), '.data/photos'));
		expect(photoStorageDir({ PHOTO_STORAGE_DIR: '  ' })).toBe(
			path.resolve(process.cwd(), '.data/photos')
		);
		expect(photoStorageDir({ PHOTO_STORAGE_DIR: '/srv/hatchlot/photos' })).toBe(
			'/srv/hatchlot/photos'
		);
	});
});

describe('photoStorage', () => {
	let dir: string;
	beforeEach(async () => {
		dir = path.join(await mkdtemp(path.join(os.tmpdir(), 'hatchlot-storage-')), 'photos');
	});
	afterEach(async () => {
		await rm(path.dirname(dir), { recursive: true, force: true });
	});

	it('creates its folder on demand and writes each variant once', async () => {
		const storage = photoStorage(dir);
		expect(await storage.exists(hash, 320)).toBe(false);
		expect(await storage.open(hash, 320)).toBeNull();
		expect(await storage.write(hash, 320, Buffer.from('first'))).toBe(true);
		expect(await storage.write(hash, 320, Buffer.from('second'))).toBe(false);
		expect(await readFile(path.join(dir, `${hash}-320.webp`), 'utf8')).toBe('first');
		const opened = await storage.open(hash, 320);
		expect(opened?.size).toBe(5);
		// Nothing is left over from writing aside.
		expect(await readdir(dir)).toEqual([`${hash}-320.webp`]);
	});

	it("removes every width of one hash and leaves other hashes' files", async () => {
		const storage = photoStorage(dir);
		await storage.write(hash, 320, Buffer.from('x'));
		await storage.write(hash, 640, Buffer.from('x'));
		await storage.write(other, 320, Buffer.from('x'));
		expect(await storage.removeAll(hash)).toBe(2);
		expect(await readdir(dir)).toEqual([`${other}-320.webp`]);
		await expect(storage.removeAll('../etc')).rejects.toThrow(RangeError);
	});

	it('refuses names that are not a hash and a width', async () => {
		const storage = photoStorage(dir);
		await expect(storage.write('../../etc/passwd', 320, Buffer.from('x'))).rejects.toThrow(
			RangeError
		);
		await expect(storage.exists(hash, -1)).rejects.toThrow(RangeError);
	});
});
