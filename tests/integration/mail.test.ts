// Shop mail end to end on real PostgreSQL: queueMail → pg-boss → the worker →
// nodemailer → the local catcher, including a relay that refuses and then recovers,
// a mail that never gets through, and a row whose job went missing.
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { sql } from 'kysely';
import nodemailer from 'nodemailer';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startJobs, type JobRunner, type JobsOptions } from '../../src/lib/server/jobs';
import {
	MailQueueUnavailableError,
	queueMail,
	sweepUnsentMail,
	type MailMessage
} from '../../src/lib/server/mail';
import { listOutgoingMail, resendFailedMail } from '../../src/lib/server/mail/admin';
import type { CaughtMessage, CaughtSummary } from '../../src/lib/server/mail/catcher';
import { startMailCatcher, type MailCatcher } from '../fakes/mail-catcher';
import { freePort, relayTo } from './support/app';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const SHOP = 'Mossback Hollow Inverts';

async function waitFor<T>(
	probe: () => Promise<T>,
	accept: (value: T) => boolean,
	ms = 15_000
): Promise<T> {
	const deadline = Date.now() + ms;
	let last = await probe();
	while (!accept(last)) {
		if (Date.now() > deadline) throw new Error(`gave up waiting; last: ${JSON.stringify(last)}`);
		await new Promise((resolve) => setTimeout(resolve, 100));
		last = await probe();
	}
	return last;
}

