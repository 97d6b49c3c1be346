// Resting tubs: the one module that writes resting_tub and tub_check. A tub is
// substrate taken out of a colony, held for weeks and looked through for young;
// young found become clutches in the same transaction as the check that found them.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type { Actor } from '$lib/server/audit';
import type { ClutchStage, SizeClass, TubState } from '$lib/server/db/schema';
import { writeAudit } from '$lib/server/audit';
import { insertClutches, type MadeClutch } from '$lib/server/clutches/create';
import { nextTubCode } from '$lib/server/stock/codes';
import { holdUntilProblem, tubDue, type TubDue } from '$lib/care/schedule';
import { foundDateProblem, offspringGeneration } from '$lib/stock/clutch-rules';
import type { TubCheckForm } from '$lib/care/forms';
import { daysBetween, type IsoDate } from '$lib/format/dates';
import type { Outcome } from '$lib/server/colonies/colonies';

/** Sets removed substrate aside as a tub; runs inside the caller's transaction. */
export async function setAsideTub(
	trx: Db,
	input: {
		colonyId: number;
		colonyCode: string;
		sourceEntryId: number | null;
		startedOn: IsoDate;
		holdUntil: IsoDate;
		note?: string;
	}
): Promise<{ id: number; code: string; holdUntil: IsoDate }> {
	const problem = holdUntilProblem(input.startedOn, input.holdUntil);
	if (problem) throw new RangeError(problem);
	const code = await nextTubCode(trx, input.colonyCode);
	const row = await trx
		.insertInto('resting_tub')
		.values({
			code,
			colony_id: input.colonyId,
			source_entry_id: input.sourceEntryId,
			started_on: input.startedOn,
			hold_until: input.holdUntil,
			note: input.note ?? ''
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	return { id: row.id, code, holdUntil: input.holdUntil };
}

/** A tub's id by its lid code, for the actions that only need to name it. */
export async function findTubId(db: Db, code: string): Promise<number | null> {
	const row = await db
		.selectFrom('resting_tub')
		.select('id')
		.where('code', '=', code)
		.executeTakeFirst();
	return row?.id ?? null;
}

export interface TubPage {
	id: number;
	code: string;
	state: TubState;
	startedOn: IsoDate;
	holdUntil: IsoDate;
	closedOn: IsoDate | null;
	note: string;
	due: TubDue;
	colony: { id: number; code: string; name: string; generation: number };
	species: { id: number; slug: string; commonName: string; scientificName: string };
	sourceEntry: { id: number; kind: string; loggedOn: IsoDate } | null;
	checks: {
		id: number;
		checkedOn: IsoDate;
		youngFound: number;
		eggsSeen: boolean;
		note: string;
		by: string | null;
		clutches: { code: string; count: number }[];
	}[];
	clutchCount: number;
}

export async function findTubPage(db: Db, code: string, today: IsoDate): Promise<TubPage | null> {
	const tub = await db
		.selectFrom('resting_tub as t')
		.innerJoin('colony as c', 'c.id', 't.colony_id')
		.innerJoin('species as s', 's.id', 'c.species_id')
		.leftJoin('care_log_entry as e', 'e.id', 't.source_entry_id')
		.select([
			't.id',
			't.code',
			't.state',
			't.started_on',
			't.hold_until',
			't.closed_on',
			't.note',
			'c.id as colony_id',
			'c.code as colony_code',
			'c.name as colony_name',
			'c.generation',
			's.id as species_id',
			's.slug',
			's.common_name',
			's.scientific_name',
			'e.id as entry_id',
			'e.kind as entry_kind',
			'e.logged_on as entry_on'
		])
		.where('t.code', '=', code)
		.executeTakeFirst();
	if (!tub) return null;
	const [checks, clutches] = await Promise.all([
		db
			.selectFrom('tub_check as k')
			.leftJoin('User as u', 'u.id', 'k.created_by')
			.select([
				'k.id',
				'k.checked_on',
				'k.young_found',
				'k.eggs_seen',
				'k.note',
				'u.name as by_name',
				'u.email as by_email'
			])
			.where('k.tub_id', '=', tub.id)
			.orderBy('k.checked_on', 'desc')
			.orderBy('k.id', 'desc')
			.execute(),
		db
			.selectFrom('clutch')
			.select(['code', 'count_found', 'tub_check_id'])
			.where('tub_id', '=', tub.id)
			.orderBy('id')
			.execute()
	]);
	return {
		id: tub.id,
		code: tub.code,
		state: tub.state,
		startedOn: tub.started_on,
		holdUntil: tub.hold_until,
		closedOn: tub.closed_on,
		note: tub.note,
		due: tubDue(
			{
				startedOn: tub.started_on,
				holdUntil: tub.hold_until,
				lastCheckOn: checks[0]?.checked_on ?? null
			},
			today
		),
		colony: {
			id: tub.colony_id,
			code: tub.colony_code,
			name: tub.colony_name,
			generation: tub.generation
		},
		species: {
			id: tub.species_id,
			slug: tub.slug,
			commonName: tub.common_name,
			scientificName: tub.scientific_name
		},
		sourceEntry:
			tub.entry_id != null && tub.entry_kind && tub.entry_on
				? { id: tub.entry_id, kind: tub.entry_kind, loggedOn: tub.entry_on }
				: null,
		checks: checks.map((check) => ({
			id: check.id,
			checkedOn: check.checked_on,
			youngFound: check.young_found,
			eggsSeen: check.eggs_seen,
			note: check.note,
			by: check.by_name ?? check.by_email ?? null,
			clutches: clutches
				.filter((clutch) => clutch.tub_check_id === check.id)
				.map((clutch) => ({ code: clutch.code, count: clutch.count_found }))
		})),
		clutchCount: clutches.length
	};
}

export type CheckOutcome = Outcome<{ checkId: number; clutches: MadeClutch[]; state: TubState }>;

/**
 * Records a look through a resting tub. Young found become clutches at once (one per
 * part, or one holding them all), all in one transaction with the check: a failure
 * anywhere leaves neither the check nor any clutch behind.
 */
export async function recordTubCheck(
	db: Db,
	actor: Actor,
	tubId: number,
	form: TubCheckForm,
	today: IsoDate
): Promise<CheckOutcome> {
	return db.transaction().execute(async (trx): Promise<CheckOutcome> => {
		const tub = await trx
			.selectFrom('resting_tub as t')
			.innerJoin('colony as c', 'c.id', 't.colony_id')
			.innerJoin('species as s', 's.id', 'c.species_id')
			.select([
				't.id',
				't.code',
				't.state',
				't.started_on',
				'c.generation',
				's.id as species_id',
				's.grow_out_weeks'
			])
			.where('t.id', '=', tubId)
			.forUpdate('t')
			.executeTakeFirst();
		if (!tub) return { ok: false, field: 'checkedOn', problem: 'This tub is gone.' };
		if (tub.state !== 'resting')
			return {
				ok: false,
				field: 'checkedOn',
				problem: `This tub is ${tub.state === 'yielded' ? 'closed after yielding young' : 'cleared'}; it takes no more checks.`
			};
		const dateProblem = foundDateProblem(form.checkedOn, tub.started_on, today);
		if (dateProblem) return { ok: false, field: 'checkedOn', problem: dateProblem };

		const check = await trx
			.insertInto('tub_check')
			.values({
				tub_id: tub.id,
				checked_on: form.checkedOn,
				young_found: form.youngFound,
				eggs_seen: form.eggsSeen,
				note: form.note,
				created_by: actor.userId
			})
			.returning('id')
			.executeTakeFirstOrThrow();

		let clutches: MadeClutch[] = [];
		if (form.youngFound > 0) {
			const parts = clutchParts(form);
			clutches = await insertClutches(
				trx,
				{
					speciesId: tub.species_id,
					growOutWeeks: tub.grow_out_weeks,
					generation: offspringGeneration(tub.generation),
					foundOn: form.checkedOn,
					origin: 'tub',
					tubId: tub.id,
					tubCheckId: check.id,
					parts
				},
				actor.userId
			);
		}
		// Young found closes the tub as yielded unless the keeper keeps it for later hatchings.
		const state: TubState = form.youngFound > 0 && !form.keepResting ? 'yielded' : 'resting';
		if (state !== 'resting')
			await trx
				.updateTable('resting_tub')
				.set({ state, closed_on: form.checkedOn, updated_at: sql`now()` })
				.where('id', '=', tub.id)
				.execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'tub.check',
			entity: 'resting_tub',
			entityId: tub.id,
			detail: {
				code: tub.code,
				checkedOn: form.checkedOn,
				youngFound: form.youngFound,
				eggsSeen: form.eggsSeen,
				clutches: clutches.map((clutch) => clutch.code),
				state
			}
		});
		return { ok: true, value: { checkId: check.id, clutches, state } };
	});
}

