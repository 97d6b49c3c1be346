import { describe, expect, it } from 'vitest';
import {
	CursorError,
	MAX_PAGE_SIZE,
	PAGE_SIZE,
	TABLE_NAMES,
	containsPattern,
	csvFileName,
	csvRecords,
	csvSafe,
	cursorAfter,
	decodeCursor,
	defaultView,
	encodeCursor,
	pageFrom,
	parseTableView,
	sortKeysOf,
	sortedBy,
	tableSpecs,
	viewHref,
	viewQuery,
	type ClutchRow,
	type TableName,
	type TableView
} from './tables';

const params = (query: string) => new URLSearchParams(query);

function parsed<N extends TableName>(table: N, query: string): TableView<N> {
	const result = parseTableView(table, params(query));
	if (!result.ok) throw new Error(`expected a view, got: ${result.message}`);
	return result.view;
}

function refusal(table: TableName, query: string): string {
	const result = parseTableView(table, params(query));
	if (result.ok) throw new Error(`expected a refusal for ?${query}`);
	return result.message;
}

const clutch = (id: number, overrides: Partial<ClutchRow> = {}): ClutchRow => ({
	id,
	code: `NAR-C${id}`,
	speciesName: 'Narceus americanus',
	tubCode: 'NAR-01-T1',
	generation: 2,
	foundOn: '2026-10-01',
	stage: 'juvenile',
	sizeClass: 'small',
	countFound: 20,
	countAlive: 18,
	countLost: 2,
	state: 'growing',
	pausedReason: null,
	saleReadyOn: '2027-01-15',
	...overrides
});

describe('defaults', () => {
	it('opens each table in its own order with no filter, 25 rows a page', () => {
		expect(parsed('colonies', '')).toMatchObject({ sort: 'code', dir: 'asc', filters: {} });
		expect(parsed('tubs', '')).toMatchObject({ sort: 'started', dir: 'desc' });
		expect(parsed('clutches', '')).toMatchObject({ sort: 'found', dir: 'desc' });
		expect(parsed('care-log', '')).toMatchObject({ sort: 'date', dir: 'desc' });
		for (const table of TABLE_NAMES) {
			expect(parsed(table, '')).toEqual(defaultView(table));
			expect(defaultView(table)).toMatchObject({ limit: PAGE_SIZE, after: null, position: null });
		}
	});

	it('gives a sorted column its own first direction when the URL names none', () => {
		expect(parsed('clutches', 'sort=code').dir).toBe('asc');
		expect(parsed('clutches', 'sort=alive').dir).toBe('desc');
		expect(parsed('tubs', 'sort=closed').dir).toBe('desc');
	});

	it('writes the default view as the bare address', () => {
		for (const table of TABLE_NAMES) expect(viewQuery(defaultView(table))).toBe('');
		expect(viewHref('/manage/tubs', defaultView('tubs'))).toBe('/manage/tubs');
	});
});

describe('reading filters', () => {
	it('reads every clutch filter, trimming text', () => {
		const view = parsed(
			'clutches',
			'species=narceus-americanus&state=paused&stage=sub_adult&size=tiny&q=%20NAR-C%20'
		);
		expect(view.filters).toEqual({
			species: 'narceus-americanus',
			state: 'paused',
			stage: 'sub_adult',
			size: 'tiny',
			q: 'NAR-C'
		});
	});

	it('takes the empty fields a GET form sends as "no filter"', () => {
		expect(parsed('colonies', 'species=&status=&q=%20%20').filters).toEqual({});
		expect(parsed('care-log', 'colony=&kind=&from=&to=&sort=&dir=&after=').filters).toEqual({});
	});

	it('reads the tub and care-log filters', () => {
		expect(parsed('tubs', 'state=resting&colony=NAR-01&holdBy=2026-12-15').filters).toEqual({
			state: 'resting',
			colony: 'NAR-01',
			holdBy: '2026-12-15'
		});
		expect(
			parsed('care-log', 'colony=PLA-02&kind=moisture_check&from=2026-01-01&to=2026-01-31').filters
		).toEqual({ colony: 'PLA-02', kind: 'moisture_check', from: '2026-01-01', to: '2026-01-31' });
		expect(parsed('colonies', 'status=retired').filters).toEqual({ status: 'retired' });
	});

	it('ignores parameters that are not part of a view', () => {
		expect(parsed('clutches', 'format=csv&utm=mail')).toEqual(defaultView('clutches'));
	});

	it('reads page sizes from 1 to 100', () => {
		expect(parsed('care-log', 'limit=1').limit).toBe(1);
		expect(parsed('care-log', `limit=${MAX_PAGE_SIZE}`).limit).toBe(100);
	});
});

