// Substrate recipes: the one module that writes substrate_recipe and its parts.
// Every change runs in a transaction with its audit entry. The recipe rows are few,
// so each write locks them all first: two keepers making different recipes the
// default at once then queue instead of tripping the one-default index.
import type { Db } from '$lib/server/db';
import type { Actor } from '$lib/server/audit';
import { writeAudit } from '$lib/server/audit';

export interface RecipePart {
	position: number;
	ingredient: string;
	/** 0 with denominator 1 means "a little" (a pinch, not a share of the volume). */
	numerator: number;
	denominator: number;
}

export interface SubstrateRecipe {
	id: number;
	name: string;
	notes: string;
	isDefault: boolean;
	updatedAt: Date;
	parts: RecipePart[];
}

export interface RecipeInput {
	name: string;
	notes: string;
	makeDefault: boolean;
	parts: { ingredient: string; numerator: number; denominator: number }[];
}

export type RecipeOutcome =
	{ ok: true; id: number } | { ok: false; field: 'name' | 'parts' | 'recipe'; problem: string };

async function withParts(
	db: Db,
	recipes: { id: number; name: string; notes: string; is_default: boolean; updated_at: Date }[]
): Promise<SubstrateRecipe[]> {
	if (recipes.length === 0) return [];
	const parts = await db
		.selectFrom('substrate_recipe_part')
		.select(['recipe_id', 'position', 'ingredient', 'parts_numerator', 'parts_denominator'])
		.where(
			'recipe_id',
			'in',
			recipes.map((r) => r.id)
		)
		.orderBy('recipe_id')
		.orderBy('position')
		.execute();
	return recipes.map((r) => ({
		id: r.id,
		name: r.name,
		notes: r.notes,
		isDefault: r.is_default,
		updatedAt: r.updated_at,
		parts: parts
			.filter((p) => p.recipe_id === r.id)
			.map((p) => ({
				position: p.position,
				ingredient: p.ingredient,
				numerator: p.parts_numerator,
				denominator: p.parts_denominator
			}))
	}));
}

const recipeColumns = ['id', 'name', 'notes', 'is_default', 'updated_at'] as const;

/** Every recipe with its parts, the default first, then by name. */
export async function listRecipes(db: Db): Promise<SubstrateRecipe[]> {
	const recipes = await db
		.selectFrom('substrate_recipe')
		.select(recipeColumns)
		.orderBy('is_default', 'desc')
		.orderBy('name')
		.execute();
	return withParts(db, recipes);
}

export async function findRecipe(db: Db, id: number): Promise<SubstrateRecipe | null> {
	const recipe = await db
		.selectFrom('substrate_recipe')
		.select(recipeColumns)
		.where('id', '=', id)
		.executeTakeFirst();
	return recipe ? ((await withParts(db, [recipe]))[0] ?? null) : null;
}

/** The shop's default recipe; else the first by name; null when there is none at all. */
export async function defaultRecipe(db: Db): Promise<SubstrateRecipe | null> {
	const recipe = await db
		.selectFrom('substrate_recipe')
		.select(recipeColumns)
		.orderBy('is_default', 'desc')
		.orderBy('name')
		.limit(1)
		.executeTakeFirst();
	return recipe ? ((await withParts(db, [recipe]))[0] ?? null) : null;
}

function partsProblem(parts: RecipeInput['parts']): string | null {
	if (parts.length === 0) return 'A recipe needs at least one part.';
	if (parts.length > 12) return 'Keep a recipe to 12 parts at most.';
	if (!parts.some((p) => p.numerator > 0))
		return 'At least one part needs a measured amount, not only "a little".';
	for (const p of parts) {
		if (!p.ingredient.trim()) return 'Every part needs an ingredient.';
		if (!Number.isInteger(p.numerator) || p.numerator < 0)
			return 'Amounts are whole parts or fractions.';
		if (!Number.isInteger(p.denominator) || p.denominator < 1)
			return 'Amounts are whole parts or fractions.';
	}
	return null;
}

async function lockRecipes(trx: Db): Promise<void> {
	await trx.selectFrom('substrate_recipe').select('id').forUpdate().execute();
}

async function nameTaken(trx: Db, name: string, exceptId: number | null): Promise<boolean> {
	let query = trx
		.selectFrom('substrate_recipe')
		.select('id')
		.where((eb) => eb(eb.fn('lower', ['name']), '=', name.toLowerCase()));
	if (exceptId !== null) query = query.where('id', '<>', exceptId);
	return (await query.executeTakeFirst()) !== undefined;
}

async function writeParts(trx: Db, recipeId: number, parts: RecipeInput['parts']): Promise<void> {
	await trx.deleteFrom('substrate_recipe_part').where('recipe_id', '=', recipeId).execute();
	await trx
		.insertInto('substrate_recipe_part')
		.values(
			parts.map((p, position) => ({
				recipe_id: recipeId,
				position,
				ingredient: p.ingredient.trim(),
				parts_numerator: p.numerator,
				// "A little" is stored as 0/1 whatever was typed below the line.
				parts_denominator: p.numerator === 0 ? 1 : p.denominator
			}))
		)
		.execute();
}

// Choosing the default leaves updated_at alone: it marks changes to a recipe's content,
// which an open editor compares against.
async function clearDefault(trx: Db, exceptId: number | null): Promise<void> {
	let query = trx
		.updateTable('substrate_recipe')
		.set({ is_default: false })
		.where('is_default', '=', true);
	if (exceptId !== null) query = query.where('id', '<>', exceptId);
	await query.execute();
}

function partsDetail(parts: RecipeInput['parts']) {
	return parts.map((p) => `${p.ingredient.trim()}: ${p.numerator}/${p.denominator}`);
}

