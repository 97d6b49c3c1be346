// Carts and their lines, and the stock holds taken when checkout starts. This module
// owns the writes of cart, cart_line and reservation. A cart belongs to an account or,
// for a guest, to a signed cookie; either way its lines live in PostgreSQL. Every money
// figure is worked out here, on the server, from the listing's tiers at the moment of
// reading: the browser only ever shows what this module returned.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type { ClutchStage, ListingKind, Service, Sex } from '$lib/server/db/schema';
import { writeAudit } from '$lib/server/audit';
import { onOfferSql } from '$lib/server/listings/offer';
import { cartTotals, MAX_LINE_QUANTITY, tierFor, type PriceTier } from '$lib/money/pricing';
import { unitLabel } from '$lib/format/units';
import type { CartLineView, CartView, LineProblem } from '$lib/cart/types';

export type { CartLineView, CartView } from '$lib/cart/types';

/** Who a cart is for on this request: an account, a verified guest cart id, or neither yet. */
export interface CartOwner {
	userId: string | null;
	guestCartId: string | null;
}

export type CartChange =
	| { ok: true; cart: CartView }
	| {
			ok: false;
			status: 400 | 404 | 409;
			field: 'quantity' | 'listingId';
			problem: string;
			cart: CartView | null;
	  };

// ---- finding and making carts

/** The cart this request reads: the account's, else the guest's. Null when none exists yet. */
export async function findCartId(db: Db, owner: CartOwner): Promise<string | null> {
	if (owner.userId) {
		const row = await db
			.selectFrom('cart')
			.select('id')
			.where('user_id', '=', owner.userId)
			.executeTakeFirst();
		return row?.id ?? null;
	}
	if (owner.guestCartId) {
		const row = await db
			.selectFrom('cart')
			.select('id')
			.where('id', '=', owner.guestCartId)
			.where('user_id', 'is', null)
			.executeTakeFirst();
		return row?.id ?? null;
	}
	return null;
}

/** The cart to write to, made on first use. A guest cart's id goes back in a signed cookie. */
export async function ensureCartId(db: Db, owner: CartOwner): Promise<string> {
	const found = await findCartId(db, owner);
	if (found) return found;
	if (owner.userId) {
		// Two first adds at once from one account: the unique user_id keeps one cart.
		await db
			.insertInto('cart')
			.values({ user_id: owner.userId })
			.onConflict((oc) => oc.column('user_id').doNothing())
			.execute();
		const row = await db
			.selectFrom('cart')
			.select('id')
			.where('user_id', '=', owner.userId)
			.executeTakeFirstOrThrow();
		return row.id;
	}
	const row = await db
		.insertInto('cart')
		.values({ user_id: null })
		.returning('id')
		.executeTakeFirstOrThrow();
	return row.id;
}

/**
 * Sign-in: the guest cart's lines join the account's cart (quantities of the same listing
 * add up, to the line limit), its holds move with them, and the guest cart is removed.
 * Safe to call twice: the second call finds no guest cart and does nothing.
 */
export async function mergeGuestCart(
	db: Db,
	guestCartId: string,
	userId: string
): Promise<{ merged: number }> {
	return db.transaction().execute(async (trx) => {
		const guest = await trx
			.selectFrom('cart')
			.select('id')
			.where('id', '=', guestCartId)
			.where('user_id', 'is', null)
			.forUpdate()
			.executeTakeFirst();
		if (!guest) return { merged: 0 };
		await trx
			.insertInto('cart')
			.values({ user_id: userId })
			.onConflict((oc) => oc.column('user_id').doNothing())
			.execute();
		const account = await trx
			.selectFrom('cart')
			.select('id')
			.where('user_id', '=', userId)
			.forUpdate()
			.executeTakeFirstOrThrow();
		const lines = await trx
			.selectFrom('cart_line')
			.select(['listing_id', 'quantity'])
			.where('cart_id', '=', guest.id)
			.execute();
		for (const line of lines) {
			await trx
				.insertInto('cart_line')
				.values({ cart_id: account.id, listing_id: line.listing_id, quantity: line.quantity })
				.onConflict((oc) =>
					oc.columns(['cart_id', 'listing_id']).doUpdateSet((eb) => ({
						quantity: sql<number>`least(${eb.ref('cart_line.quantity')} + ${eb.ref('excluded.quantity')}, ${MAX_LINE_QUANTITY})`
					}))
				)
				.execute();
		}
		// The quantities changed, so no hold matches the cart any more: both carts' holds go.
		await releaseHolds(trx, [guest.id, account.id]);
		await trx.deleteFrom('cart').where('id', '=', guest.id).execute();
		await touch(trx, account.id);
		await writeAudit(trx, {
			actorUserId: userId,
			actorIp: null,
			action: 'cart.merge',
			entity: 'cart',
			entityId: account.id,
			detail: { guestCartId: guest.id, lines: lines.length }
		});
		return { merged: lines.length };
	});
}

