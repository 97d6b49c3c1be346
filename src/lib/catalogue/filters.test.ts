import { describe, expect, it } from 'vitest';
import {
	catalogueHref,
	catalogueSearch,
	centsToDollarText,
	decodeCursor,
	defaultCatalogueQuery,
	dollarsToCents,
	encodeCursor,
	hasFilters,
	isMicroInstant,
	parseCatalogueQuery,
	type KeysetPosition
} from './filters';

const parse = (query: string) => parseCatalogueQuery(new URLSearchParams(query));

/** Base64url (RFC 4648 §5) of a UTF-8 text, written with Node's own Buffer, not ours. */
const forge = (text: string) => Buffer.from(text, 'utf8').toString('base64url');

const newPosition: KeysetPosition = {
	sort: 'new',
	value: '2026-11-17T13:30:00.123456Z',
	id: 41
};
const pricePosition: KeysetPosition = { sort: 'price', value: 1400, id: 7 };

describe('parseCatalogueQuery', () => {
	it('reads the bare catalogue as every listing, newest first, no notes', () => {
		expect(parse('')).toEqual({ query: defaultCatalogueQuery(), notes: [] });
	});

	it('reads every filter from the address', () => {
		const { query, notes } = parse(
			'q=+giant+millipede+&group=millipede&species=narceus-americanus&stage=juvenile&sex=unsexed&min=5&max=20.5&stock=1&sort=price'
		);
		expect(notes).toEqual([]);
		expect(query).toEqual({
			filters: {
				q: 'giant millipede',
				group: 'millipede',
				species: 'narceus-americanus',
				stage: 'juvenile',
				sex: 'unsexed',
				minCents: 500,
				maxCents: 2050,
				inStock: true
			},
			sort: 'price',
			after: null,
			before: null
		});
	});

	it('treats the empty fields a GET form sends as no filter', () => {
		const { query, notes } = parse('q=&group=&species=&stage=&sex=&min=&max=&sort=');
		expect(notes).toEqual([]);
		expect(query).toEqual(defaultCatalogueQuery());
	});

	it('drops each bad value with a plain note and keeps the good ones', () => {
		const { query, notes } = parse(
			'group=spiders&stage=larva&sex=both&min=ten&max=-3&stock=yes&sort=cheapest&species=Narceus%20Americanus&q=isopod'
		);
		expect(query.filters).toEqual({
			q: 'isopod',
			group: null,
			species: null,
			stage: null,
			sex: null,
			minCents: null,
			maxCents: null,
			inStock: false
		});
		expect(query.sort).toBe('new');
		expect(notes).toEqual(
			expect.arrayContaining([
				'“spiders” is not an animal group we keep, so it was left out.',
				'“larva” is not a stage we list, so it was left out.',
				'“both” is not a sex we list, so it was left out.',
				'“ten” is not a price in dollars (like 12 or 12.50), so the lowest price was left out.',
				'“-3” is not a price in dollars (like 12 or 12.50), so the highest price was left out.',
				'The in-stock choice is 1 or nothing, so it was left out.',
				'“cheapest” is not an order the catalogue knows, so it shows newest first.',
				'“Narceus Americanus” is not the web name of a species, so the species filter was left out.'
			])
		);
		expect(notes).toHaveLength(8);
	});

	it('drops a search longer than 100 characters', () => {
		const { query, notes } = parse(`q=${'a'.repeat(101)}`);
		expect(query.filters.q).toBeNull();
		expect(notes).toEqual(['Search words are kept to 100 characters, so the search was left out.']);
	});

	it('leaves out a highest price below the lowest, and says so', () => {
		const { query, notes } = parse('min=20&max=5.5');
		expect(query.filters.minCents).toBe(2000);
		expect(query.filters.maxCents).toBeNull();
		expect(notes).toEqual([
			'The highest price ($5.50) was below the lowest ($20), so the highest was left out.'
		]);
	});

	it('ignores a forged, damaged or other-sort cursor and starts at the first page', () => {
		const forged = [
			'not-a-cursor!',
			forge('{"s":"new","v":"2026-11-17T13:30:00.123456Z","i":41,"x":1}'),
			forge('{"s":"new","v":"2026-11-17T13:30:00Z","i":41}'),
			forge('{"s":"new","v":"2026-02-30T13:30:00.000000Z","i":41}'),
			forge('{"s":"new","v":"2026-11-17T13:30:00.123456Z","i":0}'),
			forge('{"s":"new","v":"2026-11-17T13:30:00.123456Z","i":1.5}'),
			forge("{'s':'new'}"),
			forge('[1,2,3]'),
			// Same content, another spelling: only encodeCursor's own is read.
			forge('{"i":41,"s":"new","v":"2026-11-17T13:30:00.123456Z"}'),
			encodeCursor(pricePosition),
			'A'.repeat(500)
		];
		for (const token of forged) {
			const { query, notes } = parse(`after=${encodeURIComponent(token)}`);
			expect(query.after, token).toBeNull();
			expect(notes).toEqual([
				'The page marker in this address could not be read, so this is the first page.'
			]);
		}
		// A price cursor is read only with the price sort.
		const priced = parse(`sort=price&before=${encodeCursor(pricePosition)}`);
		expect(priced.query.before).toEqual(pricePosition);
		expect(priced.notes).toEqual([]);
	});

	it('reads a cursor it wrote, and prefers "after" when both are given', () => {
		const after = encodeCursor(newPosition);
		const before = encodeCursor({ ...newPosition, id: 3 });
		const { query, notes } = parse(`after=${after}&before=${before}`);
		expect(notes).toEqual([]);
		expect(query.after).toEqual(newPosition);
		expect(query.before).toBeNull();
	});
});

