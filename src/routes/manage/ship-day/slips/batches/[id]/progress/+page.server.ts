import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import { readSlipBatch, slipBatchView } from '$lib/server/fulfilment/slip-batches';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const id = Number(event.params.id);
	const batch = Number.isSafeInteger(id) && id > 0 ? await readSlipBatch(getDb(), id) : undefined;
	if (!batch) error(404, 'There is no such batch of slips.');
	return { batch: slipBatchView(batch) };
};
