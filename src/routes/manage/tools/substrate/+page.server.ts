import { error } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { STANDARD_RECIPE } from '$lib/care/substrate';
import { requireRole } from '$lib/server/auth/guard';
import { listColonyEnclosures } from '$lib/server/care/enclosures';
import { listRecipes } from '$lib/server/care/recipes';
import { getDb } from '$lib/server/db';
import { batchSchema, inchesText } from './batch-form';
import type { PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

const SIZES = ['length', 'width', 'depth'] as const;

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const db = getDb();
	const [recipes, colonies] = await Promise.all([listRecipes(db), listColonyEnclosures(db)]).catch(
		(cause: unknown) => {
			logger.error({ err: cause }, '[substrate] ledger unavailable');
			error(503, 'The stock ledger cannot be reached just now. Check that PostgreSQL is running.');
		}
	);

	const params = event.url.searchParams;
	const colonyCode = params.get('colony') ?? '';
	const colony = colonies.find((c) => c.code === colonyCode) ?? null;
	const anySize = SIZES.some((size) => (params.get(size) ?? '').trim() !== '');
	// "Fill in its size" (or a link naming only a colony) takes the colony's enclosure.
	const fillFromColony = colony !== null && (params.get('fill') === 'colony' || !anySize);
	const form = fillFromColony
		? await superValidate(
				{
					length: inchesText(colony.lengthIn),
					width: inchesText(colony.widthIn),
					depth: inchesText(colony.depthIn),
					recipe: params.get('recipe') ?? '',
					colony: colony.code
				},
				zod4(batchSchema)
			)
		: await superValidate(event.url, zod4(batchSchema), { errors: anySize });

	return {
		form,
		recipes,
		colonies,
		standardRecipe: STANDARD_RECIPE,
		unknownColony: colonyCode !== '' && colony === null ? colonyCode : null,
		deleted: params.has('deleted')
	};
};
