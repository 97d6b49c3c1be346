// Guest joins send mail to whatever address is typed, so they are limited like the
// account forms (auth/limits.ts): counted in PostgreSQL's rate_limit table, so every
// app process shares the count, per client address and per e-mail address.
import type pg from 'pg';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { rethrowAsUnavailable } from '../db/unavailable';
import type { LimitConfig, LimitVerdict } from '../auth/limits';

/** A person joins a few lists in a sitting; one address gets at most a few links an hour. */
export const WAITLIST_JOIN_LIMITS: LimitConfig = {
	perAddress: { points: 20, seconds: 60 * 60 },
	perEmail: { points: 4, seconds: 60 * 60 }
};

export interface WaitlistLimits {
	/** One guest join from `address` for `email` (already lower-case). */
	consume(address: string, email: string): Promise<LimitVerdict>;
}

export function createWaitlistLimits(
	pool: pg.Pool,
	config: LimitConfig = WAITLIST_JOIN_LIMITS
): WaitlistLimits {
	const limiter = (scope: 'address' | 'email') => {
		const rule = scope === 'address' ? config.perAddress : config.perEmail;
		return new RateLimiterPostgres({
			storeClient: pool,
			storeType: 'pool',
			tableName: 'rate_limit',
			tableCreated: true, // made by a migration, not at run time
			keyPrefix: `waitlist_join:${scope}`,
			points: rule.points,
			duration: rule.seconds
		});
	};
	const byAddress = limiter('address');
	const byEmail = limiter('email');

	async function take(l: RateLimiterPostgres, key: string): Promise<LimitVerdict> {
		try {
			await l.consume(key);
			return { allowed: true };
		} catch (refusal) {
			if (refusal instanceof RateLimiterRes) {
				return {
					allowed: false,
					retryAfterSeconds: Math.max(1, Math.ceil(refusal.msBeforeNext / 1000)),
					firstRefusal: refusal.consumedPoints === l.points + 1
				};
			}
			// The counts live in PostgreSQL: with it away the request answers 503, not 500.
			rethrowAsUnavailable(refusal);
		}
	}

	return {
		async consume(address, email) {
			const first = await take(byAddress, address || 'unknown');
			if (!first.allowed) return first;
			return take(byEmail, email.toLowerCase());
		}
	};
}
