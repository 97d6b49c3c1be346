import { describe, expect, it } from 'vitest';
import { shippingCautions } from './cautions';
import { shipEstimateOf } from './estimate';
import { describeReason } from './reasons';
import type { Reason } from './ship-check';

const coldPack: Reason = {
	rule: 'cold_pack',
	date: '2026-12-02',
	place: 'destination',
	valueF: 90,
	limitF: 85
};

describe('shipEstimateOf', () => {
	it('gives a ship decision its dates, packs, sentences and the cautions', () => {
		const estimate = shipEstimateOf({
			decision: 'ship',
			shipDate: '2026-12-01',
			deliveryDate: '2026-12-02',
			packs: ['cold'],
			facilityPickup: true,
			reasons: [coldPack]
		});
		expect(estimate).toMatchObject({
			decision: 'ship',
			shipDate: '2026-12-01',
			deliveryDate: '2026-12-02',
			recheckDate: null,
			packs: ['cold'],
			facilityPickup: true
		});
		expect(estimate.reasons).toEqual([{ ...coldPack, text: describeReason(coldPack) }]);
		expect(estimate.reasons[0]?.text).toContain('cold pack');
		expect(estimate.cautions).toEqual(shippingCautions.map((caution) => ({ ...caution })));
	});

	it('gives a hold no dates or packs, only the day to look again', () => {
		const holdBelow: Reason = { ...coldPack, rule: 'hold_below', valueF: 12, limitF: 25 };
		const estimate = shipEstimateOf({
			decision: 'hold',
			recheckDate: '2026-12-02',
			reasons: [holdBelow]
		});
		expect(estimate).toMatchObject({
			decision: 'hold',
			shipDate: null,
			deliveryDate: null,
			recheckDate: '2026-12-02',
			packs: [],
			facilityPickup: false
		});
		expect(estimate.reasons[0]?.text).toContain('hold limit');
		expect(estimate.cautions).toHaveLength(shippingCautions.length);
	});
});
