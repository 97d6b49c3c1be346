// The one way shop mail leaves Hatchlot. queueMail renders a message, stores it in
// outgoing_mail and enqueues a pg-boss job with only the row id, in one transaction;
// the job worker (src/lib/server/jobs) then calls sendOutgoingMail. A request never
// waits on SMTP, and a relay that is down only delays mail: pg-boss retries it.
//
// No $env or $app imports here: integration tests and scripts use this module as is.
import { sql, type Kysely } from 'kysely';
import nodemailer, { type Transporter } from 'nodemailer';
import type { Database } from '../db/schema';
import { getBoss, jobSqlOn, MAIL_SEND_QUEUE, type MailSendJob } from '../jobs/boss';
import { smtpTransportOptions, type MailConfig } from './config';
import { renderMail, type MailMessage } from './templates';

export type { MailMessage, MailKind, RenderedMail } from './templates';
export type { MailConfig } from './config';

/** The addresses of the shop's admins who can sign in, for mail that asks the owner to act. */
export async function adminAddresses(db: Kysely<Database>): Promise<string[]> {
	const rows = await db
		.selectFrom('user_role')
		.innerJoin('User', 'User.id', 'user_role.user_id')
		.select('User.email')
		.where('user_role.role', '=', 'admin')
		.where('user_role.disabled_at', 'is', null)
		.orderBy('User.email')
		.execute();
	return rows.map((row) => row.email);
}

/** Stored last_error is for a person to read in the admin list; keep it short. */
const LAST_ERROR_MAX = 500;

/** The job could not be written: pg-boss is not installed in this database yet. */
export class MailQueueUnavailableError extends Error {
	constructor(detail: string, options?: { cause?: unknown }) {
		super(
			`Mail cannot be queued: ${detail}. Start the jobs (startJobs in src/lib/server/jobs) once against this database so pg-boss installs its schema and the "${MAIL_SEND_QUEUE}" queue.`,
			options
		);
		this.name = 'MailQueueUnavailableError';
	}
}

/** The relay refused or could not be reached; thrown so pg-boss retries the job. */
export class MailDeliveryError extends Error {
	constructor(
		readonly outgoingMailId: number,
		readonly reason: string,
		options?: { cause?: unknown }
	) {
		super(`outgoing mail #${outgoingMailId} was not delivered: ${reason}`, options);
		this.name = 'MailDeliveryError';
	}
}

async function shopNameOf(db: Kysely<Database>): Promise<string> {
	const row = await db
		.selectFrom('shop_setting')
		.select('shop_name')
		.where('id', '=', true)
		.executeTakeFirst();
	return row?.shop_name ?? 'Hatchlot shop';
}

/**
 * Enqueues the send job of one outgoing_mail row on `db`. Pass a transaction to
 * make the job commit (or roll back) with whatever else that transaction writes.
 */
export async function enqueueOutgoingMail(db: Kysely<Database>, id: number): Promise<string> {
	const data: MailSendJob = { outgoingMailId: id };
	let jobId: string | null;
	try {
		jobId = await getBoss().send(MAIL_SEND_QUEUE, data, { db: jobSqlOn(db) });
	} catch (cause) {
		// 42P01 undefined_table, 3F000 invalid_schema_name: pg-boss was never started here.
		const code = (cause as { code?: unknown }).code;
		if (code === '42P01' || code === '3F000') {
			throw new MailQueueUnavailableError('pg-boss has no tables in this database', { cause });
		}
		throw cause;
	}
	// pg-boss inserts through a join on its queue table, so a missing queue writes nothing.
	if (!jobId) throw new MailQueueUnavailableError(`the "${MAIL_SEND_QUEUE}" queue does not exist`);
	return jobId;
}

/**
 * Renders `message`, stores it as a queued outgoing_mail row and enqueues its send
 * job; returns the row id. When `db` is a transaction both writes belong to it, so
 * a rolled-back sign-up sends nothing; otherwise they get a transaction of their own.
 * The shop name comes from shop_setting unless `options.shopName` is given.
 *
 * Throws MailQueueUnavailableError when pg-boss is not installed in the database
 * (inside a caller's transaction that aborts it, which rolls back the row too).
 */
