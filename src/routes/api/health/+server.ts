import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { checkHealth } from '$lib/server/health';
import type { RequestHandler } from './$types';

// Public by design: a load balancer or monitor asks it without signing in.
export const GET: RequestHandler = async () => {
	const { httpStatus, report } = await checkHealth(getDb());
	return json(report, { status: httpStatus, headers: { 'cache-control': 'no-store' } });
};