describe('refusing bad values', () => {
	it('names what is wrong in a plain sentence', () => {
		expect(refusal('colonies', 'sort=price')).toMatch(/^Sort must be one of: code, name/);
		expect(refusal('colonies', 'dir=up')).toBe('Order must be one of: asc, desc.');
		expect(refusal('clutches', 'state=hatched')).toMatch(/^State must be one of: growing/);
		expect(refusal('clutches', 'stage=egg')).toMatch(/^Stage must be one of/);
		expect(refusal('clutches', 'size=huge')).toMatch(/^Size class must be one of/);
		expect(refusal('care-log', 'kind=watering')).toMatch(/^Kind must be one of/);
		expect(refusal('colonies', 'status=sleeping')).toMatch(/^Status must be one of/);
		expect(refusal('colonies', 'species=Narceus%20americanus')).toMatch(/slug/);
		expect(refusal('colonies', `q=${'x'.repeat(101)}`)).toMatch(/at most 100/);
	});

	it('refuses page sizes outside 1 to 100 and anything not a whole number', () => {
		for (const limit of ['0', '101', '-5', '2.5', 'lots', '1e2']) {
			expect(refusal('tubs', `limit=${limit}`)).toMatch(/Rows per page/);
		}
	});

	it('refuses dates that are not on the calendar', () => {
		// The Gregorian calendar has no 30 February and 2026 is no leap year (29 Feb 2026 does not exist).
		expect(refusal('tubs', 'holdBy=2026-02-30')).toMatch(/YYYY-MM-DD/);
		expect(refusal('care-log', 'from=2026-02-29')).toMatch(/YYYY-MM-DD/);
		expect(refusal('care-log', 'to=12/01/2026')).toMatch(/YYYY-MM-DD/);
		expect(parsed('care-log', 'from=2028-02-29').filters.from).toBe('2028-02-29');
	});

	it('refuses a date range that ends before it starts', () => {
		expect(refusal('care-log', 'from=2026-06-02&to=2026-06-01')).toBe(
			'“From” must be on or before “To”.'
		);
		expect(parsed('care-log', 'from=2026-06-01&to=2026-06-01').filters.to).toBe('2026-06-01');
	});
});

