// Clutches after they are made: the clutch page (counts, lineage, history) and every
// change a keeper makes to one. The one module that updates clutch rows and writes
// clutch_event after the 'found' event (create.ts writes that one).
//
// Concurrency: each change runs in one transaction that locks the clutch row first
// (`select … for update`), so two keepers' changes queue instead of overwriting each
// other. Losses are deltas applied to the row as it is under the lock, so two at once
// both count. Edits that set an absolute value the keeper read off the page (a census,
// the stage, the size class, the sale-ready date, the note) also carry the version the
// page showed and are refused if someone else saved in between.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type {
	AnimalGroup,
	Clutch,
	ClutchEventKind,
	ClutchStage,
	ClutchState,
	ClutchUpdate,
	SizeClass
} from '$lib/server/db/schema';
import type { Actor } from '$lib/server/accounts/users';
import { writeAudit } from '$lib/server/audit';
import { insertClutches } from '$lib/server/clutches/create';
import { syncClutchListedState, syncClutchSoldOut } from '$lib/server/listings/listings';
import { nextClutchCodes } from '$lib/server/stock/codes';
import { daysBetween, todayInZone, type IsoDate } from '$lib/format/dates';
import { sizeClassLabels, stageLabels } from '$lib/format/labels';
import {
	applyLoss,
	applyMerge,
	applyRecount,
	applySplit,
	backToGrowingProblem,
	markReadyProblem,
	mergeProblem,
	pauseProblem,
	recountProblem,
	splitProblem,
	unpauseTarget,
	type ClutchCounts,
	type ClutchForMove,
	type PauseReason
} from '$lib/stock/clutch-counts';
import { foundDateProblem } from '$lib/stock/clutch-rules';
import type { HistoryKind } from '$lib/stock/clutch-history';

// ---- shapes handed to routes

/** A clutch as it is on record now. */
export interface ClutchSnapshot {
	id: number;
	code: string;
	speciesId: number;
	state: ClutchState;
	pausedReason: PauseReason | null;
	stage: ClutchStage;
	sizeClass: SizeClass;
	origin: Clutch['origin'];
	generation: number;
	foundOn: IsoDate;
	saleReadyOn: IsoDate;
	counts: ClutchCounts;
	note: string;
	version: number;
}

/** Why a change was refused. `field` names the form field it belongs beside (null: the whole form). */
export type ClutchRefusal = {
	ok: false;
	field: string | null;
	problem: string;
	/** Set when the clutch changed since the page was opened: what is on record now. */
	current?: ClutchSnapshot;
	notFound?: true;
	/** For a split: which new clutch (0-based) the problem is about. */
	part?: number;
};

export type ClutchOutcome<T = object> = ({ ok: true; clutch: ClutchSnapshot } & T) | ClutchRefusal;

function snapshot(row: Clutch): ClutchSnapshot {
	return {
		id: row.id,
		code: row.code,
		speciesId: row.species_id,
		state: row.state,
		pausedReason: row.paused_reason,
		stage: row.stage,
		sizeClass: row.size_class,
		origin: row.origin,
		generation: row.generation,
		foundOn: row.found_on,
		saleReadyOn: row.sale_ready_on,
		counts: { found: row.count_found, alive: row.count_alive, lost: row.count_lost },
		note: row.note,
		version: row.version
	};
}

const refuse = (field: string | null, problem: string): ClutchRefusal => ({
	ok: false,
	field,
	problem
});

function notFound(code: string): ClutchRefusal {
	return { ok: false, field: null, problem: `No clutch has the code ${code}.`, notFound: true };
}

/** The sentence a keeper sees when someone else saved first, with the counts as they are now. */
export function staleProblem(current: ClutchSnapshot): string {
	const { found, alive, lost } = current.counts;
	return (
		`Changed by someone else since you opened it — here is the count now: ${alive} alive, ` +
		`${lost} lost, ${found} found (${stageLabels[current.stage].toLowerCase()}, ` +
		`${sizeClassLabels[current.sizeClass].toLowerCase()}). Check your entry and save again.`
	);
}

function stale(field: string, row: Clutch): ClutchRefusal {
	const current = snapshot(row);
	return { ok: false, field, problem: staleProblem(current), current };
}

