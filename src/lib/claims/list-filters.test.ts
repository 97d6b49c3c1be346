import { describe, expect, it } from 'vitest';
import { parseClaimListFilters } from './list-filters';

const parse = (query: string) => parseClaimListFilters(new URLSearchParams(query));

describe('parseClaimListFilters', () => {
	it('takes each state a claim can be in (PRODUCT.md: open, then refund, reship or decline)', () => {
		for (const state of ['open', 'refunded', 'reshipped', 'declined'])
			expect(parse(`state=${state}`)).toEqual({ filters: { state }, problem: null });
	});

	it('shows every claim with no state, and with a state it does not know, saying so', () => {
		expect(parse('')).toEqual({ filters: {}, problem: null });
		expect(parse('state=')).toEqual({ filters: {}, problem: null });
		const unknown = parse('state=lost');
		expect(unknown.filters).toEqual({});
		expect(unknown.problem).toMatch(/every claim is shown/);
	});
});
