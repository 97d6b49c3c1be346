import { json } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { writeAudit } from '$lib/server/audit';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { getDb, getPool } from '$lib/server/db';
import {
	createEstimateLimiter,
	shipEstimate,
	type EstimateLimiter
} from '$lib/server/shipping/estimate';
import { forecastSource } from '$lib/server/weather';
import type { RequestHandler } from './$types';

// Public by design: a visitor at the cart asks it before signing in. The limit per
// address keeps it from being used to drain the forecast provider.
let limiter: EstimateLimiter | undefined;

export const GET: RequestHandler = async (event) => {
	const address = clientAddress(event);
	limiter ??= createEstimateLimiter(getPool());
	const verdict = await limiter.consume(address ?? 'unknown');
	if (!verdict.allowed) {
		if (verdict.firstRefusal) {
			await writeAudit(getDb(), {
				actorUserId: event.locals.user?.id ?? null,
				actorIp: address,
				action: 'ship_estimate.limit_reached',
				entity: 'ship_estimate',
				entityId: null
			});
		}
		return json(
			{ message: 'Too many estimates from this address. Please wait a minute and try again.' },
			{ status: 429, headers: { 'retry-after': String(verdict.retryAfterSeconds) } }
		);
	}
	const db = getDb();
	const { today } = await shopClock(db, env.SHOP_TIME_ZONE);
	const answer = await shipEstimate(db, forecastSource(db), {
		zip: event.url.searchParams.get('zip'),
		service: event.url.searchParams.get('service'),
		today
	});
	// The forecast behind an estimate changes through the day; never serve a stale one.
	return json(answer.body, { status: answer.status, headers: { 'cache-control': 'no-store' } });
};
