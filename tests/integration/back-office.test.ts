// Colonies, the care log and resting tubs on the real database: a refresh sets a tub
// aside, a check turns young into clutches in one transaction, and the due list moves.
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { careEntrySchema, tubCheckSchema } from '../../src/lib/care/forms';
import { addDays } from '../../src/lib/format/dates';
import { loadDueToday } from '../../src/lib/server/care/due-today';
import { deleteCareEntry, logCareEntry, updateCareEntry } from '../../src/lib/server/care/care-log';
import { createColony, findColonyPage } from '../../src/lib/server/colonies/colonies';
import { closeTub, recordTubCheck } from '../../src/lib/server/tubs/tubs';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const TODAY = '2026-12-01';

describe('back office on PostgreSQL', () => {
	let scratch: ScratchDatabase;
	let actor: { userId: string; ip: string };

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: TODAY });
		const teo = await scratch.db
			.selectFrom('User')
			.select('id')
			.where('email', '=', 'teo@mossback.example.com')
			.executeTakeFirstOrThrow();
		actor = { userId: teo.id, ip: '127.0.0.1' };
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	async function newColony(name: string) {
		const species = await scratch.db
			.selectFrom('species')
			.select(['id', 'tub_hold_days', 'grow_out_weeks'])
			.where('slug', '=', 'narceus-americanus')
			.executeTakeFirstOrThrow();
		const made = await createColony(
			scratch.db,
			actor,
			{
				speciesId: species.id,
				name,
				lengthIn: 24,
				widthIn: 16,
				depthIn: 6,
				foundersCount: 6,
				foundersNote: '',
				generation: 1,
				startedOn: '2026-06-01',
				notes: ''
			},
			TODAY
		);
		if (!made.ok) throw new Error(made.problem);
		return { ...made.value, species };
	}

	const entry = (over: Record<string, unknown>) =>
		careEntrySchema.parse({ loggedOn: TODAY, note: '', ...over });

	/** A new colony with a half refresh logged on `loggedOn`, its substrate set aside. */
	async function refreshedColony(name: string, loggedOn: string) {
		const colony = await newColony(name);
		const logged = await logCareEntry(
			scratch.db,
			actor,
			colony.id,
			entry({ kind: 'substrate_refresh_half', loggedOn }),
			TODAY
		);
		if (!logged.ok) throw new Error(logged.problem);
		return { colony, logged };
	}

	it('gives a new colony the next code of its species', async () => {
		const colony = await newColony('Test bin one');
		// The demo has NAR-01 and NAR-02.
		expect(colony.code).toBe('NAR-03');
	});

	it('sets the substrate of a half refresh aside with the species hold, in one step', async () => {
		const colony = await newColony('Test bin two');
		const logged = await logCareEntry(
			scratch.db,
			actor,
			colony.id,
			entry({ kind: 'substrate_refresh_half' }),
			TODAY
		);
		if (!logged.ok) throw new Error(logged.problem);
		const tub = logged.value.tub!;
		expect(tub.code).toBe(`${colony.code}-T1`);
		expect(tub.holdUntil).toBe(addDays(TODAY, colony.species.tub_hold_days));
		const row = await scratch.db
			.selectFrom('resting_tub')
			.selectAll()
			.where('id', '=', tub.id)
			.executeTakeFirstOrThrow();
		expect(row).toMatchObject({ state: 'resting', source_entry_id: logged.value.entryId });
		const audit = await scratch.db
			.selectFrom('audit_log')
			.select('action')
			.where('entity', '=', 'care_log_entry')
			.where('entity_id', '=', String(logged.value.entryId))
			.execute();
		expect(audit.map((a) => a.action)).toEqual(['care.log']);

		// A second refresh draws the next tub number.
		const again = await logCareEntry(
			scratch.db,
			actor,
			colony.id,
			entry({ kind: 'substrate_refresh_full', holdUntil: '2027-01-20' }),
			TODAY
		);
		expect(again.ok && again.value.tub).toMatchObject({
			code: `${colony.code}-T2`,
			holdUntil: '2027-01-20'
		});
	});

	it('keeps no tub when the keeper unticks the offer', async () => {
		const colony = await newColony('Test bin three');
		const logged = await logCareEntry(
			scratch.db,
			actor,
			colony.id,
			entry({ kind: 'substrate_refresh_half', saveTub: false }),
			TODAY
		);
		expect(logged.ok && logged.value.tub).toBeNull();
	});

	it('refuses a hold-until before the tub date and a care date still to come', async () => {
		const parsed = careEntrySchema.safeParse({
			kind: 'substrate_refresh_half',
			loggedOn: TODAY,
			holdUntil: '2026-11-30'
		});
		expect(parsed.success).toBe(false);
		expect(parsed.error?.issues[0]?.path).toEqual(['holdUntil']);
		const colony = await newColony('Test bin four');
		const future = await logCareEntry(
			scratch.db,
			actor,
			colony.id,
			entry({ kind: 'leaf_top_up', loggedOn: '2026-12-05' }),
			TODAY
		);
		expect(future).toMatchObject({ ok: false, field: 'loggedOn' });
	});

	it('hands out distinct tub codes to refreshes logged at the same moment', async () => {
		const colony = await newColony('Test bin five');
		const results = await Promise.all(
			Array.from({ length: 6 }, () =>
				logCareEntry(scratch.db, actor, colony.id, entry({ kind: 'substrate_refresh_half' }), TODAY)
			)
		);
		const codes = results.map((r) => (r.ok ? r.value.tub?.code : r.problem));
		expect(new Set(codes).size).toBe(6);
	});

	it('turns 14 young into a clutch of the next generation in the same transaction as the check', async () => {
		const { colony, logged } = await refreshedColony('Test bin six', '2026-11-01');
		const checked = await recordTubCheck(
			scratch.db,
			actor,
			logged.value.tub!.id,
			tubCheckSchema.parse({ checkedOn: TODAY, youngFound: 14, eggsSeen: true }),
			TODAY
		);
		if (!checked.ok) throw new Error(checked.problem);
		expect(checked.value.state).toBe('yielded');
		const [made] = checked.value.clutches;
		const clutch = await scratch.db
			.selectFrom('clutch')
			.selectAll()
			.where('id', '=', made!.id)
			.executeTakeFirstOrThrow();
		expect(clutch).toMatchObject({
			count_found: 14,
			count_alive: 14,
			// PRODUCT.md: "A tub yields the generation of its colony plus one" (colony is F1).
			generation: 2,
			origin: 'tub',
			tub_check_id: checked.value.checkId,
			sale_ready_on: addDays(TODAY, colony.species.grow_out_weeks * 7)
		});
		const tub = await scratch.db
			.selectFrom('resting_tub')
			.select(['state', 'closed_on'])
			.where('id', '=', logged.value.tub!.id)
			.executeTakeFirstOrThrow();
		expect(tub).toEqual({ state: 'yielded', closed_on: TODAY });
	});

	it('splits the young into several clutches when asked, and refuses counts that do not add up', async () => {
		const { logged } = await refreshedColony('Test bin seven', '2026-11-01');
		const bad = tubCheckSchema.safeParse({
			checkedOn: TODAY,
			youngFound: 10,
			partCount: [4, 4],
			partStage: ['hatchling', 'juvenile'],
			partSize: ['tiny', 'small']
		});
		expect(bad.success).toBe(false);
		const checked = await recordTubCheck(
			scratch.db,
			actor,
			logged.value.tub!.id,
			tubCheckSchema.parse({
				checkedOn: TODAY,
				youngFound: 10,
				partCount: [6, 4],
				partStage: ['hatchling', 'juvenile'],
				partSize: ['tiny', 'small'],
				keepResting: true
			}),
			TODAY
		);
		if (!checked.ok) throw new Error(checked.problem);
		expect(checked.value.clutches.map((c) => c.count)).toEqual([6, 4]);
		expect(checked.value.state).toBe('resting');
		// Closing a tub that gave young makes it yielded, even before its hold is over.
		const closed = await closeTub(scratch.db, actor, logged.value.tub!.id, TODAY, '', TODAY);
		expect(closed).toEqual({ ok: true, value: { state: 'yielded' } });
	});

	it('leaves neither check nor clutch behind when making the clutch fails', async () => {
		const { logged } = await refreshedColony('Test bin eight', '2026-11-01');
		const tubId = logged.value.tub!.id;
		// A trigger that refuses this tub's clutches stands in for any failure mid-step.
		await sql
			.raw(
				`create function refuse_clutch() returns trigger language plpgsql as $$
				begin if new.tub_id = ${tubId} then raise exception 'refused for the test'; end if; return new; end $$;
				create trigger refuse_clutch before insert on clutch for each row execute function refuse_clutch();`
			)
			.execute(scratch.db);
		try {
			await expect(
				recordTubCheck(
					scratch.db,
					actor,
					tubId,
					tubCheckSchema.parse({ checkedOn: TODAY, youngFound: 5 }),
					TODAY
				)
			).rejects.toThrow(/refused for the test/);
		} finally {
			await sql
				.raw('drop trigger refuse_clutch on clutch; drop function refuse_clutch();')
				.execute(scratch.db);
		}
		const checks = await scratch.db
			.selectFrom('tub_check')
			.select('id')
			.where('tub_id', '=', tubId)
			.execute();
		const tub = await scratch.db
			.selectFrom('resting_tub')
			.select('state')
			.where('id', '=', tubId)
			.executeTakeFirstOrThrow();
		expect(checks).toEqual([]);
		expect(tub.state).toBe('resting');
	});

	it('refuses young found before the tub was set aside, and clears an empty tub only after its hold', async () => {
		const { logged } = await refreshedColony('Test bin nine', '2026-11-20');
		const tubId = logged.value.tub!.id;
		const early = await recordTubCheck(
			scratch.db,
			actor,
			tubId,
			tubCheckSchema.parse({ checkedOn: '2026-11-19', youngFound: 3 }),
			TODAY
		);
		expect(early).toMatchObject({ ok: false, field: 'checkedOn' });
		const tooSoon = await closeTub(scratch.db, actor, tubId, TODAY, '', TODAY);
		expect(tooSoon).toMatchObject({ ok: false, field: 'closedOn' });
		const holdEnd = logged.value.tub!.holdUntil;
		const cleared = await closeTub(scratch.db, actor, tubId, holdEnd, 'nothing', holdEnd);
		expect(cleared).toEqual({ ok: true, value: { state: 'cleared' } });
	});

	it('edits and deletes care entries with an audit entry for each', async () => {
		const colony = await newColony('Test bin ten');
		const logged = await logCareEntry(
			scratch.db,
			actor,
			colony.id,
			entry({ kind: 'moisture_check', moistureReading: 'dry' }),
			TODAY
		);
		if (!logged.ok) throw new Error(logged.problem);
		const id = logged.value.entryId;
		const edited = await updateCareEntry(
			scratch.db,
			actor,
			id,
			entry({ kind: 'moisture_check', moistureReading: 'right', note: 'misted' }),
			TODAY
		);
		expect(edited.ok).toBe(true);
		expect(await deleteCareEntry(scratch.db, actor, id)).toEqual({ ok: true, value: null });
		const audit = await scratch.db
			.selectFrom('audit_log')
			.select(['action', 'detail'])
			.where('entity', '=', 'care_log_entry')
			.where('entity_id', '=', String(id))
			.orderBy('id')
			.execute();
		expect(audit.map((a) => a.action)).toEqual(['care.log', 'care.edit', 'care.delete']);
		expect(JSON.stringify(audit[2]?.detail)).toContain('misted');
	});

	it('moves the due list: a refresh and a moisture check clear the colony, its tub comes due a week on', async () => {
		const colony = await newColony('Test bin eleven');
		// Started 2026-06-01 with a 4-month interval and never checked: both are due.
		let due = await loadDueToday(scratch.db, TODAY);
		expect(due.refresh.map((item) => item.colonyCode)).toContain(colony.code);
		expect(due.moisture.map((item) => item.colonyCode)).toContain(colony.code);
		const refresh = await logCareEntry(
			scratch.db,
			actor,
			colony.id,
			entry({ kind: 'substrate_refresh_half' }),
			TODAY
		);
		await logCareEntry(
			scratch.db,
			actor,
			colony.id,
			entry({ kind: 'moisture_check', moistureReading: 'right' }),
			TODAY
		);
		due = await loadDueToday(scratch.db, TODAY);
		expect(due.refresh.map((item) => item.colonyCode)).not.toContain(colony.code);
		expect(due.moisture.map((item) => item.colonyCode)).not.toContain(colony.code);
		const tubCode = refresh.ok ? refresh.value.tub!.code : '';
		expect(due.tubs.map((item) => item.tubCode)).not.toContain(tubCode);
		const weekOn = await loadDueToday(scratch.db, addDays(TODAY, 7));
		expect(weekOn.tubs.find((item) => item.tubCode === tubCode)?.kind).toBe('tub_check');
		const page = await findColonyPage(scratch.db, colony.code, TODAY);
		expect(page?.schedule.refreshDueOn).toBe(addDays(TODAY, 120));
	});
});
