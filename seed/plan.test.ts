// The demo's promises, checked on the pure plan for a spread of "today"s: every state
// shows up, counts and money add up, and the care schedule has its planned warnings.
import { describe, expect, it } from 'vitest';
import type { ClutchState, OrderState, TubState } from '../src/lib/server/db/schema';
import { addDays, daysBetween } from './dates';
import { buildSales, lineTotalCents } from './sales';
import { DEMO_SPECIES } from './species';
import { buildStock, speciesBySlug } from './stock';

const ORDER_STATES: OrderState[] = [
	'awaiting_payment',
	'paid',
	'scheduled',
	'weather_hold',
	'packed',
	'shipped',
	'delivered',
	'cancelled',
	'refunded',
	'part_refunded'
];
const CLUTCH_STATES: ClutchState[] = ['growing', 'ready', 'listed', 'sold_out', 'paused'];
const TUB_STATES: TubState[] = ['resting', 'yielded', 'cleared'];

// A week of consecutive days (every weekday) plus a leap day and a year end.
const TODAYS = [
	...Array.from({ length: 7 }, (_, i) => addDays('2026-11-30', i)),
	'2028-02-29',
	'2027-12-31'
];

describe.each(TODAYS)('demo plan around %s', (today) => {
	const stock = buildStock(today);
	const sales = buildSales(today, stock);

	it('has an order, a clutch and a tub in every state', () => {
		expect(new Set(sales.orders.map((o) => o.state))).toEqual(new Set(ORDER_STATES));
		expect(new Set(stock.clutches.map((c) => c.state))).toEqual(new Set(CLUTCH_STATES));
		expect(new Set(stock.tubs.map((t) => t.state))).toEqual(new Set(TUB_STATES));
		expect(new Set(stock.clutches.map((c) => c.stage))).toEqual(
			new Set(['hatchling', 'juvenile', 'sub_adult', 'adult'])
		);
	});

	it('dates nothing after today', () => {
		for (const e of stock.careLog) expect(daysBetween(e.loggedOn, today)).toBeGreaterThanOrEqual(0);
		for (const o of sales.orders) {
			for (const e of o.events) expect(e.at.slice(0, 10) <= today).toBe(true);
		}
	});

	it('keeps order money consistent', () => {
		for (const o of sales.orders) {
			expect(o.totalCents).toBe(o.subtotalCents + o.shippingCents);
			expect(o.subtotalCents).toBe(o.lines.reduce((sum, l) => sum + l.lineTotalCents, 0));
			expect(o.paidCents).toBeLessThanOrEqual(o.totalCents);
			expect(o.refundedCents).toBeLessThanOrEqual(o.paidCents);
			expect(o.events.at(-1)?.toState).toBe(o.state);
		}
	});

	it('never sells more of a clutch than it had, and sells out exactly', () => {
		for (const clutch of stock.clutches) {
			const lines = sales.orders.flatMap((o) =>
				o.lines.filter((l) => l.clutchCode === clutch.code)
			);
			const ordered = lines.reduce((sum, l) => sum + l.quantity * l.unitSize, 0);
			expect(ordered).toBeLessThanOrEqual(clutch.countAlive);
			expect(clutch.countAlive + clutch.countLost).toBeLessThanOrEqual(clutch.countFound);
		}
	});

	it('ties each tub to its refresh and hold', () => {
		for (const tub of stock.tubs) {
			const colony = stock.colonies.find((c) => c.code === tub.colonyCode);
			const species = speciesBySlug(colony?.speciesSlug ?? '');
			expect(tub.startedOn).toBe(tub.sourceRefreshOn);
			expect(daysBetween(tub.startedOn, tub.holdUntil)).toBe(species.tubHoldDays);
		}
	});

	it('plans the care warnings the demo is meant to show', () => {
		const last = (code: string, kinds: string[]) =>
			stock.careLog
				.filter((e) => e.colonyCode === code && kinds.includes(e.kind))
				.map((e) => e.loggedOn)
				.sort()
				.at(-1) ?? '';
		const refreshKinds = ['substrate_refresh_half', 'substrate_refresh_full'];
		const active = stock.colonies.filter((c) => c.retiredOn === null);
		const overdue = active.filter((c) => {
			const interval = speciesBySlug(c.speciesSlug).refreshIntervalDays;
			return daysBetween(addDays(last(c.code, refreshKinds), interval), today) > 0;
		});
		expect(overdue.map((c) => c.code)).toEqual(['ORT-01']);
		const staleMoisture = active.filter(
			(c) => daysBetween(last(c.code, ['moisture_check']), today) > 7
		);
		expect(staleMoisture.map((c) => c.code)).toEqual(['NAR-02']);
		const recentMolt = active.filter((c) => {
			const molt = last(c.code, ['molt_seen']);
			return molt !== '' && daysBetween(molt, today) <= 10;
		});
		expect(recentMolt.length).toBeGreaterThan(0);
	});
});

describe('species profiles', () => {
	it('stay inside the schema and the trade ranges', () => {
		for (const s of DEMO_SPECIES) {
			expect(s.refreshIntervalDays).toBeGreaterThanOrEqual(90);
			expect(s.refreshIntervalDays).toBeLessThanOrEqual(184);
			expect(s.tubHoldDays).toBeGreaterThanOrEqual(28);
			expect(s.tubHoldDays).toBeLessThanOrEqual(56);
			expect(s.tempLowF).toBeLessThanOrEqual(s.tempIdealLowF);
			expect(s.tempIdealLowF).toBeLessThanOrEqual(s.tempIdealHighF);
			expect(s.tempIdealHighF).toBeLessThanOrEqual(s.tempHighF);
		}
	});
});

describe('lineTotalCents', () => {
	const tiers = [
		{ minQuantity: 1, priceCents: 1400 },
		{ minQuantity: 5, priceCents: 6000 },
		{ minQuantity: 10, priceCents: 11000 }
	];
	it('uses the rate of the largest tier reached', () => {
		expect(lineTotalCents(tiers, 1)).toBe(1400);
		expect(lineTotalCents(tiers, 2)).toBe(2800);
		expect(lineTotalCents(tiers, 5)).toBe(6000);
		expect(lineTotalCents(tiers, 12)).toBe(13200);
	});
	it('refuses a quantity no tier covers', () => {
		expect(() => lineTotalCents([{ minQuantity: 3, priceCents: 900 }], 2)).toThrow();
	});
});