describe('dollars in the address', () => {
	// USD has two minor-unit digits (ISO 4217): $12.5 is 1250 cents, $0.07 is 7.
	it.each([
		['12', 1200],
		['12.5', 1250],
		['12.50', 1250],
		['$12.50', 1250],
		['0.07', 7],
		['1,200', 120_000],
		['0', 0]
	])('reads %s as %i cents', (text, cents) => {
		expect(dollarsToCents(text)).toBe(cents);
	});

	it.each(['12.505', '-1', 'ten', '1e3', '12.', '.5', '100001', ''])('refuses %s', (text) => {
		expect(dollarsToCents(text)).toBeNull();
	});

	it('writes cents back the way a buyer types them', () => {
		expect(centsToDollarText(1200)).toBe('12');
		expect(centsToDollarText(1250)).toBe('12.50');
		expect(centsToDollarText(7)).toBe('0.07');
	});
});

describe('cursors', () => {
	it('round-trips a position through an opaque URL-safe token', () => {
		for (const position of [newPosition, pricePosition]) {
			const token = encodeCursor(position);
			expect(token).toMatch(/^[A-Za-z0-9_-]+$/);
			expect(decodeCursor(token, position.sort)).toEqual(position);
		}
	});

	it('is plain base64url JSON (RFC 4648 §5), as Node decodes it', () => {
		const token = encodeCursor(newPosition);
		expect(JSON.parse(Buffer.from(token, 'base64url').toString('utf8'))).toEqual({
			s: 'new',
			v: '2026-11-17T13:30:00.123456Z',
			i: 41
		});
	});

	it('refuses to write a position that could not be read back', () => {
		expect(() => encodeCursor({ sort: 'new', value: '2026-11-17', id: 1 })).toThrow(RangeError);
		expect(() => encodeCursor({ sort: 'price', value: -1, id: 1 })).toThrow(RangeError);
		expect(() => encodeCursor({ sort: 'price', value: 100, id: 2 ** 31 })).toThrow(RangeError);
	});

	it('knows a microsecond UTC instant from a look-alike', () => {
		expect(isMicroInstant('2026-11-17T13:30:00.000000Z')).toBe(true);
		expect(isMicroInstant('2026-11-17T24:30:00.000000Z')).toBe(false);
		expect(isMicroInstant('2026-11-17T13:30:00.000Z')).toBe(false);
		expect(isMicroInstant('1969-12-31T23:59:59.999999Z')).toBe(false);
	});
});

describe('writing the view into an address', () => {
	it('is the bare path for the plain catalogue', () => {
		expect(catalogueHref('/catalogue', defaultCatalogueQuery())).toBe('/catalogue');
	});

	it('reads back exactly what it wrote', () => {
		const { query } = parse(
			'stock=1&max=20.5&min=5&sex=pair&stage=adult&species=porcellio-laevis&group=isopod&q=dairy+cow&sort=price'
		);
		const withCursor = { ...query, after: pricePosition };
		const search = catalogueSearch(withCursor);
		expect(search).toBe(
			`q=dairy+cow&group=isopod&species=porcellio-laevis&stage=adult&sex=pair&min=5&max=20.50&stock=1&sort=price&after=${encodeCursor(pricePosition)}`
		);
		expect(parse(search).query).toEqual(withCursor);
	});

	it('swaps the cursor for a page link and drops it for page one', () => {
		const query = { ...defaultCatalogueQuery(), after: newPosition };
		expect(catalogueSearch(query, { before: newPosition })).toBe(
			`before=${encodeCursor(newPosition)}`
		);
		expect(catalogueSearch(query, { after: null })).toBe('');
	});

	it('tells a filtered view from the plain one', () => {
		expect(hasFilters(defaultCatalogueQuery().filters)).toBe(false);
		expect(hasFilters(parse('stock=1').query.filters)).toBe(true);
		expect(hasFilters(parse('sort=price').query.filters)).toBe(false);
	});
});
