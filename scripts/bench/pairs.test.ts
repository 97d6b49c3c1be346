import { describe, expect, it } from 'vitest';
import { alternate, cookiePair, kB, pooledRate, ratio, roundRobin, tail } from './pairs';

describe('alternate', () => {
	it('takes the two targets in turn, A B A B', () => {
		expect(alternate(['page', 'file'], 3)).toEqual([
			'page',
			'file',
			'page',
			'file',
			'page',
			'file'
		]);
		expect(() => alternate(['a', 'b'], 0)).toThrow(RangeError);
		expect(() => alternate(['a', 'b'], 1.5)).toThrow(RangeError);
	});
});

describe('pooledRate', () => {
	it('divides all answers by all seconds, not the mean of each round', () => {
		// By hand: (90 + 10) answers ÷ (3 + 1) s = 25 per second; the mean of the rounds'
		// own rates, (30 + 10) ÷ 2 = 20, would weigh the short round as much as the long one.
		expect(
			pooledRate([
				{ answers: 90, seconds: 3 },
				{ answers: 10, seconds: 1 }
			])
		).toBe(25);
		expect(() => pooledRate([])).toThrow(RangeError);
		expect(() => pooledRate([{ answers: 5, seconds: 0 }])).toThrow(RangeError);
	});
});

describe('ratio', () => {
	it('divides, and refuses a zero, negative or non-finite denominator', () => {
		expect(ratio(3, 4)).toBe(0.75);
		expect(() => ratio(1, 0)).toThrow(RangeError);
		expect(() => ratio(1, -2)).toThrow(RangeError);
		expect(() => ratio(Number.NaN, 1)).toThrow(RangeError);
	});
});

describe('tail', () => {
	it('gives nearest-rank p50 and p99 and their ratio', () => {
		// Nearest rank (Wikipedia, "Percentile", from memory): of 1…100 ms, p50 is the 50th
		// value and p99 the 99th, so the ratio is 99 ÷ 50 = 1.98.
		const latencies = Array.from({ length: 100 }, (_, i) => 100 - i);
		expect(tail(latencies)).toEqual({ count: 100, p50: 50, p99: 99, ratio: 1.98 });
		// One slow answer in ten: with 10 values p99 is the 10th, the slow one.
		const tenth = [5, 5, 5, 5, 5, 5, 5, 5, 5, 40];
		expect(tail(tenth).ratio).toBe(8);
	});
});

describe('cookiePair', () => {
	it('reads the examples of RFC 6265 section 3.1', () => {
		const lines = [
			'SID=31d4d96e407aad42; Path=/; Secure; HttpOnly',
			'lang=en-US; Path=/; Domain=example.com'
		];
		expect(cookiePair(lines, 'SID')).toBe('SID=31d4d96e407aad42');
		expect(cookiePair(lines, 'lang')).toBe('lang=en-US');
		expect(cookiePair(lines, 'missing')).toBeNull();
		// The later line for the same name replaces the earlier one (the deletion example).
		expect(cookiePair([...lines, 'lang=; Expires=Sun, 06 Nov 1994 08:49:37 GMT'], 'lang')).toBe(
			'lang='
		);
	});

	it('reads the guest cart cookie as the app sets it, and ignores lines without a name', () => {
		const line =
			'hatchlot.cart=b1aa578e-c519-4f1b-bc5e-44fa80b462b3.c0v7xZQ748YFBw_Z9uG28bv; Max-Age=2592000; Path=/; HttpOnly; SameSite=Lax';
		expect(cookiePair(['=nameless; Path=/', 'novalue', line], 'hatchlot.cart')).toBe(
			'hatchlot.cart=b1aa578e-c519-4f1b-bc5e-44fa80b462b3.c0v7xZQ748YFBw_Z9uG28bv'
		);
		// RFC 6265 §5.2: white space around the name and the value is dropped.
		expect(cookiePair([' a = b ; Path=/'], 'a')).toBe('a=b');
	});
});

describe('roundRobin', () => {
	it('hands out each cookie in turn and starts again', () => {
		const next = roundRobin(['a=1', 'a=2', 'a=3']);
		expect(Array.from({ length: 7 }, () => next().cookie)).toEqual([
			'a=1',
			'a=2',
			'a=3',
			'a=1',
			'a=2',
			'a=3',
			'a=1'
		]);
		expect(() => roundRobin([])).toThrow(RangeError);
	});
});

describe('kB', () => {
	it('gives decimal kilobytes (SI: 1 kB = 1000 B)', () => {
		expect(kB(1234)).toBe('1.2 kB');
		expect(kB(98_765)).toBe('98.8 kB');
	});
});
