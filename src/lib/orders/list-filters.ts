// The keeper's order-list filters, read from the URL so a filtered list can be
// bookmarked and works without JavaScript. A value that does not parse is dropped
// (the list shows everything for that filter) and reported beside its field.
import { z } from 'zod';
import { statesOf } from '$lib/format/labels';
import { calendarDate } from '$lib/forms/calendar-date';
import type { OrderState, Service } from '$lib/server/db/schema';

export const ORDER_PAGE_SIZE = 50;

const isoDate = calendarDate('Use a real date like 2026-12-01.');

const fields = {
	state: z.enum(statesOf('order') as [OrderState, ...OrderState[]]),
	service: z.enum(['overnight', 'two_day'] satisfies Service[]),
	// Order numbers and e-mail addresses are short; anything longer is a paste gone wrong.
	q: z.string().trim().min(1).max(120),
	from: isoDate,
	to: isoDate,
	page: z.coerce.number().int().min(1).max(10_000)
};

export interface OrderListFilters {
	state?: OrderState;
	service?: Service;
	q?: string;
	/** Placed on or after this shop-calendar date. */
	from?: string;
	/** Placed on or before this shop-calendar date. */
	to?: string;
	page: number;
}

export type FilterProblems = Partial<Record<'state' | 'service' | 'q' | 'from' | 'to', string>>;

export function parseOrderListFilters(params: URLSearchParams): {
	filters: OrderListFilters;
	problems: FilterProblems;
} {
	const filters: OrderListFilters = { page: 1 };
	const problems: FilterProblems = {};
	const read = <K extends keyof typeof fields>(key: K) => {
		const raw = params.get(key);
		if (raw === null || raw.trim() === '') return undefined;
		const parsed = fields[key].safeParse(raw);
		if (parsed.success) return parsed.data as z.output<(typeof fields)[K]>;
		if (key !== 'page') problems[key as keyof FilterProblems] = parsed.error.issues[0]?.message;
		return undefined;
	};
	const state = read('state');
	if (state) filters.state = state;
	const service = read('service');
	if (service) filters.service = service;
	const q = read('q');
	if (q) filters.q = q;
	const from = read('from');
	if (from) filters.from = from;
	const to = read('to');
	if (to) filters.to = to;
	if (filters.from && filters.to && filters.from > filters.to) {
		problems.to = 'The end date is before the start date.';
		delete filters.to;
	}
	filters.page = read('page') ?? 1;
	return { filters, problems };
}

/** The query string for the same filters on another page; empty filters are left out. */
export function orderListQuery(filters: OrderListFilters, page: number): string {
	const params = new URLSearchParams();
	for (const key of ['state', 'service', 'q', 'from', 'to'] as const) {
		const value = filters[key];
		if (value) params.set(key, value);
	}
	if (page > 1) params.set('page', String(page));
	const text = params.toString();
	return text ? `?${text}` : '';
}
