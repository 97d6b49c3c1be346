// The claim list's state filter, read from the URL so a filtered list can be bookmarked
// and works without JavaScript. A state the shop does not use is dropped with a note.
import { statesOf } from '$lib/format/labels';
import type { ClaimState } from '$lib/server/db/schema';

/** Rows shown at once; the page says how many more there are. */
export const CLAIM_LIST_LIMIT = 50;

export interface ClaimListFilters {
	state?: ClaimState;
}

export function parseClaimListFilters(params: URLSearchParams): {
	filters: ClaimListFilters;
	problem: string | null;
} {
	const raw = params.get('state')?.trim() ?? '';
	if (raw === '') return { filters: {}, problem: null };
	const known = statesOf('claim') as string[];
	if (known.includes(raw)) return { filters: { state: raw as ClaimState }, problem: null };
	return {
		filters: {},
		problem: 'The state in the address is not one a claim can be in, so every claim is shown.'
	};
}
