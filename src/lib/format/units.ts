// How a listing's unit reads: one animal, a group, or a sexed pair. Pure.
import type { Sex } from '$lib/server/db/schema';

/** "each", "pair", "group of 5". */
export function unitLabel(unitSize: number, sex: Sex): string {
	if (sex === 'pair' && unitSize === 2) return 'pair';
	if (unitSize === 1) return 'each';
	return `group of ${unitSize}`;
}

/** "1 group of 5", "3 groups of 5", "2 pairs", "4" (for single animals). */
export function unitCount(quantity: number, unitSize: number, sex: Sex): string {
	const label = unitLabel(unitSize, sex);
	if (label === 'each') return String(quantity);
	if (label === 'pair') return `${quantity} ${quantity === 1 ? 'pair' : 'pairs'}`;
	return `${quantity} ${quantity === 1 ? 'group' : 'groups'} of ${unitSize}`;
}
