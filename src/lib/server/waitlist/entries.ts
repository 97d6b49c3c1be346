// Species waitlists: join (a signed-in customer at once, a guest by a mailed link),
// confirm, leave, and what the pages show. This module owns waitlist_entry's writes,
// apart from the notice marks the worker (worker.ts) sets.
//
// No $env or $app imports here: routes pass the links' origin and secret, tests theirs.
import { wantWaitlistMail } from '../accounts/profile';
import { sql } from 'kysely';
import type { Db } from '../db/connect';
import type { AnimalGroup } from '../db/schema';
import { writeAudit } from '../audit';
import { hashSecret, newSecret } from '../auth/tokens';
import { onOfferSql } from '../listings/offer';
import { queueMail } from '../mail';
import {
	CONFIRM_LINK_DAYS,
	confirmLinkExpired,
	customerJoinStep,
	guestJoinStep,
	normaliseWaitlistEmail,
	standingOf,
	type WaitlistStanding
} from '../../waitlist/rules';
import {
	confirmUrl,
	leaveTokenEntryId,
	leaveTokenMatches,
	leaveUrl,
	type WaitlistLinks
} from './links';

/** Who is acting, as the audit log records it. */
export type WaitlistActor = { userId: string | null; ip: string | null };

export interface WaitlistSpecies {
	id: number;
	slug: string;
	commonName: string;
	scientificName: string;
	animalGroup: AnimalGroup;
	/** Units on offer over all its listings: above 0 means there is nothing to wait for. */
	unitsOnOffer: number;
	/** The earliest projected sale-ready date of a clutch still growing, if any. */
	nextReadyOn: string | null;
}

type SpeciesRow = {
	id: number;
	slug: string;
	common_name: string;
	scientific_name: string;
	animal_group: AnimalGroup;
};

function speciesQuery(db: Db) {
	return db.selectFrom('species as s').select((eb) => [
		's.id',
		's.slug',
		's.common_name',
		's.scientific_name',
		's.animal_group',
		eb
			.selectFrom('listing as l')
			.select((sub) =>
				sql<number>`coalesce(sum(${onOfferSql(sub.ref('l.id'))}), 0)::integer`.as('n')
			)
			.whereRef('l.species_id', '=', 's.id')
			.where('l.state', '=', 'live')
			.as('units_on_offer'),
		eb
			.selectFrom('clutch as c')
			.select((c) => c.fn.min('c.sale_ready_on').as('d'))
			.whereRef('c.species_id', '=', 's.id')
			.where('c.state', 'in', ['growing', 'ready'])
			.where('c.count_alive', '>', 0)
			.as('next_ready_on')
	]);
}

function toSpecies(
	row: SpeciesRow & { units_on_offer: number | null; next_ready_on: string | null }
): WaitlistSpecies {
	return {
		id: row.id,
		slug: row.slug,
		commonName: row.common_name,
		scientificName: row.scientific_name,
		animalGroup: row.animal_group,
		unitsOnOffer: Number(row.units_on_offer ?? 0),
		nextReadyOn: row.next_ready_on
	};
}

/** The species a waitlist page is for, with whether it has stock on offer now; null if unknown. */
export async function findWaitlistSpecies(db: Db, slug: string): Promise<WaitlistSpecies | null> {
	const row = await speciesQuery(db).where('s.slug', '=', slug).executeTakeFirst();
	return row ? toSpecies(row) : null;
}

async function speciesById(db: Db, id: number): Promise<WaitlistSpecies> {
	return toSpecies(await speciesQuery(db).where('s.id', '=', id).executeTakeFirstOrThrow());
}

type LockedEntry = {
	id: number;
	user_id: string | null;
	confirmed_at: Date | null;
	notified_at: Date | null;
};

/** The entry for this species and address under a row lock, or null when there is none. */
async function lockEntry(trx: Db, speciesId: number, email: string): Promise<LockedEntry | null> {
	const row = await trx
		.selectFrom('waitlist_entry')
		.select(['id', 'user_id', 'confirmed_at', 'notified_at'])
		.where('species_id', '=', speciesId)
		.where('email', '=', email)
		.forUpdate()
		.executeTakeFirst();
	return row ?? null;
}

/**
 * A new entry, or null when another request made the same one a moment ago (the
 * unique species + e-mail key): the caller then locks that one and goes on from it.
 */
async function insertEntry(
	trx: Db,
	values: {
		species_id: number;
		email: string;
		user_id: string | null;
		confirmed_at: Date | null;
		confirm_token_hash: string | null;
		created_at: Date;
	}
): Promise<number | null> {
	const row = await trx
		.insertInto('waitlist_entry')
		.values(values)
		.onConflict((oc) => oc.columns(['species_id', 'email']).doNothing())
		.returning('id')
		.executeTakeFirst();
	return row?.id ?? null;
}