/** Why a date for something that happened to this clutch is refused, or null. */
function happenedOnProblem(happenedOn: IsoDate, row: Clutch, today: IsoDate): string | null {
	if (daysBetween(today, happenedOn) > 0) return 'That date is still to come.';
	if (daysBetween(row.found_on, happenedOn) < 0)
		return `This clutch was only found on ${row.found_on}.`;
	return null;
}

// ---- the locked row, the update and the event

async function lockClutch(trx: Db, code: string): Promise<Clutch | undefined> {
	return trx
		.selectFrom('clutch')
		.selectAll()
		.where('code', '=', code)
		.forUpdate()
		.executeTakeFirst();
}

async function saveClutch(trx: Db, id: number, values: ClutchUpdate): Promise<Clutch> {
	return trx
		.updateTable('clutch')
		.set((eb) => ({ ...values, version: eb('version', '+', 1), updated_at: sql`now()` }))
		.where('id', '=', id)
		.returningAll()
		.executeTakeFirstOrThrow();
}

interface EventInput {
	kind: ClutchEventKind;
	fromValue?: string | null;
	toValue?: string | null;
	countDelta?: number;
	reason?: string;
	happenedOn: IsoDate;
}

async function addEvent(trx: Db, clutchId: number, actor: Actor, event: EventInput) {
	await trx
		.insertInto('clutch_event')
		.values({
			clutch_id: clutchId,
			kind: event.kind,
			from_value: event.fromValue ?? null,
			to_value: event.toValue ?? null,
			count_delta: event.countDelta ?? 0,
			reason: event.reason ?? '',
			happened_on: event.happenedOn,
			actor_user_id: actor.userId
		})
		.execute();
}

async function audit(
	trx: Db,
	actor: Actor,
	action: string,
	row: Pick<Clutch, 'id' | 'code'>,
	detail: Record<string, unknown>
) {
	await writeAudit(trx, {
		actorUserId: actor.userId,
		actorIp: actor.ip,
		action: `clutch.${action}`,
		entity: 'clutch',
		entityId: row.id,
		detail: { code: row.code, ...detail }
	});
}

/** Runs `work` on the clutch locked for this transaction; a refusal writes nothing. */
async function withLockedClutch<T extends object>(
	db: Db,
	code: string,
	work: (trx: Db, row: Clutch) => Promise<ClutchOutcome<T>>
): Promise<ClutchOutcome<T>> {
	return db.transaction().execute(async (trx) => {
		const row = await lockClutch(trx, code);
		if (!row) return notFound(code);
		return work(trx, row);
	});
}

// ---- counts

export interface LossInput {
	count: number;
	reason: string;
	happenedOn: IsoDate;
}

/** A loss is a delta on the locked row: two keepers recording losses at once both count. */
export async function recordLoss(
	db: Db,
	actor: Actor,
	code: string,
	input: LossInput,
	today: IsoDate
): Promise<ClutchOutcome> {
	return withLockedClutch(db, code, async (trx, row) => {
		const reason = input.reason.trim();
		if (!reason) return refuse('reason', 'Say what happened, even "cause unknown".');
		const dateProblem = happenedOnProblem(input.happenedOn, row, today);
		if (dateProblem) return refuse('happenedOn', dateProblem);
		const change = applyLoss(countsOf(row), input.count);
		if (!change.ok) return refuse('count', change.problem);
		const saved = await saveClutch(trx, row.id, {
			count_alive: change.counts.alive,
			count_lost: change.counts.lost
		});
		await addEvent(trx, row.id, actor, {
			kind: 'loss',
			fromValue: String(row.count_alive),
			toValue: String(saved.count_alive),
			countDelta: change.aliveDelta,
			reason,
			happenedOn: input.happenedOn
		});
		await audit(trx, actor, 'loss', row, {
			count: input.count,
			reason,
			happenedOn: input.happenedOn,
			aliveBefore: row.count_alive,
			aliveAfter: saved.count_alive
		});
		// A loss can take the last free animal: the clutch and its live listings sell out.
		const synced = await syncClutchSoldOut(trx, row.id, actor, today);
		return { ok: true, clutch: snapshot(synced.clutch) };
	});
}

export interface RecountInput {
	countAlive: number;
	reason: string;
	happenedOn: IsoDate;
	version: number;
}

