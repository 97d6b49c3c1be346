// Substrate recipes on a scratch database: one default at most, the default and the
// last recipe kept, parts stored as exact fractions in order, every change audited.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
	createRecipe,
	defaultRecipe,
	deleteRecipe,
	findRecipe,
	listRecipes,
	makeDefaultRecipe,
	updateRecipe
} from '../../src/lib/server/care/recipes';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

// A keeper made for the test, so the audit entries have someone to name.
const actor = { userId: '', ip: '127.0.0.1' };

const houseParts = [
	{ ingredient: 'Compost or organic soil', numerator: 1, denominator: 1 },
	{ ingredient: 'Hardwood pellets, soaked', numerator: 1, denominator: 1 },
	{ ingredient: 'Crushed fallen hardwood leaves', numerator: 1, denominator: 3 },
	{ ingredient: 'Calcium', numerator: 0, denominator: 1 }
];

describe('substrate recipes', () => {
	let scratch: ScratchDatabase;
	let houseId = 0;
	let leafyId = 0;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		const keeper = await scratch.db
			.insertInto('User')
			.values({ email: 'recipe.keeper@example.test', name: 'Recipe keeper' })
			.returning('id')
			.executeTakeFirstOrThrow();
		actor.userId = keeper.id;
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	const audits = (action: string) =>
		scratch.db
			.selectFrom('audit_log')
			.select(['entity_id', 'detail'])
			.where('action', '=', action)
			.execute();

	it('makes the first recipe the default even when not asked', async () => {
		const outcome = await createRecipe(scratch.db, actor, {
			name: 'House mix',
			notes: 'Heat-treat the soil and leaves.',
			makeDefault: false,
			parts: houseParts
		});
		expect(outcome.ok).toBe(true);
		houseId = outcome.ok ? outcome.id : 0;
		const house = await findRecipe(scratch.db, houseId);
		expect(house?.isDefault).toBe(true);
		expect(house?.parts.map((p) => [p.position, p.numerator, p.denominator])).toEqual([
			[0, 1, 1],
			[1, 1, 1],
			[2, 1, 3],
			[3, 0, 1]
		]);
		expect(await audits('substrate_recipe.created')).toHaveLength(1);
	});

	it('refuses a second recipe of the same name, whatever the case', async () => {
		const outcome = await createRecipe(scratch.db, actor, {
			name: 'house MIX',
			notes: '',
			makeDefault: false,
			parts: houseParts
		});
		expect(outcome).toEqual({
			ok: false,
			field: 'name',
			problem: 'A recipe of that name exists already.'
		});
	});

	it('keeps one default when another recipe is made the default', async () => {
		const created = await createRecipe(scratch.db, actor, {
			name: 'Leafy mix',
			notes: '',
			makeDefault: true,
			parts: [
				{ ingredient: 'Leaves', numerator: 2, denominator: 1 },
				{ ingredient: 'Soil', numerator: 1, denominator: 1 }
			]
		});
		leafyId = created.ok ? created.id : 0;
		const recipes = await listRecipes(scratch.db);
		expect(recipes.map((r) => [r.name, r.isDefault])).toEqual([
			['Leafy mix', true],
			['House mix', false]
		]);
		expect((await makeDefaultRecipe(scratch.db, actor, houseId)).ok).toBe(true);
		expect((await defaultRecipe(scratch.db))?.name).toBe('House mix');
		expect(await audits('substrate_recipe.made_default')).toEqual([
			{ entity_id: String(houseId), detail: { name: 'House mix' } }
		]);
	});

	it('saves parts reordered and removed, and notices a save made meanwhile', async () => {
		const opened = (await findRecipe(scratch.db, leafyId))!;
		const outcome = await updateRecipe(
			scratch.db,
			actor,
			leafyId,
			{
				name: 'Leafy mix',
				notes: 'More leaves.',
				makeDefault: false,
				parts: [
					{ ingredient: 'Soil', numerator: 1, denominator: 1 },
					{ ingredient: 'Leaves', numerator: 5, denominator: 2 }
				]
			},
			opened.updatedAt
		);
		expect(outcome.ok).toBe(true);
		const saved = (await findRecipe(scratch.db, leafyId))!;
		expect(saved.parts.map((p) => [p.ingredient, p.numerator, p.denominator])).toEqual([
			['Soil', 1, 1],
			['Leaves', 5, 2]
		]);
		expect(saved.isDefault).toBe(false);
		// A second editor still holding the first version is stopped, nothing written.
		const stale = await updateRecipe(
			scratch.db,
			actor,
			leafyId,
			{ name: 'Leafy mix', notes: 'Old tab.', makeDefault: false, parts: houseParts },
			opened.updatedAt
		);
		expect(stale).toMatchObject({ ok: false, field: 'recipe' });
		expect((await findRecipe(scratch.db, leafyId))?.notes).toBe('More leaves.');
	});

	it('refuses a recipe with nothing measured', async () => {
		const outcome = await createRecipe(scratch.db, actor, {
			name: 'Only calcium',
			notes: '',
			makeDefault: false,
			parts: [{ ingredient: 'Calcium', numerator: 0, denominator: 1 }]
		});
		expect(outcome).toMatchObject({ ok: false, field: 'parts' });
	});

	it('keeps the default and the last recipe from being deleted', async () => {
		expect(await deleteRecipe(scratch.db, actor, houseId)).toEqual({
			ok: false,
			field: 'recipe',
			problem: 'This is the default recipe: make another recipe the default first.'
		});
		expect((await deleteRecipe(scratch.db, actor, leafyId)).ok).toBe(true);
		expect(await findRecipe(scratch.db, leafyId)).toBeNull();
		const parts = await scratch.db
			.selectFrom('substrate_recipe_part')
			.select('id')
			.where('recipe_id', '=', leafyId)
			.execute();
		expect(parts).toEqual([]);
		expect(await deleteRecipe(scratch.db, actor, houseId)).toEqual({
			ok: false,
			field: 'recipe',
			problem: 'This is the only recipe: make another one before deleting it.'
		});
		expect(await audits('substrate_recipe.deleted')).toEqual([
			{ entity_id: String(leafyId), detail: { name: 'Leafy mix' } }
		]);
	});
});