describe('shop mail', () => {
	let scratch: ScratchDatabase;
	let catcher: MailCatcher;
	let runner: JobRunner | undefined;
	const logLines: string[] = [];

	const api = (path: string, init?: RequestInit) =>
		fetch(`http://127.0.0.1:${catcher.httpPort}${path}`, init);
	const caught = async () => (await (await api('/messages')).json()) as CaughtSummary[];
	const caughtOne = async (id: string) =>
		(await (await api(`/messages/${id}`)).json()) as CaughtMessage;

	const outgoing = (id: number) =>
		scratch.db
			.selectFrom('outgoing_mail')
			.selectAll()
			.where('id', '=', id)
			.executeTakeFirstOrThrow();

	function jobsOptions(extra: Partial<JobsOptions> = {}): JobsOptions {
		return {
			connectionString: scratch.url,
			smtpUrl: `smtp://127.0.0.1:${catcher.smtpPort}`,
			mailFrom: `${SHOP} <shop@mossback.example.com>`,
			pollingIntervalSeconds: 0.5,
			mailRetryDelaySeconds: 1,
			mailRetryBackoff: false,
			log: (line) => logLines.push(line),
			...extra
		};
	}

	function signInLink(to: string, token: string): MailMessage {
		return {
			kind: 'sign_in_link',
			to,
			url: `http://127.0.0.1:3000/signin/link?token=${token}&next=%2Forders`,
			expiresInMinutes: 15
		};
	}

	beforeAll(async () => {
		scratch = await scratchDatabase();
		catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
	});
	afterAll(async () => {
		await runner?.stop();
		await catcher?.close();
		await scratch?.drop();
	});

	it('refuses to queue, keeping nothing, before pg-boss is installed in the database', async () => {
		// The template comes with pg-boss installed (as scripts/migrate.ts does); take it away here.
		await sql`drop schema if exists pgboss cascade`.execute(scratch.db);
		await expect(queueMail(scratch.db, signInLink('early@example.com', 'e1'))).rejects.toThrow(
			MailQueueUnavailableError
		);
		const rows = await scratch.db.selectFrom('outgoing_mail').select('id').execute();
		expect(rows).toEqual([]);
	});

	it('delivers a queued mail with its subject, HTML and text', async () => {
		runner = await startJobs(jobsOptions());
		await runner.ready;
		expect(runner.isStarted()).toBe(true);

		const id = await scratch.db.transaction().execute((trx) =>
			queueMail(
				trx,
				{
					kind: 'verify_email',
					to: 'ada@example.com',
					name: 'Ada <Lovelace>',
					url: 'http://127.0.0.1:3000/account/verify?token=abc123&n=1',
					expiresInMinutes: 1440
				},
				{ shopName: SHOP }
			)
		);
		const queuedRow = await outgoing(id);
		expect(queuedRow).toMatchObject({ kind: 'verify_email', to_address: 'ada@example.com' });

		const sent = await waitFor(
			() => outgoing(id),
			(row) => row.status === 'sent'
		);
		expect(sent.attempts).toBe(1);
		expect(sent.sent_at).toBeInstanceOf(Date);
		expect(sent.last_error).toBeNull();

		const list = await caught();
		const summary = list.find((message) => message.to.includes('ada@example.com'));
		expect(summary?.subject).toBe(`Confirm your e-mail address for ${SHOP}`);
		expect(summary?.from).toContain('shop@mossback.example.com');
		const message = await caughtOne(summary!.id);
		expect(message.html).toContain(
			'href="http://127.0.0.1:3000/account/verify?token=abc123&amp;n=1"'
		);
		expect(message.html).toContain('Hello Ada &lt;Lovelace&gt;,');
		expect(message.text).toContain('http://127.0.0.1:3000/account/verify?token=abc123&n=1');
		expect(message.text).toContain('expires in 24 hours');
	});

	it('sends nothing when the transaction that queued the mail rolls back', async () => {
		const before = (await caught()).length;
		await expect(
			scratch.db.transaction().execute(async (trx) => {
				await queueMail(trx, signInLink('rolled-back@example.com', 'rb'), { shopName: SHOP });
				throw new Error('the sign-up failed after queueing');
			})
		).rejects.toThrow('the sign-up failed');
		const rows = await scratch.db
			.selectFrom('outgoing_mail')
			.select('id')
			.where('to_address', '=', 'rolled-back@example.com')
			.execute();
		expect(rows).toEqual([]);
		const { count } = await sql<{ count: number }>`
			select count(*)::int as count from pgboss.job
			where name = 'mail-send' and state in ('created', 'retry', 'active')`
			.execute(scratch.db)
			.then((result) => result.rows[0]!);
		expect(count).toBe(0);
		await new Promise((resolve) => setTimeout(resolve, 1_000));
		expect((await caught()).length).toBe(before);
	});

	it('keeps retrying while SMTP refuses and delivers once it accepts again', async () => {
		catcher.setAccepting(false);
		const id = await queueMail(scratch.db, signInLink('brook@example.com', 'b1'), {
			shopName: SHOP
		});
		const refused = await waitFor(
			() => outgoing(id),
			(row) => row.attempts >= 2
		);
		expect(refused.status).toBe('queued');
		expect(refused.last_error).toMatch(/421/);
		expect((await caught()).some((message) => message.to.includes('brook@example.com'))).toBe(
			false
		);

		catcher.setAccepting(true);
		const sent = await waitFor(
			() => outgoing(id),
			(row) => row.status === 'sent'
		);
		expect(sent.attempts).toBeGreaterThanOrEqual(3);
		expect(sent.last_error).toBeNull();
		expect((await caught()).some((message) => message.to.includes('brook@example.com'))).toBe(true);
	});

	it('queues with no worker running in the process, and the next worker sends it', async () => {
		await runner!.stop();
		runner = undefined;
		const id = await queueMail(scratch.db, signInLink('cove@example.com', 'c1'), {
			shopName: SHOP
		});
		expect((await outgoing(id)).status).toBe('queued');

		runner = await startJobs(jobsOptions({ mailRetryLimit: 1 }));
		await runner.ready;
		await waitFor(
			() => outgoing(id),
			(row) => row.status === 'sent'
		);
	});

	it('marks a mail failed once it has used up its retries', async () => {
		// The runner above set the queue to 1 retry: two attempts in all.
		catcher.setAccepting(false);
		try {
			const id = await queueMail(scratch.db, signInLink('dell@example.com', 'd1'), {
				shopName: SHOP
			});
			const failed = await waitFor(
				() => outgoing(id),
				(row) => row.status === 'failed'
			);
			expect(failed.attempts).toBe(2);
			expect(failed.last_error).toMatch(/421/);
			expect(failed.sent_at).toBeNull();
			expect(
				logLines.some((line) => line.includes(`#${id}`) && line.includes('marked failed'))
			).toBe(true);
		} finally {
			catcher.setAccepting(true);
		}
	});

	it('lists failed mail first and sends a failed one again, audited', async () => {
		const ledger = await listOutgoingMail(scratch.db);
		const statuses = ledger.entries.map((entry) => entry.status);
		expect(statuses[0]).toBe('failed');
		expect(statuses.lastIndexOf('failed')).toBeLessThan(statuses.indexOf('sent'));
		expect(ledger.counts.failed).toBe(1);
		const failed = ledger.entries[0]!;
		expect(failed).toMatchObject({ toAddress: 'dell@example.com', kindLabel: 'Sign-in link' });

		const admin = await scratch.db
			.insertInto('User')
			.values({ name: 'Wren Calloway', email: 'wren@mossback.example.com' })
			.returning('id')
			.executeTakeFirstOrThrow();
		const actor = { userId: admin.id, ip: '127.0.0.1' };
		expect(await resendFailedMail(scratch.db, failed.id, actor)).toEqual({
			id: failed.id,
			toAddress: 'dell@example.com'
		});
		// Queued again at once: a second click finds nothing failed to send.
		expect(await resendFailedMail(scratch.db, failed.id, actor)).toBeNull();
		await waitFor(
			() => outgoing(failed.id),
			(row) => row.status === 'sent'
		);
		const audit = await scratch.db
			.selectFrom('audit_log')
			.select(['action', 'entity', 'entity_id', 'actor_user_id', 'actor_ip'])
			.where('action', '=', 'mail.resend')
			.execute();
		expect(audit).toEqual([
			{
				action: 'mail.resend',
				entity: 'outgoing_mail',
				entity_id: String(failed.id),
				actor_user_id: admin.id,
				actor_ip: '127.0.0.1'
			}
		]);
	});

	it('re-enqueues a queued row whose job went missing', async () => {
		const row = await scratch.db
			.insertInto('outgoing_mail')
			.values({
				kind: 'password_changed',
				to_address: 'fern@example.com',
				subject: 'Your password was changed',
				html_body: '<p>Changed.</p>',
				text_body: 'Changed.',
				updated_at: sql<Date>`now() - interval '11 minutes'`
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const fresh = await scratch.db
			.insertInto('outgoing_mail')
			.values({
				kind: 'password_changed',
				to_address: 'glen@example.com',
				subject: 'Your password was changed',
				html_body: '<p>Changed.</p>',
				text_body: 'Changed.'
			})
			.returning('id')
			.executeTakeFirstOrThrow();

		// Only the stranded row: the fresh one may still be on its way to its job.
		expect(await sweepUnsentMail(scratch.db)).toEqual([row.id]);
		await waitFor(
			() => outgoing(row.id),
			(current) => current.status === 'sent'
		);
		// A second sweep finds nothing: the row is sent and the fresh one is too young.
		expect(await sweepUnsentMail(scratch.db)).toEqual([]);
		expect((await outgoing(fresh.id)).status).toBe('queued');
	});
});

describe('jobs while PostgreSQL is down', () => {
	let scratch: ScratchDatabase;
	let catcher: MailCatcher;
	let runner: JobRunner | undefined;
	let relay: net.Server | undefined;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
	});
	afterAll(async () => {
		await runner?.stop();
		await new Promise((resolve) => (relay ? relay.close(resolve) : resolve(undefined)));
		await catcher?.close();
		await scratch?.drop();
	});

	it('keeps trying to start without throwing, and starts once the database answers', async () => {
		const lines: string[] = [];
		const dbPort = await freePort();
		const unreachable = new URL(scratch.url);
		unreachable.port = String(dbPort);
		runner = await startJobs({
			connectionString: unreachable.toString(),
			smtpUrl: `smtp://127.0.0.1:${catcher.smtpPort}`,
			mailFrom: 'shop@mossback.example.com',
			pollingIntervalSeconds: 0.5,
			startRetrySeconds: 0.3,
			log: (line) => lines.push(line)
		});
		expect(runner.isStarted()).toBe(false);
		await waitFor(
			async () => lines.filter((line) => line.includes('could not start')).length,
			(failures) => failures >= 2
		);

		// A TCP relay stands in for the database host coming up on that port.
		relay = relayTo(Number(new URL(scratch.url).port));
		await new Promise<void>((resolve) => relay!.listen(dbPort, '127.0.0.1', resolve));
		await runner.ready;
		expect(runner.isStarted()).toBe(true);

		const id = await queueMail(
			scratch.db,
			{ kind: 'password_changed', to: 'hazel@example.com', name: 'Hazel' },
			{ shopName: SHOP }
		);
		await waitFor(
			() =>
				scratch.db
					.selectFrom('outgoing_mail')
					.select('status')
					.where('id', '=', id)
					.executeTakeFirstOrThrow(),
			(row) => row.status === 'sent'
		);
	});
});

