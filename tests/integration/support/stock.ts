// Stock for shop tests: a bought-in clutch already listed, one live listing of it with
// its price tiers, and a guest cart holding some of it. Test data only; the app's own
// writes go through the listings and cart modules.
import type { ClutchStage, Sex } from '../../../src/lib/server/db/schema';
import type { Db } from '../../../src/lib/server/db/connect';
import type { PriceTier } from '../../../src/lib/money/pricing';
import { changeLine, ensureCartId, type CartOwner } from '../../../src/lib/server/cart/cart';

export interface ListedClutchSpec {
	speciesId: number;
	/** Unique per test database: the clutch code, listing slug and title are made from it. */
	code: string;
	slug: string;
	title: string;
	alive: number;
	tiers: PriceTier[];
	stage?: ClutchStage;
	unitSize?: number;
	sex?: Sex;
}

/** A seeded species' id by its slug (the demo seeds `cubaris-murina` and the rest). */
export async function speciesIdBySlug(db: Db, slug: string): Promise<number> {
	const species = await db
		.selectFrom('species')
		.select('id')
		.where('slug', '=', slug)
		.executeTakeFirstOrThrow();
	return species.id;
}

export async function insertListedClutch(
	db: Db,
	spec: ListedClutchSpec
): Promise<{ clutchId: number; listingId: number }> {
	const clutch = await db
		.insertInto('clutch')
		.values({
			code: spec.code,
			species_id: spec.speciesId,
			origin: 'bought_in',
			generation: 1,
			found_on: '2026-06-01',
			stage: spec.stage ?? 'juvenile',
			size_class: 'small',
			count_found: spec.alive,
			count_alive: spec.alive,
			state: 'listed',
			sale_ready_on: '2026-11-01'
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	const listing = await db
		.insertInto('listing')
		.values({
			slug: spec.slug,
			kind: 'animal',
			species_id: spec.speciesId,
			clutch_id: clutch.id,
			title: spec.title,
			unit_size: spec.unitSize ?? 1,
			sex: spec.sex ?? 'unsexed',
			state: 'live',
			published_at: new Date()
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	await db
		.insertInto('price_tier')
		.values(
			spec.tiers.map((tier) => ({
				listing_id: listing.id,
				min_quantity: tier.minQuantity,
				price_cents: tier.priceCents
			}))
		)
		.execute();
	return { clutchId: clutch.id, listingId: listing.id };
}

/** A new guest cart with `quantity` of the listing; null when the cart refused it. */
export async function guestCartWith(
	db: Db,
	listingId: number,
	quantity: number
): Promise<CartOwner | null> {
	const cartId = await ensureCartId(db, { userId: null, guestCartId: null });
	const owner: CartOwner = { userId: null, guestCartId: cartId };
	const outcome = await changeLine(db, owner, { listingId, quantity, mode: 'set' });
	return outcome.ok ? owner : null;
}
