import { requireRole } from '$lib/server/auth/guard';
import { tableEndpoint } from '$lib/server/backoffice/table-routes';
import type { RequestHandler } from './$types';

// The resting-tubs table as JSON pages ({rows, nextCursor}) or, with ?format=csv, one file.
export const GET: RequestHandler = async (event) => {
	requireRole(event, 'keeper');
	return tableEndpoint(event, 'tubs');
};
