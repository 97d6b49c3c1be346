import { redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { STANDARD_RECIPE } from '$lib/care/substrate';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { createRecipe, findRecipe, listRecipes } from '$lib/server/care/recipes';
import { getDb } from '$lib/server/db';
import { recipeSchema, rowsOf } from '../recipe-form';
import { readRecipeForm } from '../recipe-form.server';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const db = getDb();
	// ?from=<id> starts from a copy of a saved recipe; otherwise from the standard mix.
	const fromId = event.url.searchParams.get('from') ?? '';
	const source = /^\d{1,9}$/.test(fromId) ? await findRecipe(db, Number(fromId)) : null;
	const recipes = await listRecipes(db);
	const form = await superValidate(
		{
			name: source ? `${source.name} (copy)`.slice(0, 80) : recipes.length ? '' : 'House mix',
			notes: source?.notes ?? '',
			makeDefault: recipes.length === 0,
			...rowsOf(source?.parts ?? STANDARD_RECIPE.parts),
			seen: '',
			intent: 'save'
		},
		zod4(recipeSchema),
		{ errors: false }
	);
	return { form, copiedFrom: source?.name ?? null, firstRecipe: recipes.length === 0 };
};

export const actions: Actions = {
	save: async (event) => {
		const me = requireRole(event, 'keeper');
		const posted = await readRecipeForm(event);
		if (posted.kind === 'answer') return posted.response;
		const { form, input } = posted;
		const outcome = await createRecipe(getDb(), { userId: me.id, ip: clientAddress(event) }, input);
		if (!outcome.ok)
			return setError(
				form,
				outcome.field === 'name' ? 'name' : outcome.field === 'parts' ? 'ingredients._errors' : '',
				outcome.problem
			);
		redirect(
			303,
			`${resolve('/manage/tools/substrate/recipes/[id]', { id: String(outcome.id) })}?saved=new`
		);
	}
};