/** A census sets alive to what was counted: refused if the clutch changed since the page was read. */
export async function recount(
	db: Db,
	actor: Actor,
	code: string,
	input: RecountInput,
	today: IsoDate
): Promise<ClutchOutcome> {
	return withLockedClutch(db, code, async (trx, row) => {
		if (row.version !== input.version) return stale('countAlive', row);
		const stateProblem = recountProblem(row.state, row.paused_reason);
		if (stateProblem) return refuse('countAlive', stateProblem);
		const dateProblem = happenedOnProblem(input.happenedOn, row, today);
		if (dateProblem) return refuse('happenedOn', dateProblem);
		const change = applyRecount(countsOf(row), input.countAlive);
		if (!change.ok) return refuse('countAlive', change.problem);
		const saved = await saveClutch(trx, row.id, {
			count_found: change.counts.found,
			count_alive: change.counts.alive,
			count_lost: change.counts.lost
		});
		const reason = input.reason.trim();
		await addEvent(trx, row.id, actor, {
			kind: 'count',
			fromValue: String(row.count_alive),
			toValue: String(saved.count_alive),
			countDelta: change.aliveDelta,
			reason,
			happenedOn: input.happenedOn
		});
		await audit(trx, actor, 'recount', row, {
			reason,
			happenedOn: input.happenedOn,
			before: countsOf(row),
			after: change.counts
		});
		// A lower count can leave nothing to sell: the clutch and its live listings sell out.
		const synced = await syncClutchSoldOut(trx, row.id, actor, today);
		return { ok: true, clutch: snapshot(synced.clutch) };
	});
}

function countsOf(row: Clutch): ClutchCounts {
	return { found: row.count_found, alive: row.count_alive, lost: row.count_lost };
}

// ---- stage, size class, sale-ready date, note

export async function changeStage(
	db: Db,
	actor: Actor,
	code: string,
	input: { stage: ClutchStage; version: number },
	today: IsoDate
): Promise<ClutchOutcome> {
	return withLockedClutch(db, code, async (trx, row) => {
		if (row.version !== input.version) return stale('stage', row);
		if (row.state === 'sold_out') return refuse('stage', 'This clutch is closed (sold out).');
		if (row.stage === input.stage)
			return refuse('stage', `They are already ${stageLabels[input.stage].toLowerCase()}s.`);
		const saved = await saveClutch(trx, row.id, { stage: input.stage });
		await addEvent(trx, row.id, actor, {
			kind: 'stage',
			fromValue: row.stage,
			toValue: input.stage,
			happenedOn: today
		});
		await audit(trx, actor, 'stage', row, { from: row.stage, to: input.stage });
		return { ok: true, clutch: snapshot(saved) };
	});
}

export async function changeSizeClass(
	db: Db,
	actor: Actor,
	code: string,
	input: { sizeClass: SizeClass; version: number },
	today: IsoDate
): Promise<ClutchOutcome> {
	return withLockedClutch(db, code, async (trx, row) => {
		if (row.version !== input.version) return stale('sizeClass', row);
		if (row.state === 'sold_out') return refuse('sizeClass', 'This clutch is closed (sold out).');
		if (row.size_class === input.sizeClass)
			return refuse(
				'sizeClass',
				`The size class is already ${sizeClassLabels[input.sizeClass].toLowerCase()}.`
			);
		const saved = await saveClutch(trx, row.id, { size_class: input.sizeClass });
		await addEvent(trx, row.id, actor, {
			kind: 'size_class',
			fromValue: row.size_class,
			toValue: input.sizeClass,
			happenedOn: today
		});
		await audit(trx, actor, 'size_class', row, { from: row.size_class, to: input.sizeClass });
		return { ok: true, clutch: snapshot(saved) };
	});
}

/**
 * Moves the projected sale-ready date, with the keeper's reason. clutch_event has no kind
 * for it, so the audit entry is its record (the clutch page reads it into the history).
 */
