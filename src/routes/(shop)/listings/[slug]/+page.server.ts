import { error } from '@sveltejs/kit';
import { STANDARD_CAUTIONS } from '$lib/care/care-sheet';
import { getDb } from '$lib/server/db';
import { loadShopListing, moreOfSpecies } from '$lib/server/catalogue/shop-pages';
import type { PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

export const load: PageServerLoad = async ({ params }) => {
	const db = getDb();
	const found = await (async () => {
		const listing = await loadShopListing(db, params.slug);
		if (!listing) return null;
		const more = listing.species ? await moreOfSpecies(db, listing.species.slug, listing.id) : [];
		return { listing, more };
	})().catch((cause: unknown) => {
		logger.error({ err: cause }, '[listing page] unavailable');
		error(503, 'This listing cannot be reached just now. Please try again in a few minutes.');
	});
	// A draft was never public: its address does not exist yet.
	if (!found) error(404, 'There is no listing at this address.');
	return {
		...found,
		// The cautions the product always shows, worded once in the care sheet's module.
		cautions: {
			localRules: STANDARD_CAUTIONS.localRules,
			defensiveFluid:
				found.listing.species?.group === 'millipede' ? STANDARD_CAUTIONS.defensiveFluid : null,
			washHands: STANDARD_CAUTIONS.washHands
		}
	};
};