export type JoinRefusal = { ok: false; reason: 'on_offer'; species: WaitlistSpecies };

export type GuestJoinResult =
	/** The same answer whatever the address's standing, so the page cannot tell who is listed. */
	{ ok: true } | JoinRefusal;

/**
 * A guest joins by e-mail: a new or renewed entry waits unconfirmed and a one-time
 * link is mailed (its token stored only as a SHA-256); a confirmed entry still waiting
 * is left alone, so typing someone's address changes nothing for them.
 */
export async function joinAsGuest(
	db: Db,
	input: { speciesId: number; email: string },
	links: WaitlistLinks,
	actor: WaitlistActor,
	now = new Date()
): Promise<GuestJoinResult> {
	const email = normaliseWaitlistEmail(input.email);
	return db.transaction().execute(async (trx) => {
		const species = await speciesById(trx, input.speciesId);
		if (species.unitsOnOffer > 0) return { ok: false, reason: 'on_offer', species };

		const token = newSecret();
		const tokenHash = hashSecret(token);
		let entry = await lockEntry(trx, species.id, email);
		let step = guestJoinStep(
			entry && { confirmedAt: entry.confirmed_at, notifiedAt: entry.notified_at }
		);
		let entryId = entry?.id ?? null;
		if (step === 'create') {
			entryId = await insertEntry(trx, {
				species_id: species.id,
				email,
				user_id: null,
				confirmed_at: null,
				confirm_token_hash: tokenHash,
				created_at: now
			});
			if (entryId === null) {
				entry = await lockEntry(trx, species.id, email);
				if (!entry) throw new Error('the waitlist entry vanished while it was being joined');
				entryId = entry.id;
				step = guestJoinStep({ confirmedAt: entry.confirmed_at, notifiedAt: entry.notified_at });
			}
		}
		if (step === 'reissue') {
			// A renewed request starts its place (and its link's week) from now.
			await trx
				.updateTable('waitlist_entry')
				.set({
					confirm_token_hash: tokenHash,
					confirmed_at: null,
					notified_at: null,
					notified_listing_id: null,
					created_at: now
				})
				.where('id', '=', entryId!)
				.execute();
		}
		if (step !== 'nothing') {
			await queueMail(trx, {
				kind: 'waitlist_confirm',
				to: email,
				commonName: species.commonName,
				scientificName: species.scientificName,
				url: confirmUrl(links, token),
				leaveUrl: leaveUrl(links, { id: entryId!, email }),
				expiresInMinutes: CONFIRM_LINK_DAYS * 24 * 60
			});
		}
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'waitlist.join',
			entity: 'waitlist_entry',
			entityId: entryId,
			detail: { speciesId: species.id, email, via: 'guest', step }
		});
		return { ok: true };
	});
}

export type CustomerJoinResult =
	{ ok: true; outcome: 'joined' | 'already'; entryId: number } | JoinRefusal;

/**
 * A signed-in customer joins with the account's own address, which signing in has
 * already proved, so the entry is confirmed at once (a guest entry of theirs too).
 */
export async function joinAsCustomer(
	db: Db,
	input: { speciesId: number; user: { id: string; email: string } },
	actor: WaitlistActor,
	now = new Date()
): Promise<CustomerJoinResult> {
	const email = normaliseWaitlistEmail(input.user.email);
	return db.transaction().execute(async (trx) => {
		const species = await speciesById(trx, input.speciesId);
		if (species.unitsOnOffer > 0) return { ok: false, reason: 'on_offer', species };

		let entry = await lockEntry(trx, species.id, email);
		if (!entry) {
			const id = await insertEntry(trx, {
				species_id: species.id,
				email,
				user_id: input.user.id,
				confirmed_at: now,
				confirm_token_hash: null,
				created_at: now
			});
			if (id !== null) {
				await auditJoin(trx, actor, id, species.id, email, 'create');
				await wantWaitlistMail(trx, input.user.id);
				return { ok: true, outcome: 'joined', entryId: id };
			}
			entry = await lockEntry(trx, species.id, email);
			if (!entry) throw new Error('the waitlist entry vanished while it was being joined');
		}
		const step = customerJoinStep({
			confirmedAt: entry.confirmed_at,
			notifiedAt: entry.notified_at
		});
		if (step === 'already') {
			if (entry.user_id === null) {
				await trx
					.updateTable('waitlist_entry')
					.set({ user_id: input.user.id })
					.where('id', '=', entry.id)
					.execute();
			}
			return { ok: true, outcome: 'already', entryId: entry.id };
		}
		await trx
			.updateTable('waitlist_entry')
			.set({
				user_id: input.user.id,
				confirmed_at: now,
				confirm_token_hash: null,
				// Told about an earlier listing: waiting for the next one starts now.
				...(step === 'rejoin'
					? { notified_at: null, notified_listing_id: null, created_at: now }
					: {})
			})
			.where('id', '=', entry.id)
			.execute();
		await auditJoin(trx, actor, entry.id, species.id, email, step);
		await wantWaitlistMail(trx, input.user.id);
		return { ok: true, outcome: 'joined', entryId: entry.id };
	});
}

