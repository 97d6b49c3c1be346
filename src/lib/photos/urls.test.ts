import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { parsePhotoFileName, photoFileName, photoSrc, photoSrcset, photoUrl } from './urls';

// A real sha-256 (of the empty string, the FIPS 180-4 test value e3b0c442…b855), so names
// are checked against the shape the server actually writes.
const hash = createHash('sha256').update('').digest('hex');

describe('photo file names', () => {
	it('names a variant <sha256>-<width>.webp and reads the name back', () => {
		expect(hash).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
		expect(photoFileName(hash, 640)).toBe(`${hash}-640.webp`);
		expect(parsePhotoFileName(`${hash}-640.webp`)).toEqual({ hash, width: 640 });
	});

	it('refuses names that are not exactly ours', () => {
		for (const name of [
			`${hash}-640.jpg`,
			`${hash.toUpperCase()}-640.webp`,
			`${hash.slice(1)}-640.webp`,
			`${hash}-0640.webp`,
			`${hash}-0.webp`,
			`${hash}-640.webp/..`,
			`../${hash}-640.webp`,
			`${hash}-640.webp.webp`,
			`${hash}--640.webp`,
			''
		]) {
			expect(parsePhotoFileName(name), name).toBeNull();
		}
		expect(() => photoFileName('not-a-hash', 640)).toThrow(RangeError);
		expect(() => photoFileName(hash, 1.5)).toThrow(RangeError);
	});
});

describe('photo URLs', () => {
	const photo = { hash, widths: [1280, 320, 640] };

	it('serves variants under /photos, with the base path first when there is one', () => {
		expect(photoUrl(hash, 320)).toBe(`/photos/${hash}-320.webp`);
		expect(photoUrl(hash, 320, '/shop')).toBe(`/shop/photos/${hash}-320.webp`);
	});

	it('lists every stored width in the srcset, narrowest first', () => {
		expect(photoSrcset(photo)).toBe(
			`/photos/${hash}-320.webp 320w, /photos/${hash}-640.webp 640w, /photos/${hash}-1280.webp 1280w`
		);
	});

	it('falls back to the narrowest width that is wide enough, else the widest', () => {
		expect(photoSrc(photo, 500)).toBe(`/photos/${hash}-640.webp`);
		expect(photoSrc(photo, 640)).toBe(`/photos/${hash}-640.webp`);
		expect(photoSrc(photo, 2000)).toBe(`/photos/${hash}-1280.webp`);
		expect(() => photoSrc({ hash, widths: [] })).toThrow(RangeError);
	});
});
