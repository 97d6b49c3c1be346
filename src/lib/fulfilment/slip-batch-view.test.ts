import { describe, expect, it } from 'vitest';
import { batchIsPending, batchProgress, slipBatchUrls } from './slip-batch-view';

describe('a slip batch as the keeper sees it', () => {
	it('points at its progress, its self-refreshing page and its PDF', () => {
		expect(slipBatchUrls(7)).toEqual({
			statusUrl: '/manage/ship-day/slips/batches/7',
			progressUrl: '/manage/ship-day/slips/batches/7/progress',
			downloadUrl: '/manage/ship-day/slips/batches/7?download=1'
		});
	});

	it('counts boxes drawn in whole percent, never past 100', () => {
		const running = { state: 'running' as const, total: 200, error: null };
		expect(batchProgress({ ...running, doneCount: 0 }).percent).toBe(0);
		expect(batchProgress({ ...running, doneCount: 1 }).percent).toBe(0);
		expect(batchProgress({ ...running, doneCount: 199 }).percent).toBe(99);
		expect(batchProgress({ ...running, doneCount: 66 })).toMatchObject({
			percent: 33,
			words: 'Drawing slips: 66 of 200 boxes'
		});
		expect(batchProgress({ ...running, doneCount: 250 }).percent).toBe(100);
	});

	it('gives each state a word and a shape of its own', () => {
		const base = { doneCount: 0, total: 1, error: null };
		const looks = (['queued', 'running', 'done', 'failed'] as const).map((state) =>
			batchProgress({ ...base, state })
		);
		expect(new Set(looks.map((look) => look.icon)).size).toBe(4);
		expect(looks[0]!.words).toBe('Queued: 1 box, starting in a moment');
		expect(looks[2]!.words).toBe('Ready: 1 box in one PDF');
		expect(
			batchProgress({ ...base, state: 'failed', error: 'HL-10031 was cancelled.' }).words
		).toBe('Not made: HL-10031 was cancelled.');
	});

	it('keeps asking only while queued or drawing', () => {
		expect(['queued', 'running', 'done', 'failed'].map((s) => batchIsPending(s as never))).toEqual([
			true,
			true,
			false,
			false
		]);
	});
});
