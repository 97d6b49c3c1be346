import { error } from '@sveltejs/kit';
import {
	catalogueHref,
	catalogueSortLabels,
	centsToDollarText,
	emptyFilters,
	hasFilters,
	parseCatalogueQuery,
	type CatalogueFilters,
	type CatalogueQuery
} from '$lib/catalogue/filters';
import { animalGroupPluralLabels, sexLabels, stageLabels } from '$lib/format/labels';
import { formatCents } from '$lib/format/money';
import { getDb } from '$lib/server/db';
import { listShopSpecies, loadCataloguePage } from '$lib/server/catalogue/catalogue';
import type { PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

/** A filter in force, with the address of the same view without it. */
export interface ActiveFilter {
	label: string;
	removeHref: string;
}

export const load: PageServerLoad = async ({ url }) => {
	// A root path, not resolve(): links made in a load must not depend on which page asked.
	const path = '/catalogue';
	const parsed = parseCatalogueQuery(url.searchParams);
	const notes = [...parsed.notes];
	let query: CatalogueQuery = parsed.query;

	try {
		const db = getDb();
		const species = await listShopSpecies(db);
		const chosenSpecies = species.find((option) => option.slug === query.filters.species);
		if (query.filters.species && !chosenSpecies) {
			notes.push(
				`No species in the shop goes by “${query.filters.species}”, so the species filter was left out.`
			);
			query = { ...query, filters: { ...query.filters, species: null } };
		}

		const page = await loadCataloguePage(db, query);
		const { filters } = query;
		// Links made here carry the view as it was read, so bad values stay dropped.
		const without = (change: Partial<CatalogueFilters>) =>
			catalogueHref(path, { filters: { ...filters, ...change }, sort: query.sort });

		const active: ActiveFilter[] = [];
		if (filters.q)
			active.push({ label: `Words: “${filters.q}”`, removeHref: without({ q: null }) });
		if (filters.group)
			active.push({
				label: capitalised(animalGroupPluralLabels[filters.group]),
				removeHref: without({ group: null })
			});
		if (chosenSpecies)
			active.push({ label: chosenSpecies.commonName, removeHref: without({ species: null }) });
		if (filters.stage)
			active.push({ label: stageLabels[filters.stage], removeHref: without({ stage: null }) });
		if (filters.sex)
			active.push({ label: sexLabels[filters.sex], removeHref: without({ sex: null }) });
		if (filters.minCents !== null)
			active.push({
				label: `From ${formatCents(filters.minCents)} an animal`,
				removeHref: without({ minCents: null })
			});
		if (filters.maxCents !== null)
			active.push({
				label: `Up to ${formatCents(filters.maxCents)} an animal`,
				removeHref: without({ maxCents: null })
			});
		if (filters.inStock)
			active.push({ label: 'In stock now', removeHref: without({ inStock: false }) });

		const heading = chosenSpecies
			? chosenSpecies.commonName
			: filters.group
				? capitalised(animalGroupPluralLabels[filters.group])
				: 'Catalogue';

		return {
			heading,
			form: {
				q: filters.q ?? '',
				group: filters.group ?? '',
				species: filters.species ?? '',
				stage: filters.stage ?? '',
				sex: filters.sex ?? '',
				min: filters.minCents === null ? '' : centsToDollarText(filters.minCents),
				max: filters.maxCents === null ? '' : centsToDollarText(filters.maxCents),
				stock: filters.inStock,
				sort: query.sort
			},
			sortOptions: Object.entries(catalogueSortLabels).map(([value, label]) => ({ value, label })),
			species,
			notes,
			active,
			filtered: hasFilters(filters),
			clearHref: catalogueHref(path, { filters: emptyFilters, sort: query.sort }),
			firstPage: query.after === null && query.before === null,
			firstPageHref: catalogueHref(path, query, { after: null }),
			cards: page.cards,
			nextHref: page.next ? catalogueHref(path, query, { after: page.next }) : null,
			previousHref: page.previous ? catalogueHref(path, query, { before: page.previous }) : null,
			canonical: catalogueHref(path, query),
			// Search results are endless and thin; the listings themselves are what should be found.
			noindex: filters.q !== null
		};
	} catch (cause) {
		logger.error({ err: cause }, '[catalogue] listings unavailable');
		error(503, 'The catalogue cannot be reached just now. Please try again in a few minutes.');
	}
};

function capitalised(text: string): string {
	return text.charAt(0).toUpperCase() + text.slice(1);
}