describe('the mail catcher', () => {
	it('keeps what it caught across a restart, and forgets it when emptied', async () => {
		const folder = await mkdtemp(path.join(os.tmpdir(), 'hatchlot-catcher-'));
		const storeFile = path.join(folder, 'nested', 'caught.jsonl');
		try {
			const transportTo = (port: number) =>
				nodemailer.createTransport({ host: '127.0.0.1', port, secure: false });
			let catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0, storeFile });
			const first = transportTo(catcher.smtpPort);
			await first.sendMail({
				from: 'shop@mossback.example.com',
				to: 'ivy@example.com',
				subject: 'Kept across restarts',
				text: 'plain words',
				html: '<p>plain words</p>'
			});
			first.close();
			await catcher.close();

			catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0, storeFile });
			const transport = transportTo(catcher.smtpPort);
			const base = `http://127.0.0.1:${catcher.httpPort}`;
			try {
				expect((await fetch(`${base}/health`)).status).toBe(200);
				const list = (await (await fetch(`${base}/messages`)).json()) as CaughtSummary[];
				expect(list).toMatchObject([{ to: ['ivy@example.com'], subject: 'Kept across restarts' }]);
				const one = (await (
					await fetch(`${base}/messages/${list[0]!.id}`)
				).json()) as CaughtMessage;
				expect(one).toMatchObject({ html: '<p>plain words</p>', text: 'plain words' });
				expect((await fetch(`${base}/messages/nope`)).status).toBe(404);

				const badControl = await fetch(`${base}/control`, {
					method: 'POST',
					body: JSON.stringify({ accepting: 'no' })
				});
				expect(badControl.status).toBe(400);
				const control = await fetch(`${base}/control`, {
					method: 'POST',
					body: JSON.stringify({ accepting: false })
				});
				expect(await control.json()).toEqual({ accepting: false });
				await expect(
					transport.sendMail({ from: 'shop@example.com', to: 'x@example.com', text: 'x' })
				).rejects.toMatchObject({ responseCode: 421 });

				expect((await fetch(`${base}/messages`, { method: 'DELETE' })).status).toBe(204);
				expect(await (await fetch(`${base}/messages`)).json()).toEqual([]);
				expect(await readFile(storeFile, 'utf8')).toBe('');
			} finally {
				transport.close();
				await catcher.close();
			}
		} finally {
			await rm(folder, { recursive: true, force: true });
		}
	});
});
