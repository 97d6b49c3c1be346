import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { todayInZone } from '$lib/format/dates';
import { requireRole } from '$lib/server/auth/guard';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { loadStockPipeline } from '$lib/server/stock/pipeline';
import { pipelineTotals } from '$lib/stock/pipeline';
import type { PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const db = getDb();
	try {
		const timeZone = await resolveShopTimeZone(db, env.SHOP_TIME_ZONE);
		const today = todayInZone(timeZone);
		const rows = await loadStockPipeline(db, today);
		return { today, timeZone, rows, totals: pipelineTotals(rows) };
	} catch (cause) {
		logger.error({ err: cause }, '[pipeline] ledger unavailable');
		error(503, 'The stock ledger cannot be reached just now. Check that PostgreSQL is running.');
	}
};
