// The back-office tables on a scratch database of a few hundred rows: every page walked
// in every sort and direction (nothing missed, nothing twice, same order as one plain
// query), filters, the CSV of a view, and the JSON routes over HTTP.
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
	TABLE_NAMES,
	csvColumns,
	parseTableView,
	sortKeysOf,
	type RowOf,
	type SortDirection,
	type TableName,
	type TablePage,
	type TableView
} from '../../src/lib/backoffice/tables';
import { todayInZone } from '../../src/lib/format/dates';
import { createSession } from '../../src/lib/server/auth/sessions';
import { DEFAULT_SHOP_TIME_ZONE } from '../../src/lib/server/backoffice/settings';
import { listTablePage, tableCsv } from '../../src/lib/server/backoffice/tables';
import type { Db } from '../../src/lib/server/db/connect';
import type {
	CareEntryKind,
	ClutchStage,
	ClutchState,
	SizeClass,
	TubState
} from '../../src/lib/server/db/schema';
import { startApp, type RunningApp } from './support/app';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const COLONIES = 14;
const CARE_ENTRIES = 320;
const TUBS = 70;
const CLUTCHES = 160;

const FORMULA_NAME = '=HYPERLINK("http://x.test","open")';
const FORMULA_KEEPER = "@cmd|' /C calc'!A0";
const FORMULA_NOTES = ['=1+1', '+fresh leaves', '-2 found dead', '@front shelf'];

function addDays(isoDate: string, days: number): string {
	const date = new Date(`${isoDate}T00:00:00Z`);
	date.setUTCDate(date.getUTCDate() + days);
	return date.toISOString().slice(0, 10);
}

