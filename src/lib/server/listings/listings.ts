// Listings in the back office: the one module that writes `listing` and `price_tier`
// rows, and the clutch state moves listings cause (ready → listed when a listing of it
// goes live, listed → ready when its last live listing is withdrawn, → sold out when
// nothing is left). Quantity on offer is never stored or typed: it is read from
// PostgreSQL through offer.ts.
//
// Concurrency: every change locks the clutch row before the listing row (the clutch
// module's loss and recount paths lock the clutch and then call syncClutchSoldOut, which
// locks listings), so the two never wait on each other in opposite orders. Edits carry
// the stamp of the listing the page showed and are refused when someone saved since.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';
import type {
	AnimalGroup,
	Clutch,
	ClutchStage,
	ClutchState,
	Listing,
	ListingKind,
	ListingState,
	Sex,
	SizeClass
} from '$lib/server/db/schema';
import { writeAudit, type Actor } from '$lib/server/audit';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { clutchFreeAnimalsSql, onOfferOf, onOfferSql } from '$lib/server/listings/offer';
import { queueWaitlistNotice } from '$lib/server/waitlist/notify';
import { basePriceCents, sortedTiers, tiersProblem, type PriceTier } from '$lib/money/pricing';
import { todayInZone, type IsoDate } from '$lib/format/dates';
import {
	draftFromClutchProblem,
	listingChanges,
	listingSlug,
	nothingOnOfferProblem,
	pairProblem,
	publishProblem,
	shelfCountProblem,
	slugCandidate,
	soldOutDue,
	unitChangeProblem,
	unitSizeProblem,
	withdrawProblem,
	type ListingChanges,
	type ListingField,
	type ListingFilters
} from '$lib/stock/listing-rules';

// ---- shapes handed to routes

export interface ListingSnapshot {
	id: number;
	slug: string;
	kind: ListingKind;
	title: string;
	description: string;
	unitSize: number;
	sex: Sex;
	isLive: boolean;
	state: ListingState;
	supplyStock: number | null;
	publishedAt: Date | null;
	basePriceCents: number | null;
	updatedAt: Date;
	/** updated_at to the microsecond, as text: what an edit must carry to be accepted. */
	stamp: string;
	speciesId: number | null;
	clutchId: number | null;
	tiers: PriceTier[];
}

export type ListingRefusal = {
	ok: false;
	field: ListingField;
	problem: string;
	notFound?: true;
	/** Set when someone saved first: the listing as it is now. */
	current?: ListingSnapshot;
};

export type ListingOutcome<T = object> =
	({ ok: true; listing: ListingSnapshot } & T) | ListingRefusal;

const refuse = (field: ListingField, problem: string): ListingRefusal => ({
	ok: false,
	field,
	problem
});

function notFound(slug: string): ListingRefusal {
	return { ok: false, field: '', problem: `No listing has the address ${slug}.`, notFound: true };
}

/** A refusal found after the first write: thrown so the transaction rolls back. */
class RolledBack extends Error {
	constructor(readonly refusal: ListingRefusal) {
		super(refusal.problem);
	}
}

async function inTransaction<T extends object>(
	db: Db,
	work: (trx: Db) => Promise<ListingOutcome<T>>
): Promise<ListingOutcome<T>> {
	try {
		return await db.transaction().execute(work);
	} catch (failure) {
		if (failure instanceof RolledBack) return failure.refusal;
		throw failure;
	}
}

// ---- reading and locking rows

/** updated_at in whole microseconds: exact, where a JS Date would drop the last three digits. */
const stampSql = sql<string>`(floor(extract(epoch from listing.updated_at) * 1000000))::bigint::text`;

type ListingRow = Listing & { stamp: string };

async function tiersOf(db: Db, listingId: number): Promise<PriceTier[]> {
	const rows = await db
		.selectFrom('price_tier')
		.select(['min_quantity', 'price_cents'])
		.where('listing_id', '=', listingId)
		.orderBy('min_quantity')
		.execute();
	return rows.map((r) => ({ minQuantity: r.min_quantity, priceCents: r.price_cents }));
}

function snapshot(row: ListingRow, tiers: PriceTier[]): ListingSnapshot {
	return {
		id: row.id,
		slug: row.slug,
		kind: row.kind,
		title: row.title,
		description: row.description,
		unitSize: row.unit_size,
		sex: row.sex,
		isLive: row.is_live,
		state: row.state,
		supplyStock: row.supply_stock,
		publishedAt: row.published_at,
		basePriceCents: row.base_price_cents,
		updatedAt: row.updated_at,
		stamp: row.stamp,
		speciesId: row.species_id,
		clutchId: row.clutch_id,
		tiers
	};
}

function listingColumns() {
	return [
		'listing.id',
		'listing.slug',
		'listing.kind',
		'listing.species_id',
		'listing.clutch_id',
		'listing.title',
		'listing.description',
		'listing.unit_size',
		'listing.sex',
		'listing.is_live',
		'listing.state',
		'listing.supply_stock',
		'listing.published_at',
		'listing.base_price_cents',
		'listing.created_at',
		'listing.updated_at',
		stampSql.as('stamp')
	] as const;
}

