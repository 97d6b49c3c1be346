import { describe, expect, it } from 'vitest';
import { dueToday, type ColonyDueInput } from './due-today';

const colony = (over: Partial<ColonyDueInput>): ColonyDueInput => ({
	code: 'NAR-01',
	name: 'Rack A',
	speciesName: 'American giant millipede',
	startedOn: '2026-01-01',
	refreshIntervalDays: 120,
	moltQuietDays: 21,
	lastRefreshOn: '2026-11-01',
	lastMoistureCheckOn: '2026-11-30',
	lastMoltSeenOn: null,
	...over
});

describe('dueToday', () => {
	const today = '2026-12-01';

	it('lists overdue refreshes first', () => {
		const due = dueToday(
			{
				colonies: [
					colony({ code: 'A', lastRefreshOn: '2026-08-01' }), // due Nov 29: 2 days over
					colony({ code: 'B', lastRefreshOn: '2026-07-01' }), // due Oct 29: 33 days over
					colony({ code: 'C', lastRefreshOn: '2026-11-01' }) // due in March: not listed
				],
				tubs: [],
				clutches: []
			},
			today
		);
		expect(due.refresh.map((item) => [item.colonyCode, item.overdueDays])).toEqual([
			['B', 33],
			['A', 2]
		]);
	});

	it('holds a refresh back while the colony is in its post-molt quiet period', () => {
		const due = dueToday(
			{
				colonies: [colony({ lastRefreshOn: '2026-07-01', lastMoltSeenOn: '2026-11-25' })],
				tubs: [],
				clutches: []
			},
			today
		);
		expect(due.refresh[0]).toMatchObject({ kind: 'refresh_waits', quietUntil: '2026-12-15' });
		expect(due.quiet).toHaveLength(1);
	});

	it('lists a weekly moisture check once seven days have passed', () => {
		const due = dueToday(
			{
				colonies: [
					colony({ code: 'A', lastMoistureCheckOn: '2026-11-24' }),
					colony({ code: 'B', lastMoistureCheckOn: '2026-11-25' })
				],
				tubs: [],
				clutches: []
			},
			today
		);
		expect(due.moisture.map((item) => item.colonyCode)).toEqual(['A']);
	});

	it('puts tubs at the end of their hold before tubs due a weekly look', () => {
		const due = dueToday(
			{
				colonies: [],
				tubs: [
					{
						code: 'T-CHECK',
						colonyCode: 'NAR-01',
						speciesName: 'x',
						startedOn: '2026-11-20',
						holdUntil: '2027-01-01',
						lastCheckOn: null
					},
					{
						code: 'T-ENDED',
						colonyCode: 'NAR-01',
						speciesName: 'x',
						startedOn: '2026-10-01',
						holdUntil: '2026-11-30',
						lastCheckOn: '2026-11-29'
					},
					{
						code: 'T-FINE',
						colonyCode: 'NAR-01',
						speciesName: 'x',
						startedOn: '2026-11-28',
						holdUntil: '2027-01-01',
						lastCheckOn: null
					}
				],
				clutches: []
			},
			today
		);
		expect(due.tubs.map((item) => item.tubCode)).toEqual(['T-ENDED', 'T-CHECK']);
	});

	it('shows clutches reaching sale-ready within the week, soonest first', () => {
		const due = dueToday(
			{
				colonies: [],
				tubs: [],
				clutches: [
					{ code: 'C-LATE', speciesName: 'x', countAlive: 5, saleReadyOn: '2026-12-07' },
					{ code: 'C-NEXT', speciesName: 'x', countAlive: 5, saleReadyOn: '2026-12-08' },
					{ code: 'C-NOW', speciesName: 'x', countAlive: 5, saleReadyOn: '2026-11-30' }
				]
			},
			today
		);
		expect(due.saleReady.map((item) => [item.clutchCode, item.inDays])).toEqual([
			['C-NOW', -1],
			['C-LATE', 6]
		]);
	});
});