/** The clutches a check's young go into: the filled part rows, or one clutch of all of them. */
export function clutchParts(
	form: TubCheckForm
): { count: number; stage: ClutchStage; sizeClass: SizeClass }[] {
	const parts = form.partCount
		.map((count, index) => ({
			count,
			stage: form.partStage[index] ?? 'hatchling',
			sizeClass: form.partSize[index] ?? 'tiny'
		}))
		.filter((part) => part.count > 0);
	if (parts.length > 0) return parts;
	return [
		{
			count: form.youngFound,
			stage: form.partStage[0] ?? 'hatchling',
			sizeClass: form.partSize[0] ?? 'tiny'
		}
	];
}

/**
 * Ends a tub's rest: 'yielded' when it gave young at any check, else 'cleared'. A tub
 * with nothing found can be cleared only once its hold is over.
 */
export async function closeTub(
	db: Db,
	actor: Actor,
	tubId: number,
	closedOn: IsoDate,
	note: string,
	today: IsoDate
): Promise<Outcome<{ state: TubState }>> {
	if (daysBetween(today, closedOn) > 0)
		return { ok: false, field: 'closedOn', problem: 'That date is still to come.' };
	return db.transaction().execute(async (trx) => {
		const tub = await trx
			.selectFrom('resting_tub')
			.select(['id', 'code', 'state', 'started_on', 'hold_until', 'note'])
			.where('id', '=', tubId)
			.forUpdate()
			.executeTakeFirst();
		if (!tub) return { ok: false as const, field: 'closedOn', problem: 'This tub is gone.' };
		if (tub.state !== 'resting')
			return { ok: false as const, field: 'closedOn', problem: 'This tub is already closed.' };
		if (daysBetween(tub.started_on, closedOn) < 0)
			return {
				ok: false as const,
				field: 'closedOn',
				problem: `The tub was set aside on ${tub.started_on}; it cannot close before that.`
			};
		const young = await trx
			.selectFrom('clutch')
			.select('id')
			.where('tub_id', '=', tubId)
			.executeTakeFirst();
		if (!young && daysBetween(tub.hold_until, closedOn) < 0)
			return {
				ok: false as const,
				field: 'closedOn',
				problem: `Its hold runs until ${tub.hold_until}. Young can still hatch: keep it until then, or shorten the hold first.`
			};
		const state: TubState = young ? 'yielded' : 'cleared';
		await trx
			.updateTable('resting_tub')
			.set({
				state,
				closed_on: closedOn,
				note: note ? (tub.note ? `${tub.note}\n${note}` : note) : tub.note,
				updated_at: sql`now()`
			})
			.where('id', '=', tubId)
			.execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: state === 'cleared' ? 'tub.clear' : 'tub.close',
			entity: 'resting_tub',
			entityId: tubId,
			detail: { code: tub.code, closedOn, state, note }
		});
		return { ok: true as const, value: { state } };
	});
}

export async function changeHoldUntil(
	db: Db,
	actor: Actor,
	tubId: number,
	holdUntil: IsoDate
): Promise<Outcome<null>> {
	return db.transaction().execute(async (trx) => {
		const tub = await trx
			.selectFrom('resting_tub')
			.select(['code', 'state', 'started_on', 'hold_until'])
			.where('id', '=', tubId)
			.forUpdate()
			.executeTakeFirst();
		if (!tub) return { ok: false as const, field: 'holdUntil', problem: 'This tub is gone.' };
		if (tub.state !== 'resting')
			return { ok: false as const, field: 'holdUntil', problem: 'This tub is already closed.' };
		const problem = holdUntilProblem(tub.started_on, holdUntil);
		if (problem) return { ok: false as const, field: 'holdUntil', problem };
		await trx
			.updateTable('resting_tub')
			.set({ hold_until: holdUntil, updated_at: sql`now()` })
			.where('id', '=', tubId)
			.execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'tub.hold',
			entity: 'resting_tub',
			entityId: tubId,
			detail: { code: tub.code, from: tub.hold_until, to: holdUntil }
		});
		return { ok: true as const, value: null };
	});
}