/** A few hundred rows with many ties in every sort column, and nulls where columns allow. */
async function plantLedger(db: Db): Promise<{ keeperId: string; customerId: string }> {
	const species = await db
		.insertInto('species')
		.values(
			[
				['narceus-americanus', 'Narceus americanus', 'American giant millipede', 'millipede'],
				['porcellio-laevis', 'Porcellio laevis', 'Smooth slater', 'isopod'],
				['folsomia-candida', 'Folsomia candida', 'White springtail', 'springtail']
			].map(([slug, scientific, common, group]) => ({
				slug: slug!,
				scientific_name: scientific!,
				common_name: common!,
				animal_group: group as 'millipede' | 'isopod' | 'springtail',
				temp_low_f: 62,
				temp_ideal_low_f: 70,
				temp_ideal_high_f: 77,
				temp_high_f: 86,
				moisture_level: 'moist' as const,
				adult_length_mm: 40,
				grow_out_weeks: 20
			}))
		)
		.returning(['id', 'slug'])
		.execute();
	const prefixes = ['NAR', 'PLA', 'FOL'];

	const [keeper, customer] = await db
		.insertInto('User')
		.values([
			{ name: FORMULA_KEEPER, email: 'keeper.tables@example.com' },
			{ name: 'Customer Tables', email: 'customer.tables@example.com' }
		])
		.returning('id')
		.execute();
	await db
		.insertInto('user_role')
		.values([
			{ user_id: keeper!.id, role: 'keeper' },
			{ user_id: customer!.id, role: 'customer' }
		])
		.execute();

	const names = ['Shelf tub', 'North shelf', '100% leaf litter', 'back_row', FORMULA_NAME];
	const colonies = await db
		.insertInto('colony')
		.values(
			Array.from({ length: COLONIES }, (_, i) => {
				const startedOn = addDays('2025-01-01', (i % 5) * 30);
				return {
					code: `${prefixes[i % 3]}-${String(Math.floor(i / 3) + 1).padStart(2, '0')}`,
					species_id: species[i % 3]!.id,
					name: names[i % names.length]!,
					enclosure_length_in: '18.0',
					enclosure_width_in: '12.0',
					substrate_depth_in: '6.0',
					generation: i % 4,
					started_on: startedOn,
					retired_on: i % 3 === 1 ? addDays(startedOn, 200 + (i % 2) * 10) : null
				};
			})
		)
		.returning(['id', 'code', 'species_id'])
		.execute();

	const kinds: CareEntryKind[] = [
		'substrate_refresh_half',
		'substrate_refresh_full',
		'leaf_top_up',
		'moisture_check',
		'protein',
		'calcium',
		'molt_seen',
		'census',
		'pest_note'
	];
	await db
		.insertInto('care_log_entry')
		.values(
			Array.from({ length: CARE_ENTRIES }, (_, i) => {
				const kind = kinds[i % kinds.length]!;
				return {
					colony_id: colonies[(i * 5) % COLONIES]!.id,
					kind,
					logged_on: addDays('2026-01-01', i % 45),
					moisture_reading:
						kind === 'moisture_check' ? (['dry', 'right', 'wet'] as const)[i % 3] : null,
					census_count: kind === 'census' ? 20 + (i % 30) : null,
					note:
						i % 10 === 0
							? FORMULA_NOTES[(i / 10) % FORMULA_NOTES.length]!
							: i % 13 === 0
								? 'Misted, "lightly", then\nclosed the lid'
								: '',
					created_by: i % 4 === 0 ? null : keeper!.id
				};
			})
		)
		.execute();

	const tubStates: TubState[] = ['resting', 'yielded', 'cleared'];
	const tubs = await db
		.insertInto('resting_tub')
		.values(
			Array.from({ length: TUBS }, (_, i) => {
				const colony = colonies[i % COLONIES]!;
				const state = tubStates[i % 3]!;
				const startedOn = addDays('2026-06-01', i % 20);
				return {
					code: `${colony.code}-T${Math.floor(i / COLONIES) + 1}`,
					colony_id: colony.id,
					started_on: startedOn,
					hold_until: addDays(startedOn, 28 + (i % 3) * 14),
					state,
					closed_on: state === 'resting' ? null : addDays(startedOn, 30 + (i % 2) * 5)
				};
			})
		)
		.returning(['id', 'colony_id'])
		.execute();
	await db
		.insertInto('tub_check')
		.values(
			tubs.slice(0, 20).flatMap((tub, i) =>
				Array.from({ length: (i % 3) + 1 }, (_, k) => ({
					tub_id: tub.id,
					checked_on: addDays('2026-07-01', k * 7 + i),
					young_found: k
				}))
			)
		)
		.execute();

	const stages: ClutchStage[] = ['hatchling', 'juvenile', 'sub_adult', 'adult'];
	const sizes: SizeClass[] = ['tiny', 'small', 'medium', 'large'];
	const clutchStates: ClutchState[] = ['growing', 'ready', 'listed', 'sold_out', 'paused'];
	await db
		.insertInto('clutch')
		.values(
			Array.from({ length: CLUTCHES }, (_, i) => {
				const tub = i % 3 === 2 ? null : tubs[i % TUBS]!;
				const colony = tub ? colonies.find((c) => c.id === tub.colony_id)! : colonies[i % 3]!;
				const speciesIndex = species.findIndex((s) => s.id === colony.species_id);
				const state = clutchStates[i % clutchStates.length]!;
				const foundOn = addDays('2026-07-01', i % 25);
				const countFound = 10 + (i % 50);
				const countLost = i % 4;
				return {
					code: `${prefixes[speciesIndex]}-C${i + 1}`,
					species_id: colony.species_id,
					tub_id: tub?.id ?? null,
					origin: tub ? ('tub' as const) : ('bought_in' as const),
					generation: (i % 3) + 1,
					found_on: foundOn,
					stage: stages[i % 4]!,
					size_class: sizes[(i >> 2) % 4]!,
					count_found: countFound,
					count_alive: state === 'sold_out' ? 0 : countFound - countLost - (i % 5),
					count_lost: countLost,
					state,
					paused_reason:
						state === 'paused' ? (i % 2 ? ('molting' as const) : ('unwell' as const)) : null,
					sale_ready_on: addDays(foundOn, 60 + (i % 4) * 14)
				};
			})
		)
		.execute();

	return { keeperId: keeper!.id, customerId: customer!.id };
}

