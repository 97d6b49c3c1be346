import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { todayInZone } from '$lib/format/dates';
import { isReportName } from '$lib/reports/report';
import { requireRole } from '$lib/server/auth/guard';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import type { PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

// The role and the shop's today; the report itself comes from its JSON route (+page.ts).
export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'keeper');
	if (!isReportName(event.params.report)) error(404, 'There is no such report.');
	let timeZone: string;
	try {
		timeZone = await resolveShopTimeZone(getDb(), env.SHOP_TIME_ZONE);
	} catch (cause) {
		logger.error({ err: cause }, '[reports] ledger unavailable');
		error(503, 'The ledger cannot be reached just now. Check that PostgreSQL is running.');
	}
	return {
		name: event.params.report,
		seesMoney: user.role === 'admin',
		today: todayInZone(timeZone),
		timeZone
	};
};
