// A ship day's slips as a background job: too many boxes to draw while the keeper's
// request waits (over $lib/fulfilment/slip-rules' SLIP_SYNC_LIMIT), so a slip_batch row
// and a pg-boss job are made in one transaction, the worker draws the PDF counting
// orders in done_count, and the keeper's page reads the count until it can download.
//
// No $env or $app imports here: the job runner passes the claim links' origin.
import type { Kysely } from 'kysely';
import type { IsoDate } from '$lib/format/dates';
import { slipBatchUrls, type SlipBatchView } from '$lib/fulfilment/slip-batch-view';
import { writeAudit, type Actor } from '../audit';
import type { Database, SlipBatchState, SlipPaper } from '../db/schema';
import { getBoss, jobSqlOn, SLIP_BATCH_QUEUE, type SlipBatchJob } from '../jobs/boss';
import {
	loadSlipOrders,
	slipOrderIdsForDay,
	slipPaperOf,
	SlipRefused,
	type SlipLinks
} from './slip-data';
import { renderSlipsPdf } from './slips-pdf';

export interface SlipBatchStatus {
	id: number;
	shipOn: IsoDate;
	paper: SlipPaper;
	state: SlipBatchState;
	doneCount: number;
	total: number;
	error: string | null;
	createdAt: Date;
	finishedAt: Date | null;
}

export type CreateSlipBatchOutcome =
	{ ok: true; batch: SlipBatchStatus } | { ok: false; status: 404; reason: string };

/**
 * Queues the slips of every box scheduled or packed for `shipOn`, in ship order, on the
 * shop's paper: the batch row, its job and the audit entry commit together, so a job
 * never looks for a row that is not there and no row waits for a job never sent.
 */
export async function createSlipBatch(
	db: Kysely<Database>,
	actor: Actor,
	shipOn: IsoDate,
	links: SlipLinks
): Promise<CreateSlipBatchOutcome> {
	const orderIds = await slipOrderIdsForDay(db, shipOn);
	if (orderIds.length === 0)
		return { ok: false, status: 404, reason: 'No boxes are scheduled or packed for that day.' };
	const paper = await slipPaperOf(db);
	const row = await db.transaction().execute(async (trx) => {
		const created = await trx
			.insertInto('slip_batch')
			.values({ ship_on: shipOn, order_ids: orderIds, paper, created_by: actor.userId })
			.returningAll()
			.executeTakeFirstOrThrow();
		const job: SlipBatchJob = { slipBatchId: created.id, origin: links.origin };
		const jobId = await getBoss().send(SLIP_BATCH_QUEUE, job, { db: jobSqlOn<Database>(trx) });
		// pg-boss inserts through a join on its queue table, so a missing queue writes nothing.
		if (!jobId)
			throw new Error(
				`The "${SLIP_BATCH_QUEUE}" queue does not exist: start the jobs (startJobs in src/lib/server/jobs) once against this database.`
			);
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'slips.batch_start',
			entity: 'slip_batch',
			entityId: created.id,
			detail: { shipOn, orders: orderIds.length, paper }
		});
		return created;
	});
	return { ok: true, batch: statusOf(row) };
}

function statusOf(row: {
	id: number;
	ship_on: IsoDate;
	paper: SlipPaper;
	state: SlipBatchState;
	done_count: number;
	order_ids: number[];
	error: string | null;
	created_at: Date;
	finished_at: Date | null;
}): SlipBatchStatus {
	return {
		id: row.id,
		shipOn: row.ship_on,
		paper: row.paper,
		state: row.state,
		doneCount: row.done_count,
		total: row.order_ids.length,
		error: row.error,
		createdAt: row.created_at,
		finishedAt: row.finished_at
	};
}

/** The batch as the keeper's page reads it, with its links. */
export function slipBatchView(status: SlipBatchStatus): SlipBatchView {
	return {
		id: status.id,
		shipOn: status.shipOn,
		state: status.state,
		doneCount: status.doneCount,
		total: status.total,
		error: status.error,
		...slipBatchUrls(status.id)
	};
}

