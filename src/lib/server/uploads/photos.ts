// Photos of species, colonies and clutches: every upload is decoded (never trusted
// by its name or type), turned upright, stripped of all metadata (a phone photo's
// GPS would give away the breeder's home) and stored as WebP variants. One module
// owns writes to the photo table.
import type { Actor } from '$lib/server/audit';
import { createHash } from 'node:crypto';
import { sql, type Kysely, type Selectable } from 'kysely';
import sharp, { type Metadata } from 'sharp';
import {
	MAX_ALT_LENGTH,
	MAX_BATCH_BYTES,
	MAX_PHOTO_BYTES,
	MAX_PHOTO_PIXELS,
	MAX_PHOTOS_PER_BATCH,
	refusal,
	refusalStatus,
	sourceFormatFrom,
	variantWidths,
	type PhotoRefusal,
	type PhotoRefusalCode,
	type PhotoSourceFormat
} from '$lib/photos/limits';
import type { ClientPhoto, PhotoTarget } from '$lib/photos/urls';
import { writeAudit } from '../audit';
import type { Database, PhotoTable } from '../db/schema';
import {
	lockPhotoHashes,
	photoStorage,
	removeUnusedPhotoFiles,
	type PhotoStorage
} from './storage';

export type UploadedPhotoFile = { name: string; bytes: Uint8Array };

export interface ProcessedPhoto {
	hash: string;
	/** The upright original, in pixels. */
	width: number;
	height: number;
	/** The uploaded file's size. */
	byteSize: number;
	sourceFormat: PhotoSourceFormat;
	variants: { width: number; bytes: Buffer }[];
}

export type ProcessOutcome =
	{ ok: true; photo: ProcessedPhoto } | { ok: false; code: PhotoRefusalCode };

/** WebP quality for animal photos: fine detail of legs and segments survives. */
const WEBP_QUALITY = 82;

/**
 * Checks, decodes and re-encodes one upload. Nothing is written here; refused
 * files come back with the reason's code.
 */
export async function processPhoto(input: Uint8Array): Promise<ProcessOutcome> {
	if (input.byteLength === 0) return { ok: false, code: 'empty' };
	// Refuse by size before the decoder sees a byte of it.
	if (input.byteLength > MAX_PHOTO_BYTES) return { ok: false, code: 'too_large' };
	const buffer = Buffer.from(input.buffer, input.byteOffset, input.byteLength);

	let metadata: Metadata;
	try {
		// Reads the header only; pixels are decoded below, under the pixel limit.
		metadata = await sharp(buffer, { limitInputPixels: false }).metadata();
	} catch {
		return { ok: false, code: 'not_image' };
	}
	const sourceFormat = sourceFormatFrom(metadata.format, metadata.compression);
	if (!sourceFormat) return { ok: false, code: 'wrong_format' };
	if (!metadata.width || !metadata.height) return { ok: false, code: 'damaged' };
	if (metadata.width * metadata.height > MAX_PHOTO_PIXELS)
		return { ok: false, code: 'too_many_pixels' };

	const { width, height } = metadata.autoOrient;
	const variants: ProcessedPhoto['variants'] = [];
	try {
		for (const variantWidth of variantWidths(width)) {
			// No keepExif/keepMetadata: sharp writes none of the input's EXIF, XMP, IPTC or ICC.
			const bytes = await sharp(buffer, { limitInputPixels: MAX_PHOTO_PIXELS, failOn: 'warning' })
				.autoOrient()
				.resize({ width: variantWidth, withoutEnlargement: true })
				.webp({ quality: WEBP_QUALITY })
				.toBuffer();
			variants.push({ width: variantWidth, bytes });
		}
	} catch {
		return { ok: false, code: 'damaged' };
	}

	return {
		ok: true,
		photo: {
			hash: createHash('sha256').update(buffer).digest('hex'),
			width,
			height,
			byteSize: buffer.byteLength,
			sourceFormat,
			variants
		}
	};
}

const TARGET_COLUMN = {
	species: 'species_id',
	colony: 'colony_id',
	clutch: 'clutch_id',
	listing: 'listing_id',
	claim: 'claim_id'
} as const;

function targetColumns(target: PhotoTarget) {
	return {
		species_id: target.kind === 'species' ? target.id : null,
		colony_id: target.kind === 'colony' ? target.id : null,
		clutch_id: target.kind === 'clutch' ? target.id : null,
		listing_id: target.kind === 'listing' ? target.id : null,
		claim_id: target.kind === 'claim' ? target.id : null
	};
}

type PhotoRow = Selectable<PhotoTable>;