export async function editSaleReadyOn(
	db: Db,
	actor: Actor,
	code: string,
	input: { saleReadyOn: IsoDate; reason: string; version: number }
): Promise<ClutchOutcome> {
	return withLockedClutch(db, code, async (trx, row) => {
		if (row.version !== input.version) return stale('saleReadyOn', row);
		const reason = input.reason.trim();
		if (!reason) return refuse('reason', 'Say why the date moves.');
		if (daysBetween(row.found_on, input.saleReadyOn) < 0)
			return refuse(
				'saleReadyOn',
				`They cannot be sale size before they were found (${row.found_on}).`
			);
		if (input.saleReadyOn === row.sale_ready_on)
			return refuse('saleReadyOn', 'That is the date already on record.');
		const saved = await saveClutch(trx, row.id, { sale_ready_on: input.saleReadyOn });
		await audit(trx, actor, 'sale_ready_on', row, {
			from: row.sale_ready_on,
			to: input.saleReadyOn,
			reason
		});
		return { ok: true, clutch: snapshot(saved) };
	});
}

export async function editNote(
	db: Db,
	actor: Actor,
	code: string,
	input: { note: string; version: number }
): Promise<ClutchOutcome> {
	return withLockedClutch(db, code, async (trx, row) => {
		if (row.version !== input.version) return stale('note', row);
		const note = input.note.trim();
		if (note === row.note) return refuse('note', 'The note is unchanged.');
		const saved = await saveClutch(trx, row.id, { note });
		await audit(trx, actor, 'note', row, { from: row.note, to: note });
		return { ok: true, clutch: snapshot(saved) };
	});
}

// ---- state moves a keeper makes. Listed and sold out are set by listings.

export async function pause(
	db: Db,
	actor: Actor,
	code: string,
	input: { pausedReason: PauseReason; note: string },
	today: IsoDate
): Promise<ClutchOutcome> {
	return withLockedClutch(db, code, async (trx, row) => {
		const problem = pauseProblem(row.state, row.count_alive);
		if (problem) return refuse('pausedReason', problem);
		const saved = await saveClutch(trx, row.id, {
			state: 'paused',
			paused_reason: input.pausedReason
		});
		// The state before the pause rides on the event, so unpausing can return to it.
		await addEvent(trx, row.id, actor, {
			kind: 'pause',
			fromValue: row.state,
			toValue: input.pausedReason,
			reason: input.note.trim(),
			happenedOn: today
		});
		await audit(trx, actor, 'pause', row, {
			from: row.state,
			reason: input.pausedReason,
			note: input.note.trim()
		});
		return { ok: true, clutch: snapshot(saved) };
	});
}

export async function unpause(
	db: Db,
	actor: Actor,
	code: string,
	input: { note: string },
	today: IsoDate
): Promise<ClutchOutcome> {
	return withLockedClutch(db, code, async (trx, row) => {
		const lastPause = await trx
			.selectFrom('clutch_event')
			.select('from_value')
			.where('clutch_id', '=', row.id)
			.where('kind', '=', 'pause')
			.orderBy('id', 'desc')
			.limit(1)
			.executeTakeFirst();
		const target = unpauseTarget(row.state, lastPause?.from_value ?? null);
		if (!target.ok) return refuse('note', target.problem);
		await saveClutch(trx, row.id, { state: target.to, paused_reason: null });
		await addEvent(trx, row.id, actor, {
			kind: 'unpause',
			fromValue: row.paused_reason,
			toValue: target.to,
			reason: input.note.trim(),
			happenedOn: today
		});
		await audit(trx, actor, 'unpause', row, {
			reason: row.paused_reason,
			to: target.to,
			note: input.note.trim()
		});
		// Back to listed with no live listing (withdrawn meanwhile) means ready; nothing left, sold out.
		const settled = await syncClutchListedState(trx, row.id, actor, today);
		return { ok: true, clutch: snapshot(settled) };
	});
}

async function moveState(
	trx: Db,
	actor: Actor,
	row: Clutch,
	to: ClutchState,
	reason: string,
	happenedOn: IsoDate,
	action: string
): Promise<Clutch> {
	const saved = await saveClutch(trx, row.id, { state: to });
	await addEvent(trx, row.id, actor, {
		kind: 'state',
		fromValue: row.state,
		toValue: to,
		reason,
		happenedOn
	});
	await audit(trx, actor, action, row, { from: row.state, to, reason });
	return saved;
}

