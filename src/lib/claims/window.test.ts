import { describe, expect, it } from 'vitest';
import { claimAvailability } from './window';

// 15:00 UTC on 1 Dec 2026 is 10:00 in New York (EST, UTC−5; the US left DST on 1 Nov 2026).
const delivered = new Date('2026-12-01T15:00:00Z');
const order = { state: 'delivered', deliveredAt: delivered, hasLive: true, hasOpenClaim: false };
const zone = 'America/New_York';

describe('claim availability', () => {
	it('is open from delivery to the end of the window, closing at delivery plus the window', () => {
		// PRODUCT.md's guarantee default (common practice): report within 2 hours of delivery.
		const inside = claimAvailability(order, new Date('2026-12-01T16:59:00Z'), 2, zone);
		expect(inside).toEqual({ canFile: true, closesAt: new Date('2026-12-01T17:00:00Z') });
		const after = claimAvailability(order, new Date('2026-12-01T17:01:00Z'), 2, zone);
		expect(after.canFile).toBe(false);
		if (!after.canFile) expect(after.why).toContain('within 2 hours of delivery');
	});

	it('says why not before delivery, with a claim open, or with no live animals', () => {
		const now = new Date('2026-12-01T15:30:00Z');
		expect(
			claimAvailability({ ...order, state: 'shipped', deliveredAt: null }, now, 2, zone)
		).toEqual({
			canFile: false,
			why: 'Claims can be filed once the order is delivered.',
			closesAt: null
		});
		// A part refund after delivery leaves the window open; a full refund closes it.
		expect(claimAvailability({ ...order, state: 'part_refunded' }, now, 2, zone).canFile).toBe(
			true
		);
		expect(claimAvailability({ ...order, state: 'refunded' }, now, 2, zone).canFile).toBe(false);
		expect(claimAvailability({ ...order, hasOpenClaim: true }, now, 2, zone)).toMatchObject({
			canFile: false,
			why: 'This order already has a claim waiting for the shop.'
		});
		expect(claimAvailability({ ...order, hasLive: false }, now, 2, zone)).toMatchObject({
			canFile: false,
			why: 'The guarantee covers live animals only.'
		});
	});
});
