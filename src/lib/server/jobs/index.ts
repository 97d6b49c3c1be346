// Background jobs on pg-boss: the mail worker, the sweeper that re-enqueues mail
// whose job went missing, and the daily ship re-check. Call startJobs once per
// process (hooks.server.ts `init`); it never throws for an unreachable database but
// keeps trying in the background.
//
// No $env or $app imports: integration tests start jobs with their own values.
import type { Kysely } from 'kysely';
import pg from 'pg';
import PgBoss from 'pg-boss';
import { createDb } from '../db/connect';
import type { Database } from '../db/schema';
import {
	closeMailTransports,
	describeSendError,
	MailDeliveryError,
	markOutgoingMailFailed,
	sendOutgoingMail,
	sweepUnsentMail
} from '../mail';
import { describeSmtpUrl, mailConfigFrom, type MailConfig } from '../mail/config';
import { resolveShopTimeZone } from '../backoffice/settings';
import { sweepExpiredHolds } from '../cart/cart';
import { todayInZone } from '../../format/dates';
import {
	JOB_SCHEMA,
	MAIL_SEND_QUEUE,
	MAIL_SWEEP_QUEUE,
	SHIP_RECHECK_QUEUE,
	WAITLIST_NOTIFY_QUEUE,
	HOLD_EXPIRY_QUEUE,
	SLIP_BATCH_QUEUE,
	setRunningBoss,
	type MailSendJob,
	type SlipBatchJob,
	type WaitlistNotifyJob
} from './boss';
import type { WaitlistLinks } from '../waitlist/links';
import { notifyWaitlist } from '../waitlist/worker';
import { runSlipBatch } from '../fulfilment/slip-batches';
import { inJobContext, logger } from '../log';

export { getBoss, JOB_SCHEMA, MAIL_SEND_QUEUE, MAIL_SWEEP_QUEUE, SHIP_RECHECK_QUEUE } from './boss';

/**
 * The daily ship re-check, handed in by the app (jobs/env.ts) so this module needs
 * no forecast provider of its own; tests and scripts that leave it out get no schedule.
 */
export interface ShipRecheckOptions {
	/** One day's re-check for the shop-local date `today`; returns a line for the log. */
	run: (db: Kysely<Database>, today: string) => Promise<string>;
	/** When it runs, in the shop's own time zone (default 06:15, before the morning's packing). */
	cron?: string;
	/** The zone when the settings row has none (SHOP_TIME_ZONE). */
	timeZoneFallback?: string;
}

export interface JobsOptions {
	/** PostgreSQL of the app; pg-boss keeps its tables in the `pgboss` schema there. */
	connectionString: string;
	smtpUrl: string;
	mailFrom: string;
	/** Retries after the first failed send (5): six attempts in all. */
	mailRetryLimit?: number;
	/** Seconds before the first retry (2); doubled for each next one while backoff is on. */
	mailRetryDelaySeconds?: number;
	mailRetryBackoff?: boolean;
	/** How often an idle mail worker asks for work (2 s); pg-boss allows 0.5 at the least. */
	pollingIntervalSeconds?: number;
	/** Seconds between start attempts while PostgreSQL is unreachable (5). */
	startRetrySeconds?: number;
	/** Where the one-line reports go; the app's logger (warn) unless given. */
	log?: (line: string) => void;
	shipRecheck?: ShipRecheckOptions;
	/** Where waitlist mail links to, and the secret its leave links are signed with; no worker without it. */
	waitlist?: WaitlistLinks;
}

export interface JobRunner {
	/** Resolves once pg-boss is started and the workers are polling. */
	readonly ready: Promise<void>;
	isStarted(): boolean;
	/** Lets a send in progress finish (up to 10 s), then closes every connection. */
	stop(): Promise<void>;
}

/** The cron of the sweep; every 5 minutes is well inside the 10 minutes a row may wait. */
const SWEEP_CRON = '*/5 * * * *';
/** Every minute: a hold is 15 minutes by default, so it lapses at most a minute late in the table. */
const HOLD_EXPIRY_CRON = '* * * * *';

/** 06:15 shop time: forecasts for the day are out, and the keepers have not started packing. */
export const SHIP_RECHECK_CRON = '15 6 * * *';

let active: JobRunner | undefined;

interface Started {
	boss: PgBoss;
	pool: pg.Pool;
	db: Kysely<Database>;
}