async function touch(trx: Db, cartId: string): Promise<void> {
	await trx
		.updateTable('cart')
		.set({ updated_at: sql`now()` })
		.where('id', '=', cartId)
		.execute();
}

async function releaseHolds(trx: Db, cartIds: readonly string[]): Promise<number> {
	if (cartIds.length === 0) return 0;
	const released = await trx
		.updateTable('reservation')
		.set({ state: 'released', updated_at: sql`now()` })
		.where('cart_id', 'in', [...cartIds])
		.where('state', '=', 'held')
		.where('order_id', 'is', null)
		.executeTakeFirst();
	return Number(released.numUpdatedRows);
}

// ---- reading

interface LineRow {
	listing_id: number;
	quantity: number;
	slug: string;
	title: string;
	kind: ListingKind;
	unit_size: number;
	sex: Sex;
	is_live: boolean;
	listing_state: string;
	clutch_state: string | null;
	stage: ClutchStage | null;
	common_name: string | null;
	on_offer: number;
	held_here: number;
}

async function readLines(db: Db, cartId: string): Promise<LineRow[]> {
	const rows = await db
		.selectFrom('cart_line')
		.innerJoin('listing', 'listing.id', 'cart_line.listing_id')
		.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
		.leftJoin('species', 'species.id', 'listing.species_id')
		.select((eb) => [
			'cart_line.listing_id',
			'cart_line.quantity',
			'listing.slug',
			'listing.title',
			'listing.kind',
			'listing.unit_size',
			'listing.sex',
			'listing.is_live',
			'listing.state as listing_state',
			'clutch.state as clutch_state',
			'clutch.stage',
			'species.common_name',
			onOfferSql(eb.ref('listing.id')).as('on_offer'),
			// What this cart itself holds of the listing: it is not "taken" from this buyer.
			eb
				.selectFrom('reservation')
				.select(sql<number>`coalesce(sum(reservation.quantity), 0)::integer`.as('q'))
				.whereRef('reservation.listing_id', '=', 'listing.id')
				.where('reservation.cart_id', '=', cartId)
				.where('reservation.state', '=', 'held')
				.where('reservation.expires_at', '>', sql<Date>`now()`)
				.as('held_here')
		])
		.where('cart_line.cart_id', '=', cartId)
		.orderBy('cart_line.added_at')
		.orderBy('cart_line.id')
		.execute();
	return rows.map((row) => ({
		...row,
		on_offer: Number(row.on_offer),
		held_here: Number(row.held_here ?? 0)
	}));
}

async function readTiers(db: Db, listingIds: readonly number[]): Promise<Map<number, PriceTier[]>> {
	const byListing = new Map<number, PriceTier[]>();
	if (listingIds.length === 0) return byListing;
	const rows = await db
		.selectFrom('price_tier')
		.select(['listing_id', 'min_quantity', 'price_cents'])
		.where('listing_id', 'in', [...listingIds])
		.orderBy('listing_id')
		.orderBy('min_quantity')
		.execute();
	for (const row of rows) {
		const list = byListing.get(row.listing_id) ?? [];
		list.push({ minQuantity: row.min_quantity, priceCents: row.price_cents });
		byListing.set(row.listing_id, list);
	}
	return byListing;
}

/** Why a line cannot be bought as it stands, or null. `available` counts this cart's own holds. */
export function lineProblem(row: {
	quantity: number;
	listing_state: string;
	kind: ListingKind;
	clutch_state: string | null;
	available: number;
	hasTiers: boolean;
}): LineProblem | null {
	if (row.listing_state === 'withdrawn' || row.listing_state === 'draft' || !row.hasTiers)
		return { kind: 'gone', text: 'This listing has been taken off sale.' };
	if (row.kind === 'animal' && row.clutch_state === 'paused')
		return {
			kind: 'paused',
			text: 'These animals are resting (molting or unwell) and cannot be sold just now.'
		};
	if (row.available < 1 || row.listing_state === 'sold_out')
		return { kind: 'sold_out', text: 'Sold out since you added it.' };
	if (row.quantity > row.available)
		return {
			kind: 'short',
			text: `Only ${row.available} on offer now; you asked for ${row.quantity}. We will sell you ${row.available}.`
		};
	return null;
}

