// A slip batch as the keeper's page shows it: where to ask for its progress and fetch
// its PDF, and the words and shape for each state. Pure, so the server's JSON, the
// progress page and the ship-day button say the same thing.
import type { IconName } from '$lib/components/icons';
import { formatCount } from '$lib/format/labels';
import type { SlipBatchState } from '$lib/server/db/schema';

export interface SlipBatchView {
	id: number;
	shipOn: string;
	state: SlipBatchState;
	doneCount: number;
	total: number;
	error: string | null;
	/** JSON progress. */
	statusUrl: string;
	/** The page that refreshes itself, for browsers without JavaScript. */
	progressUrl: string;
	/** The PDF, once done. */
	downloadUrl: string;
}

export function slipBatchUrls(
	id: number
): Pick<SlipBatchView, 'statusUrl' | 'progressUrl' | 'downloadUrl'> {
	const base = `/manage/ship-day/slips/batches/${id}`;
	return { statusUrl: base, progressUrl: `${base}/progress`, downloadUrl: `${base}?download=1` };
}

/** Still to be waited for: the page keeps asking. */
export function batchIsPending(state: SlipBatchState): boolean {
	return state === 'queued' || state === 'running';
}

export interface BatchProgress {
	/** 0–100, whole. */
	percent: number;
	/** One line: the state's word, then the count. */
	words: string;
	icon: IconName;
	tone: 'waiting' | 'working' | 'done' | 'refused';
}

export function batchProgress(
	view: Pick<SlipBatchView, 'state' | 'doneCount' | 'total' | 'error'>
): BatchProgress {
	const boxes = formatCount(view.total, 'box', 'boxes');
	const percent =
		view.total > 0 ? Math.min(100, Math.floor((view.doneCount * 100) / view.total)) : 0;
	switch (view.state) {
		case 'queued':
			return {
				percent: 0,
				words: `Queued: ${boxes}, starting in a moment`,
				icon: 'hourglass',
				tone: 'waiting'
			};
		case 'running':
			return {
				percent,
				words: `Drawing slips: ${view.doneCount} of ${boxes}`,
				icon: 'clock',
				tone: 'working'
			};
		case 'done':
			return {
				percent: 100,
				words: `Ready: ${boxes} in one PDF`,
				icon: 'check-circle',
				tone: 'done'
			};
		case 'failed':
			return {
				percent,
				words: `Not made: ${view.error ?? 'the job stopped.'}`,
				icon: 'x-circle',
				tone: 'refused'
			};
	}
}
