import { describe, expect, it } from 'vitest';
import { applyRowIntent, partsOf, recipeSchema, rowsOf } from './recipe-form';

const rows = {
	ingredients: ['Compost', 'Pellets', 'Leaves'],
	amounts: ['1', '1', '1/3']
};

describe('recipe rows', () => {
	it('moves, removes and adds rows without losing what was typed', () => {
		expect(applyRowIntent(rows, 'up:2')).toEqual({
			ingredients: ['Compost', 'Leaves', 'Pellets'],
			amounts: ['1', '1/3', '1']
		});
		expect(applyRowIntent(rows, 'down:0')).toEqual({
			ingredients: ['Pellets', 'Compost', 'Leaves'],
			amounts: ['1', '1', '1/3']
		});
		expect(applyRowIntent(rows, 'remove:1')).toEqual({
			ingredients: ['Compost', 'Leaves'],
			amounts: ['1', '1/3']
		});
		expect(applyRowIntent(rows, 'add')).toEqual({
			ingredients: ['Compost', 'Pellets', 'Leaves', ''],
			amounts: ['1', '1', '1/3', '']
		});
	});

	it('ignores moves off either end and intents that are not row buttons', () => {
		expect(applyRowIntent(rows, 'up:0')).toBeNull();
		expect(applyRowIntent(rows, 'down:2')).toBeNull();
		expect(applyRowIntent(rows, 'remove:7')).toBeNull();
		expect(applyRowIntent(rows, 'save')).toBeNull();
	});

	it('turns rows into exact parts and back, dropping blank rows', () => {
		const parts = partsOf({
			ingredients: ['Compost', '', 'Leaves', 'Calcium'],
			amounts: ['1', '', '2/6', 'a little']
		});
		expect(parts).toEqual([
			{ ingredient: 'Compost', numerator: 1, denominator: 1 },
			{ ingredient: 'Leaves', numerator: 1, denominator: 3 },
			{ ingredient: 'Calcium', numerator: 0, denominator: 1 }
		]);
		expect(rowsOf(parts)).toEqual({
			ingredients: ['Compost', 'Leaves', 'Calcium'],
			amounts: ['1', '1/3', '0']
		});
	});
});

describe('recipe form checks', () => {
	const base = { name: 'Leafy mix', notes: '', makeDefault: false, seen: '', intent: 'save' };

	it('puts each row problem beside its own field', () => {
		const result = recipeSchema.safeParse({
			...base,
			ingredients: ['Compost', '', 'compost', 'Leaves'],
			amounts: ['1', '1/2', '1', 'lots']
		});
		expect(result.success).toBe(false);
		const issues = result.error!.issues.map((i) => [i.path.join('.'), i.message]);
		expect(issues).toEqual([
			['ingredients.1', 'Name the ingredient, or clear the amount to drop this row.'],
			['ingredients.2', 'Already in part 1; put it there once.'],
			['amounts.3', 'Write it as a whole number, a fraction like 1/3, or a decimal like 0.5.']
		]);
	});

	it('refuses a recipe of only "a little"', () => {
		const result = recipeSchema.safeParse({
			...base,
			ingredients: ['Calcium'],
			amounts: ['a little']
		});
		expect(result.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
			['ingredients', 'At least one part needs an amount, not only "a little".']
		]);
	});

	it('does not check rows while they are only being rearranged', () => {
		const result = recipeSchema.safeParse({
			...base,
			intent: 'add',
			ingredients: [''],
			amounts: ['lots']
		});
		expect(result.success).toBe(true);
	});
});