/** Fees per service and the hold time from the settings row (the schema's defaults before it exists). */
export async function cartSettings(
	db: Db
): Promise<{ fees: Record<Service, number>; holdMinutes: number }> {
	const row = await db
		.selectFrom('shop_setting')
		.select(['fee_overnight_cents', 'fee_two_day_cents', 'reservation_minutes'])
		.where('id', '=', true)
		.executeTakeFirst();
	return {
		fees: { overnight: row?.fee_overnight_cents ?? 4500, two_day: row?.fee_two_day_cents ?? 2800 },
		holdMinutes: row?.reservation_minutes ?? 15
	};
}

/** The cart as a buyer sees it: every line, what can be bought, and the totals for `service`. */
export async function readCart(
	db: Db,
	cartId: string | null,
	service: Service = 'overnight'
): Promise<CartView> {
	const { fees, holdMinutes } = await cartSettings(db);
	if (!cartId) return emptyCart(service, fees, holdMinutes);
	const rows = await readLines(db, cartId);
	const tiers = await readTiers(
		db,
		rows.map((row) => row.listing_id)
	);
	const lines: CartLineView[] = rows.map((row) => {
		const listingTiers = tiers.get(row.listing_id) ?? [];
		const available = row.on_offer + row.held_here;
		const problem = lineProblem({
			quantity: row.quantity,
			listing_state: row.listing_state,
			kind: row.kind,
			clutch_state: row.clutch_state,
			available,
			hasTiers: listingTiers.length > 0
		});
		const buyable = problem === null || problem.kind === 'short';
		const quantityToBuy = buyable ? Math.min(row.quantity, available) : 0;
		return {
			listingId: row.listing_id,
			slug: row.slug,
			title: row.title,
			commonName: row.common_name,
			stage: row.stage,
			sex: row.sex,
			unitSize: row.unit_size,
			unitLabel: unitLabel(row.unit_size, row.sex),
			isLive: row.is_live,
			quantity: row.quantity,
			quantityToBuy,
			available,
			tiers: listingTiers,
			tier: quantityToBuy > 0 ? tierFor(listingTiers, quantityToBuy) : null,
			lineTotalCents: 0,
			problem
		};
	});
	const priced = cartTotals(
		lines
			.filter((line) => line.quantityToBuy > 0)
			.map((line) => ({
				listingId: line.listingId,
				quantity: line.quantityToBuy,
				tiers: line.tiers,
				isLive: line.isLive
			})),
		fees[service]
	);
	const totalByListing = new Map(priced.lines.map((l) => [l.listingId, l.lineTotalCents]));
	for (const line of lines) line.lineTotalCents = totalByListing.get(line.listingId) ?? 0;
	const hold = await db
		.selectFrom('reservation')
		.select((eb) => eb.fn.min('expires_at').as('until'))
		.where('cart_id', '=', cartId)
		.where('state', '=', 'held')
		.where('expires_at', '>', sql<Date>`now()`)
		.executeTakeFirst();
	return {
		cartId,
		lines,
		itemCount: lines.reduce((sum, line) => sum + line.quantity, 0),
		service,
		fees,
		holdMinutes,
		subtotalCents: priced.subtotalCents,
		shippingCents: priced.shippingCents,
		totalCents: priced.totalCents,
		hasLive: priced.hasLive,
		heldUntil: hold?.until ? new Date(hold.until).toISOString() : null
	};
}

function emptyCart(service: Service, fees: Record<Service, number>, holdMinutes: number): CartView {
	return {
		cartId: null,
		lines: [],
		itemCount: 0,
		service,
		fees,
		holdMinutes,
		subtotalCents: 0,
		shippingCents: 0,
		totalCents: 0,
		hasLive: false,
		heldUntil: null
	};
}

/** The number shown on the cart button: units across the lines, without pricing anything. */
export async function cartItemCount(db: Db, cartId: string | null): Promise<number> {
	if (!cartId) return 0;
	const row = await db
		.selectFrom('cart_line')
		.select(sql<number>`coalesce(sum(quantity), 0)::integer`.as('n'))
		.where('cart_id', '=', cartId)
		.executeTakeFirst();
	return Number(row?.n ?? 0);
}

// ---- changing lines