async function lockListing(trx: Db, id: number): Promise<ListingRow> {
	return (await trx
		.selectFrom('listing')
		.select(listingColumns())
		.where('listing.id', '=', id)
		.forUpdate()
		.executeTakeFirstOrThrow()) as ListingRow;
}

async function readListing(db: Db, id: number): Promise<ListingRow> {
	return (await db
		.selectFrom('listing')
		.select(listingColumns())
		.where('listing.id', '=', id)
		.executeTakeFirstOrThrow()) as ListingRow;
}

async function lockClutch(trx: Db, id: number, mode: 'update' | 'share'): Promise<Clutch> {
	const query = trx.selectFrom('clutch').selectAll().where('id', '=', id);
	return (mode === 'update' ? query.forUpdate() : query.forShare()).executeTakeFirstOrThrow();
}

/**
 * Locks the clutch of a listing (if any), then the listing: always in that order.
 * clutch_id never changes once a listing exists, so it can be read before the locks.
 */
async function lockPair(
	trx: Db,
	slug: string,
	clutchLock: 'update' | 'share'
): Promise<{ row: ListingRow; clutch: Clutch | null } | null> {
	const head = await trx
		.selectFrom('listing')
		.select(['id', 'clutch_id'])
		.where('slug', '=', slug)
		.executeTakeFirst();
	if (!head) return null;
	const clutch = head.clutch_id === null ? null : await lockClutch(trx, head.clutch_id, clutchLock);
	return { row: await lockListing(trx, head.id), clutch };
}

/** Units of this listing held in carts right now (unexpired holds only). */
async function heldUnitsOf(db: Db, listingId: number): Promise<number> {
	const row = await db
		.selectFrom('reservation')
		.select(sql<number>`coalesce(sum(quantity), 0)::integer`.as('held'))
		.where('listing_id', '=', listingId)
		.where('state', '=', 'held')
		.where('expires_at', '>', sql<Date>`now()`)
		.executeTakeFirstOrThrow();
	return Number(row.held);
}

/** Animals of a clutch held in carts right now, over all its listings. */
async function heldAnimalsOf(db: Db, clutchId: number): Promise<number> {
	const row = await db
		.selectFrom('reservation as r')
		.innerJoin('listing as l', 'l.id', 'r.listing_id')
		.select(sql<number>`coalesce(sum(r.quantity * l.unit_size), 0)::integer`.as('held'))
		.where('l.clutch_id', '=', clutchId)
		.where('r.state', '=', 'held')
		.where('r.expires_at', '>', sql<Date>`now()`)
		.executeTakeFirstOrThrow();
	return Number(row.held);
}

async function freeAnimalsOf(db: Db, clutchId: number): Promise<number> {
	const row = await db
		.selectFrom('clutch')
		.select((eb) => clutchFreeAnimalsSql(eb.ref('clutch.id')).as('free'))
		.where('clutch.id', '=', clutchId)
		.executeTakeFirstOrThrow();
	return Number(row.free);
}

/** The shop itself (a paid order closing a clutch from a payment event): no user behind it. */
export type ShopActor = { userId: null; ip: null };

async function shopToday(db: Db, today?: IsoDate): Promise<IsoDate> {
	return today ?? todayInZone(await resolveShopTimeZone(db));
}

// ---- audit and clutch state moves

async function auditListing(
	trx: Db,
	actor: Actor | ShopActor,
	action: string,
	row: Pick<Listing, 'id' | 'slug'>,
	detail: Record<string, unknown>
) {
	await writeAudit(trx, {
		actorUserId: actor.userId,
		actorIp: actor.ip,
		action: `listing.${action}`,
		entity: 'listing',
		entityId: row.id,
		detail: { slug: row.slug, ...detail }
	});
}

/**
 * A state move a listing causes on its clutch: the row (version bumped, as every clutch
 * change does, so a clutch page opened before it saves against the new version), its
 * 'state' event and an audit entry, as the clutch module records its own moves.
 */
async function moveClutchState(
	trx: Db,
	actor: Actor | ShopActor,
	clutch: Clutch,
	to: ClutchState,
	reason: string,
	today: IsoDate,
	action: string
): Promise<Clutch> {
	const saved = await trx
		.updateTable('clutch')
		.set((eb) => ({
			state: to,
			paused_reason: null,
			version: eb('version', '+', 1),
			updated_at: sql`now()`
		}))
		.where('id', '=', clutch.id)
		.returningAll()
		.executeTakeFirstOrThrow();
	await trx
		.insertInto('clutch_event')
		.values({
			clutch_id: clutch.id,
			kind: 'state',
			from_value: clutch.state,
			to_value: to,
			reason,
			happened_on: today,
			actor_user_id: actor.userId
		})
		.execute();
	await writeAudit(trx, {
		actorUserId: actor.userId,
		actorIp: actor.ip,
		action: `clutch.${action}`,
		entity: 'clutch',
		entityId: clutch.id,
		detail: { code: clutch.code, from: clutch.state, to, reason }
	});
	return saved;
}

