import { error } from '@sveltejs/kit';
import type { ReportResult } from '$lib/reports/report';
import type { PageLoad } from './$types';

/** A range the API refused, with each reason for its field. */
export interface RangeProblem {
	message: string;
	errors: { from?: string; to?: string };
}

// The report comes from /api/manage/reports/<name>, on the server for the first page and
// from the browser after, so the page and any other client read the same JSON.
export const load: PageLoad = async ({ data, fetch, url }) => {
	const query = new URLSearchParams(url.searchParams);
	query.delete('format');
	query.delete('section');
	const response = await fetch(`/api/manage/reports/${data.name}?${query}`);
	if (response.status === 400) {
		const problem = (await response.json()) as RangeProblem;
		return { ...data, report: null, problem };
	}
	if (!response.ok) {
		const body = (await response.json().catch(() => null)) as { message?: string } | null;
		error(response.status, body?.message ?? 'The report could not be drawn just now.');
	}
	return { ...data, report: (await response.json()) as ReportResult, problem: null };
};