/** The refusal of a first add when none is left: sold, or held in other buyers' checkouts. */
export const SOLD_OUT_TO_ADD =
	'Sold out: every one is sold or held for another buyer who is checking out.';

/** Why a typed quantity cannot be a line's quantity, or null. */
export function quantityProblem(quantity: unknown): string | null {
	if (typeof quantity !== 'number' || !Number.isFinite(quantity)) return 'Enter a number.';
	if (!Number.isInteger(quantity)) return 'Order whole units.';
	if (quantity < 1) return 'Order at least 1, or remove the line.';
	if (quantity > MAX_LINE_QUANTITY) return `At most ${MAX_LINE_QUANTITY} of one listing per order.`;
	return null;
}

interface SellableListing {
	id: number;
	state: string;
	kind: ListingKind;
	clutch_state: string | null;
	on_offer: number;
	tiers: number;
}

async function sellable(trx: Db, listingId: number): Promise<SellableListing | undefined> {
	const row = await trx
		.selectFrom('listing')
		.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
		.select((eb) => [
			'listing.id',
			'listing.state',
			'listing.kind',
			'clutch.state as clutch_state',
			onOfferSql(eb.ref('listing.id')).as('on_offer'),
			eb
				.selectFrom('price_tier')
				.select(eb.fn.countAll<number>().as('n'))
				.whereRef('price_tier.listing_id', '=', 'listing.id')
				.as('tiers')
		])
		.where('listing.id', '=', listingId)
		.executeTakeFirst();
	return row
		? { ...row, on_offer: Number(row.on_offer), tiers: Number(row.tiers ?? 0) }
		: undefined;
}

/**
 * Sets a listing's line to `quantity` (mode 'set') or adds `quantity` to it (mode 'add').
 * Refused, with the cart unchanged, when the listing cannot be sold or not that many are
 * on offer. Any change releases the cart's holds: they no longer match what it asks for.
 */
export async function changeLine(
	db: Db,
	owner: CartOwner,
	input: { listingId: number; quantity: number; mode: 'set' | 'add' },
	service: Service = 'overnight'
): Promise<CartChange & { cartId: string | null }> {
	const shape = quantityProblem(input.quantity);
	if (shape) {
		const cartId = await findCartId(db, owner);
		return {
			ok: false,
			status: 400,
			field: 'quantity',
			problem: shape,
			cart: await readCart(db, cartId, service),
			cartId
		};
	}
	const cartId = await ensureCartId(db, owner);
	const refusal = await db.transaction().execute(async (trx) => {
		await trx.selectFrom('cart').select('id').where('id', '=', cartId).forUpdate().execute();
		const listing = await sellable(trx, input.listingId);
		if (!listing || listing.state === 'draft')
			return {
				status: 404 as const,
				field: 'listingId' as const,
				problem: 'That listing does not exist.'
			};
		const existing = await trx
			.selectFrom('cart_line')
			.select('quantity')
			.where('cart_id', '=', cartId)
			.where('listing_id', '=', input.listingId)
			.executeTakeFirst();
		const heldHere = await trx
			.selectFrom('reservation')
			.select(sql<number>`coalesce(sum(quantity), 0)::integer`.as('q'))
			.where('cart_id', '=', cartId)
			.where('listing_id', '=', input.listingId)
			.where('state', '=', 'held')
			.where('expires_at', '>', sql<Date>`now()`)
			.executeTakeFirst();
		const available = listing.on_offer + Number(heldHere?.q ?? 0);
		const wanted =
			input.mode === 'add' ? (existing?.quantity ?? 0) + input.quantity : input.quantity;
		const problem = lineProblem({
			quantity: wanted,
			listing_state: listing.state,
			kind: listing.kind,
			clutch_state: listing.clutch_state,
			available,
			hasTiers: listing.tiers > 0
		});
		// Someone adding a line for the first time never added it, so "since you added it" is wrong.
		if (problem?.kind === 'sold_out' && !existing)
			return { status: 409 as const, field: 'listingId' as const, problem: SOLD_OUT_TO_ADD };
		if (problem && problem.kind !== 'short')
			return { status: 409 as const, field: 'listingId' as const, problem: problem.text };
		if (wanted > MAX_LINE_QUANTITY)
			return {
				status: 400 as const,
				field: 'quantity' as const,
				problem: `At most ${MAX_LINE_QUANTITY} of one listing per order.`
			};
		if (problem) {
			const inCart = existing ? ` (you have ${existing.quantity} in your cart)` : '';
			return {
				status: 409 as const,
				field: 'quantity' as const,
				problem: `Only ${available} on offer${inCart}.`
			};
		}
		await trx
			.insertInto('cart_line')
			.values({ cart_id: cartId, listing_id: input.listingId, quantity: wanted })
			.onConflict((oc) => oc.columns(['cart_id', 'listing_id']).doUpdateSet({ quantity: wanted }))
			.execute();
		await releaseHolds(trx, [cartId]);
		await touch(trx, cartId);
		return null;
	});
	const cart = await readCart(db, cartId, service);
	if (refusal) return { ok: false, ...refusal, cart, cartId };
	return { ok: true, cart, cartId };
}

