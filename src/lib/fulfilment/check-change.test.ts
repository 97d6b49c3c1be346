import { describe, expect, it } from 'vitest';
import type { ShipCheckResult } from '$lib/shipping/ship-check';
import { checkChange } from './check-change';

const scheduled = { shipOn: '2026-12-08', packs: ['heat'] as const, facilityPickup: false };
const ship = (
	extra: Partial<Extract<ShipCheckResult, { decision: 'ship' }>> = {}
): ShipCheckResult => ({
	decision: 'ship',
	shipDate: '2026-12-08',
	deliveryDate: '2026-12-09',
	packs: ['heat'],
	facilityPickup: false,
	reasons: [{ rule: 'heat_pack', date: '2026-12-08', place: 'origin', valueF: 38, limitF: 50 }],
	...extra
});

describe('a ship check against what was scheduled', () => {
	it('is unchanged when the day, packs and pickup advice all still hold', () => {
		expect(checkChange(scheduled, ship())).toBeNull();
		// Pack order does not matter.
		expect(
			checkChange({ ...scheduled, packs: ['heat', 'cold'] }, ship({ packs: ['cold', 'heat'] }))
		).toBeNull();
	});

	it('names a hold with the day to look again, and keeps the reasons in words', () => {
		const change = checkChange(scheduled, {
			decision: 'hold',
			recheckDate: '2026-12-10',
			reasons: [
				{ rule: 'hold_below', date: '2026-12-09', place: 'destination', valueF: 12, limitF: 25 }
			]
		});
		expect(change?.kind).toBe('hold');
		// 8 and 10 Dec 2026 are a Tuesday and a Thursday (a fact of the Gregorian calendar).
		expect(change?.summary).toBe(
			'The forecast now says hold: not safe to ship on Tue, Dec 8, 2026. Look again on Thu, Dec 10, 2026.'
		);
		expect(change?.reasons[0]).toMatch(/12 °F/);
	});

	it('names a later day, then other packs, then changed pickup advice', () => {
		expect(checkChange(scheduled, ship({ shipDate: '2026-12-09' }))).toMatchObject({
			kind: 'later',
			shipDate: '2026-12-09'
		});
		expect(checkChange(scheduled, ship({ packs: ['cold'] }))).toMatchObject({
			kind: 'packs',
			summary: 'The box now needs a cold pack, not a heat pack.'
		});
		expect(checkChange(scheduled, ship({ packs: [] }))?.summary).toBe(
			'The box now needs no pack, not a heat pack.'
		);
		expect(checkChange(scheduled, ship({ facilityPickup: true }))).toMatchObject({
			kind: 'pickup',
			facilityPickup: true
		});
	});
});
