// Clutch changes on a real PostgreSQL: each writes its event and audit entry, refusals
// change nothing, merges and splits keep every animal accounted for, and two keepers
// working on one clutch at once never lose an update or take a count below zero.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Actor } from '../../src/lib/server/accounts/users';
import { insertClutches } from '../../src/lib/server/clutches/create';
import {
	backToGrowing,
	changeSizeClass,
	changeStage,
	editNote,
	editSaleReadyOn,
	getClutchPage,
	markReady,
	merge,
	pause,
	recordBoughtIn,
	recordLoss,
	recount,
	split,
	unpause
} from '../../src/lib/server/clutches/clutches';
import { createDb, type Db } from '../../src/lib/server/db/connect';
import type { ClutchState } from '../../src/lib/server/db/schema';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const TODAY = '2026-12-01';
const ZONE = 'America/New_York';

describe('clutches', () => {
	let scratch: ScratchDatabase;
	let db: Db;
	let wren: Actor;
	let teo: Actor;
	let narceusId: number;
	let porcellioId: number;
	let tubId: number;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		db = scratch.db;
		const person = async (name: string, email: string) =>
			(
				await db
					.insertInto('User')
					.values({ name, email })
					.returning('id')
					.executeTakeFirstOrThrow()
			).id;
		wren = { userId: await person('Wren Calloway', 'wren@example.com'), ip: '127.0.0.1' };
		teo = { userId: await person('Teo Marsh', 'teo@example.com'), ip: '127.0.0.2' };
		const species = (slug: string, scientific: string, common: string, weeks: number) =>
			db
				.insertInto('species')
				.values({
					slug,
					scientific_name: scientific,
					common_name: common,
					animal_group: slug.startsWith('narceus') ? 'millipede' : 'isopod',
					temp_low_f: 62,
					temp_ideal_low_f: 70,
					temp_ideal_high_f: 78,
					temp_high_f: 86,
					moisture_level: 'moist',
					adult_length_mm: 100,
					grow_out_weeks: weeks
				})
				.returning('id')
				.executeTakeFirstOrThrow();
		narceusId = (
			await species('narceus-americanus', 'Narceus americanus', 'American giant millipede', 40)
		).id;
		porcellioId = (await species('porcellio-laevis', 'Porcellio laevis', 'Dairy cow isopod', 10))
			.id;
		const colony = await db
			.insertInto('colony')
			.values({
				code: 'NAR-01',
				species_id: narceusId,
				name: 'Big tank',
				enclosure_length_in: '36',
				enclosure_width_in: '18',
				substrate_depth_in: '8',
				generation: 1,
				started_on: '2025-01-10'
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		tubId = (
			await db
				.insertInto('resting_tub')
				.values({
					code: 'NAR-01-T1',
					colony_id: colony.id,
					started_on: '2026-08-01',
					hold_until: '2026-09-26'
				})
				.returning('id')
				.executeTakeFirstOrThrow()
		).id;
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	/** A fresh tub clutch of `count` Narceus, F2, found 2026-09-01. */
	async function tubClutch(count: number, state: ClutchState = 'growing'): Promise<string> {
		const [made] = await insertClutches(
			db,
			{
				speciesId: narceusId,
				growOutWeeks: 40,
				generation: 2,
				foundOn: '2026-09-01',
				origin: 'tub',
				tubId,
				tubCheckId: null,
				parts: [{ count, stage: 'hatchling', sizeClass: 'tiny' }]
			},
			wren.userId
		);
		if (state !== 'growing')
			await db
				.updateTable('clutch')
				.set({ state, paused_reason: state === 'paused' ? 'molting' : null })
				.where('code', '=', made!.code)
				.execute();
		return made!.code;
	}

	const row = (code: string) =>
		db.selectFrom('clutch').selectAll().where('code', '=', code).executeTakeFirstOrThrow();
	const eventsOf = async (code: string) =>
		db
			.selectFrom('clutch_event as e')
			.innerJoin('clutch as c', 'c.id', 'e.clutch_id')
			.select([
				'e.kind',
				'e.from_value',
				'e.to_value',
				'e.count_delta',
				'e.reason',
				'e.actor_user_id'
			])
			.where('c.code', '=', code)
			.orderBy('e.id')
			.execute();
	const auditOf = async (code: string) => {
		const { id } = await row(code);
		return db
			.selectFrom('audit_log')
			.select(['action', 'actor_user_id', 'actor_ip', 'detail'])
			.where('entity', '=', 'clutch')
			.where('entity_id', '=', String(id))
			.orderBy('id')
			.execute();
	};
	/** Everything that a refused change must leave exactly as it was. */
	const footprint = async (code: string) => ({
		row: await row(code),
		events: (await eventsOf(code)).length,
		audit: (await auditOf(code)).length
	});

	describe('counts', () => {
		let code: string;
		beforeEach(async () => {
			code = await tubClutch(20);
		});

		it('records a loss: alive down, lost up, a loss event and an audit entry', async () => {
			const outcome = await recordLoss(
				db,
				teo,
				code,
				{ count: 3, reason: 'Failed molts.', happenedOn: '2026-11-20' },
				TODAY
			);
			expect(outcome.ok).toBe(true);
			const after = await row(code);
			// 20 found, 3 lost → 17 alive: worked by hand.
			expect([after.count_found, after.count_alive, after.count_lost]).toEqual([20, 17, 3]);
			expect(after.version).toBe(1);
			expect((await eventsOf(code)).at(-1)).toMatchObject({
				kind: 'loss',
				from_value: '20',
				to_value: '17',
				count_delta: -3,
				reason: 'Failed molts.',
				actor_user_id: teo.userId
			});
			expect((await auditOf(code)).at(-1)).toMatchObject({
				action: 'clutch.loss',
				actor_user_id: teo.userId,
				actor_ip: '127.0.0.2'
			});
		});

		it('refuses a loss that would take alive below zero, beside the count, changing nothing', async () => {
			const before = await footprint(code);
			const outcome = await recordLoss(
				db,
				teo,
				code,
				{ count: 21, reason: 'Mites.', happenedOn: TODAY },
				TODAY
			);
			expect(outcome).toMatchObject({ ok: false, field: 'count' });
			if (!outcome.ok) expect(outcome.problem).toMatch(/Only 20 animals alive/);
			expect(await footprint(code)).toEqual(before);
		});

		it('refuses a loss dated before the clutch was found or in the future', async () => {
			const before = await footprint(code);
			expect(
				await recordLoss(db, teo, code, { count: 1, reason: 'x', happenedOn: '2026-08-31' }, TODAY)
			).toMatchObject({ ok: false, field: 'happenedOn' });
			expect(
				await recordLoss(db, teo, code, { count: 1, reason: 'x', happenedOn: '2026-12-02' }, TODAY)
			).toMatchObject({ ok: false, field: 'happenedOn' });
			expect(await footprint(code)).toEqual(before);
		});

		it('recounts lower (the missing join the lost) and higher (found grows)', async () => {
			expect(
				(
					await recount(
						db,
						teo,
						code,
						{ countAlive: 16, reason: '', happenedOn: TODAY, version: 0 },
						TODAY
					)
				).ok
			).toBe(true);
			let after = await row(code);
			expect([after.count_found, after.count_alive, after.count_lost]).toEqual([20, 16, 4]);
			expect(
				(
					await recount(
						db,
						teo,
						code,
						{
							countAlive: 19,
							reason: 'Found a second group under the bark.',
							happenedOn: TODAY,
							version: 1
						},
						TODAY
					)
				).ok
			).toBe(true);
			after = await row(code);
			// 16 → 19: three missed at the first count join found (20 → 23).
			expect([after.count_found, after.count_alive, after.count_lost]).toEqual([23, 19, 4]);
			const events = await eventsOf(code);
			expect(events.slice(-2)).toMatchObject([
				{ kind: 'count', from_value: '20', to_value: '16', count_delta: -4, reason: '' },
				{ kind: 'count', from_value: '16', to_value: '19', count_delta: 3 }
			]);
			expect((await auditOf(code)).map((a) => a.action)).toEqual([
				'clutch.recount',
				'clutch.recount'
			]);
		});

		it('refuses a recount made against an old version, with the count now and nothing changed', async () => {
			await recordLoss(
				db,
				wren,
				code,
				{ count: 2, reason: 'Dried out.', happenedOn: TODAY },
				TODAY
			);
			const before = await footprint(code);
			const outcome = await recount(
				db,
				teo,
				code,
				{ countAlive: 15, reason: '', happenedOn: TODAY, version: 0 },
				TODAY
			);
			expect(outcome).toMatchObject({ ok: false, field: 'countAlive' });
			if (!outcome.ok) {
				expect(outcome.problem).toMatch(/changed by someone else since you opened it/i);
				expect(outcome.problem).toMatch(/18 alive/);
				expect(outcome.current?.counts).toEqual({ found: 20, alive: 18, lost: 2 });
				expect(outcome.current?.version).toBe(1);
			}
			expect(await footprint(code)).toEqual(before);
		});

		it('refuses a negative recount with nothing changed', async () => {
			const before = await footprint(code);
			expect(
				await recount(
					db,
					teo,
					code,
					{ countAlive: -1, reason: '', happenedOn: TODAY, version: 0 },
					TODAY
				)
			).toMatchObject({ ok: false, field: 'countAlive' });
			expect(await footprint(code)).toEqual(before);
		});
	});

	describe('stage, size class, dates and note', () => {
		it('changes stage and size class with their events; a stale version is refused', async () => {
			const code = await tubClutch(12);
			expect((await changeStage(db, teo, code, { stage: 'juvenile', version: 0 }, TODAY)).ok).toBe(
				true
			);
			expect(
				(await changeSizeClass(db, teo, code, { sizeClass: 'small', version: 1 }, TODAY)).ok
			).toBe(true);
			const before = await footprint(code);
			expect(
				await changeStage(db, wren, code, { stage: 'adult', version: 1 }, TODAY)
			).toMatchObject({
				ok: false,
				field: 'stage'
			});
			expect(await footprint(code)).toEqual(before);
			expect(before.row).toMatchObject({ stage: 'juvenile', size_class: 'small', version: 2 });
			expect((await eventsOf(code)).slice(-2)).toMatchObject([
				{ kind: 'stage', from_value: 'hatchling', to_value: 'juvenile' },
				{ kind: 'size_class', from_value: 'tiny', to_value: 'small' }
			]);
			expect((await auditOf(code)).map((a) => a.action)).toEqual([
				'clutch.stage',
				'clutch.size_class'
			]);
		});

		it('moves the sale-ready date with a reason and edits the note; both show in the history', async () => {
			const code = await tubClutch(12);
			expect(
				await editSaleReadyOn(db, teo, code, {
					saleReadyOn: '2026-08-31',
					reason: 'typo',
					version: 0
				})
			).toMatchObject({ ok: false, field: 'saleReadyOn' });
			expect(
				(
					await editSaleReadyOn(db, teo, code, {
						saleReadyOn: '2027-07-01',
						reason: 'Growing slowly in the cool room.',
						version: 0
					})
				).ok
			).toBe(true);
			expect(
				(await editNote(db, wren, code, { note: 'Keep on the top shelf.', version: 1 })).ok
			).toBe(true);
			const after = await row(code);
			expect(after).toMatchObject({ sale_ready_on: '2027-07-01', note: 'Keep on the top shelf.' });
			const page = await getClutchPage(db, code, ZONE);
			const kinds = page!.history.map((h) => h.kind);
			expect(kinds).toContain('sale_ready_on');
			expect(kinds).toContain('note');
			const moved = page!.history.find((h) => h.kind === 'sale_ready_on')!;
			expect(moved).toMatchObject({
				toValue: '2027-07-01',
				reason: 'Growing slowly in the cool room.',
				actorName: 'Teo Marsh'
			});
		});
	});

	describe('state moves', () => {
		it('marks ready, pauses and unpauses back to ready, and goes back to growing', async () => {
			const code = await tubClutch(12);
			expect((await markReady(db, teo, code, { note: '' }, TODAY)).ok).toBe(true);
			expect(
				(
					await pause(
						db,
						teo,
						code,
						{ pausedReason: 'molting', note: 'Three in molt chambers.' },
						TODAY
					)
				).ok
			).toBe(true);
			expect(await row(code)).toMatchObject({ state: 'paused', paused_reason: 'molting' });
			// Counting molting animals means digging them up.
			expect(
				await recount(
					db,
					teo,
					code,
					{ countAlive: 11, reason: '', happenedOn: TODAY, version: (await row(code)).version },
					TODAY
				)
			).toMatchObject({ ok: false, field: 'countAlive' });
			expect(await markReady(db, teo, code, { note: '' }, TODAY)).toMatchObject({ ok: false });
			expect((await unpause(db, teo, code, { note: 'All out and hard.' }, TODAY)).ok).toBe(true);
			expect(await row(code)).toMatchObject({ state: 'ready', paused_reason: null });
			expect(await backToGrowing(db, teo, code, { note: '' }, TODAY)).toMatchObject({
				ok: false,
				field: 'note'
			});
			expect(
				(await backToGrowing(db, teo, code, { note: 'Smaller than they looked.' }, TODAY)).ok
			).toBe(true);
			expect(await row(code)).toMatchObject({ state: 'growing' });
			expect((await eventsOf(code)).slice(1)).toMatchObject([
				{ kind: 'state', from_value: 'growing', to_value: 'ready' },
				{
					kind: 'pause',
					from_value: 'ready',
					to_value: 'molting',
					reason: 'Three in molt chambers.'
				},
				{ kind: 'unpause', from_value: 'molting', to_value: 'ready' },
				{ kind: 'state', from_value: 'ready', to_value: 'growing' }
			]);
			expect((await auditOf(code)).map((a) => a.action)).toEqual([
				'clutch.ready',
				'clutch.pause',
				'clutch.unpause',
				'clutch.back_to_growing'
			]);
		});

		it('never lets a keeper mark a listed clutch ready or send it back to growing', async () => {
			const code = await tubClutch(5, 'listed');
			const before = await footprint(code);
			expect(await markReady(db, teo, code, { note: '' }, TODAY)).toMatchObject({ ok: false });
			expect(await backToGrowing(db, teo, code, { note: 'x' }, TODAY)).toMatchObject({ ok: false });
			expect(await footprint(code)).toEqual(before);
		});
	});

	describe('merge', () => {
		it('moves every live animal into the survivor and closes the other; alive stays whole', async () => {
			const into = await tubClutch(20);
			const from = await tubClutch(12);
			await recordLoss(
				db,
				teo,
				from,
				{ count: 2, reason: 'Failed molt.', happenedOn: TODAY },
				TODAY
			);
			const aliveBefore = (await row(into)).count_alive + (await row(from)).count_alive;
			const outcome = await merge(db, teo, { intoCode: into, fromCode: from }, TODAY);
			expect(outcome.ok).toBe(true);
			const survivor = await row(into);
			const source = await row(from);
			expect(survivor.count_alive + source.count_alive).toBe(aliveBefore);
			// 20 + 10 moved: found and alive both 30; the source keeps found 12 and lost 2.
			expect([survivor.count_found, survivor.count_alive, survivor.count_lost]).toEqual([
				30, 30, 0
			]);
			expect([source.count_found, source.count_alive, source.count_lost]).toEqual([12, 0, 2]);
			expect(source.state).toBe('sold_out');
			expect((await eventsOf(into)).at(-1)).toMatchObject({
				kind: 'merge_in',
				from_value: from,
				count_delta: 10
			});
			expect((await eventsOf(from)).slice(-2)).toMatchObject([
				{ kind: 'merge_out', to_value: into, count_delta: -10 },
				{ kind: 'state', from_value: 'growing', to_value: 'sold_out' }
			]);
			expect((await auditOf(into)).at(-1)?.action).toBe('clutch.merge_in');
			expect((await auditOf(from)).at(-1)?.action).toBe('clutch.merge_out');
			expect((await getClutchPage(db, from, ZONE))!.mergedInto?.code).toBe(into);
		});

		it('refuses itself, another species, a paused and a listed clutch, changing nothing', async () => {
			const into = await tubClutch(8);
			const paused = await tubClutch(6, 'paused');
			const listed = await tubClutch(6, 'listed');
			const [isopods] = await insertClutches(
				db,
				{
					speciesId: porcellioId,
					growOutWeeks: 10,
					generation: 2,
					foundOn: '2026-09-01',
					origin: 'bought_in',
					tubId: null,
					tubCheckId: null,
					parts: [{ count: 30, stage: 'juvenile', sizeClass: 'small' }]
				},
				wren.userId
			);
			const before = await footprint(into);
			const tries: [string, RegExp][] = [
				[into, /itself/],
				[isopods!.code, /another species/],
				[paused, /paused.*kill/],
				[listed, /listed.*shop/]
			];
			for (const [fromCode, why] of tries) {
				const outcome = await merge(db, teo, { intoCode: into, fromCode }, TODAY);
				expect(outcome).toMatchObject({ ok: false, field: 'otherCode' });
				if (!outcome.ok) expect(outcome.problem).toMatch(why);
			}
			expect(await footprint(into)).toEqual(before);
			expect((await row(paused)).count_alive).toBe(6);
		});
	});

	describe('split', () => {
		it('makes new clutches from the parent; alive stays whole and lineage reaches the tub', async () => {
			const parent = await tubClutch(30);
			const outcome = await split(
				db,
				teo,
				parent,
				{
					parts: [
						{ count: 10, sizeClass: 'small' },
						{ count: 8, sizeClass: null }
					],
					note: ''
				},
				TODAY
			);
			expect(outcome.ok).toBe(true);
			if (!outcome.ok) return;
			const parentRow = await row(parent);
			const childRows = await Promise.all(outcome.children.map((c) => row(c.code)));
			expect(parentRow.count_alive + childRows.reduce((s, c) => s + c.count_alive, 0)).toBe(30);
			expect(parentRow.count_alive).toBe(12);
			for (const child of childRows) {
				expect(child).toMatchObject({
					origin: 'split',
					parent_clutch_id: parentRow.id,
					species_id: narceusId,
					generation: 2,
					found_on: parentRow.found_on,
					sale_ready_on: parentRow.sale_ready_on,
					tub_id: null
				});
				expect(child.count_alive + child.count_lost).toBeLessThanOrEqual(child.count_found);
			}
			expect(childRows.map((c) => c.size_class)).toEqual(['small', 'tiny']);
			expect((await eventsOf(parent)).slice(-2)).toMatchObject([
				{ kind: 'split_out', to_value: childRows[0]!.code, count_delta: -10 },
				{ kind: 'split_out', to_value: childRows[1]!.code, count_delta: -8 }
			]);
			expect(await eventsOf(childRows[0]!.code)).toMatchObject([
				{ kind: 'split_in', from_value: parent, count_delta: 10 }
			]);
			expect((await auditOf(parent)).at(-1)?.action).toBe('clutch.split');

			const page = await getClutchPage(db, childRows[0]!.code, ZONE);
			expect(page!.lineage).toMatchObject({
				species: { slug: 'narceus-americanus' },
				colony: { code: 'NAR-01', generation: 1 },
				tub: { code: 'NAR-01-T1' },
				splitFrom: [{ code: parent }]
			});
		});

		it('refuses taking every animal out, or splitting a paused clutch, changing nothing', async () => {
			const parent = await tubClutch(10);
			const paused = await tubClutch(10, 'paused');
			const before = await footprint(parent);
			expect(
				await split(
					db,
					teo,
					parent,
					{
						parts: [
							{ count: 6, sizeClass: null },
							{ count: 4, sizeClass: null }
						],
						note: ''
					},
					TODAY
				)
			).toMatchObject({ ok: false, field: 'parts', part: 1 });
			expect(await footprint(parent)).toEqual(before);
			expect(
				await split(db, teo, paused, { parts: [{ count: 2, sizeClass: null }], note: '' }, TODAY)
			).toMatchObject({ ok: false });
			expect(
				await db
					.selectFrom('clutch')
					.select('id')
					.where('origin', '=', 'split')
					.where('parent_clutch_id', 'in', [before.row.id, (await row(paused)).id])
					.execute()
			).toEqual([]);
		});
	});

	describe('two keepers at once', () => {
		// A pool with room for every call at once, so they really contend for the row lock.
		let wide: Db;
		beforeAll(() => {
			wide = createDb(scratch.url, 25);
		});
		afterAll(async () => {
			await wide?.destroy();
		});

		it('applies concurrent losses one by one and never goes below zero', async () => {
			const code = await tubClutch(10);
			const outcomes = await Promise.all(
				Array.from({ length: 20 }, (_, i) =>
					recordLoss(
						wide,
						i % 2 ? teo : wren,
						code,
						{ count: 1, reason: `Loss ${i + 1}`, happenedOn: TODAY },
						TODAY
					)
				)
			);
			expect(outcomes.filter((o) => o.ok)).toHaveLength(10);
			const refused = outcomes.filter((o) => !o.ok);
			expect(refused).toHaveLength(10);
			for (const o of refused) expect(o).toMatchObject({ field: 'count' });
			const after = await row(code);
			expect([after.count_found, after.count_alive, after.count_lost]).toEqual([10, 0, 10]);
			expect(after.version).toBe(10);
			expect((await eventsOf(code)).filter((e) => e.kind === 'loss')).toHaveLength(10);
			expect((await auditOf(code)).filter((a) => a.action === 'clutch.loss')).toHaveLength(10);
		});

		it('lets only one of two recounts made from the same page through', async () => {
			const code = await tubClutch(10);
			const outcomes = await Promise.all(
				[9, 12].map((countAlive, i) =>
					recount(
						wide,
						i ? teo : wren,
						code,
						{ countAlive, reason: '', happenedOn: TODAY, version: 0 },
						TODAY
					)
				)
			);
			expect(outcomes.filter((o) => o.ok)).toHaveLength(1);
			const loser = outcomes.find((o) => !o.ok);
			expect(loser?.ok === false && loser.problem).toMatch(/changed by someone else/i);
			expect((await row(code)).version).toBe(1);
		});

		it('keeps every animal accounted for when losses race a merge and a split', async () => {
			const into = await tubClutch(15);
			const from = await tubClutch(15);
			const total = async () =>
				(await row(into)).count_alive +
				(await row(from)).count_alive +
				(
					await db
						.selectFrom('clutch')
						.select((eb) => eb.fn.coalesce(eb.fn.sum<number>('count_alive'), eb.lit(0)).as('alive'))
						.where('parent_clutch_id', 'in', [(await row(into)).id, (await row(from)).id])
						.executeTakeFirstOrThrow()
				).alive;
			const before = await total();
			const losses = Array.from({ length: 6 }, (_, i) =>
				recordLoss(
					wide,
					teo,
					i % 2 ? into : from,
					{ count: 1, reason: 'Race', happenedOn: TODAY },
					TODAY
				)
			);
			const moves = [
				split(wide, wren, into, { parts: [{ count: 3, sizeClass: null }], note: '' }, TODAY),
				merge(wide, wren, { intoCode: into, fromCode: from }, TODAY)
			];
			const outcomes = await Promise.all([...losses, ...moves]);
			const lostNow = outcomes.slice(0, 6).filter((o) => o.ok).length;
			expect(Number(await total())).toBe(before - lostNow);
			for (const code of [into, from]) {
				const r = await row(code);
				expect(r.count_alive).toBeGreaterThanOrEqual(0);
				expect(r.count_alive + r.count_lost).toBeLessThanOrEqual(r.count_found);
			}
		});
	});

	describe('bought in and the page', () => {
		it('records a bought-in clutch through insertClutches, with its found event and audit', async () => {
			const outcome = await recordBoughtIn(
				db,
				wren,
				{
					speciesId: porcellioId,
					foundOn: '2026-11-15',
					stage: 'juvenile',
					sizeClass: 'small',
					count: 25,
					generation: 1,
					note: 'From a breeder two states over.'
				},
				TODAY
			);
			expect(outcome.ok).toBe(true);
			if (!outcome.ok) return;
			const made = await row(outcome.code);
			// Found 2026-11-15 + 10 grow-out weeks = 2027-01-24, counted on a paper calendar.
			expect(made).toMatchObject({
				origin: 'bought_in',
				tub_id: null,
				generation: 1,
				count_found: 25,
				count_alive: 25,
				sale_ready_on: '2027-01-24'
			});
			expect(await eventsOf(outcome.code)).toMatchObject([{ kind: 'found', count_delta: 25 }]);
			expect((await auditOf(outcome.code)).map((a) => a.action)).toEqual(['clutch.bought_in']);
			const page = await getClutchPage(db, outcome.code, ZONE);
			expect(page!.lineage).toMatchObject({ colony: null, tub: null, splitFrom: [] });
			expect(page!.history[0]).toMatchObject({ kind: 'found', actorName: 'Wren Calloway' });
		});

		it('refuses a bought-in clutch found in the future or of an unknown species', async () => {
			const input = {
				speciesId: porcellioId,
				foundOn: '2026-12-02',
				stage: 'juvenile' as const,
				sizeClass: 'small' as const,
				count: 5,
				generation: 1,
				note: ''
			};
			expect(await recordBoughtIn(db, wren, input, TODAY)).toMatchObject({
				ok: false,
				field: 'foundOn'
			});
			expect(
				await recordBoughtIn(db, wren, { ...input, foundOn: TODAY, speciesId: 999_999 }, TODAY)
			).toMatchObject({ ok: false, field: 'speciesId' });
		});

		it('returns null for an unknown code, and shows history newest first with names', async () => {
			expect(await getClutchPage(db, 'NAR-C999', ZONE)).toBeNull();
			const code = await tubClutch(9);
			await recordLoss(
				db,
				teo,
				code,
				{ count: 1, reason: 'Found dead.', happenedOn: '2026-11-02' },
				TODAY
			);
			await changeStage(db, wren, code, { stage: 'juvenile', version: 1 }, TODAY);
			const page = await getClutchPage(db, code, ZONE);
			expect(page!.history.map((h) => [h.kind, h.actorName])).toEqual([
				['stage', 'Wren Calloway'],
				['loss', 'Teo Marsh'],
				['found', 'Wren Calloway']
			]);
			expect(page!.clutch.counts).toEqual({ found: 9, alive: 8, lost: 1 });
			expect(page!.lineage.colony?.code).toBe('NAR-01');
		});
	});
});
