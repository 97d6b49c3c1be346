import { describe, expect, it } from 'vitest';
import {
	colonySchedule,
	defaultHoldUntil,
	holdUntilProblem,
	quietPeriodEnds,
	tubDue,
	type ColonyCareFacts
} from './schedule';

// Dates counted on a paper calendar for 2026–2027.
const base: ColonyCareFacts = {
	startedOn: '2026-01-10',
	refreshIntervalDays: 120,
	moltQuietDays: 21,
	lastRefreshOn: '2026-08-01',
	lastMoistureCheckOn: '2026-11-26',
	lastMoltSeenOn: null
};

describe('colonySchedule: substrate refresh', () => {
	it('falls due one interval after the last refresh', () => {
		// 2026-08-01 + 120 days: +30 to Aug 31, +30 to Sep 30, +31 to Oct 31, +29 to Nov 29.
		const plan = colonySchedule(base, '2026-12-01');
		expect(plan.refreshDueOn).toBe('2026-11-29');
		expect(plan.refreshOverdueDays).toBe(2);
	});
	it('counts from the start date when the colony was never refreshed', () => {
		const plan = colonySchedule({ ...base, lastRefreshOn: null }, '2026-12-01');
		expect(plan.refreshDueOn).toBe('2026-05-10');
	});
	it('keeps within 3–6 months for the species limits (common practice, PRODUCT.md)', () => {
		const shortest = colonySchedule({ ...base, refreshIntervalDays: 90 }, '2026-08-01');
		const longest = colonySchedule({ ...base, refreshIntervalDays: 184 }, '2026-08-01');
		expect(shortest.refreshDueOn).toBe('2026-10-30');
		expect(longest.refreshDueOn).toBe('2027-02-01');
	});
});

describe('colonySchedule: weekly moisture check (PRODUCT.md: "moisture check weekly")', () => {
	it('is due seven days after the last check', () => {
		expect(colonySchedule(base, '2026-12-02').moistureDueOn).toBe('2026-12-03');
		expect(colonySchedule(base, '2026-12-02').moistureOverdueDays).toBe(-1);
		expect(colonySchedule(base, '2026-12-03').moistureOverdueDays).toBe(0);
	});
	it('is due at once when the colony has never been checked', () => {
		const plan = colonySchedule({ ...base, lastMoistureCheckOn: null }, '2026-12-02');
		expect(plan.moistureDueOn).toBe('2026-12-02');
	});
});

describe('post-molt quiet period', () => {
	it('runs for the species quiet days, the molt day counting as day one', () => {
		expect(quietPeriodEnds('2026-11-20', 21)).toBe('2026-12-10');
		const plan = colonySchedule({ ...base, lastMoltSeenOn: '2026-11-20' }, '2026-12-10');
		expect(plan.quietUntil).toBe('2026-12-10');
	});
	it('is over the day after it ends', () => {
		const plan = colonySchedule({ ...base, lastMoltSeenOn: '2026-11-20' }, '2026-12-11');
		expect(plan.quietUntil).toBeNull();
	});
});

describe('resting tubs', () => {
	it('holds for the species default (4–8 weeks, common practice, PRODUCT.md)', () => {
		expect(defaultHoldUntil('2026-12-01', 42)).toBe('2027-01-12');
		expect(defaultHoldUntil('2026-12-01', 28)).toBe('2026-12-29');
		expect(defaultHoldUntil('2026-12-01', 56)).toBe('2027-01-26');
	});
	it('refuses a hold-until on or before the tub date', () => {
		expect(holdUntilProblem('2026-12-01', '2026-12-01')).toMatch(/after/);
		expect(holdUntilProblem('2026-12-01', '2026-11-30')).toMatch(/after/);
		expect(holdUntilProblem('2026-12-01', '2026-12-02')).toBeNull();
		expect(holdUntilProblem('2026-12-01', '2027-07-01')).toMatch(/six months/);
	});
	it('asks for a weekly check while resting, counted from the last check', () => {
		const tub = { startedOn: '2026-11-10', holdUntil: '2026-12-22', lastCheckOn: '2026-11-24' };
		expect(tubDue(tub, '2026-11-30')).toEqual({ kind: 'none', nextCheckOn: '2026-12-01' });
		expect(tubDue(tub, '2026-12-01')).toEqual({
			kind: 'check',
			dueOn: '2026-12-01',
			overdueDays: 0
		});
		expect(tubDue({ ...tub, lastCheckOn: null }, '2026-11-20')).toEqual({
			kind: 'check',
			dueOn: '2026-11-17',
			overdueDays: 3
		});
	});
	it('asks for a last look once the hold has ended', () => {
		const tub = { startedOn: '2026-10-01', holdUntil: '2026-11-12', lastCheckOn: '2026-11-30' };
		expect(tubDue(tub, '2026-12-01')).toEqual({
			kind: 'hold_ended',
			since: '2026-11-12',
			overdueDays: 19
		});
	});
});
