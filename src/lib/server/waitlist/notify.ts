// The producer side of the waitlist notice: the listing module calls this inside
// the transaction that publishes a listing, so the job exists exactly when the
// listing went live (a rolled-back publish queues nothing).
//
// No $env or $app imports here: integration tests and scripts use this module as is.
import type { Db } from '../db/connect';
import { getBoss, jobSqlOn, WAITLIST_NOTIFY_QUEUE, type WaitlistNotifyJob } from '../jobs/boss';

/** Queues the `waitlist-notify` job for a listing that just went live, on `trx`. */
export async function queueWaitlistNotice(
	trx: Db,
	listing: { listingId: number; speciesId: number }
): Promise<void> {
	const data: WaitlistNotifyJob = { listingId: listing.listingId, speciesId: listing.speciesId };
	const jobId = await getBoss().send(WAITLIST_NOTIFY_QUEUE, data, {
		db: jobSqlOn(trx),
		// A failed run (database gone) tries again; the worker marks each entry before mailing it.
		retryLimit: 3,
		retryDelay: 60
	});
	// pg-boss inserts through a join on its queue table, so a missing queue writes nothing.
	if (!jobId) {
		throw new Error(
			`The "${WAITLIST_NOTIFY_QUEUE}" queue does not exist: start the jobs (startJobs in src/lib/server/jobs) once against this database.`
		);
	}
}