/** The same rows in the same order from one plain query, written out by hand here. */
const reference: Record<TableName, { from: string; id: string; columns: Record<string, string> }> =
	{
		colonies: {
			from: 'colony join species on species.id = colony.species_id',
			id: 'colony.id',
			columns: {
				code: 'colony.code',
				name: 'colony.name',
				species: 'species.scientific_name',
				generation: 'colony.generation',
				started: 'colony.started_on',
				retired: 'colony.retired_on'
			}
		},
		tubs: {
			from: 'resting_tub join colony on colony.id = resting_tub.colony_id',
			id: 'resting_tub.id',
			columns: {
				code: 'resting_tub.code',
				colony: 'colony.code',
				started: 'resting_tub.started_on',
				hold: 'resting_tub.hold_until',
				closed: 'resting_tub.closed_on'
			}
		},
		clutches: {
			from: 'clutch join species on species.id = clutch.species_id',
			id: 'clutch.id',
			columns: {
				code: 'clutch.code',
				species: 'species.scientific_name',
				found: 'clutch.found_on',
				alive: 'clutch.count_alive',
				ready: 'clutch.sale_ready_on'
			}
		},
		'care-log': {
			from: 'care_log_entry join colony on colony.id = care_log_entry.colony_id',
			id: 'care_log_entry.id',
			columns: { date: 'care_log_entry.logged_on', colony: 'colony.code' }
		}
	};

async function referenceIds(
	db: Db,
	table: TableName,
	sort: string,
	dir: SortDirection,
	where: string[] = []
): Promise<number[]> {
	const spec = reference[table];
	const column = spec.columns[sort]!;
	const filter = where.length ? `where ${where.join(' and ')}` : '';
	const result = await sql<{
		id: number;
	}>`select ${sql.raw(spec.id)} as id from ${sql.raw(spec.from)}
		${sql.raw(filter)} order by ${sql.raw(column)} ${sql.raw(dir)} nulls last, ${sql.raw(spec.id)} ${sql.raw(dir)}`.execute(
		db
	);
	return result.rows.map((row) => row.id);
}

function viewOf<N extends TableName>(table: N, query: string): TableView<N> {
	const parsed = parseTableView(table, new URLSearchParams(query));
	if (!parsed.ok) throw new Error(`?${query}: ${parsed.message}`);
	return parsed.view;
}

/** Every page of a view, following each cursor through the URL as the browser would. */
async function walk<N extends TableName>(db: Db, table: N, query: string): Promise<RowOf<N>[]> {
	const rows: RowOf<N>[] = [];
	let after: string | null = null;
	for (let pages = 0; ; pages++) {
		if (pages > 500) throw new Error('the walk does not end');
		const params = new URLSearchParams(query);
		if (after) params.set('after', after);
		const view = viewOf(table, params.toString());
		const page = await listTablePage(db, view);
		expect(page.rows.length).toBeLessThanOrEqual(view.limit);
		// A page is only empty when nothing matches at all.
		if (pages > 0) expect(page.rows.length).toBeGreaterThan(0);
		if (page.nextCursor) expect(page.rows.length).toBe(view.limit);
		rows.push(...page.rows);
		if (!page.nextCursor) return rows;
		after = page.nextCursor;
	}
}

/** RFC 4180 §2: fields in double quotes may hold commas, CRLF and "" for one quote. */
function parseCsv(text: string): string[][] {
	const records: string[][] = [];
	let record: string[] = [];
	let field = '';
	let quoted = false;
	for (let at = 0; at < text.length; at++) {
		const char = text[at]!;
		if (quoted) {
			if (char === '"' && text[at + 1] === '"') {
				field += '"';
				at++;
			} else if (char === '"') quoted = false;
			else field += char;
		} else if (char === '"') quoted = true;
		else if (char === ',') {
			record.push(field);
			field = '';
		} else if (char === '\r' && text[at + 1] === '\n') {
			record.push(field);
			records.push(record);
			record = [];
			field = '';
			at++;
		} else field += char;
	}
	if (field !== '' || record.length > 0) {
		record.push(field);
		records.push(record);
	}
	return records;
}

