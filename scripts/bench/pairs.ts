// Pure helpers for the bench's paired measures: the A B A B order of timed rounds, the
// rate pooled over rounds, tail ratios and the cookie a guest cart answers with. No I/O.
import { percentile } from './measure';

/** One timed load round: the 2xx answers it got and the seconds it ran. */
export interface Round {
	answers: number;
	seconds: number;
}

/**
 * The order of `rounds` rounds of each of two targets taken in turn (A B A B …), so both
 * see the same moments of the machine.
 */
export function alternate<T>(pair: readonly [T, T], rounds: number): T[] {
	if (!Number.isInteger(rounds) || rounds < 1)
		throw new RangeError(`rounds must be a whole number of at least 1, not ${rounds}`);
	const order: T[] = [];
	for (let round = 0; round < rounds; round++) order.push(pair[0], pair[1]);
	return order;
}

/** Answers per second over all rounds together: total answers ÷ total seconds. */
export function pooledRate(rounds: readonly Round[]): number {
	const seconds = rounds.reduce((sum, r) => sum + r.seconds, 0);
	if (!(seconds > 0)) throw new RangeError('no time measured');
	return rounds.reduce((sum, r) => sum + r.answers, 0) / seconds;
}

/** numerator ÷ denominator, refusing a denominator that makes the ratio meaningless. */
export function ratio(numerator: number, denominator: number): number {
	if (!Number.isFinite(numerator) || !Number.isFinite(denominator) || denominator <= 0)
		throw new RangeError(`cannot divide ${numerator} by ${denominator}`);
	return numerator / denominator;
}

export interface Tail {
	count: number;
	p50: number;
	p99: number;
	/** p99 ÷ p50: 1 when every answer takes as long as the typical one. */
	ratio: number;
}

/** Nearest-rank p50 and p99 of a list of latencies, and how far the tail sits from the middle. */
export function tail(latencies: readonly number[]): Tail {
	const p50 = percentile(latencies, 50);
	const p99 = percentile(latencies, 99);
	return { count: latencies.length, p50, p99, ratio: ratio(p99, p50) };
}

/**
 * The `name=value` pair to send back for the cookie `name`, from a response's Set-Cookie
 * header lines (the pair is the text before the first `;`, name and value trimmed of
 * white space, RFC 6265 §5.2). The last line
 * naming the cookie wins, as in a browser's cookie store.
 */
export function cookiePair(setCookieLines: readonly string[], name: string): string | null {
	let found: string | null = null;
	for (const line of setCookieLines) {
		const pair = (line.split(';', 1)[0] ?? '').trim();
		const equals = pair.indexOf('=');
		if (equals <= 0) continue;
		if (pair.slice(0, equals).trim() === name) found = `${name}=${pair.slice(equals + 1).trim()}`;
	}
	return found;
}

/** Bytes in decimal kilobytes (SI: 1 kB = 1000 B). */
export function kB(bytes: number): string {
	return `${(bytes / 1000).toFixed(1)} kB`;
}

/** Hands out the pool's cookies in turn, so requests in flight at once use different carts. */
export function roundRobin(cookies: readonly string[]): () => Record<string, string> {
	if (cookies.length === 0) throw new RangeError('an empty pool of carts');
	let next = 0;
	return () => {
		const cookie = cookies[next % cookies.length] as string;
		next++;
		return { cookie };
	};
}
