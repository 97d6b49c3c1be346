// Where a stored photo is served and what a component hands the browser for it.
// Pure: shared by the server (which names the files) and the components (which show them).

/** What can carry photos uploaded in the back office. */
export const PHOTO_TARGET_KINDS = ['species', 'colony', 'clutch', 'listing'] as const;
export type PhotoTargetKind = (typeof PHOTO_TARGET_KINDS)[number];
/** Claim photos come from the customer filing a claim, never from the back-office upload form. */
export type PhotoTarget = { kind: PhotoTargetKind | 'claim'; id: number };

/** One photo as listPhotos returns it: everything a page needs, nothing about who uploaded it. */
export interface ClientPhoto {
	id: number;
	/** sha-256 of the uploaded file, lower-case hex; names the stored variants. */
	hash: string;
	/** The upright original's size in pixels (after EXIF rotation). */
	width: number;
	height: number;
	/** The WebP widths stored, smallest first. */
	widths: number[];
	altText: string;
	position: number;
}

const HASH = /^[0-9a-f]{64}$/;
const FILE_NAME = /^([0-9a-f]{64})-([1-9][0-9]{0,4})\.webp$/;

export function isPhotoHash(value: string): boolean {
	return HASH.test(value);
}

/** `<sha256>-<width>.webp`, the one name a stored variant has on disk and in its URL. */
export function photoFileName(hash: string, width: number): string {
	if (!isPhotoHash(hash)) throw new RangeError(`not a photo hash: ${hash}`);
	if (!Number.isInteger(width) || width < 1 || width > 99_999)
		throw new RangeError(`not a photo width: ${width}`);
	return `${hash}-${width}.webp`;
}

/** The hash and width a served file name stands for, or null when it is not one of ours. */
export function parsePhotoFileName(name: string): { hash: string; width: number } | null {
	const match = FILE_NAME.exec(name);
	if (!match) return null;
	return { hash: match[1]!, width: Number(match[2]) };
}

/** The URL of one stored variant; `base` is the app's base path when it has one. */
export function photoUrl(hash: string, width: number, base = ''): string {
	return `${base}/photos/${photoFileName(hash, width)}`;
}

/** Every stored width as a srcset, so the browser picks what the layout needs. */
export function photoSrcset(photo: Pick<ClientPhoto, 'hash' | 'widths'>, base = ''): string {
	return [...photo.widths]
		.sort((a, b) => a - b)
		.map((width) => `${photoUrl(photo.hash, width, base)} ${width}w`)
		.join(', ');
}

/** The fallback src: the smallest stored width at least `preferred` wide, else the largest. */
export function photoSrc(
	photo: Pick<ClientPhoto, 'hash' | 'widths'>,
	preferred = 640,
	base = ''
): string {
	const widths = [...photo.widths].sort((a, b) => a - b);
	if (widths.length === 0) throw new RangeError('a photo without stored widths');
	const width = widths.find((w) => w >= preferred) ?? widths[widths.length - 1]!;
	return photoUrl(photo.hash, width, base);
}