describe('cursor', () => {
	it('is base64url JSON of the sort, direction, last value and id', () => {
		const token = encodeCursor('clutches', 'found', 'desc', { value: '2026-10-01', id: 41 });
		// Node's Buffer implements RFC 4648 §5 base64url independently of our encoder.
		expect(JSON.parse(Buffer.from(token, 'base64url').toString('utf8'))).toEqual({
			s: 'found',
			d: 'desc',
			v: '2026-10-01',
			i: 41
		});
		expect(token).toMatch(/^[A-Za-z0-9_-]+$/);
	});

	it('carries the longest name a sort may hold, and refuses a longer one', () => {
		const longest = 'é“'.repeat(500);
		const token = encodeCursor('colonies', 'name', 'asc', { value: longest, id: 1 });
		expect(decodeCursor('colonies', 'name', 'asc', token).value).toBe(longest);
		expect(() => encodeCursor('colonies', 'name', 'asc', { value: `${longest}x`, id: 1 })).toThrow(
			CursorError
		);
	});

	it('round-trips text with letters beyond ASCII, numbers and nulls', () => {
		const cases = [
			['colonies', 'name', 'asc', { value: 'Ménagerie “north” tub', id: 7 }],
			['clutches', 'alive', 'desc', { value: 0, id: 3 }],
			['colonies', 'retired', 'desc', { value: null, id: 12 }],
			['tubs', 'closed', 'asc', { value: '2026-11-30', id: 2_147_483_647 }]
		] as const;
		for (const [table, sort, dir, position] of cases) {
			const token = encodeCursor(table, sort, dir, position);
			expect(Buffer.from(token, 'base64url').toString('base64url')).toBe(token);
			expect(decodeCursor(table, sort, dir, token)).toEqual(position);
		}
	});

	it('refuses a cursor that was not made for this table, sort and direction', () => {
		const token = encodeCursor('clutches', 'found', 'desc', { value: '2026-10-01', id: 41 });
		const forge = (body: unknown) => Buffer.from(JSON.stringify(body)).toString('base64url');
		const bad = [
			token + '!',
			'not base64 at all',
			token.slice(0, -2),
			token + 'A',
			`${token}==`,
			'x'.repeat(8_193),
			forge({ s: 'found', d: 'desc', v: '2026-10-01', i: 41, pad: 'x'.repeat(8_200) }),
			forge([1, 2]),
			forge('found'),
			forge({ s: 'found', d: 'desc', v: '2026-10-01', i: 41, extra: true }),
			forge({ s: 'code', d: 'desc', v: '2026-10-01', i: 41 }),
			forge({ s: 'found', d: 'asc', v: '2026-10-01', i: 41 }),
			forge({ s: 'found', d: 'desc', v: 'yesterday', i: 41 }),
			forge({ s: 'found', d: 'desc', v: null, i: 41 }),
			forge({ s: 'found', d: 'desc', v: 20261001, i: 41 }),
			forge({ s: 'found', d: 'desc', v: '2026-10-01', i: 0 }),
			forge({ s: 'found', d: 'desc', v: '2026-10-01', i: 4.5 }),
			forge({ s: 'found', d: 'desc', v: '2026-10-01', i: '41' }),
			forge({ s: 'found', d: 'desc', v: '2026-10-01', i: 2_147_483_648 }),
			Buffer.from([0xff, 0xfe, 0x7b]).toString('base64url')
		];
		for (const token of bad) {
			expect(() => decodeCursor('clutches', 'found', 'desc', token), token).toThrow(CursorError);
		}
		const alive = forge({ s: 'alive', d: 'desc', v: '18', i: 41 });
		expect(() => decodeCursor('clutches', 'alive', 'desc', alive)).toThrow(CursorError);
	});

	it('turns a refused cursor in the URL into a message, not an exception', () => {
		const token = encodeCursor('clutches', 'found', 'desc', { value: '2026-10-01', id: 41 });
		expect(parsed('clutches', `after=${token}`).position).toEqual({ value: '2026-10-01', id: 41 });
		expect(refusal('clutches', `sort=code&after=${token}`)).toMatch(/page marker/);
		expect(refusal('clutches', `after=${token.slice(1)}`)).toMatch(/page marker/);
	});

	it('continues after the last row shown, by the sorted field', () => {
		const view = sortedBy(defaultView('clutches'), 'alive');
		const token = cursorAfter(view, clutch(9, { countAlive: 31 }));
		expect(decodeCursor('clutches', 'alive', 'desc', token)).toEqual({ value: 31, id: 9 });
	});
});

describe('round trips', () => {
	it('writes a view into a URL that reads back as the same view', () => {
		const after = encodeCursor('care-log', 'colony', 'desc', { value: 'NAR-01', id: 300 });
		const views = [
			parsed('clutches', 'species=cubaris-murina&state=ready&size=medium&q=%25off_'),
			parsed('tubs', 'state=cleared&holdBy=2026-12-01&sort=closed&dir=asc&limit=50'),
			parsed('colonies', 'status=active&sort=generation&dir=desc'),
			parsed('care-log', `colony=NAR-01&from=2026-01-01&sort=colony&dir=desc&after=${after}`)
		];
		for (const view of views) {
			expect(parseTableView(view.table, params(viewQuery(view)))).toEqual({ ok: true, view });
		}
	});

	it('drops the cursor on request and never puts it in a CSV link', () => {
		const after = encodeCursor('tubs', 'started', 'desc', { value: '2026-12-01', id: 4 });
		const view = parsed('tubs', `state=resting&after=${after}`);
		expect(viewQuery(view, { after: null })).toBe('state=resting');
		expect(viewQuery(view, { format: 'csv' })).toBe('state=resting&format=csv');
		expect(viewQuery(view, { after: 'abc' })).toBe('state=resting&after=abc');
	});

	it('flips the direction on a second click and starts again from page one', () => {
		const after = encodeCursor('colonies', 'code', 'asc', { value: 'NAR-01', id: 1 });
		const view = parsed('colonies', `after=${after}`);
		const flipped = sortedBy(view, 'code');
		expect(flipped).toMatchObject({ sort: 'code', dir: 'desc', after: null, position: null });
		expect(sortedBy(flipped, 'code').dir).toBe('asc');
		expect(sortedBy(view, 'started').dir).toBe('desc');
		expect(viewQuery(sortedBy(view, 'started'))).toBe('sort=started');
	});

	it('has a row field behind every sort key', () => {
		for (const table of TABLE_NAMES) {
			const spec = tableSpecs[table];
			expect(Object.keys(spec.sortField).sort()).toEqual(sortKeysOf(table).sort());
		}
	});
});

