// The public ship-date estimate behind GET /api/ship-estimate: the same check the
// orders get, for a ZIP and a service, with a per-address limit so the endpoint
// cannot be used to drain the forecast provider. The limiter counts in PostgreSQL
// (rate-limiter-flexible), so every app process shares it.
import type { Kysely } from 'kysely';
import type pg from 'pg';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { rethrowAsUnavailable } from '../db/unavailable';
import type { IsoDate } from '$lib/format/dates';
import type { LimitRule } from '$lib/server/auth/limits';
import { lookUpZip } from '$lib/server/accounts/zip';
import type { Database, Service } from '$lib/server/db/schema';
import type { ForecastSource } from '$lib/server/weather/source';
import { shippingAreaProblem } from '$lib/shipping/area';
import { shipEstimateOf, type ShipEstimate } from '$lib/shipping/estimate';
import { shipCheck } from '$lib/shipping/ship-check';
import { buildShipCheckInput } from './inputs';

/** 30 estimates a minute per address: plenty for a visitor trying a few ZIPs. */
export const ESTIMATE_LIMIT: LimitRule = { points: 30, seconds: 60 };

export type EstimateLimitVerdict =
	{ allowed: true } | { allowed: false; retryAfterSeconds: number; firstRefusal: boolean };

export type EstimateLimiter = { consume(address: string): Promise<EstimateLimitVerdict> };

export function createEstimateLimiter(
	pool: pg.Pool,
	rule: LimitRule = ESTIMATE_LIMIT
): EstimateLimiter {
	const limiter = new RateLimiterPostgres({
		storeClient: pool,
		storeType: 'pool',
		tableName: 'rate_limit',
		tableCreated: true, // made by a migration, not at run time
		keyPrefix: 'ship_estimate:address',
		points: rule.points,
		duration: rule.seconds
	});
	return {
		async consume(address) {
			try {
				await limiter.consume(address || 'unknown');
				return { allowed: true };
			} catch (refusal) {
				if (refusal instanceof RateLimiterRes) {
					return {
						allowed: false,
						retryAfterSeconds: Math.max(1, Math.ceil(refusal.msBeforeNext / 1000)),
						firstRefusal: refusal.consumedPoints === rule.points + 1
					};
				}
				// The counts live in PostgreSQL: with it away the request answers 503, not 500.
				rethrowAsUnavailable(refusal);
			}
		}
	};
}

const SERVICES: readonly Service[] = ['overnight', 'two_day'];

export type EstimateAnswer =
	{ status: 200; body: ShipEstimate } | { status: 400 | 503; body: { message: string } };

/** The query as typed: ZIP and service, each checked before any forecast is asked for. */
export function estimateQueryProblem(
	zip: string | null,
	service: string | null
): { zip: string; service: Service } | { message: string } {
	const cleanZip = (zip ?? '').trim();
	if (!/^\d{5}$/.test(cleanZip)) return { message: 'Enter a five-digit US ZIP code.' };
	const place = lookUpZip(cleanZip);
	if (!place) return { message: `ZIP code ${cleanZip} does not exist.` };
	const outside = shippingAreaProblem(cleanZip, place.state);
	if (outside) return { message: outside };
	const chosen = SERVICES.find((known) => known === (service ?? '').trim());
	if (!chosen) return { message: 'Choose overnight or two-day service.' };
	return { zip: cleanZip, service: chosen };
}

/**
 * The estimate for `zip` and `service` from the shop-local `today`: 400 for a bad ZIP
 * or service, 503 before the shop's settings exist.
 */
export async function shipEstimate(
	db: Kysely<Database>,
	source: ForecastSource,
	query: { zip: string | null; service: string | null; today: IsoDate }
): Promise<EstimateAnswer> {
	const checked = estimateQueryProblem(query.zip, query.service);
	if ('message' in checked) return { status: 400, body: { message: checked.message } };
	const settings = await db
		.selectFrom('shop_setting')
		.selectAll()
		.where('id', '=', true)
		.executeTakeFirst();
	if (!settings) {
		return { status: 503, body: { message: 'The shop is not ready to estimate ship dates yet.' } };
	}
	const input = await buildShipCheckInput(source, settings, {
		service: checked.service,
		destinationZip: checked.zip,
		firstDate: query.today
	});
	return { status: 200, body: shipEstimateOf(shipCheck(input)) };
}
