// The care log: the one module that writes care_log_entry. A half or full substrate
// refresh can set the removed substrate aside as a resting tub in the same step.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type { Actor } from '$lib/server/audit';
import type { CareEntryKind, MoistureReading } from '$lib/server/db/schema';
import { writeAudit } from '$lib/server/audit';
import { setAsideTub } from '$lib/server/tubs/tubs';
import { defaultHoldUntil } from '$lib/care/schedule';
import { isRefresh, type CareEntryForm } from '$lib/care/forms';
import { daysBetween, type IsoDate } from '$lib/format/dates';
import type { Outcome } from '$lib/server/colonies/colonies';

function entryValues(form: CareEntryForm) {
	return {
		kind: form.kind,
		logged_on: form.loggedOn,
		moisture_reading: form.kind === 'moisture_check' ? (form.moistureReading ?? null) : null,
		census_count: form.kind === 'census' ? (form.censusCount ?? null) : null,
		note: form.note
	};
}

function dateProblem(loggedOn: IsoDate, startedOn: IsoDate, today: IsoDate): string | null {
	if (daysBetween(today, loggedOn) > 0) return 'That date is still to come.';
	if (daysBetween(startedOn, loggedOn) < 0)
		return `The colony started on ${startedOn}; log care from that day on.`;
	return null;
}

export type LoggedEntry = {
	entryId: number;
	tub: { id: number; code: string; holdUntil: IsoDate } | null;
};

export async function logCareEntry(
	db: Db,
	actor: Actor,
	colonyId: number,
	form: CareEntryForm,
	today: IsoDate
): Promise<Outcome<LoggedEntry>> {
	return db.transaction().execute(async (trx): Promise<Outcome<LoggedEntry>> => {
		const colony = await trx
			.selectFrom('colony as c')
			.innerJoin('species as s', 's.id', 'c.species_id')
			.select(['c.id', 'c.code', 'c.started_on', 'c.retired_on', 's.tub_hold_days'])
			.where('c.id', '=', colonyId)
			.executeTakeFirst();
		if (!colony) return { ok: false, field: 'kind', problem: 'This colony is gone.' };
		if (colony.retired_on)
			return { ok: false, field: 'kind', problem: 'This colony is retired; bring it back first.' };
		const problem = dateProblem(form.loggedOn, colony.started_on, today);
		if (problem) return { ok: false, field: 'loggedOn', problem };

		const entry = await trx
			.insertInto('care_log_entry')
			.values({ colony_id: colony.id, created_by: actor.userId, ...entryValues(form) })
			.returning('id')
			.executeTakeFirstOrThrow();
		let tub: LoggedEntry['tub'] = null;
		if (isRefresh(form.kind) && form.saveTub) {
			tub = await setAsideTub(trx, {
				colonyId: colony.id,
				colonyCode: colony.code,
				sourceEntryId: entry.id,
				startedOn: form.loggedOn,
				holdUntil: form.holdUntil || defaultHoldUntil(form.loggedOn, colony.tub_hold_days)
			});
		}
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'care.log',
			entity: 'care_log_entry',
			entityId: entry.id,
			detail: { colony: colony.code, ...entryValues(form), tub: tub?.code ?? null }
		});
		return { ok: true, value: { entryId: entry.id, tub } };
	});
}