/** Growing → ready: the keeper judges them sale size (before or after the projected date). */
export async function markReady(
	db: Db,
	actor: Actor,
	code: string,
	input: { note: string },
	today: IsoDate
): Promise<ClutchOutcome> {
	return withLockedClutch(db, code, async (trx, row) => {
		const problem = markReadyProblem(row.state, row.count_alive);
		if (problem) return refuse('note', problem);
		const saved = await moveState(trx, actor, row, 'ready', input.note.trim(), today, 'ready');
		return { ok: true, clutch: snapshot(saved) };
	});
}

/** Ready → growing: a second look says they are not sale size yet. */
export async function backToGrowing(
	db: Db,
	actor: Actor,
	code: string,
	input: { note: string },
	today: IsoDate
): Promise<ClutchOutcome> {
	return withLockedClutch(db, code, async (trx, row) => {
		const problem = backToGrowingProblem(row.state);
		if (problem) return refuse('note', problem);
		const note = input.note.trim();
		if (!note) return refuse('note', 'Say why they are not sale size yet.');
		const saved = await moveState(trx, actor, row, 'growing', note, today, 'back_to_growing');
		return { ok: true, clutch: snapshot(saved) };
	});
}

// ---- merge and split

function forMove(row: Clutch): ClutchForMove {
	return {
		code: row.code,
		speciesId: row.species_id,
		generation: row.generation,
		state: row.state,
		counts: countsOf(row)
	};
}

/**
 * Pours every live animal of `fromCode` into `intoCode` (one species, same generation and
 * state, neither paused nor listed). The survivor's found and alive grow by the animals
 * moved (event merge_in). The emptied clutch keeps its history; its alive goes to 0
 * (event merge_out) and its state to sold_out: the schema's one closed state, which takes
 * it out of every growing and ready list and the pipeline and can never be listed again.
 * Its merge_out event says where the animals went.
 */
export async function merge(
	db: Db,
	actor: Actor,
	input: { intoCode: string; fromCode: string },
	today: IsoDate
): Promise<ClutchOutcome<{ source: ClutchSnapshot; moved: number }>> {
	if (input.intoCode === input.fromCode)
		return refuse('otherCode', 'A clutch cannot be merged into itself.');
	return db.transaction().execute(async (trx) => {
		// Both rows locked in id order, so two merges of the same pair cannot deadlock.
		const rows = await trx
			.selectFrom('clutch')
			.selectAll()
			.where('code', 'in', [input.intoCode, input.fromCode])
			.orderBy('id')
			.forUpdate()
			.execute();
		const survivor = rows.find((r) => r.code === input.intoCode);
		const source = rows.find((r) => r.code === input.fromCode);
		if (!survivor) return { ...notFound(input.intoCode), field: 'otherCode' };
		if (!source) return { ...notFound(input.fromCode), field: 'otherCode' };
		const problem = mergeProblem(forMove(survivor), forMove(source));
		if (problem) return refuse('otherCode', problem);
		const change = applyMerge(countsOf(survivor), countsOf(source));
		if (!change.ok) return refuse('otherCode', change.problem);

		const savedSurvivor = await saveClutch(trx, survivor.id, {
			count_found: change.survivor.found,
			count_alive: change.survivor.alive
		});
		const savedSource = await saveClutch(trx, source.id, {
			count_alive: 0,
			state: 'sold_out'
		});
		await addEvent(trx, survivor.id, actor, {
			kind: 'merge_in',
			fromValue: source.code,
			toValue: String(savedSurvivor.count_alive),
			countDelta: change.moved,
			happenedOn: today
		});
		await addEvent(trx, source.id, actor, {
			kind: 'merge_out',
			fromValue: String(source.count_alive),
			toValue: survivor.code,
			countDelta: -change.moved,
			happenedOn: today
		});
		await addEvent(trx, source.id, actor, {
			kind: 'state',
			fromValue: source.state,
			toValue: 'sold_out',
			reason: `All moved into ${survivor.code}.`,
			happenedOn: today
		});
		const detail = { into: survivor.code, from: source.code, moved: change.moved };
		await audit(trx, actor, 'merge_in', survivor, detail);
		await audit(trx, actor, 'merge_out', source, detail);
		return {
			ok: true,
			clutch: snapshot(savedSurvivor),
			source: snapshot(savedSource),
			moved: change.moved
		};
	});
}