export async function removeLine(
	db: Db,
	owner: CartOwner,
	listingId: number,
	service: Service = 'overnight'
): Promise<CartView> {
	const cartId = await findCartId(db, owner);
	if (!cartId) return readCart(db, null, service);
	await db.transaction().execute(async (trx) => {
		await trx.selectFrom('cart').select('id').where('id', '=', cartId).forUpdate().execute();
		const removed = await trx
			.deleteFrom('cart_line')
			.where('cart_id', '=', cartId)
			.where('listing_id', '=', listingId)
			.executeTakeFirst();
		if (Number(removed.numDeletedRows) > 0) {
			await releaseHolds(trx, [cartId]);
			await touch(trx, cartId);
		}
	});
	return readCart(db, cartId, service);
}

// ---- holds (reservations)

export type HoldOutcome =
	| { ok: true; heldUntil: Date; cart: CartView }
	| {
			ok: false;
			problem: string;
			/** Per listing: why that line could not be held as it stands. */
			lines: Array<{ listingId: number; problem: string; available: number }>;
			cart: CartView;
	  };

/**
 * Checkout starts: every line of the cart is held for the shop's reservation time, in
 * one transaction, or nothing is. The clutches (and supply listings) behind the lines are
 * locked in id order first, so two buyers racing for the last animals queue up here and
 * the second sees what the first took: together they never hold more than is on offer.
 */
export async function holdCart(
	db: Db,
	owner: CartOwner,
	clientIp: string | null,
	service: Service = 'overnight'
): Promise<HoldOutcome> {
	const cartId = await findCartId(db, owner);
	if (!cartId) {
		return {
			ok: false,
			problem: 'Your cart is empty.',
			lines: [],
			cart: await readCart(db, null, service)
		};
	}
	const minutes = (await cartSettings(db)).holdMinutes;
	const result = await db
		.transaction()
		.execute((trx) => holdCartIn(trx, cartId, owner, clientIp, minutes))
		.catch((failure: unknown) => {
			if (failure instanceof HoldRefused)
				return { ok: false as const, problem: failure.message, lines: failure.lines };
			throw failure;
		});
	const cart = await readCart(db, cartId, service);
	return result.ok ? { ...result, cart } : { ...result, cart };
}

/**
 * Locks the stock rows behind some lines: their clutches, then their supply listings,
 * each by id. Every hold and every sale takes its locks in this order, so two buyers
 * reaching for the same animals wait for each other instead of deadlocking. Returns
 * the clutches locked.
 */
export async function lockStockOf(
	trx: Db,
	lines: readonly { listing_id: number; clutch_id: number | null; kind: string }[]
): Promise<number[]> {
	const clutchIds = [...new Set(lines.flatMap((l) => (l.clutch_id === null ? [] : [l.clutch_id])))];
	if (clutchIds.length)
		await trx
			.selectFrom('clutch')
			.select('id')
			.where('id', 'in', clutchIds)
			.orderBy('id')
			.forUpdate()
			.execute();
	const supplyIds = [...new Set(lines.filter((l) => l.kind === 'supply').map((l) => l.listing_id))];
	if (supplyIds.length)
		await trx
			.selectFrom('listing')
			.select('id')
			.where('id', 'in', supplyIds)
			.orderBy('id')
			.forUpdate()
			.execute();
	return clutchIds;
}

/**
 * The hold itself, in the caller's transaction (checkout holds and makes its order in
 * one): locks the cart, then the clutches and supply listings, and holds every line or
 * throws HoldRefused, which rolls back the caller's whole transaction.
 */
