// A slip batch: its progress as JSON for the page's script, or with ?download=1 its PDF
// once done. A browser tab opening the bare address is sent to the progress page.
import { json, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import {
	readSlipBatch,
	readSlipBatchPdf,
	slipBatchView
} from '$lib/server/fulfilment/slip-batches';
import { pdfResponse, refusalResponse, wantsHtml } from '$lib/server/fulfilment/slip-responses';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	requireRole(event, 'keeper');
	const id = Number(event.params.id);
	const db = getDb();
	const batch = Number.isSafeInteger(id) && id > 0 ? await readSlipBatch(db, id) : undefined;
	if (!batch)
		return refusalResponse(event.request, 404, 'There is no such batch of slips.', {
			href: '/manage/ship-day',
			label: 'Back to the ship day'
		});
	const view = slipBatchView(batch);
	if (event.url.searchParams.has('download')) {
		const pdf = batch.state === 'done' ? await readSlipBatchPdf(db, id) : null;
		if (!pdf)
			return refusalResponse(
				event.request,
				409,
				batch.state === 'failed'
					? `These slips were not made: ${batch.error ?? 'the job stopped.'}`
					: `These slips are still being drawn (${batch.doneCount} of ${batch.total} boxes).`,
				{ href: view.progressUrl, label: 'Watch the progress' }
			);
		return pdfResponse(pdf, `slips-${batch.shipOn}.pdf`, 'attachment');
	}
	if (wantsHtml(event.request)) redirect(303, view.progressUrl);
	return json(view, { headers: { 'cache-control': 'no-store' } });
};