async function auditJoin(
	trx: Db,
	actor: WaitlistActor,
	entryId: number,
	speciesId: number,
	email: string,
	step: string
): Promise<void> {
	await writeAudit(trx, {
		actorUserId: actor.userId,
		actorIp: actor.ip,
		action: 'waitlist.join',
		entity: 'waitlist_entry',
		entityId: entryId,
		detail: { speciesId, email, via: 'account', step }
	});
}

export type LinkProblem = 'unknown' | 'expired';

export type ConfirmPeek =
	| { ok: true; species: WaitlistSpecies; email: string; expiresAt: Date }
	| { ok: false; reason: LinkProblem; species: WaitlistSpecies | null };

async function entryByConfirmToken(db: Db, token: string, lock: boolean) {
	// A token is base64url of 32 random bytes; anything else is not one of ours.
	if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return null;
	let query = db
		.selectFrom('waitlist_entry')
		.select(['id', 'species_id', 'email', 'created_at'])
		.where('confirm_token_hash', '=', hashSecret(token))
		.where('confirmed_at', 'is', null);
	if (lock) query = query.forUpdate();
	return (await query.executeTakeFirst()) ?? null;
}

/** What a confirm link's page shows before its button is pressed; changes nothing. */
export async function peekConfirmLink(
	db: Db,
	token: string,
	now = new Date()
): Promise<ConfirmPeek> {
	const entry = await entryByConfirmToken(db, token, false);
	if (!entry) return { ok: false, reason: 'unknown', species: null };
	const species = await speciesById(db, entry.species_id);
	if (confirmLinkExpired(entry.created_at, now)) return { ok: false, reason: 'expired', species };
	return {
		ok: true,
		species,
		email: entry.email,
		expiresAt: new Date(entry.created_at.getTime() + CONFIRM_LINK_DAYS * 24 * 60 * 60 * 1000)
	};
}

export type ConfirmResult =
	| { ok: true; species: WaitlistSpecies }
	| { ok: false; reason: LinkProblem; species: WaitlistSpecies | null };

/** The button on a confirm link's page: the entry is confirmed and the link used up. */
export async function confirmByToken(
	db: Db,
	token: string,
	actor: WaitlistActor,
	now = new Date()
): Promise<ConfirmResult> {
	return db.transaction().execute(async (trx) => {
		const entry = await entryByConfirmToken(trx, token, true);
		if (!entry) return { ok: false, reason: 'unknown', species: null };
		const species = await speciesById(trx, entry.species_id);
		if (confirmLinkExpired(entry.created_at, now)) return { ok: false, reason: 'expired', species };
		await trx
			.updateTable('waitlist_entry')
			.set({ confirmed_at: now, confirm_token_hash: null })
			.where('id', '=', entry.id)
			.execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'waitlist.confirm',
			entity: 'waitlist_entry',
			entityId: entry.id,
			detail: { speciesId: species.id, email: entry.email }
		});
		return { ok: true, species };
	});
}

export type LeavePeek = { ok: true; species: WaitlistSpecies; email: string } | { ok: false };

async function entryByLeaveToken(db: Db, secret: string, token: string, lock: boolean) {
	const id = leaveTokenEntryId(token);
	if (id === null) return null;
	let query = db
		.selectFrom('waitlist_entry')
		.select(['id', 'species_id', 'email'])
		.where('id', '=', id);
	if (lock) query = query.forUpdate();
	const entry = await query.executeTakeFirst();
	return entry && leaveTokenMatches(secret, token, entry) ? entry : null;
}

/** What a leave link's page shows before its button is pressed; changes nothing. */
export async function peekLeaveLink(db: Db, secret: string, token: string): Promise<LeavePeek> {
	const entry = await entryByLeaveToken(db, secret, token, false);
	if (!entry) return { ok: false };
	return { ok: true, species: await speciesById(db, entry.species_id), email: entry.email };
}

