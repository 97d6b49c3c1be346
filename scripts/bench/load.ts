// The bench's load rounds through autocannon on loopback: one round against a target, two
// targets in A B A B rounds, and a pool of guest carts for adding lines at a steady cost.
import autocannon from 'autocannon';
import { alternate, cookiePair, type Round } from './pairs';

export class BenchError extends Error {}

export interface Target {
	/** What the printed table calls it. */
	label: string;
	url: string;
	method?: 'GET' | 'POST';
	headers?: Record<string, string>;
	body?: string;
	/** Each request's extra headers, e.g. the next cart's cookie. */
	perRequest?: () => Record<string, string>;
	/** The most answers a round may take; the round ends at the next one-second tick once it has them. */
	maxRequests?: number;
	/** Runs before each round of this target, e.g. to empty the carts. */
	beforeRound?: () => Promise<void>;
}

export interface RoundResult extends Round {
	/** Each answer's time to the last byte, in ms, when asked for. */
	latencies: number[];
}

export interface LoadSettings {
	connections: number;
	timeoutSeconds: number;
	/** Where to look when a round fails. */
	serverLog: string;
}

/** One round of `seconds` against a target; any error or non-2xx answer fails the bench. */
export function loadRound(
	target: Target,
	seconds: number,
	settings: LoadSettings,
	keepLatencies = false
): Promise<RoundResult> {
	const latencies: number[] = [];
	const perRequest = target.perRequest;
	return new Promise((resolve, reject) => {
		const instance = autocannon(
			{
				url: target.url,
				connections: settings.connections,
				duration: seconds,
				maxOverallRequests: target.maxRequests ?? 1_000_000,
				timeout: settings.timeoutSeconds,
				method: target.method ?? 'GET',
				headers: target.headers,
				body: target.body,
				requests: perRequest
					? [
							{
								setupRequest: (request) => {
									request.headers = { ...request.headers, ...perRequest() };
									return request;
								}
							}
						]
					: undefined
			},
			(error: unknown, result) => {
				if (error) {
					reject(error instanceof Error ? error : new BenchError(String(error)));
					return;
				}
				if (result.errors > 0 || result.non2xx > 0) {
					const codes = Object.entries(result.statusCodeStats ?? {})
						.map(([code, stat]) => `${code}×${stat.count}`)
						.join(', ');
					reject(
						new BenchError(
							`${target.method ?? 'GET'} ${target.url}: ${result.errors} errors and ` +
								`${result.non2xx} non-2xx answers under load (${codes}); see ${settings.serverLog}`
						)
					);
					return;
				}
				resolve({ answers: result['2xx'], seconds: result.duration, latencies });
			}
		);
		if (keepLatencies)
			instance.on('response', (_client, statusCode, _bytes, responseTime) => {
				if (statusCode >= 200 && statusCode < 300) latencies.push(responseTime);
			});
	});
}

export interface PairResult {
	a: RoundResult[];
	b: RoundResult[];
}

/**
 * A warm-up round of each target, then `rounds` rounds of each taken in turn (A B A B …),
 * every round `seconds` long.
 */
export async function alternatingRounds(
	pair: readonly [Target, Target],
	options: { rounds: number; seconds: number; warmupSeconds: number },
	settings: LoadSettings
): Promise<PairResult> {
	for (const target of pair) {
		await target.beforeRound?.();
		await loadRound(target, options.warmupSeconds, settings);
	}
	const result: PairResult = { a: [], b: [] };
	for (const target of alternate(pair, options.rounds)) {
		await target.beforeRound?.();
		const round = await loadRound(target, options.seconds, settings);
		(target === pair[0] ? result.a : result.b).push(round);
	}
	return result;
}

export const CART_COOKIE = 'hatchlot.cart';

/**
 * `count` guest carts made the way a shopper's first "add to cart" makes one: a POST to
 * /api/cart without a cookie, answered with the signed cart cookie. Returns each cookie pair.
 */
export async function guestCarts(
	base: string,
	listingId: number,
	count: number,
	timeoutMs: number
): Promise<string[]> {
	const cookies: string[] = [];
	for (let i = 0; i < count; i++) {
		const res = await fetch(`${base}/api/cart`, {
			method: 'POST',
			headers: { 'content-type': 'application/json', origin: base },
			body: JSON.stringify({ listingId, quantity: 1 }),
			signal: AbortSignal.timeout(timeoutMs)
		});
		await res.arrayBuffer();
		if (res.status !== 200)
			throw new BenchError(`POST /api/cart for listing ${listingId} answered ${res.status}`);
		const pair = cookiePair(res.headers.getSetCookie(), CART_COOKIE);
		if (!pair) throw new BenchError(`POST /api/cart set no ${CART_COOKIE} cookie`);
		cookies.push(pair);
	}
	return cookies;
}
