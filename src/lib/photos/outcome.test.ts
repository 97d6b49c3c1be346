import { describe, expect, it } from 'vitest';
import { refusal } from './limits';
import { outcomeFor, outcomeUrl, readOutcome, safeReturnPath, splitRefusals } from './outcome';

describe('safeReturnPath', () => {
	it('keeps back-office paths on this site, with their query', () => {
		expect(safeReturnPath('/manage')).toBe('/manage');
		expect(safeReturnPath('/manage/colonies/NA-01')).toBe('/manage/colonies/NA-01');
		expect(safeReturnPath('/manage/species/narceus?tab=care#photos')).toBe(
			'/manage/species/narceus?tab=care'
		);
	});

	it('refuses other hosts, other areas and tricks that lead off the site', () => {
		for (const value of [
			'',
			null,
			undefined,
			'https://evil.example.com/manage',
			'//evil.example.com/manage',
			'/\\evil.example.com/manage',
			'/manage\\..\\admin',
			'/managers',
			'/admin/users',
			'/',
			'manage/colonies',
			'/manage/../admin',
			'/manage/%2e%2e/admin',
			'/manage\n/x',
			'javascript:alert(1)'
		]) {
			expect(safeReturnPath(value), String(value)).toBeNull();
		}
	});
});

describe('outcome in the query string', () => {
	const colony = { kind: 'colony' as const, id: 12 };

	it('round-trips a saved upload and replaces an earlier outcome', () => {
		const first = outcomeUrl('/manage/colonies/NA-01?tab=log', {
			status: 'refused',
			target: colony,
			refusals: [refusal('a.jpg', 'too_large')]
		});
		const second = outcomeUrl(first, { status: 'saved', target: colony, count: 3 });
		expect(second).toBe(
			'/manage/colonies/NA-01?tab=log&photos=saved&photos_for=colony%3A12&photos_count=3'
		);
		expect(readOutcome(new URL(second, 'http://x'))).toEqual({
			status: 'saved',
			target: colony,
			count: 3
		});
	});

	it('carries codes and file names, and gives back our own sentences and the typed description', () => {
		const url = outcomeUrl('/manage/colonies/NA-01', {
			status: 'refused',
			target: colony,
			refusals: [refusal('', 'too_many_files'), refusal('tub: 3.jpg', 'not_image')],
			altText: 'Adults on cork bark'
		});
		const outcome = readOutcome(new URL(url, 'http://x'))!;
		expect(outcome.refusals).toEqual([
			refusal('', 'too_many_files'),
			refusal('tub: 3.jpg', 'not_image')
		]);
		expect(outcome.altText).toBe('Adults on cork bark');
		expect(splitRefusals(outcome.refusals!).files.map((r) => r.file)).toEqual(['tub: 3.jpg']);
	});

	it('drops codes it does not know, so a crafted link cannot add words', () => {
		const outcome = readOutcome(
			new URL('/manage?photos=refused&photos_refused=Call%20this%20number:x.jpg', 'http://x')
		)!;
		expect(outcome.refusals).toBeUndefined();
		expect(readOutcome(new URL('/manage?photos=hacked', 'http://x'))).toBeNull();
		expect(readOutcome(new URL('/manage', 'http://x'))).toBeNull();
	});

	it('hands a panel only the outcome about its own target or photos', () => {
		const url = new URL(
			outcomeUrl('/manage', { status: 'saved', target: colony, count: 1 }),
			'http://x'
		);
		expect(outcomeFor(url, colony)).not.toBeNull();
		expect(outcomeFor(url, { kind: 'colony', id: 13 })).toBeNull();
		expect(outcomeFor(url, { kind: 'species', id: 12 })).toBeNull();
		const aboutPhoto = new URL(
			outcomeUrl('/manage', {
				status: 'refused',
				target: null,
				photoId: 7,
				refusals: [refusal('', 'alt_too_long')]
			}),
			'http://x'
		);
		expect(outcomeFor(aboutPhoto, colony, [7, 8])?.photoId).toBe(7);
		expect(outcomeFor(aboutPhoto, colony, [8])).toBeNull();
	});
});