/** A new recipe. The first recipe the shop has becomes its default whatever was asked. */
export async function createRecipe(
	db: Db,
	actor: Actor,
	input: RecipeInput
): Promise<RecipeOutcome> {
	const problem = partsProblem(input.parts);
	if (problem) return { ok: false, field: 'parts', problem };
	const name = input.name.trim();
	return db.transaction().execute(async (trx) => {
		await lockRecipes(trx);
		if (await nameTaken(trx, name, null))
			return { ok: false, field: 'name', problem: 'A recipe of that name exists already.' };
		const anyRecipe = await trx.selectFrom('substrate_recipe').select('id').executeTakeFirst();
		const isDefault = input.makeDefault || !anyRecipe;
		if (isDefault) await clearDefault(trx, null);
		const recipe = await trx
			.insertInto('substrate_recipe')
			.values({ name, notes: input.notes.trim(), is_default: isDefault, updated_at: new Date() })
			.returning('id')
			.executeTakeFirstOrThrow();
		await writeParts(trx, recipe.id, input.parts);
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'substrate_recipe.created',
			entity: 'substrate_recipe',
			entityId: recipe.id,
			detail: { name, isDefault, parts: partsDetail(input.parts) }
		});
		return { ok: true, id: recipe.id };
	});
}

/**
 * Saves a recipe's name, notes and parts (replacing its parts list, so rows added,
 * removed or moved all land at once). `seenUpdatedAt` is when the editor loaded it:
 * if someone saved it since, nothing is written and the keeper is told.
 */
export async function updateRecipe(
	db: Db,
	actor: Actor,
	id: number,
	input: RecipeInput,
	seenUpdatedAt?: Date
): Promise<RecipeOutcome> {
	const problem = partsProblem(input.parts);
	if (problem) return { ok: false, field: 'parts', problem };
	const name = input.name.trim();
	return db.transaction().execute(async (trx) => {
		await lockRecipes(trx);
		const before = await trx
			.selectFrom('substrate_recipe')
			.select(['name', 'is_default', 'updated_at'])
			.where('id', '=', id)
			.executeTakeFirst();
		if (!before) return { ok: false, field: 'recipe', problem: 'That recipe no longer exists.' };
		// Within a millisecond: PostgreSQL keeps microseconds, a JS Date does not.
		if (seenUpdatedAt && Math.abs(before.updated_at.getTime() - seenUpdatedAt.getTime()) >= 1)
			return {
				ok: false,
				field: 'recipe',
				problem:
					'Someone saved this recipe after you opened it. Your changes are still below; open the recipe again to see theirs first.'
			};
		if (await nameTaken(trx, name, id))
			return { ok: false, field: 'name', problem: 'Another recipe has that name.' };
		// Unticking "default" does not leave the shop without one: choose another instead.
		const isDefault = before.is_default || input.makeDefault;
		if (isDefault && !before.is_default) await clearDefault(trx, id);
		await trx
			.updateTable('substrate_recipe')
			.set({
				name,
				notes: input.notes.trim(),
				is_default: isDefault,
				// At least 1 ms on, so an editor holding the old time always sees the change.
				updated_at: new Date(Math.max(Date.now(), before.updated_at.getTime() + 1))
			})
			.where('id', '=', id)
			.execute();
		await writeParts(trx, id, input.parts);
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'substrate_recipe.updated',
			entity: 'substrate_recipe',
			entityId: id,
			detail: {
				name,
				...(before.name !== name ? { renamedFrom: before.name } : {}),
				isDefault,
				parts: partsDetail(input.parts)
			}
		});
		return { ok: true, id };
	});
}

export async function makeDefaultRecipe(db: Db, actor: Actor, id: number): Promise<RecipeOutcome> {
	return db.transaction().execute(async (trx) => {
		await lockRecipes(trx);
		const recipe = await trx
			.selectFrom('substrate_recipe')
			.select(['name', 'is_default'])
			.where('id', '=', id)
			.executeTakeFirst();
		if (!recipe) return { ok: false, field: 'recipe', problem: 'That recipe no longer exists.' };
		if (recipe.is_default) return { ok: true, id };
		await clearDefault(trx, id);
		await trx
			.updateTable('substrate_recipe')
			.set({ is_default: true })
			.where('id', '=', id)
			.execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'substrate_recipe.made_default',
			entity: 'substrate_recipe',
			entityId: id,
			detail: { name: recipe.name }
		});
		return { ok: true, id };
	});
}

/**
 * Deletes a recipe. The default cannot go (make another the default first), so the
 * calculator and the colony pages always have one to use.
 */
export async function deleteRecipe(db: Db, actor: Actor, id: number): Promise<RecipeOutcome> {
	return db.transaction().execute(async (trx) => {
		await lockRecipes(trx);
		const recipe = await trx
			.selectFrom('substrate_recipe')
			.select(['name', 'is_default'])
			.where('id', '=', id)
			.executeTakeFirst();
		if (!recipe) return { ok: false, field: 'recipe', problem: 'That recipe is already gone.' };
		const others = await trx
			.selectFrom('substrate_recipe')
			.select('id')
			.where('id', '<>', id)
			.executeTakeFirst();
		if (!others)
			return {
				ok: false,
				field: 'recipe',
				problem: 'This is the only recipe: make another one before deleting it.'
			};
		if (recipe.is_default)
			return {
				ok: false,
				field: 'recipe',
				problem: 'This is the default recipe: make another recipe the default first.'
			};
		// Parts go with it (on delete cascade).
		await trx.deleteFrom('substrate_recipe').where('id', '=', id).execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'substrate_recipe.deleted',
			entity: 'substrate_recipe',
			entityId: id,
			detail: { name: recipe.name }
		});
		return { ok: true, id };
	});
}