/** One line for a failed start; "localhost" refusing on both IPv4 and IPv6 is an AggregateError with no message. */
function whyItFailed(error: unknown): string {
	if (error instanceof AggregateError && !error.message) return whyItFailed(error.errors[0]);
	if (error instanceof Error)
		return error.message || (error as { code?: string }).code || error.name;
	return String(error);
}

/** One line per distinct message per minute: a dropped database must not flood the log. */
function throttled(log: (line: string) => void): (line: string) => void {
	const lastSaid = new Map<string, number>();
	return (line) => {
		const now = Date.now();
		if ((lastSaid.get(line) ?? 0) > now - 60_000) return;
		lastSaid.set(line, now);
		log(line);
	};
}

/** Works the jobs one after another, each with its id and queue on every line it logs. */
async function eachInContext<J extends { id: string; name: string }>(
	jobs: J[],
	work: (job: J) => Promise<void>
): Promise<void> {
	for (const job of jobs) await inJobContext(job, () => work(job));
}

async function deliverMail(
	db: Kysely<Database>,
	mail: MailConfig,
	jobs: PgBoss.JobWithMetadata<MailSendJob>[],
	log: (line: string) => void
): Promise<void> {
	await eachInContext(jobs, async (job) => {
		const id = job.data.outgoingMailId;
		try {
			await sendOutgoingMail(db, id, mail);
		} catch (error) {
			const reason = error instanceof MailDeliveryError ? error.reason : describeSendError(error);
			// retryCount counts retries already made: equal to the limit means no attempt is left.
			const lastAttempt = job.retryCount >= job.retryLimit;
			if (lastAttempt) await markOutgoingMailFailed(db, id, reason);
			log(
				`[mail] #${id}: attempt ${job.retryCount + 1} of ${job.retryLimit + 1} failed (${reason})` +
					(lastAttempt ? '; marked failed' : '; it will be retried')
			);
			throw error;
		}
	});
}

/** The queues and their retry rules; createQueue leaves an existing queue alone, so changes go through updateQueue. */
async function createQueues(
	boss: PgBoss,
	options: Pick<JobsOptions, 'mailRetryLimit' | 'mailRetryDelaySeconds' | 'mailRetryBackoff'>
): Promise<void> {
	const mailQueue: PgBoss.Queue = {
		name: MAIL_SEND_QUEUE,
		retryLimit: options.mailRetryLimit ?? 5,
		retryDelay: options.mailRetryDelaySeconds ?? 2,
		retryBackoff: options.mailRetryBackoff ?? true,
		// Longer than nodemailer's timeouts together (10 + 10 + 30 s, mail/config.ts), so a
		// hung relay fails the attempt first.
		expireInSeconds: 60
	};
	await boss.createQueue(MAIL_SEND_QUEUE, mailQueue);
	await boss.updateQueue(MAIL_SEND_QUEUE, mailQueue);
	const sweepQueue: PgBoss.Queue = {
		name: MAIL_SWEEP_QUEUE,
		policy: 'singleton',
		retryLimit: 0,
		expireInSeconds: 300
	};
	await boss.createQueue(MAIL_SWEEP_QUEUE, sweepQueue);
	const recheckQueue: PgBoss.Queue = {
		name: SHIP_RECHECK_QUEUE,
		// One waiting and one running at most: a late run never piles up behind another.
		policy: 'stately',
		// A run that failed as a whole (database gone) tries again; checks are safe to repeat.
		retryLimit: 2,
		retryDelay: 600,
		expireInSeconds: 1800
	};
	await boss.createQueue(SHIP_RECHECK_QUEUE, recheckQueue);
	const waitlistQueue: PgBoss.Queue = {
		name: WAITLIST_NOTIFY_QUEUE,
		// A run that failed as a whole tries again; entries already marked are never mailed twice.
		retryLimit: 3,
		retryDelay: 60,
		expireInSeconds: 600
	};
	await boss.createQueue(WAITLIST_NOTIFY_QUEUE, waitlistQueue);
	const slipQueue: PgBoss.Queue = {
		name: SLIP_BATCH_QUEUE,
		// One more try after a failure that was not the orders' fault (the database away).
		retryLimit: 1,
		retryDelay: 30,
		// A 1000-order batch draws in well under this on a small machine.
		expireInSeconds: 900
	};
	await boss.createQueue(SLIP_BATCH_QUEUE, slipQueue);
	// Reads already ignore expired holds; the sweep only tidies rows, so one run at a time.
	await boss.createQueue(HOLD_EXPIRY_QUEUE, {
		name: HOLD_EXPIRY_QUEUE,
		policy: 'singleton',
		retryLimit: 0,
		expireInSeconds: 120
	});
}

