// What a photo upload may be, the reasons one is refused, and the WebP widths
// kept. Pure, so the form can say the same sentence the server decides.

/** Bytes per file: 15 MiB (1024-based, which is what phones and file managers call 15 MB). */
export const MAX_PHOTO_BYTES = 15 * 1024 * 1024;
/** Pixels per image: 50 megapixels (SI mega, 10^6). */
export const MAX_PHOTO_PIXELS = 50_000_000;
/** Files per batch, and bytes per batch: kept under the server's BODY_SIZE_LIMIT (64M). */
export const MAX_PHOTOS_PER_BATCH = 12;
export const MAX_BATCH_BYTES = 60 * 1024 * 1024;
/** A description for screen readers: a sentence, not an essay. */
export const MAX_ALT_LENGTH = 300;
/** The WebP widths written for each photo (grid tile, detail, wide screens). */
export const PHOTO_WIDTHS = [320, 640, 1280, 1920] as const;

export const PHOTO_SOURCE_FORMATS = ['jpeg', 'png', 'webp', 'avif'] as const;
export type PhotoSourceFormat = (typeof PHOTO_SOURCE_FORMATS)[number];
/** For the file picker's accept attribute. */
export const PHOTO_ACCEPT = 'image/jpeg,image/png,image/webp,image/avif';

export const PHOTO_REFUSAL_CODES = [
	'no_files',
	'too_many_files',
	'batch_too_large',
	'empty',
	'too_large',
	'not_image',
	'wrong_format',
	'too_many_pixels',
	'damaged',
	'alt_too_long',
	'target_missing',
	'photo_missing',
	'bad_form'
] as const;
export type PhotoRefusalCode = (typeof PHOTO_REFUSAL_CODES)[number];

/** One refused file (file is '' when the refusal is about the whole batch). */
export type PhotoRefusal = { file: string; code: PhotoRefusalCode; reason: string };

export function isPhotoRefusalCode(value: string): value is PhotoRefusalCode {
	return (PHOTO_REFUSAL_CODES as readonly string[]).includes(value);
}

const MB = 1024 * 1024;

/** The sentence shown beside the field. */
export function refusalReason(code: PhotoRefusalCode): string {
	switch (code) {
		case 'no_files':
			return 'Choose at least one photo.';
		case 'too_many_files':
			return `Up to ${MAX_PHOTOS_PER_BATCH} photos at a time; send the rest in another batch.`;
		case 'batch_too_large':
			return `More than ${MAX_BATCH_BYTES / MB} MB in one upload. Send fewer photos at a time, or smaller ones.`;
		case 'empty':
			return 'The file is empty.';
		case 'too_large':
			return `Over ${MAX_PHOTO_BYTES / MB} MB. Export it smaller (a long side of 4000 px is plenty) and try again.`;
		case 'not_image':
			return 'Not a picture we can read. Use a JPEG, PNG, WebP or AVIF photo.';
		case 'wrong_format':
			return 'This kind of image is not taken. Use a JPEG, PNG, WebP or AVIF photo.';
		case 'too_many_pixels':
			return `More than ${MAX_PHOTO_PIXELS / 1_000_000} megapixels. Scale it down and try again.`;
		case 'damaged':
			return 'The picture is damaged or cut short. Export it again and retry.';
		case 'alt_too_long':
			return `Keep the description to ${MAX_ALT_LENGTH} characters.`;
		case 'target_missing':
			return 'That record no longer exists; reload the page.';
		case 'photo_missing':
			return 'That photo is already gone; reload the page.';
		case 'bad_form':
			return 'The form arrived incomplete; reload the page and try again.';
	}
}

export function refusal(file: string, code: PhotoRefusalCode): PhotoRefusal {
	return { file, code, reason: refusalReason(code) };
}

/** The HTTP status for a refused upload: size first (413), then kind (415), then the rest. */
export function refusalStatus(codes: readonly PhotoRefusalCode[]): 400 | 404 | 413 | 415 {
	const sizeCodes: PhotoRefusalCode[] = ['too_large', 'batch_too_large', 'too_many_pixels'];
	if (codes.some((c) => sizeCodes.includes(c))) return 413;
	if (codes.some((c) => c === 'not_image' || c === 'wrong_format')) return 415;
	if (codes.some((c) => c === 'target_missing' || c === 'photo_missing')) return 404;
	return 400;
}

/**
 * Our format name for what the decoder found, or null for anything we do not take.
 * The decoder reports AVIF as its container, HEIF, with AV1 compression; HEIF with
 * HEVC (a phone's HEIC) is a different format and not taken.
 */
export function sourceFormatFrom(
	decoderFormat: string | undefined,
	compression?: string
): PhotoSourceFormat | null {
	if (decoderFormat === 'jpeg' || decoderFormat === 'png' || decoderFormat === 'webp')
		return decoderFormat;
	if (decoderFormat === 'heif' && compression === 'av1') return 'avif';
	return null;
}

/**
 * The WebP widths to write for an upright original `width` px wide: each standard
 * width narrower than the original, plus the original's own width when it is
 * narrower than the largest standard one, so no variant is ever enlarged.
 */
export function variantWidths(width: number): number[] {
	if (!Number.isInteger(width) || width < 1) throw new RangeError(`not an image width: ${width}`);
	const largest = PHOTO_WIDTHS[PHOTO_WIDTHS.length - 1]!;
	const widths: number[] = PHOTO_WIDTHS.filter((w) => w < width);
	widths.push(Math.min(width, largest));
	return [...new Set(widths)].sort((a, b) => a - b);
}

type PickedFile = { name: string; size: number; type: string };

/**
 * What the browser can tell before sending: counts and sizes, and a file type that
 * is plainly not one we take. The server decodes every file and has the last word.
 */
export function precheckFiles(files: readonly PickedFile[]): PhotoRefusal[] {
	if (files.length === 0) return [refusal('', 'no_files')];
	const refusals: PhotoRefusal[] = [];
	if (files.length > MAX_PHOTOS_PER_BATCH) refusals.push(refusal('', 'too_many_files'));
	const total = files.reduce((sum, f) => sum + f.size, 0);
	if (total > MAX_BATCH_BYTES && files.every((f) => f.size <= MAX_PHOTO_BYTES))
		refusals.push(refusal('', 'batch_too_large'));
	const accepted = PHOTO_ACCEPT.split(',');
	for (const file of files) {
		if (file.size === 0) refusals.push(refusal(file.name, 'empty'));
		else if (file.size > MAX_PHOTO_BYTES) refusals.push(refusal(file.name, 'too_large'));
		// An empty type means the browser could not tell; leave it to the server.
		else if (file.type && !accepted.includes(file.type))
			refusals.push(refusal(file.name, 'wrong_format'));
	}
	return refusals;
}

/** "2.4 MB", "380 kB": a file size for the list of chosen files. */
export function formatFileSize(bytes: number): string {
	if (bytes >= MB) return `${(bytes / MB).toFixed(1)} MB`;
	return `${Math.max(1, Math.round(bytes / 1024))} kB`;
}
