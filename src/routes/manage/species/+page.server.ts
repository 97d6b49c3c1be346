import { getDb } from '$lib/server/db';
import { requireRole } from '$lib/server/auth/guard';
import { listSpecies } from '$lib/server/species/species';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	return { species: await listSpecies(getDb()) };
};
