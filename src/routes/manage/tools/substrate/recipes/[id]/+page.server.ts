import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import {
	deleteRecipe,
	findRecipe,
	listRecipes,
	makeDefaultRecipe,
	updateRecipe
} from '$lib/server/care/recipes';
import { getDb } from '$lib/server/db';
import { deleteSchema, makeDefaultSchema, recipeSchema, rowsOf } from '../recipe-form';
import { readRecipeForm } from '../recipe-form.server';
import type { Actions, PageServerLoad } from './$types';

function recipeIdOf(param: string): number {
	// Not a small whole number is not a recipe; PostgreSQL would refuse to compare it.
	if (!/^\d{1,9}$/.test(param)) error(404, 'No such recipe.');
	return Number(param);
}

async function recipeOr404(param: string) {
	const recipe = await findRecipe(getDb(), recipeIdOf(param));
	if (!recipe) error(404, 'No such recipe.');
	return recipe;
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const recipe = await recipeOr404(event.params.id);
	const recipeCount = (await listRecipes(getDb())).length;
	return {
		recipe,
		recipeCount,
		saved: event.url.searchParams.get('saved') === 'new',
		form: await superValidate(
			{
				name: recipe.name,
				notes: recipe.notes,
				makeDefault: false,
				...rowsOf(recipe.parts),
				seen: recipe.updatedAt.toISOString(),
				intent: 'save'
			},
			zod4(recipeSchema),
			{ errors: false }
		),
		defaultForm: await superValidate({ recipeId: recipe.id }, zod4(makeDefaultSchema), {
			id: 'make-default',
			errors: false
		}),
		deleteForm: await superValidate({ recipeId: recipe.id, confirm: false }, zod4(deleteSchema), {
			id: 'delete',
			errors: false
		})
	};
};

export const actions: Actions = {
	save: async (event) => {
		const me = requireRole(event, 'keeper');
		const id = recipeIdOf(event.params.id);
		const posted = await readRecipeForm(event);
		if (posted.kind === 'answer') return posted.response;
		const { form, input } = posted;
		const seen = new Date(form.data.seen);
		const outcome = await updateRecipe(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			id,
			input,
			Number.isNaN(seen.getTime()) ? undefined : seen
		);
		if (!outcome.ok)
			return setError(
				form,
				outcome.field === 'name' ? 'name' : outcome.field === 'parts' ? 'ingredients._errors' : '',
				outcome.problem
			);
		// The next save compares against this one, not the version first opened.
		const saved = await findRecipe(getDb(), id);
		if (saved) form.data.seen = saved.updatedAt.toISOString();
		return message(form, 'Recipe saved.');
	},
	makeDefault: async (event) => {
		const me = requireRole(event, 'keeper');
		const id = recipeIdOf(event.params.id);
		const form = await superValidate(event.request, zod4(makeDefaultSchema), {
			id: 'make-default'
		});
		if (!form.valid || form.data.recipeId !== id) return fail(400, { defaultForm: form });
		const outcome = await makeDefaultRecipe(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			id
		);
		if (!outcome.ok) return setError(form, 'recipeId', outcome.problem);
		return message(form, 'This is now the shop default.');
	},
	delete: async (event) => {
		const me = requireRole(event, 'keeper');
		const id = recipeIdOf(event.params.id);
		const form = await superValidate(event.request, zod4(deleteSchema), { id: 'delete' });
		if (!form.valid || form.data.recipeId !== id) return fail(400, { deleteForm: form });
		const outcome = await deleteRecipe(getDb(), { userId: me.id, ip: clientAddress(event) }, id);
		if (!outcome.ok) return setError(form, 'recipeId', outcome.problem);
		redirect(303, resolve('/manage/tools/substrate?deleted=1#recipes'));
	}
};