async function scheduleShipRecheck(
	boss: PgBoss,
	db: Kysely<Database>,
	recheck: ShipRecheckOptions,
	log: (line: string) => void
): Promise<void> {
	await boss.work(SHIP_RECHECK_QUEUE, { pollingIntervalSeconds: 60 }, (jobs) =>
		eachInContext(jobs, async () => {
			// The zone is read per run, so a changed setting counts from the next morning's run.
			const today = todayInZone(await resolveShopTimeZone(db, recheck.timeZoneFallback));
			log(`[ship-recheck] ${today}: ${await recheck.run(db, today)}`);
		})
	);
	const tz = await resolveShopTimeZone(db, recheck.timeZoneFallback);
	await boss.schedule(SHIP_RECHECK_QUEUE, recheck.cron ?? SHIP_RECHECK_CRON, {}, { tz });
}

/**
 * Installs pg-boss's tables and our queues without starting any worker, so mail
 * can be queued from the first request on. Run by scripts/migrate.ts after the
 * migrations, and by the test setup on its template database.
 */
export async function installJobSchema(connectionString: string): Promise<void> {
	const boss = new PgBoss({
		connectionString,
		schema: JOB_SCHEMA,
		supervise: false,
		schedule: false,
		max: 2
	});
	boss.on('error', (error) => logger.warn(`[jobs] ${error.message}`));
	await boss.start();
	try {
		await createQueues(boss, {});
	} finally {
		await boss.stop({ graceful: false, wait: true });
	}
}