function toClientPhoto(row: PhotoRow): ClientPhoto {
	return {
		id: row.id,
		hash: row.content_hash,
		width: row.width,
		height: row.height,
		widths: [...row.widths].sort((a, b) => a - b),
		altText: row.alt_text,
		position: row.position
	};
}

/** The species, colony, clutch, listing or claim a photo belongs to. */
function targetOf(row: PhotoRow): PhotoTarget | null {
	if (row.species_id !== null) return { kind: 'species', id: row.species_id };
	if (row.colony_id !== null) return { kind: 'colony', id: row.colony_id };
	if (row.clutch_id !== null) return { kind: 'clutch', id: row.clutch_id };
	if (row.listing_id !== null) return { kind: 'listing', id: row.listing_id };
	if (row.claim_id !== null) return { kind: 'claim', id: row.claim_id };
	return null;
}

async function targetExists(db: Kysely<Database>, target: PhotoTarget): Promise<boolean> {
	const table = target.kind === 'species' ? 'species' : target.kind;
	const row = await db
		.selectFrom(table)
		.select('id')
		.where('id', '=', target.id)
		.executeTakeFirst();
	return row !== undefined;
}

/** A target's photos in the order they are shown. */
export async function listPhotos(
	db: Kysely<Database>,
	target: PhotoTarget
): Promise<ClientPhoto[]> {
	const rows = await db
		.selectFrom('photo')
		.selectAll()
		.where(TARGET_COLUMN[target.kind], '=', target.id)
		.orderBy('position')
		.orderBy('id')
		.execute();
	return rows.map(toClientPhoto);
}

export type SaveOutcome =
	| { ok: true; photos: ClientPhoto[] }
	| { ok: false; status: 400 | 404 | 413 | 415; refusals: PhotoRefusal[] };

function refused(refusals: PhotoRefusal[]): SaveOutcome {
	return { ok: false, status: refusalStatus(refusals.map((r) => r.code)), refusals };
}

/**
 * Saves a batch of photos for one target: every file is checked first, and when
 * any is refused nothing at all is saved (each refused file gets its reason).
 * Rows and the audit entry go in one transaction; the files are written inside it.
 */
export async function savePhotos(
	db: Kysely<Database>,
	actor: Actor,
	target: PhotoTarget,
	files: readonly UploadedPhotoFile[],
	options: { altText?: string; storage?: PhotoStorage } = {}
): Promise<SaveOutcome> {
	const altText = (options.altText ?? '').trim();
	if (altText.length > MAX_ALT_LENGTH) return refused([refusal('', 'alt_too_long')]);
	if (files.length === 0) return refused([refusal('', 'no_files')]);
	if (files.length > MAX_PHOTOS_PER_BATCH) return refused([refusal('', 'too_many_files')]);
	const total = files.reduce((sum, f) => sum + f.bytes.byteLength, 0);
	if (total > MAX_BATCH_BYTES && files.every((f) => f.bytes.byteLength <= MAX_PHOTO_BYTES))
		return refused([refusal('', 'batch_too_large')]);
	if (!(await targetExists(db, target))) return refused([refusal('', 'target_missing')]);

	// One at a time: a batch of 50-megapixel decodes side by side would be a lot of memory.
	const processed: ProcessedPhoto[] = [];
	const refusals: PhotoRefusal[] = [];
	for (const file of files) {
		const outcome = await processPhoto(file.bytes);
		if (outcome.ok) processed.push(outcome.photo);
		else refusals.push(refusal(file.name, outcome.code));
	}
	if (refusals.length) return refused(refusals);

	const storage = options.storage ?? photoStorage();
	const hashes = processed.map((p) => p.hash);
	try {
		const rows = await db.transaction().execute(async (trx) => {
			await lockPhotoHashes(trx, hashes);
			const last = await trx
				.selectFrom('photo')
				.select(sql<number>`coalesce(max(position), -1)`.as('position'))
				.where(TARGET_COLUMN[target.kind], '=', target.id)
				.executeTakeFirstOrThrow();
			const inserted = await trx
				.insertInto('photo')
				.values(
					processed.map((photo, index) => ({
						content_hash: photo.hash,
						width: photo.width,
						height: photo.height,
						byte_size: photo.byteSize,
						alt_text: altText,
						position: last.position + 1 + index,
						...targetColumns(target),
						uploaded_by: actor.userId,
						widths: photo.variants.map((v) => v.width),
						source_format: photo.sourceFormat
					}))
				)
				.returningAll()
				.execute();
			for (const photo of processed) {
				for (const variant of photo.variants)
					await storage.write(photo.hash, variant.width, variant.bytes);
			}
			await writeAudit(trx, {
				actorUserId: actor.userId,
				actorIp: actor.ip,
				action: 'photo.upload',
				entity: target.kind,
				entityId: target.id,
				detail: {
					photoIds: inserted.map((r) => r.id),
					files: files.map((f) => f.name.slice(0, 120)),
					formats: processed.map((p) => p.sourceFormat)
				}
			});
			return inserted;
		});
		return { ok: true, photos: rows.sort((a, b) => a.position - b.position).map(toClientPhoto) };
	} catch (failure) {
		// Files written before the failure belong to no row now.
		for (const hash of new Set(hashes)) {
			await removeUnusedPhotoFiles(db, hash, storage).catch(() => undefined);
		}
		throw failure;
	}
}

