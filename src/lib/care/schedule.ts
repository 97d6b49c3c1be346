// The care schedule (PRODUCT.md, "Computations" 2): when each colony is due its next
// substrate refresh and moisture check, when a molt means "do not dig", and when a
// resting tub is due a look or reaches the end of its hold. Pure: today is an input.
import { addDays, daysBetween, type IsoDate } from '$lib/format/dates';

/** Moisture is checked weekly (PRODUCT.md). */
export const MOISTURE_CHECK_DAYS = 7;
/** Resting tubs are looked through once a week while they rest (our default). */
export const TUB_CHECK_DAYS = 7;

export interface ColonyCareFacts {
	startedOn: IsoDate;
	/** The species' refresh interval (90–184 days: half the substrate every 3–6 months). */
	refreshIntervalDays: number;
	moltQuietDays: number;
	lastRefreshOn: IsoDate | null;
	lastMoistureCheckOn: IsoDate | null;
	lastMoltSeenOn: IsoDate | null;
}

export interface ColonySchedule {
	refreshDueOn: IsoDate;
	/** Days past the refresh date (0 when due today, negative while still ahead). */
	refreshOverdueDays: number;
	moistureDueOn: IsoDate;
	moistureOverdueDays: number;
	/** The last day of the post-molt quiet period, or null when none is running. */
	quietUntil: IsoDate | null;
}

/** The last date the colony is left undisturbed after a molt seen on `moltSeenOn`. */
export function quietPeriodEnds(moltSeenOn: IsoDate, moltQuietDays: number): IsoDate {
	return addDays(moltSeenOn, moltQuietDays - 1);
}

export function colonySchedule(facts: ColonyCareFacts, today: IsoDate): ColonySchedule {
	const refreshDueOn = addDays(facts.lastRefreshOn ?? facts.startedOn, facts.refreshIntervalDays);
	// A colony never checked is due its first check at once.
	const moistureDueOn = facts.lastMoistureCheckOn
		? addDays(facts.lastMoistureCheckOn, MOISTURE_CHECK_DAYS)
		: today;
	const quietEnd = facts.lastMoltSeenOn
		? quietPeriodEnds(facts.lastMoltSeenOn, facts.moltQuietDays)
		: null;
	return {
		refreshDueOn,
		refreshOverdueDays: daysBetween(refreshDueOn, today),
		moistureDueOn,
		moistureOverdueDays: daysBetween(moistureDueOn, today),
		quietUntil: quietEnd && daysBetween(today, quietEnd) >= 0 ? quietEnd : null
	};
}

/** The default hold-until of a tub set aside on `startedOn` (4–8 weeks, common practice). */
export function defaultHoldUntil(startedOn: IsoDate, tubHoldDays: number): IsoDate {
	return addDays(startedOn, tubHoldDays);
}

/** Why a hold-until date is refused, or null. */
export function holdUntilProblem(startedOn: IsoDate, holdUntil: IsoDate): string | null {
	const days = daysBetween(startedOn, holdUntil);
	if (days <= 0) return 'The hold must end after the day the tub was set aside.';
	if (days > 180) return 'Hold a tub for six months at most; old substrate is kept 1–2 months.';
	return null;
}

export interface TubFacts {
	startedOn: IsoDate;
	holdUntil: IsoDate;
	lastCheckOn: IsoDate | null;
}

export type TubDue =
	| { kind: 'hold_ended'; since: IsoDate; overdueDays: number }
	| { kind: 'check'; dueOn: IsoDate; overdueDays: number }
	| { kind: 'none'; nextCheckOn: IsoDate };

/** What a resting tub needs today: a last look once its hold ends, else a weekly check. */
export function tubDue(tub: TubFacts, today: IsoDate): TubDue {
	if (daysBetween(tub.holdUntil, today) >= 0)
		return {
			kind: 'hold_ended',
			since: tub.holdUntil,
			overdueDays: daysBetween(tub.holdUntil, today)
		};
	const dueOn = addDays(tub.lastCheckOn ?? tub.startedOn, TUB_CHECK_DAYS);
	const overdueDays = daysBetween(dueOn, today);
	return overdueDays >= 0
		? { kind: 'check', dueOn, overdueDays }
		: { kind: 'none', nextCheckOn: dueOn };
}