export async function holdCartIn(
	trx: Db,
	cartId: string,
	owner: CartOwner,
	clientIp: string | null,
	minutes: number
): Promise<{ ok: true; heldUntil: Date } | { ok: false; problem: string; lines: [] }> {
	await trx.selectFrom('cart').select('id').where('id', '=', cartId).forUpdate().execute();
	await releaseHolds(trx, [cartId]);
	const lines = await trx
		.selectFrom('cart_line')
		.innerJoin('listing', 'listing.id', 'cart_line.listing_id')
		.select(['cart_line.listing_id', 'cart_line.quantity', 'listing.clutch_id', 'listing.kind'])
		.where('cart_line.cart_id', '=', cartId)
		.orderBy('cart_line.listing_id')
		.execute();
	if (lines.length === 0) return { ok: false as const, problem: 'Your cart is empty.', lines: [] };
	await lockStockOf(trx, lines);
	// A fresh statement after the locks: it sees every hold committed before them.
	const problems: Array<{ listingId: number; problem: string; available: number }> = [];
	for (const line of lines) {
		const listing = await sellable(trx, line.listing_id);
		const available = listing?.on_offer ?? 0;
		const problem = listing
			? lineProblem({
					quantity: line.quantity,
					listing_state: listing.state,
					kind: listing.kind,
					clutch_state: listing.clutch_state,
					available,
					hasTiers: listing.tiers > 0
				})
			: { kind: 'gone' as const, text: 'This listing has been taken off sale.' };
		if (problem) {
			problems.push({
				listingId: line.listing_id,
				problem:
					problem.kind === 'short'
						? `Only ${available} left now; lower the quantity to hold them.`
						: problem.text,
				available
			});
			continue;
		}
		// Each insert is its own statement, so a later line of the same clutch sees this one.
		await trx
			.insertInto('reservation')
			.values({
				cart_id: cartId,
				listing_id: line.listing_id,
				quantity: line.quantity,
				state: 'held',
				expires_at: sql<Date>`now() + make_interval(mins => ${minutes})`
			})
			.execute();
	}
	if (problems.length > 0) {
		// All or nothing: the transaction rolls back every hold made above.
		throw new HoldRefused(problems);
	}
	const held = await trx
		.selectFrom('reservation')
		.select((eb) => eb.fn.min('expires_at').as('until'))
		.where('cart_id', '=', cartId)
		.where('state', '=', 'held')
		.executeTakeFirstOrThrow();
	await writeAudit(trx, {
		actorUserId: owner.userId,
		actorIp: clientIp,
		action: 'cart.hold',
		entity: 'cart',
		entityId: cartId,
		detail: {
			lines: lines.map((l) => ({ listingId: l.listing_id, quantity: l.quantity })),
			minutes
		}
	});
	return { ok: true as const, heldUntil: new Date(held.until as Date) };
}

export class HoldRefused extends Error {
	constructor(readonly lines: Array<{ listingId: number; problem: string; available: number }>) {
		super(
			lines.length === 1
				? 'One line of your cart cannot be held as it stands; nothing was held.'
				: `${lines.length} lines of your cart cannot be held as they stand; nothing was held.`
		);
	}
}

/** Lets go of a cart's holds (the buyer left checkout). */
export async function releaseCartHolds(db: Db, owner: CartOwner): Promise<number> {
	const cartId = await findCartId(db, owner);
	if (!cartId) return 0;
	return db.transaction().execute((trx) => releaseHolds(trx, [cartId]));
}

/**
 * The expiry sweep (a pg-boss job each minute): holds past their time become released.
 * Reads never wait for it — an expired hold counts for nothing the moment it expires —
 * so this only tidies the rows. Guest carts untouched for 30 days go too.
 */
export async function sweepExpiredHolds(
	db: Db
): Promise<{ released: number; cartsRemoved: number }> {
	const released = await db
		.updateTable('reservation')
		.set({ state: 'released', updated_at: sql`now()` })
		.where('state', '=', 'held')
		.where('expires_at', '<=', sql<Date>`now()`)
		.executeTakeFirst();
	const removed = await db
		.deleteFrom('cart')
		.where('user_id', 'is', null)
		.where('updated_at', '<', sql<Date>`now() - interval '30 days'`)
		.where(({ not, exists, selectFrom }) =>
			not(
				exists(
					selectFrom('reservation')
						.select('reservation.id')
						.whereRef('reservation.cart_id', '=', 'cart.id')
						.where('reservation.order_id', 'is not', null)
				)
			)
		)
		.executeTakeFirst();
	return {
		released: Number(released.numUpdatedRows),
		cartsRemoved: Number(removed.numDeletedRows)
	};
}