export type PhotoChange =
	| { ok: true; photo: ClientPhoto; target: PhotoTarget | null }
	| { ok: false; status: 400 | 404; refusals: PhotoRefusal[] };

const photoMissing: PhotoChange = {
	ok: false,
	status: 404,
	refusals: [refusal('', 'photo_missing')]
};

/** Removes one photo (claim photos are evidence and are not removed here), with its files if unused. */
export async function deletePhoto(
	db: Kysely<Database>,
	actor: Actor,
	photoId: number,
	storage: PhotoStorage = photoStorage()
): Promise<PhotoChange> {
	const removed = await db.transaction().execute(async (trx) => {
		const row = await trx
			.deleteFrom('photo')
			.where('id', '=', photoId)
			.where('claim_id', 'is', null)
			.returningAll()
			.executeTakeFirst();
		if (!row) return null;
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'photo.delete',
			entity: 'photo',
			entityId: row.id,
			detail: { target: targetOf(row), hash: row.content_hash }
		});
		return row;
	});
	if (!removed) return photoMissing;
	// After the commit, under the hash's lock: an upload of the same picture may have come in meanwhile.
	await removeUnusedPhotoFiles(db, removed.content_hash, storage);
	return { ok: true, photo: toClientPhoto(removed), target: targetOf(removed) };
}

/** Sets the description a screen reader speaks for the photo. */
export async function updateAlt(
	db: Kysely<Database>,
	actor: Actor,
	photoId: number,
	altText: string
): Promise<PhotoChange> {
	const next = altText.trim();
	if (next.length > MAX_ALT_LENGTH)
		return { ok: false, status: 400, refusals: [refusal('', 'alt_too_long')] };
	const changed = await db.transaction().execute(async (trx) => {
		const before = await trx
			.selectFrom('photo')
			.select(['id', 'alt_text'])
			.where('id', '=', photoId)
			.where('claim_id', 'is', null)
			.forUpdate()
			.executeTakeFirst();
		if (!before) return null;
		const row = await trx
			.updateTable('photo')
			.set({ alt_text: next })
			.where('id', '=', photoId)
			.returningAll()
			.executeTakeFirstOrThrow();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'photo.alt',
			entity: 'photo',
			entityId: photoId,
			detail: { from: before.alt_text, to: next }
		});
		return row;
	});
	if (!changed) return photoMissing;
	return { ok: true, photo: toClientPhoto(changed), target: targetOf(changed) };
}

/**
 * Who may fetch a stored variant: 'public' when a species, clutch or listing photo
 * uses the hash at that width; 'owner' when the viewer filed a claim that uses it
 * (only they and staff see claim photos); 'keeper' when only colony or other
 * customers' claim photos use it; null when no photo does.
 */
export async function photoVisibility(
	db: Kysely<Database>,
	hash: string,
	width: number,
	viewerId: string | null = null
): Promise<'public' | 'owner' | 'keeper' | null> {
	const row = await db
		.selectFrom('photo')
		.leftJoin('claim', 'claim.id', 'photo.claim_id')
		.select([
			sql<
				boolean | null
			>`bool_or(photo.species_id is not null or photo.clutch_id is not null or photo.listing_id is not null)`.as(
				'shop'
			),
			sql<boolean | null>`bool_or(claim.user_id is not null and claim.user_id = ${viewerId})`.as(
				'owner'
			),
			sql<boolean | null>`bool_or(photo.colony_id is not null or photo.claim_id is not null)`.as(
				'office'
			)
		])
		.where('photo.content_hash', '=', hash)
		.where(sql<boolean>`${width}::integer = any(photo.widths)`)
		.executeTakeFirst();
	if (row?.shop) return 'public';
	if (row?.owner) return 'owner';
	if (row?.office) return 'keeper';
	return null;
}
