// Whether an order's ship check still holds on its ship day. The ship-day page checks
// every box again against today's forecast when it opens; a box never goes out on a
// stale decision without the keeper seeing what changed. Pure: the fresh result is
// computed by the caller.
import { formatShopDate, type IsoDate } from '$lib/format/dates';
import type { Pack, ShipCheckResult } from '$lib/shipping/ship-check';
import { describeReason } from '$lib/shipping/reasons';

/** What the order was scheduled with. */
export interface ScheduledCheck {
	shipOn: IsoDate;
	packs: readonly Pack[];
	facilityPickup: boolean;
}

export type CheckChange =
	| { kind: 'hold'; summary: string; reasons: string[] }
	| { kind: 'later'; summary: string; shipDate: IsoDate; reasons: string[] }
	| { kind: 'packs'; summary: string; packs: Pack[]; reasons: string[] }
	| { kind: 'pickup'; summary: string; facilityPickup: boolean; reasons: string[] };

const packWords = (packs: readonly Pack[]) =>
	packs.length === 0 ? 'no pack' : packs.map((p) => `a ${p} pack`).join(' and ');

const samePacks = (a: readonly Pack[], b: readonly Pack[]) =>
	a.length === b.length && [...a].sort().join() === [...b].sort().join();

/** Calendar dates carry no zone; 'UTC' only keeps the formatter from shifting the day. */
const day = (date: IsoDate) => formatShopDate(date, 'UTC');

/**
 * Null when a check run now, starting from the ship day, still ships that day with the
 * same packs and pickup advice; otherwise the first difference, in words.
 */
export function checkChange(scheduled: ScheduledCheck, fresh: ShipCheckResult): CheckChange | null {
	const reasons = [...new Set(fresh.reasons.map(describeReason))];
	if (fresh.decision === 'hold')
		return {
			kind: 'hold',
			summary: `The forecast now says hold: not safe to ship on ${day(scheduled.shipOn)}. Look again on ${day(fresh.recheckDate)}.`,
			reasons
		};
	if (fresh.shipDate !== scheduled.shipOn)
		return {
			kind: 'later',
			summary: `The first safe day is now ${day(fresh.shipDate)}, not ${day(scheduled.shipOn)}.`,
			shipDate: fresh.shipDate,
			reasons
		};
	if (!samePacks(fresh.packs, scheduled.packs))
		return {
			kind: 'packs',
			summary: `The box now needs ${packWords(fresh.packs)}, not ${packWords(scheduled.packs)}.`,
			packs: [...fresh.packs],
			reasons
		};
	if (fresh.facilityPickup !== scheduled.facilityPickup)
		return {
			kind: 'pickup',
			summary: fresh.facilityPickup
				? 'The destination is now near a limit: advise holding the box at a staffed carrier facility for pickup.'
				: 'Facility pickup is no longer needed: the destination is comfortably inside the limits.',
			facilityPickup: fresh.facilityPickup,
			reasons
		};
	return null;
}