export async function updateCareEntry(
	db: Db,
	actor: Actor,
	entryId: number,
	form: CareEntryForm,
	today: IsoDate
): Promise<Outcome<null>> {
	return db.transaction().execute(async (trx): Promise<Outcome<null>> => {
		const before = await trx
			.selectFrom('care_log_entry as e')
			.innerJoin('colony as c', 'c.id', 'e.colony_id')
			.selectAll('e')
			.select(['c.code as colony_code', 'c.started_on'])
			.where('e.id', '=', entryId)
			.forUpdate('e')
			.executeTakeFirst();
		if (!before) return { ok: false, field: 'kind', problem: 'This entry is gone.' };
		// A refresh that set a tub aside stays a refresh: the tub's lineage points at it.
		const madeTub = await trx
			.selectFrom('resting_tub')
			.select('code')
			.where('source_entry_id', '=', entryId)
			.executeTakeFirst();
		if (madeTub && !isRefresh(form.kind))
			return {
				ok: false,
				field: 'kind',
				problem: `Tub ${madeTub.code} came from this refresh; it stays a substrate refresh.`
			};
		const problem = dateProblem(form.loggedOn, before.started_on, today);
		if (problem) return { ok: false, field: 'loggedOn', problem };
		await trx
			.updateTable('care_log_entry')
			.set({ ...entryValues(form), updated_at: sql`now()` })
			.where('id', '=', entryId)
			.execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'care.edit',
			entity: 'care_log_entry',
			entityId: entryId,
			detail: {
				colony: before.colony_code,
				before: {
					kind: before.kind,
					logged_on: before.logged_on,
					moisture_reading: before.moisture_reading,
					census_count: before.census_count,
					note: before.note
				},
				after: entryValues(form)
			}
		});
		return { ok: true, value: null };
	});
}

export async function deleteCareEntry(
	db: Db,
	actor: Actor,
	entryId: number
): Promise<Outcome<null>> {
	return db.transaction().execute(async (trx): Promise<Outcome<null>> => {
		const before = await trx
			.selectFrom('care_log_entry as e')
			.innerJoin('colony as c', 'c.id', 'e.colony_id')
			.selectAll('e')
			.select('c.code as colony_code')
			.where('e.id', '=', entryId)
			.forUpdate('e')
			.executeTakeFirst();
		if (!before) return { ok: false, field: 'entryId', problem: 'This entry is already gone.' };
		// The tub keeps its own dates; only its link back to this entry is dropped.
		await trx.deleteFrom('care_log_entry').where('id', '=', entryId).execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'care.delete',
			entity: 'care_log_entry',
			entityId: entryId,
			detail: {
				colony: before.colony_code,
				kind: before.kind,
				logged_on: before.logged_on,
				moisture_reading: before.moisture_reading,
				census_count: before.census_count,
				note: before.note
			}
		});
		return { ok: true, value: null };
	});
}

export interface TimelineEntry {
	id: number;
	kind: CareEntryKind;
	loggedOn: IsoDate;
	moistureReading: MoistureReading | null;
	censusCount: number | null;
	note: string;
	by: string | null;
	tubCode: string | null;
}

/** The newest entries of one colony, for its page (the full log is the care-log table). */
export async function colonyTimeline(
	db: Db,
	colonyId: number,
	limit = 40
): Promise<{ entries: TimelineEntry[]; total: number }> {
	const [rows, total] = await Promise.all([
		db
			.selectFrom('care_log_entry as e')
			.leftJoin('User as u', 'u.id', 'e.created_by')
			.leftJoin('resting_tub as t', 't.source_entry_id', 'e.id')
			.select([
				'e.id',
				'e.kind',
				'e.logged_on',
				'e.moisture_reading',
				'e.census_count',
				'e.note',
				'u.name as by_name',
				'u.email as by_email',
				't.code as tub_code'
			])
			.where('e.colony_id', '=', colonyId)
			.orderBy('e.logged_on', 'desc')
			.orderBy('e.id', 'desc')
			.limit(limit)
			.execute(),
		db
			.selectFrom('care_log_entry')
			.select((eb) => eb.fn.countAll<number>().as('n'))
			.where('colony_id', '=', colonyId)
			.executeTakeFirstOrThrow()
	]);
	return {
		entries: rows.map((row) => ({
			id: row.id,
			kind: row.kind,
			loggedOn: row.logged_on,
			moistureReading: row.moisture_reading,
			censusCount: row.census_count,
			note: row.note,
			by: row.by_name ?? row.by_email ?? null,
			tubCode: row.tub_code
		})),
		total: Number(total.n)
	};
}

export async function findCareEntry(db: Db, entryId: number) {
	return db.selectFrom('care_log_entry').selectAll().where('id', '=', entryId).executeTakeFirst();
}