/** The button on a leave link's page: the entry is gone, and every link to it with it. */
export async function leaveByToken(
	db: Db,
	secret: string,
	token: string,
	actor: WaitlistActor
): Promise<LeavePeek> {
	return db.transaction().execute(async (trx) => {
		const entry = await entryByLeaveToken(trx, secret, token, true);
		if (!entry) return { ok: false };
		const species = await speciesById(trx, entry.species_id);
		await removeEntry(trx, entry, actor, 'link');
		return { ok: true, species, email: entry.email };
	});
}

async function removeEntry(
	trx: Db,
	entry: { id: number; species_id: number; email: string },
	actor: WaitlistActor,
	via: 'link' | 'account'
): Promise<void> {
	await trx.deleteFrom('waitlist_entry').where('id', '=', entry.id).execute();
	await writeAudit(trx, {
		actorUserId: actor.userId,
		actorIp: actor.ip,
		action: 'waitlist.leave',
		entity: 'waitlist_entry',
		entityId: entry.id,
		detail: { speciesId: entry.species_id, email: entry.email, via }
	});
}

/** A signed-in customer's own entries: made while signed in, or by a guest with their address. */
function ownEntries(db: Db, user: { id: string; email: string }) {
	const email = normaliseWaitlistEmail(user.email);
	return db
		.selectFrom('waitlist_entry as e')
		.where((eb) => eb.or([eb('e.user_id', '=', user.id), eb('e.email', '=', email)]));
}

export type LeaveResult = { ok: true; species: WaitlistSpecies } | { ok: false };

/** "Leave" on the account page; another customer's entry answers as if it were not there. */
export async function leaveAsCustomer(
	db: Db,
	user: { id: string; email: string },
	entryId: number,
	actor: WaitlistActor
): Promise<LeaveResult> {
	return db.transaction().execute(async (trx) => {
		const entry = await ownEntries(trx, user)
			.select(['e.id', 'e.species_id', 'e.email'])
			.where('e.id', '=', entryId)
			.forUpdate()
			.executeTakeFirst();
		if (!entry) return { ok: false };
		const species = await speciesById(trx, entry.species_id);
		await removeEntry(trx, entry, actor, 'account');
		return { ok: true, species };
	});
}

export interface CustomerWaitlistEntry {
	id: number;
	standing: WaitlistStanding;
	species: { slug: string; commonName: string; scientificName: string };
	joinedAt: Date;
	notifiedAt: Date | null;
	/** The listing the notice was about, while it still exists. */
	notifiedListing: { slug: string; title: string } | null;
}

/** The account page's list: the customer's entries (of one species when asked), oldest first. */
export async function listCustomerEntries(
	db: Db,
	user: { id: string; email: string },
	speciesId?: number
): Promise<CustomerWaitlistEntry[]> {
	let query = ownEntries(db, user);
	if (speciesId !== undefined) query = query.where('e.species_id', '=', speciesId);
	const rows = await query
		.innerJoin('species as s', 's.id', 'e.species_id')
		.leftJoin('listing as l', 'l.id', 'e.notified_listing_id')
		.select([
			'e.id',
			'e.confirmed_at',
			'e.notified_at',
			'e.created_at',
			's.slug',
			's.common_name',
			's.scientific_name',
			'l.slug as listing_slug',
			'l.title as listing_title'
		])
		.orderBy('e.created_at')
		.orderBy('e.id')
		.execute();
	return rows.map((row) => ({
		id: row.id,
		standing: standingOf({ confirmedAt: row.confirmed_at, notifiedAt: row.notified_at }),
		species: { slug: row.slug, commonName: row.common_name, scientificName: row.scientific_name },
		joinedAt: row.created_at,
		notifiedAt: row.notified_at,
		notifiedListing:
			row.listing_slug && row.listing_title
				? { slug: row.listing_slug, title: row.listing_title }
				: null
	}));
}

/** The signed-in customer's entry for one species, for the join page; null when there is none. */
export async function customerEntryFor(
	db: Db,
	user: { id: string; email: string },
	speciesId: number
): Promise<CustomerWaitlistEntry | null> {
	const [entry] = await listCustomerEntries(db, user, speciesId);
	return entry ?? null;
}

/**
 * Whether the customer's saved mail choice lets waitlist notices through. Only a choice
 * they saved as "no" stops them: joining a list is itself the request to be told.
 */
export async function customerAllowsWaitlistMail(db: Db, userId: string): Promise<boolean> {
	const row = await db
		.selectFrom('user_profile')
		.select('wants_waitlist_mail')
		.where('user_id', '=', userId)
		.executeTakeFirst();
	return row?.wants_waitlist_mail !== false;
}
