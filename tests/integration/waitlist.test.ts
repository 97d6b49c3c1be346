// Species waitlists against a real PostgreSQL: a guest joins and confirms by the mailed
// link, a signed-in customer joins at once, both can leave, and the `waitlist-notify`
// job mails each confirmed entry once, in the order people joined, even when it runs
// twice or two workers race. The demo (seeded for 2026-12-01) has three confirmed
// entries for Orthoporus ornatus, which has nothing ready.
import { createHash } from 'node:crypto';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import { createDb, createPool, type Db } from '../../src/lib/server/db/connect';
import { startJobs, type JobRunner } from '../../src/lib/server/jobs';
import { WAITLIST_NOTIFY_QUEUE } from '../../src/lib/server/jobs/boss';
import {
	confirmByToken,
	customerEntryFor,
	findWaitlistSpecies,
	joinAsCustomer,
	joinAsGuest,
	leaveAsCustomer,
	leaveByToken,
	listCustomerEntries,
	peekConfirmLink,
	peekLeaveLink
} from '../../src/lib/server/waitlist/entries';
import { createWaitlistLimits } from '../../src/lib/server/waitlist/limits';
import type { WaitlistLinks } from '../../src/lib/server/waitlist/links';
import { queueWaitlistNotice } from '../../src/lib/server/waitlist/notify';
import { NOTIFY_BATCH_SIZE, notifyWaitlist } from '../../src/lib/server/waitlist/worker';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const WAITED_FOR = 'orthoporus-ornatus';
const links: WaitlistLinks = {
	origin: 'http://127.0.0.1:3000',
	secret: 'integration-tests-only-waitlist-secret-0123456789'
};
const guestActor = { userId: null, ip: '203.0.113.7' };
const DAY_MS = 24 * 60 * 60 * 1000;

function sha256Hex(text: string): string {
	return createHash('sha256').update(text).digest('hex');
}

function demoEmail(firstName: string): string {
	const account = DEMO_ACCOUNTS.find((a) => a.email.startsWith(firstName));
	if (!account) throw new Error(`no demo account for ${firstName}`);
	return account.email;
}

