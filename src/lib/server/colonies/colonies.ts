// Colonies: the one module that writes the colony table. Routes call these; every
// write runs in a transaction with its audit entry.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type { Actor } from '$lib/server/audit';
import { writeAudit } from '$lib/server/audit';
import { nextColonyCode } from '$lib/server/stock/codes';
import { colonySchedule, type ColonySchedule } from '$lib/care/schedule';
import { daysBetween, type IsoDate } from '$lib/format/dates';
import type { ColonyForm } from '$lib/care/forms';

export type Outcome<T> = { ok: true; value: T } | { ok: false; field: string; problem: string };

export interface SpeciesChoice {
	id: number;
	slug: string;
	commonName: string;
	scientificName: string;
	tubHoldDays: number;
}

export async function speciesChoices(db: Db): Promise<SpeciesChoice[]> {
	return db
		.selectFrom('species')
		.select([
			'id',
			'slug',
			'common_name as commonName',
			'scientific_name as scientificName',
			'tub_hold_days as tubHoldDays'
		])
		.orderBy('common_name')
		.execute();
}

function startProblem(startedOn: IsoDate, today: IsoDate): string | null {
	return daysBetween(today, startedOn) > 0 ? 'A colony cannot start in the future.' : null;
}

export async function createColony(
	db: Db,
	actor: Actor,
	form: ColonyForm,
	today: IsoDate
): Promise<Outcome<{ id: number; code: string }>> {
	const problem = startProblem(form.startedOn, today);
	if (problem) return { ok: false, field: 'startedOn', problem };
	return db.transaction().execute(async (trx) => {
		const species = await trx
			.selectFrom('species')
			.select('id')
			.where('id', '=', form.speciesId)
			.executeTakeFirst();
		if (!species)
			return { ok: false as const, field: 'speciesId', problem: 'That species is not recorded.' };
		const code = await nextColonyCode(trx, form.speciesId);
		const row = await trx
			.insertInto('colony')
			.values({
				code,
				species_id: form.speciesId,
				name: form.name,
				enclosure_length_in: form.lengthIn,
				enclosure_width_in: form.widthIn,
				substrate_depth_in: form.depthIn,
				founders_count: form.foundersCount,
				founders_note: form.foundersNote,
				generation: form.generation,
				started_on: form.startedOn,
				notes: form.notes
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'colony.create',
			entity: 'colony',
			entityId: row.id,
			detail: { code, ...form }
		});
		return { ok: true as const, value: { id: row.id, code } };
	});
}

export async function updateColony(
	db: Db,
	actor: Actor,
	colonyId: number,
	form: ColonyForm,
	today: IsoDate
): Promise<Outcome<null>> {
	const problem = startProblem(form.startedOn, today);
	if (problem) return { ok: false, field: 'startedOn', problem };
	return db.transaction().execute(async (trx) => {
		const before = await trx
			.selectFrom('colony')
			.selectAll()
			.where('id', '=', colonyId)
			.forUpdate()
			.executeTakeFirst();
		if (!before) return { ok: false as const, field: 'name', problem: 'This colony is gone.' };
		if (before.species_id !== form.speciesId) {
			// Tubs and clutches already point at the colony's species through their lineage.
			const used = await trx
				.selectFrom('resting_tub')
				.select('id')
				.where('colony_id', '=', colonyId)
				.executeTakeFirst();
			if (used)
				return {
					ok: false as const,
					field: 'speciesId',
					problem: 'This colony already has resting tubs; its species cannot change.'
				};
		}
		const earliestTub = await trx
			.selectFrom('resting_tub')
			.select((eb) => eb.fn.min('started_on').as('first'))
			.where('colony_id', '=', colonyId)
			.executeTakeFirst();
		if (earliestTub?.first && daysBetween(earliestTub.first, form.startedOn) > 0)
			return {
				ok: false as const,
				field: 'startedOn',
				problem: `A tub was set aside from this colony on ${earliestTub.first}; it started on or before that.`
			};
		await trx
			.updateTable('colony')
			.set({
				species_id: form.speciesId,
				name: form.name,
				enclosure_length_in: form.lengthIn,
				enclosure_width_in: form.widthIn,
				substrate_depth_in: form.depthIn,
				founders_count: form.foundersCount,
				founders_note: form.foundersNote,
				generation: form.generation,
				started_on: form.startedOn,
				notes: form.notes,
				updated_at: sql`now()`
			})
			.where('id', '=', colonyId)
			.execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'colony.update',
			entity: 'colony',
			entityId: colonyId,
			detail: {
				code: before.code,
				before: {
					name: before.name,
					lengthIn: before.enclosure_length_in,
					widthIn: before.enclosure_width_in,
					depthIn: before.substrate_depth_in,
					generation: before.generation,
					startedOn: before.started_on
				},
				after: form
			}
		});
		return { ok: true as const, value: null };
	});
}

