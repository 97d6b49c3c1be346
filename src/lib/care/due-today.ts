// The keeper's "due today" list, built from the schedule: what the rack needs, most
// urgent first, each item naming the one entry that clears it. Pure.
import { colonySchedule, tubDue, type ColonyCareFacts } from './schedule';
import { daysBetween, type IsoDate } from '$lib/format/dates';

export interface ColonyDueInput extends ColonyCareFacts {
	code: string;
	name: string;
	speciesName: string;
}

export interface TubDueInput {
	code: string;
	colonyCode: string;
	speciesName: string;
	startedOn: IsoDate;
	holdUntil: IsoDate;
	lastCheckOn: IsoDate | null;
}

export interface ClutchDueInput {
	code: string;
	speciesName: string;
	countAlive: number;
	saleReadyOn: IsoDate;
}

export type DueItem =
	| { kind: 'refresh'; colonyCode: string; title: string; dueOn: IsoDate; overdueDays: number }
	| {
			kind: 'refresh_waits';
			colonyCode: string;
			title: string;
			dueOn: IsoDate;
			overdueDays: number;
			quietUntil: IsoDate;
	  }
	| { kind: 'moisture'; colonyCode: string; title: string; dueOn: IsoDate; overdueDays: number }
	| { kind: 'quiet'; colonyCode: string; title: string; quietUntil: IsoDate }
	| { kind: 'tub_check'; tubCode: string; title: string; dueOn: IsoDate; overdueDays: number }
	| { kind: 'tub_hold_ended'; tubCode: string; title: string; since: IsoDate; overdueDays: number }
	| {
			kind: 'sale_ready';
			clutchCode: string;
			title: string;
			saleReadyOn: IsoDate;
			inDays: number;
			countAlive: number;
	  };

export interface DueToday {
	refresh: Extract<DueItem, { kind: 'refresh' | 'refresh_waits' }>[];
	moisture: Extract<DueItem, { kind: 'moisture' }>[];
	quiet: Extract<DueItem, { kind: 'quiet' }>[];
	tubs: Extract<DueItem, { kind: 'tub_check' | 'tub_hold_ended' }>[];
	saleReady: Extract<DueItem, { kind: 'sale_ready' }>[];
	total: number;
}

/** Clutches whose projection falls in the next seven days count as "this week". */
export const SALE_READY_WINDOW_DAYS = 7;

const mostOverdueFirst = <T extends { overdueDays: number }>(a: T, b: T) =>
	b.overdueDays - a.overdueDays;

export function dueToday(
	input: { colonies: ColonyDueInput[]; tubs: TubDueInput[]; clutches: ClutchDueInput[] },
	today: IsoDate
): DueToday {
	const refresh: DueToday['refresh'] = [];
	const moisture: DueToday['moisture'] = [];
	const quiet: DueToday['quiet'] = [];
	for (const colony of input.colonies) {
		const plan = colonySchedule(colony, today);
		const title = `${colony.code} · ${colony.name}`;
		if (plan.quietUntil)
			quiet.push({ kind: 'quiet', colonyCode: colony.code, title, quietUntil: plan.quietUntil });
		if (plan.refreshOverdueDays >= 0) {
			// Digging out substrate during a molt can kill the animals: the refresh waits.
			refresh.push(
				plan.quietUntil
					? {
							kind: 'refresh_waits',
							colonyCode: colony.code,
							title,
							dueOn: plan.refreshDueOn,
							overdueDays: plan.refreshOverdueDays,
							quietUntil: plan.quietUntil
						}
					: {
							kind: 'refresh',
							colonyCode: colony.code,
							title,
							dueOn: plan.refreshDueOn,
							overdueDays: plan.refreshOverdueDays
						}
			);
		}
		if (plan.moistureOverdueDays >= 0)
			moisture.push({
				kind: 'moisture',
				colonyCode: colony.code,
				title,
				dueOn: plan.moistureDueOn,
				overdueDays: plan.moistureOverdueDays
			});
	}
	const tubs: DueToday['tubs'] = [];
	for (const tub of input.tubs) {
		const due = tubDue(tub, today);
		const title = `${tub.code} · ${tub.speciesName}`;
		if (due.kind === 'hold_ended')
			tubs.push({
				kind: 'tub_hold_ended',
				tubCode: tub.code,
				title,
				since: due.since,
				overdueDays: due.overdueDays
			});
		else if (due.kind === 'check')
			tubs.push({
				kind: 'tub_check',
				tubCode: tub.code,
				title,
				dueOn: due.dueOn,
				overdueDays: due.overdueDays
			});
	}
	const saleReady: DueToday['saleReady'] = input.clutches
		.map((clutch) => ({
			kind: 'sale_ready' as const,
			clutchCode: clutch.code,
			title: `${clutch.code} · ${clutch.speciesName}`,
			saleReadyOn: clutch.saleReadyOn,
			inDays: daysBetween(today, clutch.saleReadyOn),
			countAlive: clutch.countAlive
		}))
		.filter((item) => item.inDays < SALE_READY_WINDOW_DAYS)
		.sort((a, b) => a.inDays - b.inDays);

	refresh.sort(mostOverdueFirst);
	moisture.sort(mostOverdueFirst);
	// Hold-ended tubs first (a last look before clearing), then checks by lateness.
	tubs.sort((a, b) =>
		a.kind === b.kind ? mostOverdueFirst(a, b) : a.kind === 'tub_hold_ended' ? -1 : 1
	);
	quiet.sort((a, b) => daysBetween(b.quietUntil, a.quietUntil));
	return {
		refresh,
		moisture,
		quiet,
		tubs,
		saleReady,
		total: refresh.length + moisture.length + tubs.length + saleReady.length
	};
}
