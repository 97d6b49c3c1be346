// Quantity on offer: derived in PostgreSQL (migration 2026-12-02T0500's
// listing_on_offer / clutch_free_animals), never typed. Every page and every hold reads
// it through here, so the catalogue, the cart and a reservation agree on one number.
import { sql, type Expression, type RawBuilder } from 'kysely';
import type { Db } from '$lib/server/db';

/** Units of a listing that can be sold now: 0 unless live, and unless its clutch is listed. */
export function onOfferSql(listingId: Expression<number>): RawBuilder<number> {
	return sql<number>`listing_on_offer(${listingId})`;
}

/** Animals of a clutch not sold and not held. May be negative after a loss: a shortfall. */
export function clutchFreeAnimalsSql(clutchId: Expression<number>): RawBuilder<number> {
	return sql<number>`clutch_free_animals(${clutchId})`;
}

/** Units on offer for each listing asked for (missing ids are left out). */
export async function onOfferFor(
	db: Db,
	listingIds: readonly number[]
): Promise<Map<number, number>> {
	if (listingIds.length === 0) return new Map();
	const rows = await db
		.selectFrom('listing')
		.select((eb) => ['listing.id', onOfferSql(eb.ref('listing.id')).as('on_offer')])
		.where('listing.id', 'in', [...new Set(listingIds)])
		.execute();
	return new Map(rows.map((row) => [row.id, Number(row.on_offer)]));
}

export async function onOfferOf(db: Db, listingId: number): Promise<number> {
	return (await onOfferFor(db, [listingId])).get(listingId) ?? 0;
}
