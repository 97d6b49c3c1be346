// Making clutches: the one place new clutch rows are written (from a tub check, or
// bought in). Runs inside the caller's transaction and writes the 'found' event.
import type { Db } from '$lib/server/db';
import type { ClutchOrigin, ClutchStage, SizeClass } from '$lib/server/db/schema';
import { projectedSaleReadyOn } from '$lib/stock/clutch-rules';
import { nextClutchCodes } from '$lib/server/stock/codes';

export interface NewClutchPart {
	count: number;
	stage: ClutchStage;
	sizeClass: SizeClass;
	note?: string;
}

export interface NewClutches {
	speciesId: number;
	growOutWeeks: number;
	generation: number;
	foundOn: string;
	origin: Extract<ClutchOrigin, 'tub' | 'bought_in'>;
	tubId: number | null;
	tubCheckId: number | null;
	parts: NewClutchPart[];
}

export interface MadeClutch {
	id: number;
	code: string;
	count: number;
	saleReadyOn: string;
}

/** Inserts one clutch per part; the caller owns the transaction and the audit entry. */
export async function insertClutches(
	trx: Db,
	input: NewClutches,
	actorUserId: string | null
): Promise<MadeClutch[]> {
	const saleReadyOn = projectedSaleReadyOn(input.foundOn, input.growOutWeeks);
	for (const part of input.parts)
		if (!Number.isInteger(part.count) || part.count < 1)
			throw new RangeError(`a clutch holds at least one animal, got ${part.count}`);
	const codes = await nextClutchCodes(trx, input.speciesId, input.parts.length);
	const made: MadeClutch[] = [];
	for (const [index, part] of input.parts.entries()) {
		const code = codes[index]!;
		const row = await trx
			.insertInto('clutch')
			.values({
				code,
				species_id: input.speciesId,
				tub_id: input.tubId,
				tub_check_id: input.tubCheckId,
				origin: input.origin,
				generation: input.generation,
				found_on: input.foundOn,
				stage: part.stage,
				size_class: part.sizeClass,
				count_found: part.count,
				count_alive: part.count,
				sale_ready_on: saleReadyOn,
				note: part.note ?? ''
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await trx
			.insertInto('clutch_event')
			.values({
				clutch_id: row.id,
				kind: 'found',
				to_value: String(part.count),
				count_delta: part.count,
				happened_on: input.foundOn,
				actor_user_id: actorUserId
			})
			.execute();
		made.push({ id: row.id, code, count: part.count, saleReadyOn });
	}
	return made;
}