describe('pages', () => {
	it('takes the extra fetched row as the sign that another page follows', () => {
		const view = { ...defaultView('clutches'), limit: 3 };
		const fetched = [clutch(5), clutch(4), clutch(3, { foundOn: '2026-09-30' }), clutch(2)];
		const page = pageFrom(view, fetched);
		expect(page.rows.map((row) => row.id)).toEqual([5, 4, 3]);
		expect(decodeCursor('clutches', 'found', 'desc', page.nextCursor!)).toEqual({
			value: '2026-09-30',
			id: 3
		});
		expect(pageFrom(view, fetched.slice(0, 3)).nextCursor).toBeNull();
		expect(pageFrom(view, [])).toEqual({ rows: [], nextCursor: null });
	});
});

describe('search text', () => {
	it("takes LIKE's wildcards and escape literally", () => {
		// PostgreSQL LIKE: % and _ are wildcards, backslash the default escape (PostgreSQL manual §9.7.1).
		expect(containsPattern('NAR')).toBe('%NAR%');
		expect(containsPattern('50%_off\\')).toBe('%50\\%\\_off\\\\%');
	});
});

describe('CSV', () => {
	it('makes formula-looking cells text with a leading apostrophe', () => {
		// OWASP "CSV Injection": cells beginning =, +, -, @, tab or carriage return are prefixed with '.
		expect(csvSafe('=HYPERLINK("http://x.test")')).toBe(`'=HYPERLINK("http://x.test")`);
		expect(csvSafe('+1')).toBe("'+1");
		expect(csvSafe('-2+3')).toBe("'-2+3");
		expect(csvSafe('@SUM(A1)')).toBe("'@SUM(A1)");
		expect(csvSafe('\tcmd')).toBe("'\tcmd");
		expect(csvSafe('\rcmd')).toBe("'\rcmd");
		expect(csvSafe('Leaf top-up = fine')).toBe('Leaf top-up = fine');
		expect(csvSafe(-3)).toBe(-3);
		expect(csvSafe(null)).toBe('');
	});

	it('writes words for codes and dates as YYYY-MM-DD', () => {
		const { header, records } = csvRecords('clutches', [
			clutch(1, { state: 'paused', pausedReason: 'molting', stage: 'sub_adult', tubCode: null })
		]);
		expect(header).toEqual([
			'Code',
			'Species',
			'Tub',
			'Generation',
			'Found',
			'Stage',
			'Size class',
			'Found count',
			'Alive',
			'Lost',
			'State',
			'Paused for',
			'Sale-ready'
		]);
		expect(records).toEqual([
			[
				'NAR-C1',
				'Narceus americanus',
				'',
				'F2',
				'2026-10-01',
				'Sub-adult',
				'Small',
				20,
				18,
				2,
				'Paused',
				'Molting',
				'2027-01-15'
			]
		]);
	});

	it('names the file after the table and the day', () => {
		expect(csvFileName('clutches', '2026-12-02')).toBe('hatchlot-clutches-2026-12-02.csv');
		expect(csvFileName('care-log', '2026-12-02')).toBe('hatchlot-care-log-2026-12-02.csv');
	});
});
