import { describe, expect, it } from 'vitest';
import {
	formatFileSize,
	MAX_BATCH_BYTES,
	MAX_PHOTO_BYTES,
	MAX_PHOTO_PIXELS,
	MAX_PHOTOS_PER_BATCH,
	precheckFiles,
	refusalReason,
	refusalStatus,
	sourceFormatFrom,
	variantWidths
} from './limits';

describe('upload limits', () => {
	it('are 15 MiB a file and 50 megapixels an image', () => {
		// IEC 80000-13: 1 MiB = 2^20 bytes; SI: mega = 10^6 (NIST SP 811).
		expect(MAX_PHOTO_BYTES).toBe(15_728_640);
		expect(MAX_PHOTO_PIXELS).toBe(50_000_000);
		// An 8000 × 7500 image is 60 megapixels: over the limit.
		expect(8000 * 7500).toBeGreaterThan(MAX_PHOTO_PIXELS);
		// adapter-node reads BODY_SIZE_LIMIT=64M as 64 × 2^20 bytes; a full batch must fit under it.
		expect(MAX_BATCH_BYTES).toBeLessThan(64 * 1024 * 1024);
	});

	it('says the limits in the refusal sentences', () => {
		expect(refusalReason('too_large')).toContain('15 MB');
		expect(refusalReason('too_many_pixels')).toContain('50 megapixels');
		expect(refusalReason('too_many_files')).toContain(String(MAX_PHOTOS_PER_BATCH));
	});
});

describe('refusalStatus', () => {
	it('answers 413 for anything too big, 415 for the wrong kind, 404 for a missing record', () => {
		// RFC 9110 §15.5.14 (413 Content Too Large), §15.5.16 (415 Unsupported Media Type).
		expect(refusalStatus(['not_image', 'too_large'])).toBe(413);
		expect(refusalStatus(['too_many_pixels'])).toBe(413);
		expect(refusalStatus(['wrong_format', 'damaged'])).toBe(415);
		expect(refusalStatus(['target_missing'])).toBe(404);
		expect(refusalStatus(['no_files'])).toBe(400);
		expect(refusalStatus(['damaged'])).toBe(400);
	});
});

describe('sourceFormatFrom', () => {
	it('takes JPEG, PNG, WebP and AV1-coded HEIF (AVIF) only', () => {
		expect(sourceFormatFrom('jpeg')).toBe('jpeg');
		expect(sourceFormatFrom('png')).toBe('png');
		expect(sourceFormatFrom('webp')).toBe('webp');
		expect(sourceFormatFrom('heif', 'av1')).toBe('avif');
		expect(sourceFormatFrom('heif', 'hevc')).toBeNull();
		expect(sourceFormatFrom('gif')).toBeNull();
		expect(sourceFormatFrom('svg')).toBeNull();
		expect(sourceFormatFrom('tiff')).toBeNull();
		expect(sourceFormatFrom(undefined)).toBeNull();
	});
});

describe('variantWidths', () => {
	it('writes the standard widths below the original and never enlarges', () => {
		expect(variantWidths(6000)).toEqual([320, 640, 1280, 1920]);
		expect(variantWidths(1920)).toEqual([320, 640, 1280, 1920]);
		expect(variantWidths(1000)).toEqual([320, 640, 1000]);
		expect(variantWidths(640)).toEqual([320, 640]);
		expect(variantWidths(200)).toEqual([200]);
		expect(() => variantWidths(0)).toThrow(RangeError);
	});
});

describe('precheckFiles', () => {
	const jpeg = (name: string, size: number) => ({ name, size, type: 'image/jpeg' });

	it('asks for a file when none is chosen', () => {
		expect(precheckFiles([]).map((r) => r.code)).toEqual(['no_files']);
	});

	it('names each file that is too big, empty or plainly not a photo', () => {
		const refusals = precheckFiles([
			jpeg('ok.jpg', 2_000_000),
			jpeg('huge.jpg', MAX_PHOTO_BYTES + 1),
			jpeg('empty.jpg', 0),
			{ name: 'notes.txt', size: 100, type: 'text/plain' },
			{ name: 'unknown', size: 100, type: '' }
		]);
		expect(refusals.map((r) => [r.file, r.code])).toEqual([
			['huge.jpg', 'too_large'],
			['empty.jpg', 'empty'],
			['notes.txt', 'wrong_format']
		]);
	});

	it('refuses a batch with too many files or too many bytes in all', () => {
		const many = Array.from({ length: MAX_PHOTOS_PER_BATCH + 1 }, (_, i) => jpeg(`${i}.jpg`, 10));
		expect(precheckFiles(many).map((r) => r.code)).toEqual(['too_many_files']);
		const heavy = Array.from({ length: 5 }, (_, i) => jpeg(`${i}.jpg`, 14 * 1024 * 1024));
		expect(precheckFiles(heavy).map((r) => r.code)).toEqual(['batch_too_large']);
	});
});

describe('formatFileSize', () => {
	it('shows MB with one decimal and kB whole', () => {
		expect(formatFileSize(2.5 * 1024 * 1024)).toBe('2.5 MB');
		expect(formatFileSize(380 * 1024)).toBe('380 kB');
		expect(formatFileSize(10)).toBe('1 kB');
	});
});
