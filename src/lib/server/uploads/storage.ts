// The one place photo files live: a folder outside static/ (PHOTO_STORAGE_DIR,
// default .data/photos under the project root), or an S3-compatible bucket when
// PHOTO_S3_URL is set (s3-storage.ts); one WebP per stored width, named by the
// upload's content hash, written once and never changed. Files go when no
// photo row uses their hash any more. Writers and removers of one hash take the
// same PostgreSQL advisory lock, so an upload and a delete of the same picture
// cannot cross.
import { randomBytes } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { link, mkdir, readdir, stat, unlink, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { sql, type Kysely } from 'kysely';
import { isPhotoHash, photoFileName } from '$lib/photos/urls';
import type { Database } from '../db/schema';
import { s3ConfigFrom, s3PhotoStorage } from './s3-storage';

/**
 * The storage folder. Read from process.env on each call (adapter-node fills it from
 * the environment; scripts and tests that run outside SvelteKit see the same value).
 */
export function photoStorageDir(env: Record<string, string | undefined> = process.env): string {
	const configured = env.PHOTO_STORAGE_DIR?.trim();
	// The app, the scripts and the tests all run from the project root.
	return path.resolve(process.cwd(), configured || path.join('.data', 'photos'));
}

export interface StoredFile {
	size: number;
	stream: () => Readable;
}

/** Where photo files live: this folder, or an S3-compatible bucket (s3-storage.ts). */
export interface PhotoStorage {
	/** Writes the variant unless it is already there; true when this call wrote it. */
	write(hash: string, width: number, bytes: Uint8Array): Promise<boolean>;
	exists(hash: string, width: number): Promise<boolean>;
	/** The variant's size and a reader for it, or null when it is not stored. */
	open(hash: string, width: number): Promise<StoredFile | null>;
	/** Removes every stored variant of the hash; returns how many files went. */
	removeAll(hash: string): Promise<number>;
}

function isMissing(failure: unknown): boolean {
	return (failure as NodeJS.ErrnoException | undefined)?.code === 'ENOENT';
}

let bucket: { settings: string; storage: PhotoStorage } | undefined;

/**
 * The store the environment names: the bucket at PHOTO_S3_URL when that is set (several
 * app machines share it), else the folder. Given a folder, always that folder.
 */
export function photoStorage(dir?: string): PhotoStorage {
	if (dir === undefined) {
		const config = s3ConfigFrom(process.env);
		if (config) {
			const settings = JSON.stringify(config);
			if (bucket?.settings !== settings) bucket = { settings, storage: s3PhotoStorage(config) };
			return bucket.storage;
		}
	}
	return folderPhotoStorage(dir ?? photoStorageDir());
}

export function folderPhotoStorage(dir: string): PhotoStorage & { readonly dir: string } {
	const fileFor = (hash: string, width: number) => path.join(dir, photoFileName(hash, width));

	return {
		dir,
		async write(hash, width, bytes) {
			const target = fileFor(hash, width);
			await mkdir(dir, { recursive: true });
			// Write aside, then hard-link into place: a reader never sees half a file,
			// and link() refuses to replace a file that is already there (write-once).
			const aside = path.join(dir, `.incoming-${randomBytes(8).toString('hex')}`);
			await writeFile(aside, bytes, { flag: 'wx' });
			try {
				await link(aside, target);
				return true;
			} catch (failure) {
				if ((failure as NodeJS.ErrnoException).code === 'EEXIST') return false;
				throw failure;
			} finally {
				await unlink(aside).catch(() => undefined);
			}
		},
		async exists(hash, width) {
			try {
				return (await stat(fileFor(hash, width))).isFile();
			} catch (failure) {
				if (isMissing(failure)) return false;
				throw failure;
			}
		},
		async open(hash, width) {
			const file = fileFor(hash, width);
			try {
				const info = await stat(file);
				if (!info.isFile()) return null;
				return { size: info.size, stream: () => createReadStream(file) };
			} catch (failure) {
				if (isMissing(failure)) return null;
				throw failure;
			}
		},
		async removeAll(hash) {
			if (!isPhotoHash(hash)) throw new RangeError(`not a photo hash: ${hash}`);
			let names: string[];
			try {
				names = await readdir(dir);
			} catch (failure) {
				if (isMissing(failure)) return 0;
				throw failure;
			}
			let removed = 0;
			for (const name of names) {
				if (!name.startsWith(`${hash}-`) || !name.endsWith('.webp')) continue;
				await unlink(path.join(dir, name)).catch((failure) => {
					if (!isMissing(failure)) throw failure;
				});
				removed += 1;
			}
			return removed;
		}
	};
}

/** A 60-bit lock key from the hash; collisions only make two uploads wait for each other. */
function lockKey(hash: string): string {
	if (!isPhotoHash(hash)) throw new RangeError(`not a photo hash: ${hash}`);
	return BigInt(`0x${hash.slice(0, 15)}`).toString();
}

/** Holds the hashes' locks until the transaction ends; sorted, so two writers never deadlock. */
export async function lockPhotoHashes(trx: Kysely<Database>, hashes: Iterable<string>) {
	for (const hash of [...new Set(hashes)].sort()) {
		await sql`select pg_advisory_xact_lock(${lockKey(hash)}::bigint)`.execute(trx);
	}
}

/**
 * Removes the hash's files when no photo row uses it any more. Call it after the
 * transaction that deleted a row (or failed to add one) has ended.
 */
export async function removeUnusedPhotoFiles(
	db: Kysely<Database>,
	hash: string,
	storage: PhotoStorage = photoStorage()
): Promise<number> {
	return db.transaction().execute(async (trx) => {
		await lockPhotoHashes(trx, [hash]);
		const inUse = await trx
			.selectFrom('photo')
			.select('id')
			.where('content_hash', '=', hash)
			.limit(1)
			.executeTakeFirst();
		return inUse ? 0 : storage.removeAll(hash);
	});
}