async function startOnce(
	options: JobsOptions,
	mail: MailConfig,
	log: (line: string) => void
): Promise<Started> {
	// Our own pool (not pg-boss's) so a failed start can always be closed again.
	const pool = new pg.Pool({
		connectionString: options.connectionString,
		max: 4,
		connectionTimeoutMillis: 3_000,
		idleTimeoutMillis: 30_000,
		application_name: 'hatchlot-jobs'
	});
	const noisy = throttled(log);
	pool.on('error', (error) => noisy(`[jobs] idle connection lost: ${error.message}`));
	const db = createDb(options.connectionString, 2);
	const boss = new PgBoss({
		db: { executeSql: (text, values) => pool.query(text, values) },
		schema: JOB_SCHEMA,
		// A job whose end could not be written (the database went away mid-send) stays active
		// until it expires and the next maintenance pass finds it; every 30 s rather than
		// pg-boss's 120 s, so such a receipt goes out within about a minute and a half.
		maintenanceIntervalSeconds: 30
	});
	boss.on('error', (error) => noisy(`[jobs] ${error.message}`));
	try {
		await boss.start();
		await createQueues(boss, options);
		await boss.work<MailSendJob>(
			MAIL_SEND_QUEUE,
			{
				includeMetadata: true,
				batchSize: 1,
				pollingIntervalSeconds: options.pollingIntervalSeconds ?? 2
			},
			(jobs) => deliverMail(db, mail, jobs, log)
		);
		await boss.work(MAIL_SWEEP_QUEUE, { pollingIntervalSeconds: 30 }, (jobs) =>
			eachInContext(jobs, async () => {
				const requeued = await sweepUnsentMail(db);
				if (requeued.length)
					log(`[mail] sweep re-enqueued ${requeued.map((id) => `#${id}`).join(', ')}`);
			})
		);
		await boss.schedule(MAIL_SWEEP_QUEUE, SWEEP_CRON);
		await boss.work(HOLD_EXPIRY_QUEUE, { pollingIntervalSeconds: 30 }, (jobs) =>
			eachInContext(jobs, async () => {
				const swept = await sweepExpiredHolds(db);
				if (swept.released || swept.cartsRemoved)
					log(
						`[holds] released ${swept.released}, removed ${swept.cartsRemoved} stale guest carts`
					);
			})
		);
		await boss.schedule(HOLD_EXPIRY_QUEUE, HOLD_EXPIRY_CRON);
		await boss.work<SlipBatchJob>(
			SLIP_BATCH_QUEUE,
			{ batchSize: 1, pollingIntervalSeconds: options.pollingIntervalSeconds ?? 2 },
			(jobs) =>
				eachInContext(jobs, async (job) => {
					const run = await runSlipBatch(db, job.data.slipBatchId, { origin: job.data.origin });
					log(
						`[slips] batch #${job.data.slipBatchId}: ` +
							(run.outcome === 'done'
								? `${run.pages} pages, ${run.bytes} bytes`
								: run.outcome === 'failed'
									? `failed (${run.reason})`
									: `nothing to do (${run.why})`)
					);
				})
		);
		if (options.shipRecheck) await scheduleShipRecheck(boss, db, options.shipRecheck, log);
		const waitlistLinks = options.waitlist;
		if (waitlistLinks) {
			await boss.work<WaitlistNotifyJob>(
				WAITLIST_NOTIFY_QUEUE,
				{ batchSize: 1, pollingIntervalSeconds: options.pollingIntervalSeconds ?? 2 },
				(jobs) =>
					eachInContext(jobs, async (job) => {
						const outcome = await notifyWaitlist(db, job.data, waitlistLinks);
						log(
							`[waitlist] listing #${job.data.listingId}: ` +
								('skipped' in outcome
									? `nothing sent (${outcome.skipped})`
									: `${outcome.mailed} mailed`)
						);
					})
			);
		}
		return { boss, pool, db };
	} catch (error) {
		await boss.stop({ graceful: false, wait: true }).catch(() => undefined);
		await pool.end().catch(() => undefined);
		await db.destroy().catch(() => undefined);
		throw error;
	}
}

/**
 * Starts pg-boss (schema `pgboss`), the `mail-send` queue (5 retries, 2 s apart,
 * doubling) with its worker, and the 5-minute sweep. Resolves with the runner after
 * the first attempt, whether or not it worked; `ready` resolves once a start has
 * succeeded. While PostgreSQL cannot be reached it logs one line per failed attempt
 * and tries again every `startRetrySeconds`, without throwing.
 * A second call while a runner is active returns that runner.
 */
export async function startJobs(options: JobsOptions): Promise<JobRunner> {
	if (active) return active;
	if (!options.connectionString) throw new Error('startJobs needs a connectionString');
	const mail = mailConfigFrom({ SMTP_URL: options.smtpUrl, MAIL_FROM: options.mailFrom });
	const log = options.log ?? ((line: string) => logger.warn(line));
	const retryMs = (options.startRetrySeconds ?? 5) * 1000;

	let started: Started | undefined;
	let stopping = false;
	let retryTimer: NodeJS.Timeout | undefined;
	let attempt: Promise<void> | undefined;
	let markReady: () => void = () => undefined;
	const ready = new Promise<void>((resolve) => (markReady = resolve));

	const tryStart = async (): Promise<void> => {
		try {
			const fresh = await startOnce(options, mail, log);
			if (stopping) {
				await fresh.boss.stop({ graceful: false, wait: true });
				await fresh.pool.end();
				await fresh.db.destroy();
				return;
			}
			started = fresh;
			setRunningBoss(fresh.boss);
			log(`[jobs] started: mail goes to ${describeSmtpUrl(mail.smtpUrl)} from ${mail.mailFrom}`);
			markReady();
			// Whatever was stranded while this process was down goes out now, not in 5 minutes.
			const requeued = await sweepUnsentMail(fresh.db).catch((error: Error) => {
				log(`[mail] start-up sweep failed: ${error.message}`);
				return [];
			});
			if (requeued.length) log(`[mail] re-enqueued ${requeued.map((id) => `#${id}`).join(', ')}`);
		} catch (error) {
			if (stopping) return;
			log(`[jobs] could not start (${whyItFailed(error)}); trying again in ${retryMs / 1000} s`);
			retryTimer = setTimeout(() => {
				attempt = tryStart();
			}, retryMs);
		}
	};

	const runner: JobRunner = {
		ready,
		isStarted: () => started !== undefined,
		stop: async () => {
			if (stopping) return;
			stopping = true;
			clearTimeout(retryTimer);
			await attempt;
			const current = started;
			started = undefined;
			if (current) {
				setRunningBoss(undefined);
				await current.boss.stop({ graceful: true, wait: true, timeout: 10_000 });
				await current.pool.end();
				await current.db.destroy();
			}
			closeMailTransports();
			if (active === runner) active = undefined;
		}
	};
	active = runner;
	attempt = tryStart();
	await attempt;
	return runner;
}