/** A batch's progress (never its PDF bytes), or undefined. */
export async function readSlipBatch(
	db: Kysely<Database>,
	id: number
): Promise<SlipBatchStatus | undefined> {
	const row = await db
		.selectFrom('slip_batch')
		.select([
			'id',
			'ship_on',
			'paper',
			'state',
			'done_count',
			'order_ids',
			'error',
			'created_at',
			'finished_at'
		])
		.where('id', '=', id)
		.executeTakeFirst();
	return row ? statusOf(row) : undefined;
}

/** A finished batch's PDF, or null while it is not done. */
export async function readSlipBatchPdf(
	db: Kysely<Database>,
	id: number
): Promise<Uint8Array | null> {
	const row = await db
		.selectFrom('slip_batch')
		.select(['state', 'pdf'])
		.where('id', '=', id)
		.executeTakeFirst();
	return row?.state === 'done' && row.pdf ? new Uint8Array(row.pdf) : null;
}

/** How often the worker writes done_count: about 50 steps per batch, every order for small ones. */
export function progressStep(total: number): number {
	return Math.max(1, Math.floor(total / 50));
}

export type SlipBatchRun =
	| { outcome: 'done'; pages: number; bytes: number }
	| { outcome: 'failed'; reason: string }
	| { outcome: 'skipped'; why: 'not_found' | 'finished' };

/**
 * The job: draws a queued batch and stores its PDF. A batch whose orders changed since
 * it was asked for (one cancelled, say) fails with the reason, to be made again; any
 * other failure is stored too and thrown, so pg-boss tries once more.
 */
export async function runSlipBatch(
	db: Kysely<Database>,
	id: number,
	links: SlipLinks
): Promise<SlipBatchRun> {
	// Claimed from queued (or from running, when a worker died half way and the job came back).
	const batch = await db
		.updateTable('slip_batch')
		.set({ state: 'running', done_count: 0, error: null })
		.where('id', '=', id)
		.where('state', 'in', ['queued', 'running', 'failed'])
		.returning(['order_ids', 'paper'])
		.executeTakeFirst();
	if (!batch) {
		const exists = await readSlipBatch(db, id);
		return { outcome: 'skipped', why: exists ? 'finished' : 'not_found' };
	}
	const fail = async (reason: string) => {
		await db
			.updateTable('slip_batch')
			.set({ state: 'failed', error: reason.slice(0, 2000), finished_at: new Date() })
			.where('id', '=', id)
			.execute();
	};
	try {
		const orders = await loadSlipOrders(db, batch.order_ids, links);
		const step = progressStep(orders.length);
		const pdf = await renderSlipsPdf(orders, {
			paper: batch.paper,
			onProgress: async (done) => {
				// Drawing is synchronous work in the app's process: let waiting requests in
				// between boxes, so the shop stays quick while a big day is drawn.
				await new Promise((resolve) => setImmediate(resolve));
				if (done % step === 0 && done < orders.length)
					await db
						.updateTable('slip_batch')
						.set({ done_count: done })
						.where('id', '=', id)
						.execute();
			}
		});
		await db
			.updateTable('slip_batch')
			.set({ state: 'done', done_count: orders.length, pdf, finished_at: new Date() })
			.where('id', '=', id)
			.execute();
		return { outcome: 'done', pages: countPages(pdf), bytes: pdf.length };
	} catch (failure) {
		if (failure instanceof SlipRefused) {
			const reason = `Some boxes changed since the batch was asked for: ${failure.message} Make the day’s slips again.`;
			await fail(reason);
			return { outcome: 'failed', reason };
		}
		await fail('The slips could not be drawn; the job tries once more.');
		throw failure;
	}
}

/** Pages in a PDF pdfkit wrote: one "/Type /Page" object each (ISO 32000-1, 7.7.3.3). */
function countPages(pdf: Uint8Array): number {
	return (
		Buffer.from(pdf)
			.toString('latin1')
			.match(/\/Type \/Page\b/g)?.length ?? 0
	);
}