export interface SplitPart {
	count: number;
	/** The new clutch's size class; the parent's when null (a split is often by size). */
	sizeClass: SizeClass | null;
}

export interface MadeSplitClutch {
	id: number;
	code: string;
	count: number;
	sizeClass: SizeClass;
}

/**
 * Inserts the new clutches of a split: origin 'split', the parent's species, generation,
 * found and sale-ready dates, stage and state; each with a split_in event. A sibling of
 * insertClutches (create.ts), which makes only tub and bought-in clutches.
 */
async function insertSplitClutches(
	trx: Db,
	parent: Clutch,
	parts: readonly SplitPart[],
	note: string,
	actor: Actor,
	happenedOn: IsoDate
): Promise<MadeSplitClutch[]> {
	const codes = await nextClutchCodes(trx, parent.species_id, parts.length);
	const made: MadeSplitClutch[] = [];
	for (const [index, part] of parts.entries()) {
		const code = codes[index]!;
		const sizeClass = part.sizeClass ?? parent.size_class;
		const row = await trx
			.insertInto('clutch')
			.values({
				code,
				species_id: parent.species_id,
				tub_id: null,
				tub_check_id: null,
				origin: 'split',
				generation: parent.generation,
				found_on: parent.found_on,
				stage: parent.stage,
				size_class: sizeClass,
				count_found: part.count,
				count_alive: part.count,
				state: parent.state,
				sale_ready_on: parent.sale_ready_on,
				parent_clutch_id: parent.id,
				note
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await addEvent(trx, row.id, actor, {
			kind: 'split_in',
			fromValue: parent.code,
			toValue: String(part.count),
			countDelta: part.count,
			reason: note,
			happenedOn
		});
		made.push({ id: row.id, code, count: part.count, sizeClass });
	}
	return made;
}

/** Splits part of a clutch off into new clutches; the parent keeps the rest (at least one). */
export async function split(
	db: Db,
	actor: Actor,
	code: string,
	input: { parts: readonly SplitPart[]; note: string },
	today: IsoDate
): Promise<ClutchOutcome<{ children: MadeSplitClutch[] }>> {
	return withLockedClutch(db, code, async (trx, row) => {
		const problem = splitProblem(forMove(row));
		if (problem) return refuse(null, problem);
		const change = applySplit(
			countsOf(row),
			input.parts.map((p) => p.count)
		);
		if (!change.ok)
			return change.part === null
				? refuse(null, change.problem)
				: { ...refuse('parts', change.problem), part: change.part };
		const note = input.note.trim() || `Split from ${row.code}.`;
		const saved = await saveClutch(trx, row.id, { count_alive: change.parent.alive });
		const children = await insertSplitClutches(trx, row, input.parts, note, actor, today);
		for (const child of children)
			await addEvent(trx, row.id, actor, {
				kind: 'split_out',
				fromValue: String(row.count_alive),
				toValue: child.code,
				countDelta: -child.count,
				reason: input.note.trim(),
				happenedOn: today
			});
		await audit(trx, actor, 'split', row, {
			aliveBefore: row.count_alive,
			aliveAfter: saved.count_alive,
			children: children.map((c) => ({ code: c.code, count: c.count, sizeClass: c.sizeClass }))
		});
		return { ok: true, clutch: snapshot(saved), children };
	});
}

// ---- bought-in clutches

export interface BoughtInInput {
	speciesId: number;
	foundOn: IsoDate;
	stage: ClutchStage;
	sizeClass: SizeClass;
	count: number;
	generation: number;
	note: string;
}

/** Records young bought from another breeder, through insertClutches like every new clutch. */
export async function recordBoughtIn(
	db: Db,
	actor: Actor,
	input: BoughtInInput,
	today: IsoDate
): Promise<{ ok: true; code: string } | ClutchRefusal> {
	const dateProblem = foundDateProblem(input.foundOn, null, today);
	if (dateProblem) return refuse('foundOn', dateProblem);
	if (!Number.isInteger(input.count) || input.count < 1)
		return refuse('count', 'A clutch holds at least one animal.');
	if (!Number.isInteger(input.generation) || input.generation < 0)
		return refuse('generation', '0 means wild-caught; it cannot be lower.');
	return db.transaction().execute(async (trx) => {
		const species = await trx
			.selectFrom('species')
			.select(['id', 'grow_out_weeks'])
			.where('id', '=', input.speciesId)
			.executeTakeFirst();
		if (!species) return refuse('speciesId', 'That species is not in the catalogue.');
		const [made] = await insertClutches(
			trx,
			{
				speciesId: species.id,
				growOutWeeks: species.grow_out_weeks,
				generation: input.generation,
				foundOn: input.foundOn,
				origin: 'bought_in',
				tubId: null,
				tubCheckId: null,
				parts: [
					{
						count: input.count,
						stage: input.stage,
						sizeClass: input.sizeClass,
						note: input.note.trim()
					}
				]
			},
			actor.userId
		);
		if (!made) throw new Error('insertClutches made no clutch for one part');
		await audit(trx, actor, 'bought_in', made, {
			speciesId: species.id,
			count: input.count,
			generation: input.generation,
			foundOn: input.foundOn,
			saleReadyOn: made.saleReadyOn
		});
		return { ok: true, code: made.code };
	});
}

export async function speciesChoices(
	db: Db
): Promise<{ id: number; commonName: string; scientificName: string; growOutWeeks: number }[]> {
	const rows = await db
		.selectFrom('species')
		.select(['id', 'common_name', 'scientific_name', 'grow_out_weeks'])
		.orderBy('common_name')
		.execute();
	return rows.map((r) => ({
		id: r.id,
		commonName: r.common_name,
		scientificName: r.scientific_name,
		growOutWeeks: r.grow_out_weeks
	}));
}

// ---- the clutch page

export interface HistoryEntry {
	key: string;
	kind: HistoryKind;
	fromValue: string | null;
	toValue: string | null;
	countDelta: number;
	reason: string;
	happenedOn: IsoDate;
	at: Date;
	actorName: string | null;
}

export interface ClutchLineage {
	species: {
		slug: string;
		commonName: string;
		scientificName: string;
		animalGroup: AnimalGroup;
		growOutWeeks: number;
	};
	colony: { code: string; name: string; generation: number } | null;
	tub: { code: string; startedOn: IsoDate } | null;
	/** Clutches this one was split from, oldest first. */
	splitFrom: { code: string }[];
}

export interface ClutchPage {
	clutch: ClutchSnapshot;
	lineage: ClutchLineage;
	history: HistoryEntry[];
	/** Clutches split off this one. */
	children: { code: string; countAlive: number; state: ClutchState }[];
	/** Clutches of the same species a merge could pair with this one (checked again on save). */
	mergeCandidates: {
		code: string;
		countAlive: number;
		state: ClutchState;
		stage: ClutchStage;
		generation: number;
	}[];
	/** Where the animals went, when this clutch was emptied by a merge. */
	mergedInto: { code: string; happenedOn: IsoDate } | null;
	/** The species' own handling cautions, shown beside the forms that mean handling them. */
	speciesCautions: string;
}

const MAX_SPLIT_DEPTH = 20;

export async function getClutchPage(
	db: Db,
	code: string,
	timeZone: string
): Promise<ClutchPage | null> {
	const row = await db.selectFrom('clutch').selectAll().where('code', '=', code).executeTakeFirst();
	if (!row) return null;

	const species = await db
		.selectFrom('species')
		.select([
			'slug',
			'common_name',
			'scientific_name',
			'animal_group',
			'grow_out_weeks',
			'cautions'
		])
		.where('id', '=', row.species_id)
		.executeTakeFirstOrThrow();

	// A split clutch came from its parent's tub: walk up to the first clutch with one.
	const splitFrom: { code: string }[] = [];
	let tubId = row.tub_id;
	let parentId = row.parent_clutch_id;
	for (let depth = 0; parentId !== null && tubId === null && depth < MAX_SPLIT_DEPTH; depth++) {
		const parent = await db
			.selectFrom('clutch')
			.select(['code', 'tub_id', 'parent_clutch_id'])
			.where('id', '=', parentId)
			.executeTakeFirst();
		if (!parent) break;
		splitFrom.unshift({ code: parent.code });
		tubId = parent.tub_id;
		parentId = parent.parent_clutch_id;
	}
	const tub =
		tubId === null
			? undefined
			: await db
					.selectFrom('resting_tub as t')
					.innerJoin('colony as c', 'c.id', 't.colony_id')
					.select(['t.code', 't.started_on', 'c.code as colony_code', 'c.name', 'c.generation'])
					.where('t.id', '=', tubId)
					.executeTakeFirst();

	const events = await db
		.selectFrom('clutch_event as e')
		.leftJoin('User as u', 'u.id', 'e.actor_user_id')
		.select([
			'e.id',
			'e.kind',
			'e.from_value',
			'e.to_value',
			'e.count_delta',
			'e.reason',
			'e.happened_on',
			'e.created_at',
			sql<string | null>`coalesce(u.name, u.email)`.as('actor_name')
		])
		.where('e.clutch_id', '=', row.id)
		.execute();
	const edits = await db
		.selectFrom('audit_log as a')
		.leftJoin('User as u', 'u.id', 'a.actor_user_id')
		.select([
			'a.id',
			'a.action',
			'a.detail',
			'a.created_at',
			sql<string | null>`coalesce(u.name, u.email)`.as('actor_name')
		])
		.where('a.entity', '=', 'clutch')
		.where('a.entity_id', '=', String(row.id))
		.where('a.action', 'in', ['clutch.sale_ready_on', 'clutch.note'])
		.execute();

	const history: HistoryEntry[] = [
		...events.map((e) => ({
			key: `e${e.id}`,
			kind: e.kind,
			fromValue: e.from_value,
			toValue: e.to_value,
			countDelta: e.count_delta,
			reason: e.reason,
			happenedOn: e.happened_on,
			at: e.created_at,
			actorName: e.actor_name
		})),
		...edits.map((a) => {
			const detail = (a.detail ?? {}) as { from?: unknown; to?: unknown; reason?: unknown };
			return {
				key: `a${a.id}`,
				kind: (a.action === 'clutch.note' ? 'note' : 'sale_ready_on') as HistoryKind,
				fromValue: typeof detail.from === 'string' ? detail.from : null,
				toValue: typeof detail.to === 'string' ? detail.to : null,
				countDelta: 0,
				reason: typeof detail.reason === 'string' ? detail.reason : '',
				happenedOn: todayInZone(timeZone, a.created_at),
				at: a.created_at,
				actorName: a.actor_name
			};
		})
	].sort(
		(a, b) =>
			b.happenedOn.localeCompare(a.happenedOn) ||
			b.at.getTime() - a.at.getTime() ||
			b.key.localeCompare(a.key)
	);

	const children = await db
		.selectFrom('clutch')
		.select(['code', 'count_alive', 'state'])
		.where('parent_clutch_id', '=', row.id)
		.orderBy('id')
		.execute();
	const candidates = await db
		.selectFrom('clutch')
		.select(['code', 'count_alive', 'state', 'stage', 'generation'])
		.where('species_id', '=', row.species_id)
		.where('id', '!=', row.id)
		.where('state', 'in', ['growing', 'ready'])
		.where('count_alive', '>', 0)
		.orderBy('code')
		.execute();
	const lastMergeOut = events
		.filter((e) => e.kind === 'merge_out' && e.to_value)
		.sort((a, b) => b.id - a.id)[0];

	return {
		clutch: snapshot(row),
		lineage: {
			species: {
				slug: species.slug,
				commonName: species.common_name,
				scientificName: species.scientific_name,
				animalGroup: species.animal_group,
				growOutWeeks: species.grow_out_weeks
			},
			colony: tub ? { code: tub.colony_code, name: tub.name, generation: tub.generation } : null,
			tub: tub ? { code: tub.code, startedOn: tub.started_on } : null,
			splitFrom
		},
		history,
		children: children.map((c) => ({ code: c.code, countAlive: c.count_alive, state: c.state })),
		mergeCandidates: candidates.map((c) => ({
			code: c.code,
			countAlive: c.count_alive,
			state: c.state,
			stage: c.stage,
			generation: c.generation
		})),
		mergedInto:
			row.count_alive === 0 && lastMergeOut?.to_value
				? { code: lastMergeOut.to_value, happenedOn: lastMergeOut.happened_on }
				: null,
		speciesCautions: species.cautions
	};
}
