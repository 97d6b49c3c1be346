// Species and their care profiles: the one module that writes the species table.
// Routes call these; each write runs in a transaction with its audit entry, and a
// name or web name already taken comes back as a field error, never a 500.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type { Actor } from '$lib/server/accounts/users';
import { writeAudit } from '$lib/server/audit';
import type { AnimalGroup, Species } from '$lib/server/db/schema';
import {
	temperatureOrderProblems,
	type SpeciesFormField,
	type SpeciesValues
} from '$lib/care/species-schema';

export interface SpeciesListRow {
	id: number;
	slug: string;
	scientificName: string;
	commonName: string;
	group: AnimalGroup;
	tempIdealLowF: number;
	tempIdealHighF: number;
	growOutWeeks: number;
	activeColonies: number;
	liveClutches: number;
}

/** Every species by common name, with its colonies not retired and clutches not sold out. */
export async function listSpecies(db: Db): Promise<SpeciesListRow[]> {
	const rows = await db
		.selectFrom('species as s')
		.select((eb) => [
			's.id',
			's.slug',
			's.scientific_name',
			's.common_name',
			's.animal_group',
			's.temp_ideal_low_f',
			's.temp_ideal_high_f',
			's.grow_out_weeks',
			eb
				.selectFrom('colony as c')
				.select((inner) => inner.fn.countAll<number>().as('n'))
				.whereRef('c.species_id', '=', 's.id')
				.where('c.retired_on', 'is', null)
				.as('active_colonies'),
			eb
				.selectFrom('clutch as k')
				.select((inner) => inner.fn.countAll<number>().as('n'))
				.whereRef('k.species_id', '=', 's.id')
				.where('k.state', '!=', 'sold_out')
				.as('live_clutches')
		])
		.orderBy('s.common_name')
		.orderBy('s.id')
		.execute();
	return rows.map((row) => ({
		id: row.id,
		slug: row.slug,
		scientificName: row.scientific_name,
		commonName: row.common_name,
		group: row.animal_group,
		tempIdealLowF: row.temp_ideal_low_f,
		tempIdealHighF: row.temp_ideal_high_f,
		growOutWeeks: row.grow_out_weeks,
		activeColonies: Number(row.active_colonies ?? 0),
		liveClutches: Number(row.live_clutches ?? 0)
	}));
}

/** One species by its web name, or null. */
export async function getSpeciesBySlug(db: Db, slug: string): Promise<Species | null> {
	const row = await db
		.selectFrom('species')
		.selectAll()
		.where('slug', '=', slug)
		.executeTakeFirst();
	return row ?? null;
}

export interface SpeciesColonyRow {
	code: string;
	name: string;
	generation: number;
	startedOn: string;
	retiredOn: string | null;
}

/** The species' colonies: active ones first, then by code. */
export async function listSpeciesColonies(db: Db, speciesId: number): Promise<SpeciesColonyRow[]> {
	return db
		.selectFrom('colony')
		.select(['code', 'name', 'generation', 'started_on as startedOn', 'retired_on as retiredOn'])
		.where('species_id', '=', speciesId)
		.orderBy(sql`retired_on is not null`)
		.orderBy('code')
		.execute();
}

export type FieldErrors = Partial<Record<SpeciesFormField, string>>;
export type SpeciesOutcome =
	{ ok: true; species: Species; changed: string[] } | { ok: false; fieldErrors: FieldErrors };

const TAKEN = {
	scientific: 'Another species already has this scientific name.',
	slug: 'Another species already uses this web name; enter a different one.',
	// The slug was made from the scientific name, so the keeper never typed it.
	madeSlug:
		'The web name made from the scientific name is taken by another species; enter one here.'
} as const;

/** Names another species holds already (compared without case, as buyers read them). */
async function nameConflicts(
	trx: Db,
	values: SpeciesValues,
	slugTyped: boolean,
	exceptId: number | null
): Promise<FieldErrors> {
	let query = trx
		.selectFrom('species')
		.select(['scientific_name', 'slug'])
		.where((eb) =>
			eb.or([
				eb(sql`lower(scientific_name)`, '=', values.scientific_name.toLowerCase()),
				eb('slug', '=', values.slug)
			])
		);
	if (exceptId !== null) query = query.where('id', '!=', exceptId);
	const clashes = await query.execute();
	const errors: FieldErrors = {};
	for (const clash of clashes) {
		if (clash.scientific_name.toLowerCase() === values.scientific_name.toLowerCase())
			errors.scientificName = TAKEN.scientific;
		if (clash.slug === values.slug) errors.slug = slugTyped ? TAKEN.slug : TAKEN.madeSlug;
	}
	// A web name made from a taken scientific name clears itself once the name is changed.
	if (!slugTyped && errors.scientificName) delete errors.slug;
	return errors;
}

