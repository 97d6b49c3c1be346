// The pg-boss instance that job producers (queueMail, the sweeper, "send again") use.
// Producers always hand pg-boss their own connection, so a job is written on the
// caller's Kysely handle, inside the caller's transaction when there is one.
import { CompiledQuery, type Kysely } from 'kysely';
import PgBoss from 'pg-boss';

/** The PostgreSQL schema pg-boss keeps its tables in. */
export const JOB_SCHEMA = 'pgboss';
/** One job per outgoing_mail row; the job carries only the row id. */
export const MAIL_SEND_QUEUE = 'mail-send';
/** Re-enqueues queued rows whose job went missing (a crash between two steps). */
export const MAIL_SWEEP_QUEUE = 'mail-sweep';
/** Once a day: every open order's ship check again, for the shop-local date. */
export const SHIP_RECHECK_QUEUE = 'ship-recheck';
/** One job per listing gone live: mail its species' waitlist, once per entry. */
export const WAITLIST_NOTIFY_QUEUE = 'waitlist-notify';
/** Each minute: stock holds past their time are released, and stale guest carts removed. */
export const HOLD_EXPIRY_QUEUE = 'hold-expiry';

/** One job per slip_batch row: a ship day's packing slips drawn into one PDF, with progress. */
export const SLIP_BATCH_QUEUE = 'slip-batch';

export interface MailSendJob {
	outgoingMailId: number;
}

export interface SlipBatchJob {
	slipBatchId: number;
	/** The shop's public origin, for the claim links on the slips. */
	origin: string;
}

export interface WaitlistNotifyJob {
	listingId: number;
	speciesId: number;
}

let running: PgBoss | undefined;
let sendOnly: PgBoss | undefined;

/** Called by startJobs once its boss is started, and with undefined when it stops. */
export function setRunningBoss(boss: PgBoss | undefined): void {
	running = boss;
}

/**
 * The boss started by startJobs, or else a send-only one. The send-only boss is
 * never started and has no pool: with `{ db }` on every send, pg-boss only supplies
 * its insert SQL, which runs on the producer's connection. So mail can be queued
 * before (or without) the worker running in this process, e.g. from a script; it
 * needs only pg-boss's tables and the queue, which startJobs installs once per database.
 */
export function getBoss(): PgBoss {
	if (running) return running;
	sendOnly ??= new PgBoss({
		schema: JOB_SCHEMA,
		db: {
			executeSql: () =>
				Promise.reject(
					new Error('the send-only pg-boss has no connection of its own; pass { db } to send()')
				)
		},
		supervise: false,
		schedule: false,
		migrate: false
	});
	return sendOnly;
}

/** pg-boss's executeSql on a Kysely handle: a transaction stays that transaction. */
export function jobSqlOn<DB>(db: Kysely<DB>): PgBoss.Db {
	return {
		executeSql: async (text, values) => {
			const result = await db.executeQuery(CompiledQuery.raw(text, values));
			return { rows: [...result.rows] };
		}
	};
}
