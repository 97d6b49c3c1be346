import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { getDb } from '$lib/server/db';
import { loadKeeperOverview } from '$lib/server/backoffice/overview';
import { loadDueToday } from '$lib/server/care/due-today';
import { requireRole } from '$lib/server/auth/guard';
import type { PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	try {
		const overview = await loadKeeperOverview(getDb(), { fallbackTimeZone: env.SHOP_TIME_ZONE });
		return { overview, due: await loadDueToday(getDb(), overview.today) };
	} catch (cause) {
		logger.error({ err: cause }, '[manage] overview unavailable');
		error(503, 'The stock ledger cannot be reached just now. Check that PostgreSQL is running.');
	}
};