/** A unique violation from a save that raced another, as the field error it stands for. */
export function uniqueViolation(error: unknown, slugTyped: boolean): FieldErrors | null {
	if (typeof error !== 'object' || error === null) return null;
	const { code, constraint } = error as { code?: string; constraint?: string };
	if (code !== '23505') return null;
	if (constraint === 'species_scientific_name_key') return { scientificName: TAKEN.scientific };
	if (constraint === 'species_slug_key') return { slug: slugTyped ? TAKEN.slug : TAKEN.madeSlug };
	return null;
}

/** The form checks the order too; this keeps a caller that skipped the form from a 500. */
function orderErrors(values: SpeciesValues): FieldErrors {
	const errors: FieldErrors = {};
	for (const problem of temperatureOrderProblems({
		tempLowF: values.temp_low_f,
		tempIdealLowF: values.temp_ideal_low_f,
		tempIdealHighF: values.temp_ideal_high_f,
		tempHighF: values.temp_high_f
	})) {
		errors[problem.field] = problem.message;
	}
	return errors;
}

function hasErrors(errors: FieldErrors): boolean {
	return Object.keys(errors).length > 0;
}

export interface SaveOptions {
	/** Whether the keeper typed the web name, or it was made from the scientific name. */
	slugTyped: boolean;
}

export async function createSpecies(
	db: Db,
	actor: Actor,
	values: SpeciesValues,
	options: SaveOptions
): Promise<SpeciesOutcome> {
	const unordered = orderErrors(values);
	if (hasErrors(unordered)) return { ok: false, fieldErrors: unordered };
	try {
		return await db.transaction().execute(async (trx): Promise<SpeciesOutcome> => {
			const conflicts = await nameConflicts(trx, values, options.slugTyped, null);
			if (hasErrors(conflicts)) return { ok: false, fieldErrors: conflicts };
			const species = await trx
				.insertInto('species')
				.values(values)
				.returningAll()
				.executeTakeFirstOrThrow();
			await writeAudit(trx, {
				actorUserId: actor.userId,
				actorIp: actor.ip,
				action: 'species.create',
				entity: 'species',
				entityId: species.id,
				detail: { ...values }
			});
			return { ok: true, species, changed: Object.keys(values) };
		});
	} catch (error) {
		const fieldErrors = uniqueViolation(error, options.slugTyped);
		if (fieldErrors) return { ok: false, fieldErrors };
		throw error;
	}
}

/** The columns whose values differ, with before and after, for the audit entry. */
export function profileChanges(
	before: SpeciesValues,
	after: SpeciesValues
): Record<string, { from: unknown; to: unknown }> {
	const changes: Record<string, { from: unknown; to: unknown }> = {};
	for (const key of Object.keys(after) as Array<keyof SpeciesValues>) {
		if (before[key] !== after[key]) changes[key] = { from: before[key], to: after[key] };
	}
	return changes;
}

export async function updateSpecies(
	db: Db,
	actor: Actor,
	speciesId: number,
	values: SpeciesValues,
	options: SaveOptions
): Promise<SpeciesOutcome | null> {
	const unordered = orderErrors(values);
	if (hasErrors(unordered)) return { ok: false, fieldErrors: unordered };
	try {
		return await db.transaction().execute(async (trx): Promise<SpeciesOutcome | null> => {
			// Lock the row so two keepers saving at once record their changes one after the other.
			const before = await trx
				.selectFrom('species')
				.selectAll()
				.where('id', '=', speciesId)
				.forUpdate()
				.executeTakeFirst();
			if (!before) return null;
			const conflicts = await nameConflicts(trx, values, options.slugTyped, speciesId);
			if (hasErrors(conflicts)) return { ok: false, fieldErrors: conflicts };
			const changes = profileChanges(before, values);
			const changed = Object.keys(changes);
			// Nothing changed: no write and nothing to record.
			if (changed.length === 0) return { ok: true, species: before, changed };
			const species = await trx
				.updateTable('species')
				.set({ ...values, updated_at: new Date() })
				.where('id', '=', speciesId)
				.returningAll()
				.executeTakeFirstOrThrow();
			await writeAudit(trx, {
				actorUserId: actor.userId,
				actorIp: actor.ip,
				action: 'species.update',
				entity: 'species',
				entityId: speciesId,
				detail: { slug: species.slug, changes }
			});
			return { ok: true, species, changed };
		});
	} catch (error) {
		const fieldErrors = uniqueViolation(error, options.slugTyped);
		if (fieldErrors) return { ok: false, fieldErrors };
		throw error;
	}
}
