import { requireRole } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import { tablePageData } from '$lib/server/backoffice/table-routes';
import { tableFilterOptions } from '$lib/server/backoffice/tables';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const [table, options] = await Promise.all([
		tablePageData(event, 'care-log'),
		tableFilterOptions(getDb())
	]);
	return { ...table, colonies: options.colonies };
};