export async function queueMail(
	db: Kysely<Database>,
	message: MailMessage,
	options: { shopName?: string } = {}
): Promise<number> {
	const store = async (trx: Kysely<Database>): Promise<number> => {
		const shopName = options.shopName ?? (await shopNameOf(trx));
		const rendered = renderMail(message, { shopName });
		const row = await trx
			.insertInto('outgoing_mail')
			.values({
				kind: message.kind,
				to_address: message.to.trim(),
				subject: rendered.subject,
				html_body: rendered.html,
				text_body: rendered.text
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await enqueueOutgoingMail(trx, row.id);
		return row.id;
	};
	return db.isTransaction ? store(db) : db.transaction().execute(store);
}

const transports = new Map<string, Transporter>();

function transportFor(smtpUrl: string): Transporter {
	let transport = transports.get(smtpUrl);
	if (!transport) {
		transport = nodemailer.createTransport(smtpTransportOptions(smtpUrl));
		transports.set(smtpUrl, transport);
	}
	return transport;
}

/** Closes the SMTP transports this process opened (on shutdown). */
export function closeMailTransports(): void {
	for (const transport of transports.values()) transport.close();
	transports.clear();
}

/** What the relay said, as one readable line: "421 Mail catcher is not accepting mail". */
export function describeSendError(cause: unknown): string {
	const error = cause as { code?: unknown; response?: unknown; message?: unknown };
	const said = typeof error.response === 'string' ? error.response : undefined;
	const message = typeof error.message === 'string' ? error.message : String(cause);
	const code = typeof error.code === 'string' ? `${error.code}: ` : '';
	return `${code}${said ?? message}`.replace(/\s+/g, ' ').trim().slice(0, LAST_ERROR_MAX);
}

export type SendOutcome = 'sent' | 'already_sent' | 'not_queued' | 'missing';

/**
 * Sends one queued outgoing_mail row over SMTP and records the attempt. The row is
 * locked while it is sent, so two jobs for the same row (a sweep racing a retry)
 * cannot both deliver it. Throws MailDeliveryError when the relay fails, after
 * storing attempts and last_error, so pg-boss retries. `db` must not be a transaction.
 */
export async function sendOutgoingMail(
	db: Kysely<Database>,
	id: number,
	config: MailConfig
): Promise<SendOutcome> {
	const transport = transportFor(config.smtpUrl);
	const outcome = await db.transaction().execute(async (trx) => {
		const row = await trx
			.selectFrom('outgoing_mail')
			.selectAll()
			.where('id', '=', id)
			.forUpdate()
			.executeTakeFirst();
		if (!row) return { result: 'missing' as const };
		if (row.status === 'sent') return { result: 'already_sent' as const };
		if (row.status !== 'queued') return { result: 'not_queued' as const };
		try {
			await transport.sendMail({
				from: config.mailFrom,
				to: row.to_address,
				subject: row.subject,
				html: row.html_body,
				text: row.text_body,
				// A stable id per row, so a mail sent twice (crash after SMTP, before the
				// update) is recognised as one by clients that de-duplicate on it.
				messageId: `<outgoing-mail-${row.id}.${row.created_at.getTime()}@hatchlot.invalid>`,
				headers: { 'X-Hatchlot-Mail-Kind': row.kind }
			});
		} catch (cause) {
			const reason = describeSendError(cause);
			await trx
				.updateTable('outgoing_mail')
				.set({ attempts: sql`attempts + 1`, last_error: reason, updated_at: sql`now()` })
				.where('id', '=', id)
				.execute();
			return { result: 'refused' as const, reason, cause };
		}
		await trx
			.updateTable('outgoing_mail')
			.set({
				status: 'sent',
				attempts: sql`attempts + 1`,
				// A refusal before this success no longer describes the mail.
				last_error: null,
				sent_at: sql`now()`,
				updated_at: sql`now()`
			})
			.where('id', '=', id)
			.execute();
		return { result: 'sent' as const };
	});
	if (outcome.result === 'refused') {
		throw new MailDeliveryError(id, outcome.reason, { cause: outcome.cause });
	}
	return outcome.result;
}

/** Gives up on a row after its last retry; an admin can send it again. */
export async function markOutgoingMailFailed(
	db: Kysely<Database>,
	id: number,
	reason: string
): Promise<void> {
	await db
		.updateTable('outgoing_mail')
		.set({ status: 'failed', last_error: reason.slice(0, LAST_ERROR_MAX), updated_at: sql`now()` })
		.where('id', '=', id)
		.where('status', '=', 'queued')
		.execute();
}

/**
 * Queued rows untouched for `olderThanMinutes` that have no pending send job get
 * one again, so a crash between storing a row and finishing its job never loses a
 * mail. Returns the ids it re-enqueued. The age keeps it off rows still being written.
 */
export async function sweepUnsentMail(
	db: Kysely<Database>,
	options: { olderThanMinutes?: number; limit?: number } = {}
): Promise<number[]> {
	const olderThanMinutes = options.olderThanMinutes ?? 10;
	const limit = options.limit ?? 200;
	// pgboss.job is not in the Database interface (pg-boss owns it), hence the raw subquery.
	const stranded = await db
		.selectFrom('outgoing_mail as mail')
		.select('mail.id')
		.where('mail.status', '=', 'queued')
		.where('mail.updated_at', '<', sql<Date>`now() - make_interval(mins => ${olderThanMinutes})`)
		.where(({ not, exists }) =>
			not(
				exists(
					sql`(select 1 from ${sql.table('pgboss.job')} as job
						where job.name = ${MAIL_SEND_QUEUE}
						and job.state in ('created', 'retry', 'active')
						and job.data ->> 'outgoingMailId' = mail.id::text)`
				)
			)
		)
		.orderBy('mail.id')
		.limit(limit)
		.execute();
	const requeued: number[] = [];
	for (const { id } of stranded) {
		await enqueueOutgoingMail(db, id);
		requeued.push(id);
	}
	return requeued;
}
