import { describe, expect, it } from 'vitest';
import { instantFromShopTime, shopTimeOf } from './local-time';

// Expected instants from GNU date over the system's IANA time zone database, e.g.
// date -u -d 'TZ="America/New_York" 2026-12-02 16:30' → 2026-12-02T21:30:00Z.
describe('instantFromShopTime', () => {
	it('reads a winter and a summer time in New York (EST UTC−5, EDT UTC−4)', () => {
		expect(instantFromShopTime('2026-12-02T16:30', 'America/New_York')?.toISOString()).toBe(
			'2026-12-02T21:30:00.000Z'
		);
		expect(instantFromShopTime('2026-07-15T09:05', 'America/New_York')?.toISOString()).toBe(
			'2026-07-15T13:05:00.000Z'
		);
	});

	it('reads a zone without summer time (Phoenix, UTC−7 all year)', () => {
		expect(instantFromShopTime('2026-07-15T09:05', 'America/Phoenix')?.toISOString()).toBe(
			'2026-07-15T16:05:00.000Z'
		);
	});

	it('has no instant for a time skipped when the clocks go forward (2026-03-08 02:30 in New York)', () => {
		expect(instantFromShopTime('2026-03-08T02:30', 'America/New_York')).toBeNull();
		expect(instantFromShopTime('2026-03-08T03:30', 'America/New_York')?.toISOString()).toBe(
			'2026-03-08T07:30:00.000Z'
		);
	});

	it('takes the first of a time that happens twice (2026-11-01 01:30 in New York, as GNU date does)', () => {
		expect(instantFromShopTime('2026-11-01T01:30', 'America/New_York')?.toISOString()).toBe(
			'2026-11-01T05:30:00.000Z'
		);
	});

	it('refuses what is not a time', () => {
		for (const text of ['', '2026-12-02', '2026-02-30T10:00', '2026-12-02T24:00', '12/02/2026 4pm'])
			expect(instantFromShopTime(text, 'America/New_York'), text).toBeNull();
	});

	it('drops seconds a browser may send', () => {
		expect(instantFromShopTime('2026-12-02T16:30:59', 'America/New_York')?.toISOString()).toBe(
			'2026-12-02T21:30:00.000Z'
		);
	});
});

describe('shopTimeOf', () => {
	it('shows an instant on the shop clock, and reads back to the same minute', () => {
		const instant = new Date('2026-12-02T21:30:00Z');
		expect(shopTimeOf(instant, 'America/New_York')).toBe('2026-12-02T16:30');
		expect(
			instantFromShopTime(shopTimeOf(instant, 'America/New_York'), 'America/New_York')
		).toEqual(instant);
		expect(shopTimeOf(new Date('2026-12-02T04:59:00Z'), 'America/New_York')).toBe(
			'2026-12-01T23:59'
		);
	});
});