async function hasOtherLiveListing(trx: Db, clutchId: number, exceptId: number | null) {
	let query = trx
		.selectFrom('listing')
		.select('id')
		.where('clutch_id', '=', clutchId)
		.where('state', '=', 'live');
	if (exceptId !== null) query = query.where('id', '!=', exceptId);
	return (await query.limit(1).executeTakeFirst()) !== undefined;
}

export interface SoldOutSync {
	/** True when this call closed the clutch. */
	soldOut: boolean;
	/** The clutch as it is after the call. */
	clutch: Clutch;
	/** Listings this call marked sold out. */
	listings: { id: number; slug: string }[];
}

/**
 * Closes a clutch when nothing is left to sell: no animal free (alive less sold less
 * held) and no unexpired hold that could still come back. Its live listings go sold out
 * with it. Call inside the transaction of the change that may have emptied it (a loss,
 * a recount, a sale); the clutch row is locked here if the caller has not already.
 */
export async function syncClutchSoldOut(
	trx: Db,
	clutchId: number,
	actor: Actor | ShopActor,
	today?: IsoDate
): Promise<SoldOutSync> {
	const clutch = await lockClutch(trx, clutchId, 'update');
	if (clutch.state === 'sold_out') return { soldOut: false, clutch, listings: [] };
	// One connection in a transaction: these run one after the other anyway.
	const freeAnimals = await freeAnimalsOf(trx, clutchId);
	const heldAnimals = await heldAnimalsOf(trx, clutchId);
	let stateBeforePause: ClutchState | null = null;
	if (clutch.state === 'paused') {
		const lastPause = await trx
			.selectFrom('clutch_event')
			.select('from_value')
			.where('clutch_id', '=', clutchId)
			.where('kind', '=', 'pause')
			.orderBy('id', 'desc')
			.limit(1)
			.executeTakeFirst();
		stateBeforePause = (lastPause?.from_value as ClutchState | undefined) ?? null;
	}
	const due = soldOutDue({
		state: clutch.state,
		stateBeforePause,
		countAlive: clutch.count_alive,
		freeAnimals,
		heldAnimals
	});
	if (!due) return { soldOut: false, clutch, listings: [] };

	const day = await shopToday(trx, today);
	const reason =
		clutch.count_alive === 0
			? 'No animals left alive.'
			: 'Nothing left to sell: every animal alive is sold.';
	const saved = await moveClutchState(trx, actor, clutch, 'sold_out', reason, day, 'sold_out');
	const listings = await trx
		.updateTable('listing')
		.set({ state: 'sold_out', updated_at: sql`now()` })
		.where('clutch_id', '=', clutchId)
		.where('state', '=', 'live')
		.returning(['id', 'slug'])
		.execute();
	for (const listing of listings)
		await auditListing(trx, actor, 'sold_out', listing, {
			from: 'live',
			to: 'sold_out',
			clutch: clutch.code,
			freeAnimals
		});
	return { soldOut: true, clutch: saved, listings };
}

/**
 * Settles a clutch after a change that may leave it listed with nothing live (an
 * unpause back to listed after its last listing was withdrawn during the pause): it goes
 * back to ready; then it is closed if nothing is left.
 */
export async function syncClutchListedState(
	trx: Db,
	clutchId: number,
	actor: Actor,
	today?: IsoDate
): Promise<Clutch> {
	const clutch = await lockClutch(trx, clutchId, 'update');
	if (clutch.state === 'listed' && !(await hasOtherLiveListing(trx, clutchId, null))) {
		await moveClutchState(
			trx,
			actor,
			clutch,
			'ready',
			'None of its listings is live.',
			await shopToday(trx, today),
			'unlisted'
		);
	}
	return (await syncClutchSoldOut(trx, clutchId, actor, today)).clutch;
}

// ---- writing listings

export interface ListingInput {
	title: string;
	description: string;
	unitSize: number;
	sex: Sex;
	isLive: boolean;
	/** Supplies only: the species it is (a live culture), or null. */
	speciesId: number | null;
	/** Supplies only: the shelf count. */
	supplyStock: number | null;
	tiers: PriceTier[];
}

export type NewListingInput = ListingInput &
	({ kind: 'animal'; clutchCode: string } | { kind: 'supply' });

/** An animal listing is a live animal; a supply is live only when the keeper says so. */
function settled(kind: ListingKind, input: ListingInput): ListingInput {
	if (kind === 'animal') return { ...input, isLive: true, speciesId: null, supplyStock: null };
	return { ...input, unitSize: 1, sex: 'unsexed' };
}

