import { describe, expect, it } from 'vitest';
import { MAX_PHOTO_BYTES, MAX_PHOTOS_PER_BATCH } from '$lib/photos/limits';
import { claimFormSchema, claimLinesOf, isChosenFile } from './claim-form';

const photo = (name = 'box.jpg', size = 2048, type = 'image/jpeg') =>
	new File([new Uint8Array(size)], name, { type });
const emptyPart = () => new File([], '', { type: 'application/octet-stream' });

const base = {
	lineId: [11, 12],
	deadCount: ['2', ''],
	photos: [photo()],
	note: 'Two curled up and did not move when the cup was opened.'
};

const problems = (input: unknown) => {
	const parsed = claimFormSchema.safeParse(input);
	return parsed.success ? [] : parsed.error.issues.map((i) => [i.path.join('.'), i.message]);
};

describe('claim form', () => {
	it('takes counts per line and keeps only lines with deaths', () => {
		const parsed = claimFormSchema.parse(base);
		expect(claimLinesOf(parsed)).toEqual([{ orderLineId: 11, deadCount: 2 }]);
		expect(claimLinesOf({ ...parsed, deadCount: ['0', ' 3 '] })).toEqual([
			{ orderLineId: 12, deadCount: 3 }
		]);
	});

	it('puts a bad count beside its own box, and asks for at least one death', () => {
		expect(problems({ ...base, deadCount: ['two', ''] })).toEqual([
			['deadCount.0', 'A whole number of animals, or blank.']
		]);
		expect(problems({ ...base, deadCount: ['-1', ''] })).toEqual([
			['deadCount.0', 'A whole number of animals, or blank.']
		]);
		expect(problems({ ...base, deadCount: ['0', ''] })).toEqual([
			['deadCount', 'Say how many arrived dead on at least one line.']
		]);
	});

	it('needs a photo: the empty part of an untouched file field does not count', () => {
		expect(isChosenFile(emptyPart())).toBe(false);
		expect(isChosenFile(photo())).toBe(true);
		expect(problems({ ...base, photos: [emptyPart()] })).toEqual([
			['photos', 'Add at least one photo of the animals as they arrived.']
		]);
		expect(problems({ ...base, photos: [] })).toEqual([
			['photos', 'Add at least one photo of the animals as they arrived.']
		]);
	});

	it('refuses too many photos, an oversized one and a plainly wrong type, in words', () => {
		const many = Array.from({ length: MAX_PHOTOS_PER_BATCH + 1 }, (_, i) => photo(`p${i}.jpg`));
		expect(problems({ ...base, photos: many })[0]?.[1]).toContain(
			`Up to ${MAX_PHOTOS_PER_BATCH} photos`
		);
		const big = photo('huge.jpg', MAX_PHOTO_BYTES + 1);
		expect(problems({ ...base, photos: [big] })[0]?.[1]).toMatch(/^huge\.jpg: Over 15 MB/);
		const svg = photo('box.svg', 200, 'image/svg+xml');
		expect(problems({ ...base, photos: [svg] })[0]?.[1]).toMatch(/^box\.svg: This kind of image/);
	});

	it('trims the note and caps its length', () => {
		expect(claimFormSchema.parse({ ...base, note: '  cold box  ' }).note).toBe('cold box');
		expect(problems({ ...base, note: 'x'.repeat(2001) })).toEqual([
			['note', 'Keep the note under 2000 characters.']
		]);
	});

	it('drops a NUL from the note, which PostgreSQL would refuse in text', () => {
		expect(claimFormSchema.parse({ ...base, note: 'cold\0 box\0' }).note).toBe('cold box');
	});
});