describe('back-office tables', () => {
	let scratch: ScratchDatabase;
	let db: Db;
	let people: { keeperId: string; customerId: string };

	beforeAll(async () => {
		scratch = await scratchDatabase();
		db = scratch.db;
		people = await plantLedger(db);
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	it('walks every sort of every table in both directions without missing or repeating a row', async () => {
		for (const table of TABLE_NAMES) {
			for (const sort of sortKeysOf(table)) {
				for (const dir of ['asc', 'desc'] as const) {
					// 13 rows a page: never a divisor of the row counts, so last pages are partial.
					const walked = await walk(db, table, `sort=${sort}&dir=${dir}&limit=13`);
					const ids = walked.map((row) => row.id);
					const label = `${table} by ${sort} ${dir}`;
					expect(new Set(ids).size, label).toBe(ids.length);
					expect(ids, label).toEqual(await referenceIds(db, table, sort, dir));
				}
			}
		}
	});

	it('ends on a full last page without an empty page after it', async () => {
		// 320 entries at 32 a page: exactly ten full pages, the tenth without a cursor.
		const sizes: number[] = [];
		let after: string | null = null;
		do {
			const view: TableView<'care-log'> = viewOf(
				'care-log',
				after ? `limit=32&after=${after}` : 'limit=32'
			);
			const page: TablePage<'care-log'> = await listTablePage(db, view);
			sizes.push(page.rows.length);
			after = page.nextCursor;
		} while (after);
		expect(sizes).toEqual(Array.from({ length: CARE_ENTRIES / 32 }, () => 32));
	});

	it('keeps rows without a sort value together at the end, in both directions', async () => {
		for (const dir of ['asc', 'desc'] as const) {
			const retired = (await walk(db, 'colonies', `sort=retired&dir=${dir}&limit=4`)).map(
				(row) => row.retiredOn
			);
			const firstActive = retired.indexOf(null);
			expect(firstActive).toBeGreaterThan(0);
			expect(retired.slice(firstActive).every((value) => value === null)).toBe(true);
			const dated = retired.slice(0, firstActive) as string[];
			expect(dated).toEqual(
				[...dated].sort((a, b) => (dir === 'asc' ? a.localeCompare(b) : b.localeCompare(a)))
			);
		}
	});

	it('filters colonies by species, status and text on code or name', async () => {
		const isopods = await walk(db, 'colonies', 'species=porcellio-laevis&limit=5');
		expect(isopods.length).toBeGreaterThan(0);
		expect(isopods.every((row) => row.speciesName === 'Porcellio laevis')).toBe(true);
		expect(isopods.map((row) => row.id)).toEqual(
			await referenceIds(db, 'colonies', 'code', 'asc', ["species.slug = 'porcellio-laevis'"])
		);

		const retired = await walk(db, 'colonies', 'status=retired');
		const active = await walk(db, 'colonies', 'status=active');
		expect(retired.every((row) => row.retiredOn !== null)).toBe(true);
		expect(active.every((row) => row.retiredOn === null)).toBe(true);
		expect(retired.length + active.length).toBe(COLONIES);

		// LIKE's % is taken literally: only the name that has one matches.
		const percent = await walk(db, 'colonies', 'q=100%25');
		expect(percent.map((row) => row.name)).toEqual(percent.map(() => '100% leaf litter'));
		expect(percent.length).toBeGreaterThan(0);
		expect(await walk(db, 'colonies', 'q=%25')).toEqual(percent);
		expect((await walk(db, 'colonies', 'q=ck_r')).every((row) => row.name === 'back_row')).toBe(
			true
		);
		// Case does not matter, and the code is searched too.
		const byCode = await walk(db, 'colonies', 'q=nar-0');
		expect(byCode.length).toBeGreaterThan(0);
		expect(byCode.every((row) => row.code.startsWith('NAR-0'))).toBe(true);
		expect(await walk(db, 'colonies', 'q=no-such-colony')).toEqual([]);
	});

	it('filters tubs by state, colony, hold end and code', async () => {
		const resting = await walk(db, 'tubs', 'state=resting&limit=7');
		expect(resting.length).toBe(Math.ceil(TUBS / 3));
		expect(resting.every((row) => row.state === 'resting' && row.closedOn === null)).toBe(true);

		const ofColony = await walk(db, 'tubs', 'colony=NAR-01');
		expect(ofColony.length).toBeGreaterThan(0);
		expect(ofColony.every((row) => row.colonyCode === 'NAR-01')).toBe(true);

		const dueBy = await walk(db, 'tubs', 'holdBy=2026-07-05&sort=hold&limit=9');
		expect(dueBy.every((row) => row.holdUntil <= '2026-07-05')).toBe(true);
		expect(dueBy.map((row) => row.id)).toEqual(
			await referenceIds(db, 'tubs', 'hold', 'asc', ["resting_tub.hold_until <= '2026-07-05'"])
		);
		expect(dueBy.length).toBeGreaterThan(0);
		expect(dueBy.length).toBeLessThan(TUBS);

		const t2 = await walk(db, 'tubs', 'q=-t2');
		expect(t2.length).toBeGreaterThan(0);
		expect(t2.every((row) => row.code.endsWith('-T2'))).toBe(true);

		const checked = (await walk(db, 'tubs', 'sort=code')).filter((row) => row.checkCount > 0);
		expect(checked).toHaveLength(20);
		expect(checked.every((row) => row.lastCheckedOn !== null)).toBe(true);
	});

	it('filters clutches by species, state, stage, size class and code', async () => {
		const view = 'species=narceus-americanus&state=paused&stage=juvenile&limit=3';
		const clutches = await walk(db, 'clutches', view);
		expect(clutches.length).toBeGreaterThan(0);
		for (const row of clutches) {
			expect(row).toMatchObject({
				speciesName: 'Narceus americanus',
				state: 'paused',
				stage: 'juvenile'
			});
			expect(row.pausedReason).not.toBeNull();
		}
		expect(clutches.map((row) => row.id)).toEqual(
			await referenceIds(db, 'clutches', 'found', 'desc', [
				"species.slug = 'narceus-americanus'",
				"clutch.state = 'paused'",
				"clutch.stage = 'juvenile'"
			])
		);
		const tiny = await walk(db, 'clutches', 'size=tiny');
		expect(tiny.length).toBeGreaterThan(0);
		expect(tiny.every((row) => row.sizeClass === 'tiny')).toBe(true);
		const c1x = await walk(db, 'clutches', 'q=C1');
		expect(c1x.every((row) => /-C1\d*$/.test(row.code))).toBe(true);
		const bought = (await walk(db, 'clutches', 'sort=code')).filter((row) => row.tubCode === null);
		expect(bought.length).toBe(Math.floor(CLUTCHES / 3));
	});

	it('filters the care log by colony, kind and dates, both ends included', async () => {
		const census = await walk(db, 'care-log', 'kind=census&from=2026-01-10&to=2026-01-20&limit=4');
		expect(census.length).toBeGreaterThan(0);
		for (const row of census) {
			expect(row.kind).toBe('census');
			expect(row.censusCount).not.toBeNull();
			expect(row.loggedOn >= '2026-01-10' && row.loggedOn <= '2026-01-20').toBe(true);
		}
		expect(census.map((row) => row.id)).toEqual(
			await referenceIds(db, 'care-log', 'date', 'desc', [
				"care_log_entry.kind = 'census'",
				"care_log_entry.logged_on between '2026-01-10' and '2026-01-20'"
			])
		);
		const oneDay = await walk(db, 'care-log', 'from=2026-01-03&to=2026-01-03');
		expect(oneDay.length).toBeGreaterThan(0);
		expect(oneDay.every((row) => row.loggedOn === '2026-01-03')).toBe(true);

		const ofColony = await walk(db, 'care-log', 'colony=PLA-02&sort=colony');
		expect(ofColony.length).toBeGreaterThan(0);
		expect(ofColony.every((row) => row.colonyCode === 'PLA-02')).toBe(true);
		const named = ofColony.filter((row) => row.loggedBy !== null);
		expect(named.every((row) => row.loggedBy === FORMULA_KEEPER)).toBe(true);
	});

	it('writes the whole view as CSV: a header, the same rows in the same order', async () => {
		const query = 'kind=pest_note&sort=colony&dir=desc&limit=5';
		const walked = await walk(db, 'care-log', query);
		// A cursor in the address does not cut the export: it starts from the first row.
		const secondPage = viewOf(
			'care-log',
			`${query}&after=${(await listTablePage(db, viewOf('care-log', query))).nextCursor}`
		);
		const exported = await tableCsv(db, secondPage);
		expect(exported.csv.startsWith('\uFEFF')).toBe(true);
		const [header, ...records] = parseCsv(exported.csv.slice(1));
		expect(header).toEqual(csvColumns['care-log'].map((column) => column.header));
		expect(exported).toMatchObject({ rowCount: walked.length, capped: false });
		expect(records).toHaveLength(walked.length);
		expect(records.map((record) => [record[0], record[1]])).toEqual(
			walked.map((row) => [row.loggedOn, row.colonyCode])
		);
		expect(records.every((record) => record[3] === 'Pest note')).toBe(true);
	});

	it('escapes formula-looking cells and keeps quotes, commas and line breaks inside a cell', async () => {
		const exported = await tableCsv(db, viewOf('care-log', ''));
		const records = parseCsv(exported.csv.slice(1)).slice(1);
		expect(records).toHaveLength(CARE_ENTRIES);
		const notes = records.map((record) => record[6]);
		for (const formula of FORMULA_NOTES) {
			expect(notes).toContain(`'${formula}`);
			expect(notes).not.toContain(formula);
		}
		expect(notes).toContain('Misted, "lightly", then\nclosed the lid');
		expect(records.some((record) => record[7] === `'${FORMULA_KEEPER}`)).toBe(true);
		for (const record of records) {
			for (const cell of record) expect(cell).not.toMatch(/^[=+\-@]/);
		}
		const colonies = parseCsv((await tableCsv(db, viewOf('colonies', ''))).csv.slice(1));
		expect(colonies.some((record) => record[1] === `'${FORMULA_NAME}`)).toBe(true);
		expect(colonies[1]).toHaveLength(csvColumns.colonies.length);
	});

	it('cuts an export at its cap and says so', async () => {
		const exported = await tableCsv(db, viewOf('care-log', ''), 50);
		expect(exported).toMatchObject({ rowCount: 50, capped: true });
		expect(parseCsv(exported.csv.slice(1))).toHaveLength(51);
	});

	describe('over HTTP', () => {
		let app: RunningApp;
		const cookie: Record<'keeper' | 'customer', string> = { keeper: '', customer: '' };

		beforeAll(async () => {
			app = await startApp({ DATABASE_URL: scratch.url });
			cookie.keeper = `hatchlot.session=${await createSession(db, people.keeperId)}`;
			cookie.customer = `hatchlot.session=${await createSession(db, people.customerId)}`;
		});
		afterAll(async () => {
			await app?.stop();
		});

		const get = (path: string, who?: 'keeper' | 'customer', accept = 'application/json') =>
			fetch(`${app.origin}${path}`, {
				headers: { accept, ...(who ? { cookie: cookie[who] } : {}) },
				redirect: 'manual'
			});

		it('answers a keeper with a page of rows and the cursor for the next', async () => {
			const response = await get('/api/manage/clutches?state=growing&limit=10', 'keeper');
			expect(response.status).toBe(200);
			const body = (await response.json()) as {
				rows: RowOf<'clutches'>[];
				nextCursor: string | null;
			};
			expect(body.rows).toHaveLength(10);
			expect(body.rows.every((row) => row.state === 'growing')).toBe(true);
			const next = await get(
				`/api/manage/clutches?state=growing&limit=10&after=${body.nextCursor}`,
				'keeper'
			);
			const second = (await next.json()) as { rows: RowOf<'clutches'>[] };
			expect(second.rows.map((row) => row.id)).not.toContain(body.rows[0]!.id);
		});

		it('refuses a tampered cursor and bad parameters with 400 and a plain message', async () => {
			const first = (await (await get('/api/manage/care-log?limit=5', 'keeper')).json()) as {
				nextCursor: string;
			};
			const body = JSON.parse(Buffer.from(first.nextCursor, 'base64url').toString()) as Record<
				string,
				unknown
			>;
			const tampered = Buffer.from(
				JSON.stringify({ ...body, v: "2026-01-01'; drop table colony; --" })
			).toString('base64url');
			for (const path of [
				`/api/manage/care-log?limit=5&after=${tampered}`,
				`/api/manage/care-log?limit=5&after=${first.nextCursor.slice(0, -3)}`,
				`/api/manage/care-log?sort=colony&after=${first.nextCursor}`,
				'/api/manage/care-log?sort=price',
				'/api/manage/tubs?holdBy=2026-02-30',
				'/api/manage/colonies?limit=1000',
				'/api/manage/clutches?format=xlsx'
			]) {
				const response = await get(path, 'keeper');
				expect(response.status, path).toBe(400);
				const { message } = (await response.json()) as { message: string };
				expect(message, path).toMatch(/^[A-Z“].+\.$/);
			}
			const csv = await get(`/api/manage/care-log?format=csv&after=${tampered}`, 'keeper');
			expect(csv.status).toBe(400);
			expect(csv.headers.get('content-type')).toMatch(/^text\/plain/);
		});

		it('downloads the view as a CSV file named after the table and the day', async () => {
			const before = todayInZone(DEFAULT_SHOP_TIME_ZONE);
			const response = await get('/api/manage/tubs?state=yielded&format=csv', 'keeper', 'text/csv');
			const after = todayInZone(DEFAULT_SHOP_TIME_ZONE);
			expect(response.status).toBe(200);
			expect(response.headers.get('content-type')).toBe('text/csv; charset=utf-8');
			const disposition = response.headers.get('content-disposition');
			expect(
				[before, after].map((day) => `attachment; filename="hatchlot-tubs-${day}.csv"`)
			).toContain(disposition);
			// Read as bytes: TextDecoder would drop the byte-order mark.
			const bytes = new Uint8Array(await response.arrayBuffer());
			expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
			const records = parseCsv(new TextDecoder().decode(bytes));
			expect(records[0]).toEqual(csvColumns.tubs.map((column) => column.header));
			expect(records.slice(1).every((record) => record[3] === 'Yielded')).toBe(true);
			expect(records.length - 1).toBe(Number(response.headers.get('x-hatchlot-rows')));
		});

		it('refuses visitors who are signed out (401) and customers (403)', async () => {
			for (const table of TABLE_NAMES) {
				expect((await get(`/api/manage/${table}`)).status).toBe(401);
				expect((await get(`/api/manage/${table}?format=csv`, 'customer')).status).toBe(403);
			}
		});

		it('renders the first page on the server, with the next page as a plain link', async () => {
			const response = await get('/manage/care-log?kind=census', 'keeper', 'text/html');
			expect(response.status).toBe(200);
			const html = await response.text();
			expect(html).toContain('Census count');
			// resolve() writes page-relative links during server rendering ("../manage/…").
			const next =
				/href="((?:\.\.)?\/manage\/care-log\?kind=census&amp;after=[A-Za-z0-9_-]+)"/.exec(html);
			expect(next).not.toBeNull();
			const nextUrl = new URL(next![1]!.replaceAll('&amp;', '&'), `${app.origin}/manage/care-log`);
			const nextPage = await get(nextUrl.pathname + nextUrl.search, 'keeper', 'text/html');
			expect(nextPage.status).toBe(200);
			expect(await nextPage.text()).toContain('Back to the first page');

			const refused = await get('/manage/tubs?state=sleeping', 'keeper', 'text/html');
			expect(refused.status).toBe(200);
			expect(await refused.text()).toContain('State must be one of: resting, yielded, cleared.');
		});
	});
});