function inputProblem(kind: ListingKind, input: ListingInput): ListingRefusal | null {
	const tiers = tiersProblem(input.tiers);
	if (tiers) return refuse('tierQuantity', tiers);
	const pair = pairProblem(input.sex, input.unitSize);
	if (pair) return refuse('unitSize', pair);
	if (kind === 'supply' && input.supplyStock === null)
		return refuse('supplyStock', 'Give the shelf count: how many you have to sell.');
	return null;
}

async function speciesProblem(trx: Db, speciesId: number | null): Promise<ListingRefusal | null> {
	if (speciesId === null) return null;
	const found = await trx
		.selectFrom('species')
		.select('id')
		.where('id', '=', speciesId)
		.executeTakeFirst();
	return found ? null : refuse('speciesId', 'That species is not in the catalogue.');
}

/** A slug no other listing has: the title's words (and clutch code), then -2, -3, … */
async function freeSlug(trx: Db, wanted: string, exceptId: number | null): Promise<string> {
	// One slug chooser at a time, so two listings with one title cannot both take it.
	await sql`select pg_advisory_xact_lock(hashtext('listing:slug'))`.execute(trx);
	const taken = await trx
		.selectFrom('listing')
		.select(['id', 'slug'])
		.where((eb) => eb.or([eb('slug', '=', wanted), eb('slug', 'like', `${wanted}-%`)]))
		.execute();
	const used = new Set(taken.filter((r) => r.id !== exceptId).map((r) => r.slug));
	for (let attempt = 1; ; attempt++) {
		const candidate = slugCandidate(wanted, attempt);
		if (!used.has(candidate)) return candidate;
	}
}

async function writeTiers(trx: Db, listingId: number, tiers: readonly PriceTier[]) {
	await trx.deleteFrom('price_tier').where('listing_id', '=', listingId).execute();
	if (tiers.length === 0) return;
	await trx
		.insertInto('price_tier')
		.values(
			sortedTiers(tiers).map((tier) => ({
				listing_id: listingId,
				min_quantity: tier.minQuantity,
				price_cents: tier.priceCents
			}))
		)
		.execute();
}

/** The fields an edit compares and audits, as the keeper sees them. */
function auditedFields(input: ListingInput) {
	return {
		title: input.title,
		description: input.description,
		unitSize: input.unitSize,
		sex: input.sex,
		isLive: input.isLive,
		speciesId: input.speciesId,
		supplyStock: input.supplyStock,
		tiers: sortedTiers(input.tiers)
	};
}

function inputOf(row: Listing, tiers: PriceTier[]): ListingInput {
	return {
		title: row.title,
		description: row.description,
		unitSize: row.unit_size,
		sex: row.sex,
		isLive: row.is_live,
		speciesId: row.kind === 'supply' ? row.species_id : null,
		supplyStock: row.supply_stock,
		tiers
	};
}

