// The rules a clutch is born with: its generation and its projected sale-ready date.
// Pure: no clock, no I/O.
import { addDays, daysBetween, type IsoDate } from '$lib/format/dates';

/**
 * Young recovered from a colony's substrate are one generation on from the colony:
 * a wild-caught founding group (generation 0) yields captive-bred F1, an F1 colony F2.
 */
export function offspringGeneration(colonyGeneration: number): number {
	if (!Number.isInteger(colonyGeneration) || colonyGeneration < 0)
		throw new RangeError(`a generation is a whole number from 0, got ${colonyGeneration}`);
	return colonyGeneration + 1;
}

/** "F2", or "wild-caught" for generation 0. */
export function generationLabel(generation: number): string {
	return generation === 0 ? 'wild-caught' : `captive-bred F${generation}`;
}

/** The projected day a clutch reaches sale size: found date plus the species' grow-out weeks. */
export function projectedSaleReadyOn(foundOn: IsoDate, growOutWeeks: number): IsoDate {
	if (!Number.isInteger(growOutWeeks) || growOutWeeks < 1)
		throw new RangeError(`grow-out weeks must be a whole number from 1, got ${growOutWeeks}`);
	return addDays(foundOn, growOutWeeks * 7);
}

/** Why a clutch's found date is refused, or null: it cannot precede the tub it came from. */
export function foundDateProblem(
	foundOn: IsoDate,
	tubStartedOn: IsoDate | null,
	today: IsoDate
): string | null {
	if (tubStartedOn && daysBetween(tubStartedOn, foundOn) < 0)
		return `The tub was only set aside on ${tubStartedOn}; young cannot be found in it earlier.`;
	if (daysBetween(today, foundOn) > 0) return 'That date is still to come.';
	return null;
}
