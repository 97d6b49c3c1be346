// Abuse limits on the account forms, counted in PostgreSQL (rate-limiter-flexible)
// so every app process shares them: per client address and per e-mail.
import type pg from 'pg';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { rethrowAsUnavailable } from '../db/unavailable';

export type LimitedAction = 'sign_in' | 'sign_up' | 'reset' | 'sign_in_link';
export type LimitRule = { points: number; seconds: number };
export type LimitConfig = { perAddress: LimitRule; perEmail: LimitRule };

export const DEFAULT_LIMITS: LimitConfig = {
	perAddress: { points: 30, seconds: 15 * 60 },
	perEmail: { points: 8, seconds: 15 * 60 }
};

export type LimitVerdict =
	{ allowed: true } | { allowed: false; retryAfterSeconds: number; firstRefusal: boolean };

export type AccountLimits = {
	consume(action: LimitedAction, address: string, email: string): Promise<LimitVerdict>;
	forgetEmail(action: LimitedAction, email: string): Promise<void>;
};

export function createAccountLimits(
	pool: pg.Pool,
	config: LimitConfig = DEFAULT_LIMITS
): AccountLimits {
	const limiters = new Map<string, RateLimiterPostgres>();
	function limiter(action: LimitedAction, scope: 'address' | 'email'): RateLimiterPostgres {
		const key = `${action}:${scope}`;
		let found = limiters.get(key);
		if (!found) {
			const rule = scope === 'address' ? config.perAddress : config.perEmail;
			found = new RateLimiterPostgres({
				storeClient: pool,
				storeType: 'pool',
				tableName: 'rate_limit',
				tableCreated: true, // made by a migration, not at run time
				keyPrefix: key,
				points: rule.points,
				duration: rule.seconds
			});
			limiters.set(key, found);
		}
		return found;
	}

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
		async consume(action, address, email) {
			const byAddress = await take(limiter(action, 'address'), address || 'unknown');
			if (!byAddress.allowed) return byAddress;
			return email ? take(limiter(action, 'email'), email.toLowerCase()) : byAddress;
		},
		async forgetEmail(action, email) {
			await limiter(action, 'email').delete(email.toLowerCase());
		}
	};
}

export function limitsFromEnv(env: Record<string, string | undefined>): LimitConfig {
	const read = (name: string, fallback: number) => {
		const value = Number(env[name]);
		return Number.isInteger(value) && value > 0 ? value : fallback;
	};
	return {
		perAddress: {
			points: read('AUTH_LIMIT_PER_ADDRESS', DEFAULT_LIMITS.perAddress.points),
			seconds: read('AUTH_LIMIT_WINDOW_SECONDS', DEFAULT_LIMITS.perAddress.seconds)
		},
		perEmail: {
			points: read('AUTH_LIMIT_PER_EMAIL', DEFAULT_LIMITS.perEmail.points),
			seconds: read('AUTH_LIMIT_WINDOW_SECONDS', DEFAULT_LIMITS.perEmail.seconds)
		}
	};
}