/** Makes a draft listing of a ready (or listed) clutch, or of a supply. */
export async function createListing(
	db: Db,
	actor: Actor,
	raw: NewListingInput
): Promise<ListingOutcome> {
	const input = settled(raw.kind, raw);
	const problem = inputProblem(raw.kind, input);
	if (problem) return problem;
	return inTransaction(db, async (trx) => {
		let clutch: Clutch | null = null;
		let speciesId = input.speciesId;
		if (raw.kind === 'animal') {
			const found = await trx
				.selectFrom('clutch')
				.select('id')
				.where('code', '=', raw.clutchCode)
				.executeTakeFirst();
			if (!found) return refuse('', `No clutch has the code ${raw.clutchCode}.`);
			clutch = await lockClutch(trx, found.id, 'share');
			const stateProblem = draftFromClutchProblem(clutch.state, clutch.code);
			if (stateProblem) return refuse('', stateProblem);
			const unit = unitSizeProblem(input.unitSize, clutch.count_alive, clutch.code);
			if (unit) return refuse('unitSize', unit);
			speciesId = clutch.species_id;
		} else {
			const missing = await speciesProblem(trx, speciesId);
			if (missing) return missing;
		}
		const slug = await freeSlug(trx, listingSlug(input.title, clutch?.code ?? null), null);
		const inserted = await trx
			.insertInto('listing')
			.values({
				slug,
				kind: raw.kind,
				species_id: speciesId,
				clutch_id: clutch?.id ?? null,
				title: input.title,
				description: input.description,
				unit_size: input.unitSize,
				sex: input.sex,
				is_live: input.isLive,
				state: 'draft',
				supply_stock: input.supplyStock,
				base_price_cents: basePriceCents(input.tiers, input.unitSize)
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await writeTiers(trx, inserted.id, input.tiers);
		await auditListing(
			trx,
			actor,
			'create',
			{ id: inserted.id, slug },
			{
				kind: raw.kind,
				clutch: clutch?.code ?? null,
				...auditedFields(input)
			}
		);
		const row = await readListing(trx, inserted.id);
		return { ok: true, listing: snapshot(row, sortedTiers(input.tiers)) };
	});
}

function stale(row: ListingRow, tiers: PriceTier[], field: ListingField = ''): ListingRefusal {
	return {
		ok: false,
		field,
		problem:
			'Someone else saved this listing since you opened it. What is on record now is shown; check your changes and save again.',
		current: snapshot(row, tiers)
	};
}

/** Saves a keeper's edit: refused if the listing changed since the page read it (`stamp`). */
export async function editListing(
	db: Db,
	actor: Actor,
	slug: string,
	raw: ListingInput & { stamp: string }
): Promise<ListingOutcome<{ changes: ListingChanges }>> {
	return inTransaction(db, async (trx) => {
		const locked = await lockPair(trx, slug, 'share');
		if (!locked) return notFound(slug);
		const { row, clutch } = locked;
		const tiersBefore = await tiersOf(trx, row.id);
		if (row.stamp !== raw.stamp) return stale(row, tiersBefore);

		const input = settled(row.kind, raw);
		const problem = inputProblem(row.kind, input);
		if (problem) return problem;
		const before = inputOf(row, tiersBefore);
		if (input.unitSize !== before.unitSize) {
			const change = unitChangeProblem(row.state, await heldUnitsOf(trx, row.id));
			if (change) return refuse('unitSize', change);
			if (clutch) {
				const unit = unitSizeProblem(input.unitSize, clutch.count_alive, clutch.code);
				if (unit) return refuse('unitSize', unit);
			}
		}
		if (row.kind === 'supply') {
			const missing = await speciesProblem(trx, input.speciesId);
			if (missing) return missing;
			if (input.supplyStock !== null && input.supplyStock !== before.supplyStock) {
				const shelf = shelfCountProblem(input.supplyStock, await heldUnitsOf(trx, row.id));
				if (shelf) return refuse('supplyStock', shelf);
			}
		}

		const changes = listingChanges(auditedFields(before), auditedFields(input));
		if (Object.keys(changes).length === 0)
			return { ok: true, listing: snapshot(row, tiersBefore), changes };
		// A listing keeps its address once it has been in the shop; a draft follows its title.
		const newSlug =
			changes.title && row.published_at === null
				? await freeSlug(trx, listingSlug(input.title, clutch?.code ?? null), row.id)
				: row.slug;
		await trx
			.updateTable('listing')
			.set({
				slug: newSlug,
				title: input.title,
				description: input.description,
				unit_size: input.unitSize,
				sex: input.sex,
				is_live: input.isLive,
				species_id: row.kind === 'supply' ? input.speciesId : row.species_id,
				supply_stock: row.kind === 'supply' ? input.supplyStock : null,
				base_price_cents: basePriceCents(input.tiers, input.unitSize),
				updated_at: sql`now()`
			})
			.where('id', '=', row.id)
			.execute();
		if (changes.tiers) await writeTiers(trx, row.id, input.tiers);
		await auditListing(
			trx,
			actor,
			'edit',
			{ id: row.id, slug: newSlug },
			{
				...(newSlug !== row.slug ? { slugFrom: row.slug } : {}),
				changes
			}
		);
		const saved = await readListing(trx, row.id);
		return { ok: true, listing: snapshot(saved, sortedTiers(input.tiers)), changes };
	});
}

/**
 * Draft or withdrawn (or a restocked supply) → live. Refused while its clutch is paused
 * or growing, and when nothing would be on offer: the listing is set live, the clutch
 * listed, and the derived quantity read back inside the transaction; 0 rolls it all back.
 * Queues the waitlist notice of its species in the same transaction.
 */
export async function publishListing(
	db: Db,
	actor: Actor,
	slug: string,
	input: { stamp: string },
	today?: IsoDate
): Promise<ListingOutcome<{ onOffer: number }>> {
	return inTransaction(db, async (trx) => {
		const locked = await lockPair(trx, slug, 'update');
		if (!locked) return notFound(slug);
		const { row, clutch } = locked;
		const tiers = await tiersOf(trx, row.id);
		if (row.stamp !== input.stamp) return stale(row, tiers);
		const problem = publishProblem({
			kind: row.kind,
			state: row.state,
			tierCount: tiers.length,
			unitSize: row.unit_size,
			clutch: clutch
				? {
						code: clutch.code,
						state: clutch.state,
						pausedReason: clutch.paused_reason,
						countAlive: clutch.count_alive
					}
				: null,
			supplyStock: row.supply_stock
		});
		if (problem) return refuse('', problem);

		await trx
			.updateTable('listing')
			.set({
				state: 'live',
				published_at: sql`coalesce(published_at, now())`,
				updated_at: sql`now()`
			})
			.where('id', '=', row.id)
			.execute();
		let clutchMoved = false;
		if (clutch && clutch.state === 'ready') {
			const day = await shopToday(trx, today);
			await moveClutchState(
				trx,
				actor,
				clutch,
				'listed',
				`Listing ${row.slug} went live.`,
				day,
				'listed'
			);
			clutchMoved = true;
		}
		const onOffer = await onOfferOf(trx, row.id);
		if (onOffer < 1) {
			const freeAnimals = clutch ? await freeAnimalsOf(trx, clutch.id) : null;
			throw new RolledBack(
				refuse(
					'',
					nothingOnOfferProblem({
						kind: row.kind,
						unitSize: row.unit_size,
						freeAnimals,
						heldUnits: await heldUnitsOf(trx, row.id)
					})
				)
			);
		}
		await auditListing(trx, actor, 'publish', row, {
			from: row.state,
			to: 'live',
			onOffer,
			firstTime: row.published_at === null,
			...(clutchMoved ? { clutch: { code: clutch?.code, from: 'ready', to: 'listed' } } : {})
		});
		if (row.species_id !== null)
			await queueWaitlistNotice(trx, { listingId: row.id, speciesId: row.species_id });
		const saved = await readListing(trx, row.id);
		return { ok: true, listing: snapshot(saved, tiers), onOffer };
	});
}

/** Live → withdrawn; the clutch goes back to ready when no listing of it is live any more. */
export async function withdrawListing(
	db: Db,
	actor: Actor,
	slug: string,
	input: { stamp: string },
	today?: IsoDate
): Promise<ListingOutcome<{ clutchState: ClutchState | null }>> {
	return inTransaction(db, async (trx) => {
		const locked = await lockPair(trx, slug, 'update');
		if (!locked) return notFound(slug);
		const { row, clutch } = locked;
		const tiers = await tiersOf(trx, row.id);
		if (row.stamp !== input.stamp) return stale(row, tiers);
		const problem = withdrawProblem(row.state);
		if (problem) return refuse('', problem);
		await trx
			.updateTable('listing')
			.set({ state: 'withdrawn', updated_at: sql`now()` })
			.where('id', '=', row.id)
			.execute();
		let clutchState: ClutchState | null = clutch?.state ?? null;
		if (
			clutch &&
			clutch.state === 'listed' &&
			!(await hasOtherLiveListing(trx, clutch.id, row.id))
		) {
			const day = await shopToday(trx, today);
			const moved = await moveClutchState(
				trx,
				actor,
				clutch,
				'ready',
				`Listing ${row.slug} was withdrawn; none of its listings is live.`,
				day,
				'unlisted'
			);
			clutchState = moved.state;
		}
		await auditListing(trx, actor, 'withdraw', row, {
			from: row.state,
			to: 'withdrawn',
			...(clutch && clutchState !== clutch.state
				? { clutch: { code: clutch.code, from: clutch.state, to: clutchState } }
				: {})
		});
		const saved = await readListing(trx, row.id);
		return { ok: true, listing: snapshot(saved, tiers), clutchState };
	});
}

// ---- the back-office pages

export interface ListingListRow {
	id: number;
	slug: string;
	kind: ListingKind;
	title: string;
	state: ListingState;
	unitSize: number;
	sex: Sex;
	isLive: boolean;
	basePriceCents: number | null;
	onOffer: number;
	speciesCommonName: string | null;
	speciesScientificName: string | null;
	clutchCode: string | null;
	clutchState: ClutchState | null;
	pausedReason: 'molting' | 'unwell' | null;
	updatedAt: Date;
}

/** The most rows the listings table shows at once; a shop this size has far fewer. */
export const LISTING_TABLE_CAP = 500;

/** Every listing matching the filters, live first, then drafts, withdrawn, sold out; one query. */
export async function listListings(
	db: Db,
	filters: ListingFilters
): Promise<{ rows: ListingListRow[]; capped: boolean }> {
	let query = db
		.selectFrom('listing')
		.leftJoin('species', 'species.id', 'listing.species_id')
		.leftJoin('clutch', 'clutch.id', 'listing.clutch_id')
		.select((eb) => [
			'listing.id',
			'listing.slug',
			'listing.kind',
			'listing.title',
			'listing.state',
			'listing.unit_size as unitSize',
			'listing.sex',
			'listing.is_live as isLive',
			'listing.base_price_cents as basePriceCents',
			onOfferSql(eb.ref('listing.id')).as('onOffer'),
			'species.common_name as speciesCommonName',
			'species.scientific_name as speciesScientificName',
			'clutch.code as clutchCode',
			'clutch.state as clutchState',
			'clutch.paused_reason as pausedReason',
			'listing.updated_at as updatedAt'
		]);
	if (filters.state) query = query.where('listing.state', '=', filters.state);
	if (filters.kind) query = query.where('listing.kind', '=', filters.kind);
	if (filters.species) query = query.where('species.slug', '=', filters.species);
	if (filters.q) {
		const pattern = `%${filters.q.replace(/[\\%_]/g, (char) => `\\${char}`)}%`;
		query = query.where((eb) =>
			eb.or([
				eb('listing.title', 'ilike', pattern),
				eb('listing.slug', 'ilike', pattern),
				eb('clutch.code', 'ilike', pattern)
			])
		);
	}
	const rows = await query
		.orderBy(
			sql`case listing.state when 'live' then 0 when 'draft' then 1 when 'withdrawn' then 2 else 3 end`
		)
		.orderBy('listing.title')
		.orderBy('listing.id')
		.limit(LISTING_TABLE_CAP + 1)
		.execute();
	return {
		rows: rows.slice(0, LISTING_TABLE_CAP).map((r) => ({ ...r, onOffer: Number(r.onOffer) })),
		capped: rows.length > LISTING_TABLE_CAP
	};
}

export interface ListableClutch {
	code: string;
	state: ClutchState;
	stage: ClutchStage;
	sizeClass: SizeClass;
	generation: number;
	countAlive: number;
	freeAnimals: number;
	speciesCommonName: string;
	speciesScientificName: string;
	listings: number;
}

/** Clutches a listing can be drafted from: ready or listed, with animals alive. */
export async function listableClutches(db: Db): Promise<ListableClutch[]> {
	const rows = await db
		.selectFrom('clutch')
		.innerJoin('species', 'species.id', 'clutch.species_id')
		.select((eb) => [
			'clutch.code',
			'clutch.state',
			'clutch.stage',
			'clutch.size_class as sizeClass',
			'clutch.generation',
			'clutch.count_alive as countAlive',
			clutchFreeAnimalsSql(eb.ref('clutch.id')).as('freeAnimals'),
			'species.common_name as speciesCommonName',
			'species.scientific_name as speciesScientificName',
			sql<number>`(select count(*)::integer from listing where listing.clutch_id = clutch.id)`.as(
				'listings'
			)
		])
		.where('clutch.state', 'in', ['ready', 'listed'])
		.where('clutch.count_alive', '>', 0)
		.orderBy(sql`clutch.state = 'listed'`)
		.orderBy('species.common_name')
		.orderBy('clutch.code')
		.execute();
	return rows.map((r) => ({
		...r,
		freeAnimals: Number(r.freeAnimals),
		listings: Number(r.listings)
	}));
}

export interface ClutchForListing {
	id: number;
	code: string;
	state: ClutchState;
	pausedReason: 'molting' | 'unwell' | null;
	stage: ClutchStage;
	sizeClass: SizeClass;
	generation: number;
	countAlive: number;
	freeAnimals: number;
	species: {
		id: number;
		slug: string;
		commonName: string;
		scientificName: string;
		animalGroup: AnimalGroup;
	};
}

/** A clutch as the new-listing form shows it, or null for an unknown code. */
export async function clutchForListing(db: Db, code: string): Promise<ClutchForListing | null> {
	const row = await db
		.selectFrom('clutch')
		.innerJoin('species', 'species.id', 'clutch.species_id')
		.select((eb) => [
			'clutch.id',
			'clutch.code',
			'clutch.state',
			'clutch.paused_reason',
			'clutch.stage',
			'clutch.size_class',
			'clutch.generation',
			'clutch.count_alive',
			clutchFreeAnimalsSql(eb.ref('clutch.id')).as('free'),
			'species.id as species_id',
			'species.slug as species_slug',
			'species.common_name',
			'species.scientific_name',
			'species.animal_group'
		])
		.where('clutch.code', '=', code)
		.executeTakeFirst();
	if (!row) return null;
	return {
		id: row.id,
		code: row.code,
		state: row.state,
		pausedReason: row.paused_reason,
		stage: row.stage,
		sizeClass: row.size_class,
		generation: row.generation,
		countAlive: row.count_alive,
		freeAnimals: Number(row.free),
		species: {
			id: row.species_id,
			slug: row.species_slug,
			commonName: row.common_name,
			scientificName: row.scientific_name,
			animalGroup: row.animal_group
		}
	};
}

export type OnOfferBreakdown =
	| {
			kind: 'animal';
			alive: number;
			/** Animals in paid-or-later orders, less what was restocked. */
			sold: number;
			/** Animals in unexpired cart holds, over every listing of the clutch. */
			heldNow: number;
			/** alive − sold − held, as PostgreSQL derives it (negative: a shortfall). */
			free: number;
			unitSize: number;
			/** What the shop offers now: 0 unless live and the clutch listed. */
			unitsOnOffer: number;
			/** What it would offer if it were live and its clutch listed. */
			unitsIfLive: number;
	  }
	| {
			kind: 'supply';
			shelf: number;
			heldNow: number;
			unitsOnOffer: number;
			unitsIfLive: number;
	  };

export interface ListingHistoryEntry {
	id: number;
	action: string;
	detail: Record<string, unknown>;
	at: Date;
	actorName: string | null;
}

export interface ListingPage {
	listing: ListingSnapshot;
	species: { id: number; slug: string; commonName: string; scientificName: string } | null;
	clutch: ClutchForListing | null;
	breakdown: OnOfferBreakdown;
	/** In the shop's catalogue now: live, and (for animals) its clutch listed. */
	inShop: boolean;
	/** Other listings of the same clutch: they share its animals. */
	siblings: {
		slug: string;
		title: string;
		state: ListingState;
		unitSize: number;
		sex: Sex;
		onOffer: number;
	}[];
	history: ListingHistoryEntry[];
	/** Why its clutch is paused, when it is: the reason, the keeper's note and the day. */
	pause: { reason: 'molting' | 'unwell'; note: string; since: IsoDate } | null;
}

const HISTORY_LIMIT = 50;

export async function getListingPage(db: Db, slug: string): Promise<ListingPage | null> {
	const head = await db
		.selectFrom('listing')
		.select('id')
		.where('slug', '=', slug)
		.executeTakeFirst();
	if (!head) return null;
	const row = await readListing(db, head.id);
	const [tiers, clutch, species, onOffer, history] = await Promise.all([
		tiersOf(db, row.id),
		row.clutch_id === null
			? Promise.resolve(null)
			: db
					.selectFrom('clutch')
					.select('code')
					.where('id', '=', row.clutch_id)
					.executeTakeFirstOrThrow()
					.then((c) => clutchForListing(db, c.code)),
		row.species_id === null
			? Promise.resolve(null)
			: db
					.selectFrom('species')
					.select(['id', 'slug', 'common_name', 'scientific_name'])
					.where('id', '=', row.species_id)
					.executeTakeFirst(),
		onOfferOf(db, row.id),
		db
			.selectFrom('audit_log as a')
			.leftJoin('User as u', 'u.id', 'a.actor_user_id')
			.select([
				'a.id',
				'a.action',
				'a.detail',
				'a.created_at',
				sql<string | null>`coalesce(u.name, u.email)`.as('actor_name')
			])
			.where('a.entity', '=', 'listing')
			.where('a.entity_id', '=', String(row.id))
			.orderBy('a.id', 'desc')
			.limit(HISTORY_LIMIT)
			.execute()
	]);

	let breakdown: OnOfferBreakdown;
	if (clutch) {
		const figures = await db
			.selectFrom('clutch as c')
			.select([
				sql<number>`coalesce((select sum((ol.quantity - ol.restocked_quantity) * ol.unit_size)
					from order_line ol join customer_order o on o.id = ol.order_id
					where ol.clutch_id = c.id and o.state not in ('cancelled', 'awaiting_payment')), 0)::integer`.as(
					'sold'
				),
				sql<number>`greatest(0, clutch_free_animals(c.id)) / ${row.unit_size}::integer`.as('ifLive')
			])
			.where('c.id', '=', clutch.id)
			.executeTakeFirstOrThrow();
		breakdown = {
			kind: 'animal',
			alive: clutch.countAlive,
			sold: Number(figures.sold),
			heldNow: await heldAnimalsOf(db, clutch.id),
			free: clutch.freeAnimals,
			unitSize: row.unit_size,
			unitsOnOffer: onOffer,
			unitsIfLive: Number(figures.ifLive)
		};
	} else {
		const held = await heldUnitsOf(db, row.id);
		const shelf = row.supply_stock ?? 0;
		breakdown = {
			kind: 'supply',
			shelf,
			heldNow: held,
			unitsOnOffer: onOffer,
			unitsIfLive: Math.max(0, shelf - held)
		};
	}

	const siblings =
		row.clutch_id === null
			? []
			: await db
					.selectFrom('listing')
					.select((eb) => [
						'slug',
						'title',
						'state',
						'unit_size as unitSize',
						'sex',
						onOfferSql(eb.ref('listing.id')).as('onOffer')
					])
					.where('clutch_id', '=', row.clutch_id)
					.where('id', '!=', row.id)
					.orderBy('id')
					.execute();

	const lastPause =
		clutch?.state === 'paused'
			? await db
					.selectFrom('clutch_event')
					.select(['reason', 'happened_on'])
					.where('clutch_id', '=', clutch.id)
					.where('kind', '=', 'pause')
					.orderBy('id', 'desc')
					.limit(1)
					.executeTakeFirst()
			: undefined;

	return {
		listing: snapshot(row, tiers),
		pause:
			clutch?.state === 'paused' && clutch.pausedReason
				? {
						reason: clutch.pausedReason,
						note: lastPause?.reason ?? '',
						since: lastPause?.happened_on ?? ''
					}
				: null,
		species: species
			? {
					id: species.id,
					slug: species.slug,
					commonName: species.common_name,
					scientificName: species.scientific_name
				}
			: null,
		clutch,
		breakdown,
		inShop: row.state === 'live' && (row.kind === 'supply' || clutch?.state === 'listed'),
		siblings: siblings.map((s) => ({ ...s, onOffer: Number(s.onOffer) })),
		history: history.map((h) => ({
			id: h.id,
			action: h.action,
			detail: (h.detail ?? {}) as Record<string, unknown>,
			at: h.created_at,
			actorName: h.actor_name
		}))
	};
}
