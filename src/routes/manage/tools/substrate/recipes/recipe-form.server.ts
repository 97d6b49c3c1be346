// Reading a posted recipe form, shared by the new-recipe and edit pages: a row button
// comes back rearranged and unsaved, anything else is checked for saving.
import { fail, type RequestEvent } from '@sveltejs/kit';
import { superValidate, type SuperValidated } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import type { RecipeInput } from '$lib/server/care/recipes';
import { applyRowIntent, partsOf, recipeSchema, type RecipeForm } from './recipe-form';

export type PostedRecipe =
	| { kind: 'answer'; response: ReturnType<typeof fail> | { form: SuperValidated<RecipeForm> } }
	| { kind: 'save'; form: SuperValidated<RecipeForm>; input: RecipeInput };

export async function readRecipeForm(event: RequestEvent): Promise<PostedRecipe> {
	const form = await superValidate(event.request, zod4(recipeSchema));
	if (form.data.intent !== 'save') {
		// Without JavaScript the row buttons land here: apply the move, keep every word typed.
		const rows = applyRowIntent(form.data, form.data.intent);
		if (rows) Object.assign(form.data, rows);
		form.data.intent = 'save';
		form.errors = {};
		return { kind: 'answer', response: { form } };
	}
	if (!form.valid) return { kind: 'answer', response: fail(400, { form }) };
	return {
		kind: 'save',
		form,
		input: {
			name: form.data.name,
			notes: form.data.notes,
			makeDefault: form.data.makeDefault,
			parts: partsOf(form.data)
		}
	};
}