/** Retire (a date) or bring back (null). A retired colony leaves the care schedule. */
export async function setRetired(
	db: Db,
	actor: Actor,
	colonyId: number,
	retiredOn: IsoDate | null,
	reason: string,
	today: IsoDate
): Promise<Outcome<null>> {
	if (retiredOn && daysBetween(today, retiredOn) > 0)
		return { ok: false, field: 'retiredOn', problem: 'Retire it today or on a past day.' };
	return db.transaction().execute(async (trx) => {
		const colony = await trx
			.selectFrom('colony')
			.select(['code', 'started_on', 'retired_on'])
			.where('id', '=', colonyId)
			.forUpdate()
			.executeTakeFirst();
		if (!colony) return { ok: false as const, field: 'retiredOn', problem: 'This colony is gone.' };
		if (retiredOn && daysBetween(colony.started_on, retiredOn) < 0)
			return {
				ok: false as const,
				field: 'retiredOn',
				problem: `The colony started on ${colony.started_on}; it cannot retire before that.`
			};
		await trx
			.updateTable('colony')
			.set({ retired_on: retiredOn, updated_at: sql`now()` })
			.where('id', '=', colonyId)
			.execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: retiredOn ? 'colony.retire' : 'colony.reinstate',
			entity: 'colony',
			entityId: colonyId,
			detail: { code: colony.code, retiredOn, was: colony.retired_on, reason }
		});
		return { ok: true as const, value: null };
	});
}

/** One colony row by its lid code: what actions and the edit form need, in one query. */
export async function findColony(db: Db, code: string) {
	return db.selectFrom('colony').selectAll().where('code', '=', code).executeTakeFirst();
}

export interface ColonyPage {
	id: number;
	code: string;
	name: string;
	species: {
		id: number;
		slug: string;
		commonName: string;
		scientificName: string;
		refreshIntervalDays: number;
		tubHoldDays: number;
		moltQuietDays: number;
	};
	lengthIn: number;
	widthIn: number;
	depthIn: number;
	foundersCount: number;
	foundersNote: string;
	generation: number;
	startedOn: IsoDate;
	retiredOn: IsoDate | null;
	notes: string;
	schedule: ColonySchedule;
	lastRefreshOn: IsoDate | null;
	lastMoisture: { on: IsoDate; reading: string } | null;
	lastCensus: { on: IsoDate; count: number } | null;
	tubs: {
		id: number;
		code: string;
		state: 'resting' | 'yielded' | 'cleared';
		startedOn: IsoDate;
		holdUntil: IsoDate;
		youngFound: number;
	}[];
	clutches: {
		code: string;
		state: 'growing' | 'ready' | 'listed' | 'sold_out' | 'paused';
		countAlive: number;
		stage: string;
		saleReadyOn: IsoDate;
	}[];
}