describe('species waitlists', () => {
	let scratch: ScratchDatabase;
	let db: Db;
	let speciesId: number;
	let listingCount = 0;

	async function user(email: string): Promise<{ id: string; email: string }> {
		return db
			.selectFrom('User')
			.select(['id', 'email'])
			.where('email', '=', email)
			.executeTakeFirstOrThrow();
	}

	async function entry(email: string) {
		return db
			.selectFrom('waitlist_entry')
			.selectAll()
			.where('species_id', '=', speciesId)
			.where('email', '=', email)
			.executeTakeFirst();
	}

	async function mailsOf(kind: string, to?: string) {
		let query = db
			.selectFrom('outgoing_mail')
			.select(['id', 'to_address', 'subject', 'text_body', 'html_body'])
			.where('kind', '=', kind);
		if (to) query = query.where('to_address', '=', to);
		return query.orderBy('id').execute();
	}

	/** The token in the latest confirm mail to `to`, read from the link as a reader would. */
	async function confirmTokenMailedTo(to: string): Promise<string> {
		const mails = await mailsOf('waitlist_confirm', to);
		const text = mails.at(-1)?.text_body ?? '';
		const match = /\/waitlist\/confirm\/([A-Za-z0-9_-]+)/.exec(text);
		if (!match) throw new Error(`no confirm link in the mail to ${to}`);
		return match[1]!;
	}

	function leaveTokenIn(text: string): string {
		const match = /\/waitlist\/leave\/([0-9]+\.[A-Za-z0-9_-]+)/.exec(text);
		if (!match) throw new Error('no leave link in the mail');
		return match[1]!;
	}

	/**
	 * A clutch of the waited-for species put on sale: a listed clutch and a live listing,
	 * published in one transaction that queues the notice, as the listing module does.
	 */
	async function publishListing(state: 'live' | 'withdrawn' = 'live'): Promise<number> {
		listingCount++;
		return db.transaction().execute(async (trx) => {
			const clutch = await trx
				.insertInto('clutch')
				.values({
					code: `ORN-WT${listingCount}`,
					species_id: speciesId,
					origin: 'bought_in',
					generation: 1,
					found_on: '2026-09-01',
					stage: 'sub_adult',
					size_class: 'medium',
					count_found: 12,
					count_alive: 12,
					state: 'listed',
					sale_ready_on: '2026-11-30'
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			const listing = await trx
				.insertInto('listing')
				.values({
					slug: `desert-millipedes-sub-adult-wt${listingCount}`,
					kind: 'animal',
					species_id: speciesId,
					clutch_id: clutch.id,
					title: `Desert millipedes, sub-adult, each (lot ${listingCount})`,
					unit_size: 1,
					state,
					published_at: new Date(),
					base_price_cents: 2450
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			await trx
				.insertInto('price_tier')
				.values([
					{ listing_id: listing.id, min_quantity: 1, price_cents: 2800 },
					{ listing_id: listing.id, min_quantity: 4, price_cents: 9800 }
				])
				.execute();
			await queueWaitlistNotice(trx, { listingId: listing.id, speciesId });
			return listing.id;
		});
	}

	/**
	 * Confirmed entries not yet told, in the order the worker must mail them; an entry of
	 * a customer whose saved mail choice says no to waitlist mail is not written to.
	 */
	async function waitingInOrder(): Promise<string[]> {
		const rows = await db
			.selectFrom('waitlist_entry as e')
			.leftJoin('user_profile as p', 'p.user_id', 'e.user_id')
			.select('e.email')
			.where('e.species_id', '=', speciesId)
			.where('e.confirmed_at', 'is not', null)
			.where('e.notified_at', 'is', null)
			.where((eb) =>
				eb.or([eb('p.wants_waitlist_mail', 'is', null), eb('p.wants_waitlist_mail', '=', true)])
			)
			.orderBy('e.created_at')
			.orderBy('e.id')
			.execute();
		return rows.map((row) => row.email);
	}

	/** Earlier lots sell out, so the species has nothing on offer again. */
	async function sellOutEarlierLots(): Promise<void> {
		await db
			.updateTable('listing')
			.set({ state: 'sold_out' })
			.where('slug', 'like', 'desert-millipedes-sub-adult-wt%')
			.execute();
	}

	beforeAll(async () => {
		scratch = await scratchDatabase();
		db = scratch.db;
		await seedDemo(db, { today: '2026-12-01' });
		const species = await findWaitlistSpecies(db, WAITED_FOR);
		if (!species) throw new Error('the demo has no Orthoporus ornatus');
		speciesId = species.id;
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	it('knows the waited-for species has nothing on offer, and one with stock does', async () => {
		const waited = await findWaitlistSpecies(db, WAITED_FOR);
		expect(waited?.unitsOnOffer).toBe(0);
		expect(waited?.commonName).toBeTruthy();
		const stocked = await findWaitlistSpecies(db, 'narceus-americanus');
		expect(stocked?.unitsOnOffer).toBeGreaterThan(0);
		expect(await findWaitlistSpecies(db, 'no-such-species')).toBeNull();
	});

	describe('a guest', () => {
		const guest = 'wade.keeper@example.test';

		it('joins by e-mail, gets a one-time link, and is on the list only after confirming', async () => {
			const result = await joinAsGuest(
				db,
				{ speciesId, email: '  Wade.Keeper@Example.TEST ' },
				links,
				guestActor
			);
			expect(result).toEqual({ ok: true });
			const stored = await entry(guest);
			expect(stored?.confirmed_at).toBeNull();
			expect(stored?.user_id).toBeNull();

			const mails = await mailsOf('waitlist_confirm', guest);
			expect(mails).toHaveLength(1);
			const token = await confirmTokenMailedTo(guest);
			// Only the token's SHA-256 is stored (FIPS 180-4 via node:crypto), never the token.
			expect(stored?.confirm_token_hash).toBe(sha256Hex(token));
			expect(JSON.stringify(stored)).not.toContain(token);
			expect(mails[0]!.text_body).toContain('expires in 7 days');

			// Opening the page changes nothing: a mail scanner's GET must not confirm.
			const peek = await peekConfirmLink(db, token);
			expect(peek.ok).toBe(true);
			expect((await entry(guest))?.confirmed_at).toBeNull();

			const confirmed = await confirmByToken(db, token, guestActor);
			expect(confirmed.ok).toBe(true);
			const after = await entry(guest);
			expect(after?.confirmed_at).toBeInstanceOf(Date);
			expect(after?.confirm_token_hash).toBeNull();

			// Used once: the same link now answers as unknown.
			expect(await confirmByToken(db, token, guestActor)).toMatchObject({
				ok: false,
				reason: 'unknown'
			});
			expect(await peekConfirmLink(db, 'not-a-token-we-sent-0000000000')).toMatchObject({
				ok: false,
				reason: 'unknown'
			});

			const audit = await db
				.selectFrom('audit_log')
				.select(['action', 'actor_ip'])
				.where('entity', '=', 'waitlist_entry')
				.where('entity_id', '=', String(after!.id))
				.orderBy('id')
				.execute();
			expect(audit.map((a) => a.action)).toEqual(['waitlist.join', 'waitlist.confirm']);
			expect(audit[0]!.actor_ip).toBe('203.0.113.7');
		});

		it('joining again answers the same, and leaves a confirmed entry alone', async () => {
			const before = await entry(guest);
			const mailsBefore = (await mailsOf('waitlist_confirm', guest)).length;
			expect(await joinAsGuest(db, { speciesId, email: guest }, links, guestActor)).toEqual({
				ok: true
			});
			const after = await entry(guest);
			expect(after).toEqual(before);
			expect(await mailsOf('waitlist_confirm', guest)).toHaveLength(mailsBefore);
		});

		it('asking twice before confirming replaces the first link with a new one', async () => {
			const twice = 'twice.asked@example.com';
			await joinAsGuest(db, { speciesId, email: twice }, links, guestActor);
			const first = await confirmTokenMailedTo(twice);
			await joinAsGuest(db, { speciesId, email: twice }, links, guestActor);
			const second = await confirmTokenMailedTo(twice);
			expect(second).not.toBe(first);
			expect((await confirmByToken(db, first, guestActor)).ok).toBe(false);
			expect((await confirmByToken(db, second, guestActor)).ok).toBe(true);
		});

		it('refuses a link older than seven days and keeps the entry unconfirmed', async () => {
			const late = 'late.reader@example.com';
			const sent = new Date(Date.now() - 8 * DAY_MS);
			await joinAsGuest(db, { speciesId, email: late }, links, guestActor, sent);
			const token = await confirmTokenMailedTo(late);
			// Still good the moment before the seventh day is out.
			expect((await peekConfirmLink(db, token, new Date(sent.getTime() + 7 * DAY_MS - 1))).ok).toBe(
				true
			);
			expect(await peekConfirmLink(db, token)).toMatchObject({ ok: false, reason: 'expired' });
			expect(await confirmByToken(db, token, guestActor)).toMatchObject({
				ok: false,
				reason: 'expired'
			});
			expect((await entry(late))?.confirmed_at).toBeNull();
		});

		it('cannot join while the species has stock on offer', async () => {
			const stocked = await findWaitlistSpecies(db, 'narceus-americanus');
			const result = await joinAsGuest(
				db,
				{ speciesId: stocked!.id, email: 'too.late@example.com' },
				links,
				guestActor
			);
			expect(result).toMatchObject({ ok: false, reason: 'on_offer' });
			expect(await mailsOf('waitlist_confirm', 'too.late@example.com')).toHaveLength(0);
		});

		it('leaves by the link in the mail, after pressing the button', async () => {
			const leaver = 'soon.gone@example.com';
			await joinAsGuest(db, { speciesId, email: leaver }, links, guestActor);
			const [mail] = await mailsOf('waitlist_confirm', leaver);
			const token = leaveTokenIn(mail!.text_body);

			const peek = await peekLeaveLink(db, links.secret, token);
			expect(peek).toMatchObject({ ok: true, email: leaver });
			expect(await entry(leaver)).toBeDefined();

			// A forged signature, or another entry's id with this signature, is refused.
			const [id, signature] = token.split('.');
			const forged = `${id}.${signature!.slice(0, -2)}${signature!.endsWith('AA') ? 'BB' : 'AA'}`;
			expect((await leaveByToken(db, links.secret, forged, guestActor)).ok).toBe(false);
			expect(
				(await leaveByToken(db, links.secret, `${Number(id) - 1}.${signature}`, guestActor)).ok
			).toBe(false);
			expect(await entry(leaver)).toBeDefined();

			expect((await leaveByToken(db, links.secret, token, guestActor)).ok).toBe(true);
			expect(await entry(leaver)).toBeUndefined();
			expect((await leaveByToken(db, links.secret, token, guestActor)).ok).toBe(false);
			const audit = await db
				.selectFrom('audit_log')
				.select('detail')
				.where('action', '=', 'waitlist.leave')
				.orderBy('id', 'desc')
				.executeTakeFirstOrThrow();
			expect(audit.detail).toMatchObject({ email: leaver, via: 'link', speciesId });
		});
	});

	describe('a signed-in customer', () => {
		it('joins at once with the account address, and hears they are already on it', async () => {
			const jory = await user(demoEmail('jory'));
			const actor = { userId: jory.id, ip: '198.51.100.4' };
			const first = await joinAsCustomer(db, { speciesId, user: jory }, actor);
			expect(first).toMatchObject({ ok: true, outcome: 'joined' });
			const stored = await entry(jory.email);
			expect(stored?.confirmed_at).toBeInstanceOf(Date);
			expect(stored?.user_id).toBe(jory.id);
			expect(await joinAsCustomer(db, { speciesId, user: jory }, actor)).toMatchObject({
				ok: true,
				outcome: 'already'
			});
			expect((await customerEntryFor(db, jory, speciesId))?.standing).toBe('waiting');
			// No mail: signing in already proved the address.
			expect(await mailsOf('waitlist_confirm', jory.email)).toHaveLength(0);
			// Joining is asking to be told: the account's waitlist-mail choice is now on.
			const profile = await db
				.selectFrom('user_profile')
				.select('wants_waitlist_mail')
				.where('user_id', '=', jory.id)
				.executeTakeFirstOrThrow();
			expect(profile.wants_waitlist_mail).toBe(true);
		});

		it('confirms a guest entry made earlier with the same address', async () => {
			const account = await db
				.insertInto('User')
				.values({ name: 'Pell Ostrander', email: 'pell.ostrander@example.com' })
				.returning(['id', 'email'])
				.executeTakeFirstOrThrow();
			await joinAsGuest(db, { speciesId, email: account.email }, links, guestActor);
			expect((await entry(account.email))?.confirmed_at).toBeNull();
			const joined = await joinAsCustomer(
				db,
				{ speciesId, user: account },
				{ userId: account.id, ip: null }
			);
			expect(joined).toMatchObject({ ok: true, outcome: 'joined' });
			const stored = await entry(account.email);
			expect(stored?.confirmed_at).toBeInstanceOf(Date);
			expect(stored?.confirm_token_hash).toBeNull();
			expect(stored?.user_id).toBe(account.id);
		});

		it("leaves from the account page, and cannot remove someone else's entry", async () => {
			const marisol = await user(demoEmail('marisol'));
			const pell = await user('pell.ostrander@example.com');
			const pellsEntry = await entry(pell.email);
			expect(
				(await leaveAsCustomer(db, marisol, pellsEntry!.id, { userId: marisol.id, ip: null })).ok
			).toBe(false);
			expect(await entry(pell.email)).toBeDefined();

			const list = await listCustomerEntries(db, pell);
			expect(list.map((e) => e.species.slug)).toEqual([WAITED_FOR]);
			expect(
				(await leaveAsCustomer(db, pell, pellsEntry!.id, { userId: pell.id, ip: null })).ok
			).toBe(true);
			expect(await entry(pell.email)).toBeUndefined();
			expect(await listCustomerEntries(db, pell)).toEqual([]);
		});
	});

	describe('the notice when a listing goes live', () => {
		const unconfirmed = 'never.clicked@example.com';

		it('mails confirmed entries once, in order of joining, and never an unconfirmed one', async () => {
			await joinAsGuest(db, { speciesId, email: unconfirmed }, links, guestActor);
			const expected = await waitingInOrder();
			// The demo's three, by the days they joined (100, 61 and 20 days before Dec 1), come first.
			expect(expected.slice(0, 3)).toEqual([
				demoEmail('dagny'),
				demoEmail('marisol'),
				demoEmail('ines')
			]);
			expect(expected).toContain('wade.keeper@example.test');
			expect(expected).not.toContain(unconfirmed);
			// Jory's saved choices said no to waitlist mail (the demo's), but joining above is
			// asking to be told, so it switched that choice on.
			const jory = demoEmail('jory');
			expect(await entry(jory)).toBeDefined();
			expect(expected).toContain(jory);

			const listingId = await publishListing();
			// The publishing transaction queued the job with it.
			const jobs = await sql<{ name: string; data: unknown }>`
				select name, data from pgboss.job where data->>'listingId' = ${String(listingId)}`.execute(db);
			expect(jobs.rows).toEqual([{ name: WAITLIST_NOTIFY_QUEUE, data: { listingId, speciesId } }]);

			expect(await notifyWaitlist(db, { listingId, speciesId }, links)).toEqual({
				mailed: expected.length
			});
			// The same job again (a retry, a duplicate) sends nothing more.
			expect(await notifyWaitlist(db, { listingId, speciesId }, links)).toEqual({ mailed: 0 });

			const mails = await mailsOf('waitlist_ready');
			expect(mails.map((m) => m.to_address)).toEqual(expected);
			expect(mails.map((m) => m.to_address)).not.toContain(unconfirmed);
			const dagnys = mails[0]!;
			expect(dagnys.text_body).toContain(`Desert millipedes, sub-adult, each (lot 1), from $24.50`);
			expect(dagnys.text_body).toContain(
				`http://127.0.0.1:3000/listings/desert-millipedes-sub-adult-wt1`
			);
			expect(dagnys.text_body).toContain("Your state's rules.");

			const marked = await db
				.selectFrom('waitlist_entry')
				.select(['email', 'notified_at', 'notified_listing_id'])
				.where('species_id', '=', speciesId)
				.where('email', 'in', expected)
				.execute();
			for (const row of marked) {
				expect(row.notified_at).toBeInstanceOf(Date);
				expect(row.notified_listing_id).toBe(listingId);
			}
			expect((await entry(unconfirmed))?.notified_at).toBeNull();
			expect((await entry(jory))?.notified_at).toBeInstanceOf(Date);

			// Dagny's account page shows the notice and the listing it was about.
			const dagny = await user(demoEmail('dagny'));
			const [dagnysEntry] = await listCustomerEntries(db, dagny);
			expect(dagnysEntry).toMatchObject({
				standing: 'told',
				notifiedListing: { slug: 'desert-millipedes-sub-adult-wt1' }
			});

			// The leave link in the notice works like the one in the confirm mail.
			const leave = await peekLeaveLink(db, links.secret, leaveTokenIn(dagnys.text_body));
			expect(leave).toMatchObject({ ok: true, email: dagny.email });
		});

		it('mails each entry once when two workers race, over several batches, still in order', async () => {
			const count = NOTIFY_BATCH_SIZE + 37;
			const start = Date.now() - 60_000;
			await db
				.insertInto('waitlist_entry')
				.values(
					Array.from({ length: count }, (_, i) => ({
						species_id: speciesId,
						email: `racer-${String(i).padStart(3, '0')}@example.test`,
						confirmed_at: new Date(start + i * 100),
						// Joined in reverse of their numbers, so the order cannot come from the ids.
						created_at: new Date(start + (count - i) * 100)
					}))
				)
				.execute();
			const expected = await waitingInOrder();
			expect(expected).toHaveLength(count);
			expect(expected[0]).toBe(`racer-${String(count - 1).padStart(3, '0')}@example.test`);

			const before = (await mailsOf('waitlist_ready')).length;
			const listingId = await publishListing();
			// Two workers with their own connections, as two app processes would have.
			const other = createDb(scratch.url, 4);
			try {
				const [a, b] = await Promise.all([
					notifyWaitlist(db, { listingId, speciesId }, links),
					notifyWaitlist(other, { listingId, speciesId }, links)
				]);
				expect(a.mailed + b.mailed).toBe(count);
			} finally {
				await other.destroy();
			}
			const mails = (await mailsOf('waitlist_ready')).slice(before);
			expect(mails.map((m) => m.to_address)).toEqual(expected);
			expect(new Set(mails.map((m) => m.to_address)).size).toBe(count);
		});

		it('sends nothing for a listing that is not on offer, and skips a customer who said no', async () => {
			const marisol = await user(demoEmail('marisol'));
			const actor = { userId: marisol.id, ip: null };
			// While lots are on offer there is nothing to wait for.
			expect(await joinAsCustomer(db, { speciesId, user: marisol }, actor)).toMatchObject({
				ok: false,
				reason: 'on_offer'
			});
			await sellOutEarlierLots();
			// Marisol was told about lot 1; she waits again, then turns waitlist mail off.
			expect(await joinAsCustomer(db, { speciesId, user: marisol }, actor)).toMatchObject({
				ok: true,
				outcome: 'joined'
			});
			expect((await entry(marisol.email))?.notified_at).toBeNull();
			await db
				.updateTable('user_profile')
				.set({ wants_waitlist_mail: false })
				.where('user_id', '=', marisol.id)
				.execute();
			const newcomer = 'after.the.rush@example.com';
			await db
				.insertInto('waitlist_entry')
				.values({ species_id: speciesId, email: newcomer, confirmed_at: new Date() })
				.execute();

			const withdrawn = await publishListing('withdrawn');
			expect(await notifyWaitlist(db, { listingId: withdrawn, speciesId }, links)).toEqual({
				mailed: 0,
				skipped: 'not_on_offer'
			});
			expect((await entry(newcomer))?.notified_at).toBeNull();

			const live = await publishListing();
			expect(await notifyWaitlist(db, { listingId: live, speciesId }, links)).toEqual({
				mailed: 1
			});
			expect(await mailsOf('waitlist_ready', newcomer)).toHaveLength(1);
			expect((await entry(marisol.email))?.notified_at).toBeNull();
			expect(await mailsOf('waitlist_ready', marisol.email)).toHaveLength(1); // lot 1 only
		});

		it('runs as a pg-boss job once the job runner is started with waitlist links', async () => {
			// The earlier lots sold out: their queued jobs, run now, find nothing on offer.
			await sellOutEarlierLots();
			const late = 'through.the.queue@example.com';
			await db
				.insertInto('waitlist_entry')
				.values({ species_id: speciesId, email: late, confirmed_at: new Date() })
				.execute();
			const lines: string[] = [];
			let runner: JobRunner | undefined;
			try {
				runner = await startJobs({
					connectionString: scratch.url,
					// Nothing listens here: the mail jobs just wait; this test reads outgoing_mail.
					smtpUrl: 'smtp://127.0.0.1:9',
					mailFrom: 'shop@mossback.example.com',
					pollingIntervalSeconds: 0.5,
					waitlist: links,
					log: (line) => lines.push(line)
				});
				await runner.ready;
				const listingId = await publishListing();
				const deadline = Date.now() + 20_000;
				const said = () => lines.includes(`[waitlist] listing #${listingId}: 1 mailed`);
				while ((await entry(late))?.notified_at == null || !said()) {
					if (Date.now() > deadline) throw new Error(`no notice after 20 s:\n${lines.join('\n')}`);
					await new Promise((resolve) => setTimeout(resolve, 200));
				}
				expect((await entry(late))?.notified_listing_id).toBe(listingId);
				expect(await mailsOf('waitlist_ready', late)).toHaveLength(1);
				expect(
					lines.filter((line) => line.includes('mailed') && !line.includes(': 0 mailed'))
				).toEqual([`[waitlist] listing #${listingId}: 1 mailed`]);
			} finally {
				await runner?.stop();
			}
		});
	});

	it('limits guest joins per e-mail and per address', async () => {
		const pool = createPool(scratch.url, 2);
		try {
			const limits = createWaitlistLimits(pool, {
				perAddress: { points: 4, seconds: 3600 },
				perEmail: { points: 2, seconds: 3600 }
			});
			expect(await limits.consume('192.0.2.1', 'a@example.com')).toEqual({ allowed: true });
			expect(await limits.consume('192.0.2.1', 'A@Example.com')).toEqual({ allowed: true });
			expect(await limits.consume('192.0.2.1', 'a@example.com')).toMatchObject({
				allowed: false,
				firstRefusal: true
			});
			// Another address for the same mailbox is refused too, no longer as the first refusal.
			expect(await limits.consume('192.0.2.2', 'a@example.com')).toMatchObject({
				allowed: false,
				firstRefusal: false
			});
			// The first address has had three tries (a refusal by e-mail counts too): one more, then no.
			expect(await limits.consume('192.0.2.1', 'b@example.com')).toMatchObject({
				allowed: true
			});
			expect(await limits.consume('192.0.2.1', 'c@example.com')).toMatchObject({
				allowed: false
			});
		} finally {
			await pool.end();
		}
	});
});
