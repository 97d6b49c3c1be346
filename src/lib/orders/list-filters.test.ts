import { describe, expect, it } from 'vitest';
import { orderListQuery, parseOrderListFilters } from './list-filters';

const parse = (query: string) => parseOrderListFilters(new URLSearchParams(query));

describe('parseOrderListFilters', () => {
	it('reads every filter and the page', () => {
		expect(
			parse('state=weather_hold&service=two_day&q=+HL-1001+&from=2026-11-01&to=2026-11-30&page=3')
		).toEqual({
			filters: {
				state: 'weather_hold',
				service: 'two_day',
				q: 'HL-1001',
				from: '2026-11-01',
				to: '2026-11-30',
				page: 3
			},
			problems: {}
		});
	});

	it('treats empty fields as no filter', () => {
		expect(parse('state=&service=&q=&from=&to=')).toEqual({ filters: { page: 1 }, problems: {} });
	});

	it('drops what does not parse and says why beside the field', () => {
		const { filters, problems } = parse('state=lost&service=pigeon&from=2026-02-30x&page=-2');
		expect(filters).toEqual({ page: 1 });
		expect(Object.keys(problems).sort()).toEqual(['from', 'service', 'state']);
	});

	it('refuses a range that ends before it starts', () => {
		const { filters, problems } = parse('from=2026-12-01&to=2026-11-01');
		expect(filters.from).toBe('2026-12-01');
		expect(filters.to).toBeUndefined();
		expect(problems.to).toMatch(/before/);
	});
});

describe('orderListQuery', () => {
	it('round-trips through the parser', () => {
		const filters = { state: 'paid', q: 'a@example.com', from: '2026-11-01', page: 1 } as const;
		const query = orderListQuery(filters, 2);
		expect(query).toBe('?state=paid&q=a%40example.com&from=2026-11-01&page=2');
		expect(parse(query.slice(1)).filters).toEqual({ ...filters, page: 2 });
	});

	it('leaves page 1 and empty filters out', () => {
		expect(orderListQuery({ page: 1 }, 1)).toBe('');
	});
});