export async function findColonyPage(
	db: Db,
	code: string,
	today: IsoDate
): Promise<ColonyPage | null> {
	const colony = await db
		.selectFrom('colony as c')
		.innerJoin('species as s', 's.id', 'c.species_id')
		.select([
			'c.id',
			'c.code',
			'c.name',
			'c.enclosure_length_in',
			'c.enclosure_width_in',
			'c.substrate_depth_in',
			'c.founders_count',
			'c.founders_note',
			'c.generation',
			'c.started_on',
			'c.retired_on',
			'c.notes',
			's.id as species_id',
			's.slug',
			's.common_name',
			's.scientific_name',
			's.refresh_interval_days',
			's.tub_hold_days',
			's.molt_quiet_days'
		])
		.where('c.code', '=', code)
		.executeTakeFirst();
	if (!colony) return null;

	const [lasts, moisture, census, tubs, clutches] = await Promise.all([
		db
			.selectFrom('care_log_entry')
			.select((eb) => [
				eb.fn
					.max<IsoDate | null>('logged_on')
					.filterWhere('kind', 'in', ['substrate_refresh_half', 'substrate_refresh_full'])
					.as('refresh'),
				eb.fn
					.max<IsoDate | null>('logged_on')
					.filterWhere('kind', '=', 'moisture_check')
					.as('moisture'),
				eb.fn.max<IsoDate | null>('logged_on').filterWhere('kind', '=', 'molt_seen').as('molt')
			])
			.where('colony_id', '=', colony.id)
			.executeTakeFirstOrThrow(),
		db
			.selectFrom('care_log_entry')
			.select(['logged_on', 'moisture_reading'])
			.where('colony_id', '=', colony.id)
			.where('kind', '=', 'moisture_check')
			.orderBy('logged_on', 'desc')
			.orderBy('id', 'desc')
			.executeTakeFirst(),
		db
			.selectFrom('care_log_entry')
			.select(['logged_on', 'census_count'])
			.where('colony_id', '=', colony.id)
			.where('kind', '=', 'census')
			.orderBy('logged_on', 'desc')
			.orderBy('id', 'desc')
			.executeTakeFirst(),
		db
			.selectFrom('resting_tub as t')
			.leftJoin('tub_check as k', 'k.tub_id', 't.id')
			.select((eb) => [
				't.id',
				't.code',
				't.state',
				't.started_on',
				't.hold_until',
				eb.fn.coalesce(eb.fn.sum<number>('k.young_found'), eb.lit(0)).as('young')
			])
			.where('t.colony_id', '=', colony.id)
			.groupBy('t.id')
			.orderBy('t.started_on', 'desc')
			.limit(30)
			.execute(),
		db
			.selectFrom('clutch as k')
			.innerJoin('resting_tub as t', 't.id', 'k.tub_id')
			.select(['k.code', 'k.state', 'k.count_alive', 'k.stage', 'k.sale_ready_on'])
			.where('t.colony_id', '=', colony.id)
			.orderBy('k.found_on', 'desc')
			.limit(30)
			.execute()
	]);
	const facts = {
		startedOn: colony.started_on,
		refreshIntervalDays: colony.refresh_interval_days,
		moltQuietDays: colony.molt_quiet_days,
		lastRefreshOn: lasts.refresh,
		lastMoistureCheckOn: lasts.moisture,
		lastMoltSeenOn: lasts.molt
	};
	return {
		id: colony.id,
		code: colony.code,
		name: colony.name,
		species: {
			id: colony.species_id,
			slug: colony.slug,
			commonName: colony.common_name,
			scientificName: colony.scientific_name,
			refreshIntervalDays: colony.refresh_interval_days,
			tubHoldDays: colony.tub_hold_days,
			moltQuietDays: colony.molt_quiet_days
		},
		lengthIn: Number(colony.enclosure_length_in),
		widthIn: Number(colony.enclosure_width_in),
		depthIn: Number(colony.substrate_depth_in),
		foundersCount: colony.founders_count,
		foundersNote: colony.founders_note,
		generation: colony.generation,
		startedOn: colony.started_on,
		retiredOn: colony.retired_on,
		notes: colony.notes,
		schedule: colonySchedule(facts, today),
		lastRefreshOn: facts.lastRefreshOn,
		lastMoisture: moisture
			? { on: moisture.logged_on, reading: moisture.moisture_reading ?? 'right' }
			: null,
		lastCensus: census ? { on: census.logged_on, count: census.census_count ?? 0 } : null,
		tubs: tubs.map((t) => ({
			id: t.id,
			code: t.code,
			state: t.state,
			startedOn: t.started_on,
			holdUntil: t.hold_until,
			youngFound: Number(t.young)
		})),
		clutches: clutches.map((k) => ({
			code: k.code,
			state: k.state,
			countAlive: k.count_alive,
			stage: k.stage,
			saleReadyOn: k.sale_ready_on
		}))
	};
}
