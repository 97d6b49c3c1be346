// The listings table: every listing with what it offers now, filtered from the URL so
// the filter bar is a plain GET form that works without JavaScript.
import { requireRole } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import { tableFilterOptions } from '$lib/server/backoffice/tables';
import { listListings } from '$lib/server/listings/listings';
import { parseListingFilters } from '$lib/stock/listing-rules';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const db = getDb();
	const parsed = parseListingFilters(event.url.searchParams);
	const filters = parsed.ok ? parsed.filters : {};
	const [listed, options] = await Promise.all([listListings(db, filters), tableFilterOptions(db)]);
	return {
		filters,
		problem: parsed.ok ? null : parsed.problem,
		rows: listed.rows,
		capped: listed.capped,
		species: options.species,
		filtered: Object.values(filters).some((value) => value !== undefined)
	};
};
