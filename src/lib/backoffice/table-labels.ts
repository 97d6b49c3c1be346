// Words the back-office tables show for codes that $lib/format/labels has no map for,
// and the compact forms of dates and generations a dense table needs.
import { parseIsoDate, type IsoDate } from '$lib/format/dates';

/** Why a clutch is paused (clutch.paused_reason). */
export const pausedReasonLabels = {
	molting: 'Molting',
	unwell: 'Unwell'
} as const satisfies Record<'molting' | 'unwell', string>;

/** A colony is active until it has a retired_on date. */
export const colonyStatusLabels = {
	active: 'Active',
	retired: 'Retired'
} as const;

export type ColonyStatus = keyof typeof colonyStatusLabels;

/** "F2": captive-bred generation as breeders write it (F0 for wild-caught founders). */
export function formatGeneration(generation: number): string {
	if (!Number.isInteger(generation) || generation < 0) {
		throw new RangeError(`a generation is a whole number from 0, got ${generation}`);
	}
	return `F${generation}`;
}

const compactDate = new Intl.DateTimeFormat('en-US', {
	timeZone: 'UTC',
	year: 'numeric',
	month: 'short',
	day: 'numeric'
});

/** "Mar 10, 2026": a calendar date short enough for a table cell, never shifted by a zone. */
export function formatLedgerDate(isoDate: IsoDate): string {
	return compactDate.format(parseIsoDate(isoDate));
}
