// The recipe editor's fields. Parts travel as two parallel lists (ingredient, amount)
// so the form posts as plain form data and works without JavaScript; the row buttons
// (add, move, remove) post an `intent` that the server applies without saving.
import { z } from 'zod';
import { MAX_INTEGER_COLUMN, NO_SUCH_ROW } from '$lib/forms/row-id';
import { parsePartAmount, partAmountText, type RecipePartInput } from '$lib/care/substrate';

export const MAX_PART_ROWS = 12;

const rowsProblem = 'Keep a recipe to 12 parts at most.';

export const recipeSchema = z
	.object({
		name: z
			.string()
			.trim()
			.min(1, 'Name the recipe, e.g. "Leafy mix".')
			.max(80, 'Keep the name under 80 characters.'),
		notes: z.string().trim().max(2000, 'Keep the notes under 2,000 characters.').default(''),
		makeDefault: z.boolean().default(false),
		ingredients: z
			.array(z.string().max(80, 'Keep it under 80 characters.'))
			.max(MAX_PART_ROWS, rowsProblem)
			.default([]),
		amounts: z
			.array(z.string().max(20, 'Keep it short, like 1 or 1/3.'))
			.max(MAX_PART_ROWS, rowsProblem)
			.default([]),
		/** When the editor loaded the recipe (ISO time), to notice someone else's save. */
		seen: z.string().max(40).default(''),
		/** save, or a row button: add, up:N, down:N, remove:N. */
		intent: z.string().max(20).default('save')
	})
	.superRefine((form, ctx) => {
		// Row buttons only rearrange the rows; nothing is checked until the keeper saves.
		if (form.intent !== 'save') return;
		let measured = 0;
		let filled = 0;
		const seen = new Map<string, number>();
		const rows = Math.max(form.ingredients.length, form.amounts.length);
		for (let index = 0; index < rows; index++) {
			const ingredient = (form.ingredients[index] ?? '').trim();
			const amount = (form.amounts[index] ?? '').trim();
			if (!ingredient && !amount) continue;
			filled++;
			if (!ingredient) {
				ctx.addIssue({
					code: 'custom',
					path: ['ingredients', index],
					message: 'Name the ingredient, or clear the amount to drop this row.'
				});
			} else {
				const key = ingredient.toLowerCase();
				if (seen.has(key)) {
					ctx.addIssue({
						code: 'custom',
						path: ['ingredients', index],
						message: `Already in part ${seen.get(key)! + 1}; put it there once.`
					});
				} else seen.set(key, index);
			}
			const parsed = parsePartAmount(amount);
			if (!parsed.ok) {
				ctx.addIssue({ code: 'custom', path: ['amounts', index], message: parsed.problem });
			} else if (parsed.amount.numerator > 0) measured++;
		}
		if (filled === 0) {
			ctx.addIssue({
				code: 'custom',
				path: ['ingredients'],
				message: 'Add at least one part.'
			});
		} else if (measured === 0) {
			ctx.addIssue({
				code: 'custom',
				path: ['ingredients'],
				message: 'At least one part needs an amount, not only "a little".'
			});
		}
	});

export type RecipeForm = z.infer<typeof recipeSchema>;

/** The editor's rows for stored parts. */
export function rowsOf(
	parts: readonly RecipePartInput[]
): Pick<RecipeForm, 'ingredients' | 'amounts'> {
	return {
		ingredients: parts.map((p) => p.ingredient),
		amounts: parts.map((p) => partAmountText(p))
	};
}

/** The parts to store from a checked form: blank rows dropped, amounts exact. */
export function partsOf(form: Pick<RecipeForm, 'ingredients' | 'amounts'>): RecipePartInput[] {
	const parts: RecipePartInput[] = [];
	const rows = Math.max(form.ingredients.length, form.amounts.length);
	for (let index = 0; index < rows; index++) {
		const ingredient = (form.ingredients[index] ?? '').trim();
		const amount = (form.amounts[index] ?? '').trim();
		if (!ingredient && !amount) continue;
		const parsed = parsePartAmount(amount);
		if (!parsed.ok) throw new RangeError(`unchecked amount in row ${index}: ${amount}`);
		parts.push({ ingredient, ...parsed.amount });
	}
	return parts;
}

/**
 * Applies a row button to the rows: add a blank row, move one up or down, or remove
 * one. Returns null for an intent that is not a row button (or points at no row).
 */
export function applyRowIntent(
	rows: Pick<RecipeForm, 'ingredients' | 'amounts'>,
	intent: string
): Pick<RecipeForm, 'ingredients' | 'amounts'> | null {
	const length = Math.max(rows.ingredients.length, rows.amounts.length);
	const ingredients = Array.from({ length }, (_, i) => rows.ingredients[i] ?? '');
	const amounts = Array.from({ length }, (_, i) => rows.amounts[i] ?? '');
	if (intent === 'add') {
		if (length >= MAX_PART_ROWS) return null;
		return { ingredients: [...ingredients, ''], amounts: [...amounts, ''] };
	}
	const match = /^(up|down|remove):(\d{1,2})$/.exec(intent);
	if (!match) return null;
	const index = Number(match[2]);
	if (index >= length) return null;
	if (match[1] === 'remove') {
		ingredients.splice(index, 1);
		amounts.splice(index, 1);
		return { ingredients, amounts };
	}
	const other = match[1] === 'up' ? index - 1 : index + 1;
	if (other < 0 || other >= length) return null;
	[ingredients[index], ingredients[other]] = [ingredients[other]!, ingredients[index]!];
	[amounts[index], amounts[other]] = [amounts[other]!, amounts[index]!];
	return { ingredients, amounts };
}

const recipeId = z.number().int().positive().max(MAX_INTEGER_COLUMN, NO_SUCH_ROW);

export const makeDefaultSchema = z.object({ recipeId });

export const deleteSchema = z.object({
	recipeId,
	confirm: z.boolean().refine((yes) => yes, 'Tick the box to confirm.')
});
