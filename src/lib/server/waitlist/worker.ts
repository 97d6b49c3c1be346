// The `waitlist-notify` job: a listing of a waited-for species went live, so each
// confirmed entry not yet told gets one e-mail, in the order people joined.
//
// Exactly once, however often the job runs and however many workers run it: each
// batch takes its rows with FOR UPDATE SKIP LOCKED, marks each one only while it is
// still unmarked, and queues its mail in that same transaction. A rolled-back batch
// leaves its rows unmarked and unmailed, for the retry. Batches of one species also
// queue behind a transaction-scoped advisory lock, so a second worker waits for the
// first batch and then finds its rows marked: mail leaves in the order of joining.
//
// No $env or $app imports here: the job runner passes the links' origin and secret.
import { sql } from 'kysely';
import type { Db } from '../db/connect';
import type { WaitlistNotifyJob } from '../jobs/boss';
import { writeAudit } from '../audit';
import { onOfferSql } from '../listings/offer';
import { queueMail } from '../mail';
import { basePriceCents } from '../../money/pricing';
import { leaveUrl, listingUrl, type WaitlistLinks } from './links';

/** Rows per transaction: a long list goes out in several short transactions, not one long one. */
export const NOTIFY_BATCH_SIZE = 100;

export type NotifyOutcome =
	| { mailed: number }
	/** Nothing was sent; the entries keep waiting for the next listing. */
	| { mailed: 0; skipped: 'no_listing' | 'not_on_offer' | 'other_species' };

interface ListingFacts {
	id: number;
	slug: string;
	title: string;
	speciesId: number;
	commonName: string;
	scientificName: string;
	priceFromCents: number;
	unitsOnOffer: number;
}

async function listingFacts(db: Db, listingId: number): Promise<ListingFacts | null> {
	const row = await db
		.selectFrom('listing as l')
		.innerJoin('species as s', 's.id', 'l.species_id')
		.select((eb) => [
			'l.id',
			'l.slug',
			'l.title',
			'l.unit_size',
			'l.base_price_cents',
			's.id as species_id',
			's.common_name',
			's.scientific_name',
			onOfferSql(eb.ref('l.id')).as('units_on_offer')
		])
		.where('l.id', '=', listingId)
		.executeTakeFirst();
	if (!row) return null;
	let priceFromCents = row.base_price_cents;
	if (priceFromCents === null) {
		// Kept by the listing writes; worked out from the tiers should a row lack it.
		const tiers = await db
			.selectFrom('price_tier')
			.select(['min_quantity as minQuantity', 'price_cents as priceCents'])
			.where('listing_id', '=', listingId)
			.execute();
		priceFromCents = basePriceCents(tiers, row.unit_size);
	}
	if (priceFromCents === null) return null;
	return {
		id: row.id,
		slug: row.slug,
		title: row.title,
		speciesId: row.species_id,
		commonName: row.common_name,
		scientificName: row.scientific_name,
		priceFromCents,
		unitsOnOffer: Number(row.units_on_offer)
	};
}

/** One batch in one transaction: how many rows it took, and how many of them it marked and mailed. */
async function notifyBatch(
	trx: Db,
	listing: ListingFacts,
	links: WaitlistLinks
): Promise<{ taken: number; mailed: number }> {
	await sql`select pg_advisory_xact_lock(hashtext(${'waitlist-notify:' + listing.speciesId}))`.execute(
		trx
	);
	const waiting = await trx
		.selectFrom('waitlist_entry as e')
		.leftJoin('User as u', 'u.id', 'e.user_id')
		.select(['e.id', 'e.email', 'u.name'])
		.where('e.species_id', '=', listing.speciesId)
		.where('e.confirmed_at', 'is not', null)
		.where('e.notified_at', 'is', null)
		// A customer who saved "no" to waitlist mail keeps the entry but is not written to.
		.where((eb) =>
			eb.not(
				eb.exists(
					eb
						.selectFrom('user_profile as p')
						.select('p.user_id')
						.whereRef('p.user_id', '=', 'e.user_id')
						.where('p.wants_waitlist_mail', '=', false)
				)
			)
		)
		.orderBy('e.created_at')
		.orderBy('e.id')
		.limit(NOTIFY_BATCH_SIZE)
		.forUpdate(['e'])
		.skipLocked()
		.execute();
	let mailed = 0;
	for (const entry of waiting) {
		// Still unmarked under the lock: the condition makes a second marking impossible.
		const marked = await trx
			.updateTable('waitlist_entry')
			.set({ notified_at: sql<Date>`now()`, notified_listing_id: listing.id })
			.where('id', '=', entry.id)
			.where('notified_at', 'is', null)
			.returning('id')
			.executeTakeFirst();
		if (!marked) continue;
		await queueMail(trx, {
			kind: 'waitlist_ready',
			to: entry.email,
			name: entry.name,
			commonName: listing.commonName,
			scientificName: listing.scientificName,
			listingTitle: listing.title,
			priceFromCents: listing.priceFromCents,
			listingUrl: listingUrl(links, listing.slug),
			leaveUrl: leaveUrl(links, entry)
		});
		mailed++;
	}
	if (mailed > 0) {
		await writeAudit(trx, {
			actorUserId: null,
			actorIp: null,
			action: 'waitlist.notify',
			entity: 'listing',
			entityId: listing.id,
			detail: { speciesId: listing.speciesId, mailed, entryIds: waiting.map((e) => e.id) }
		});
	}
	return { taken: waiting.length, mailed };
}

/**
 * Runs one `waitlist-notify` job. A listing that is gone, not on offer any more, or
 * not of the job's species sends nothing: its entries keep waiting for the next one.
 */
export async function notifyWaitlist(
	db: Db,
	job: WaitlistNotifyJob,
	links: WaitlistLinks
): Promise<NotifyOutcome> {
	const listing = await listingFacts(db, job.listingId);
	if (!listing) return { mailed: 0, skipped: 'no_listing' };
	if (listing.speciesId !== job.speciesId) return { mailed: 0, skipped: 'other_species' };
	if (listing.unitsOnOffer <= 0) return { mailed: 0, skipped: 'not_on_offer' };
	let mailed = 0;
	for (;;) {
		const batch = await db.transaction().execute((trx) => notifyBatch(trx, listing, links));
		mailed += batch.mailed;
		// A short batch is the end of the list (or the rest is another worker's, under its locks).
		if (batch.taken < NOTIFY_BATCH_SIZE) break;
	}
	return { mailed };
}
