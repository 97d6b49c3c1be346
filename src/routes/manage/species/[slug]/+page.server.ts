import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { careSheet, careSheetGaps } from '$lib/care/care-sheet';
import { requireRole } from '$lib/server/auth/guard';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { listPhotos } from '$lib/server/uploads/photos';
import { getSpeciesBySlug, listSpeciesColonies } from '$lib/server/species/species';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const db = getDb();
	const species = await getSpeciesBySlug(db, event.params.slug);
	if (!species) error(404, 'No species has that web name.');
	const [colonies, timeZone, photos] = await Promise.all([
		listSpeciesColonies(db, species.id),
		resolveShopTimeZone(db, env.SHOP_TIME_ZONE),
		listPhotos(db, { kind: 'species', id: species.id })
	]);
	const saved = event.url.searchParams.get('saved');
	return {
		species,
		sheet: careSheet(species),
		gaps: careSheetGaps(species),
		colonies,
		photos,
		timeZone,
		saved: saved === 'new' || saved === 'edit' ? saved : null
	};
};
