import { describe, expect, it } from 'vitest';
import { expectedDeliveryOn, type ExpectedDeliveryInput } from './expected-delivery';

// Weekdays checked with GNU date: 2026-12-02 Wednesday, 2026-12-04 Friday,
// 2026-12-24 Thursday, 2026-12-25 Friday, 2026-12-28 Monday. Christmas Day is a US
// federal holiday (5 U.S.C. 6103), so carriers do not deliver on it.
const base: ExpectedDeliveryInput = {
	shippedOn: '2026-12-02',
	service: 'overnight',
	carrier: 'UPS',
	check: null,
	extraClosedDates: []
};

describe('expectedDeliveryOn', () => {
	it("keeps the ship check's date when the box leaves on the check's ship date", () => {
		expect(
			expectedDeliveryOn({
				...base,
				check: { shipDate: '2026-12-02', deliveryDate: '2026-12-03' }
			})
		).toBe('2026-12-03');
	});

	it('counts from the day it really left when that is another day', () => {
		// Checked for Wednesday, left Thursday: overnight arrives Friday.
		expect(
			expectedDeliveryOn({
				...base,
				shippedOn: '2026-12-03',
				check: { shipDate: '2026-12-02', deliveryDate: '2026-12-03' }
			})
		).toBe('2026-12-04');
		expect(expectedDeliveryOn({ ...base, service: 'two_day' })).toBe('2026-12-04');
	});

	it('skips the weekend for a box that left on a Friday', () => {
		expect(expectedDeliveryOn({ ...base, shippedOn: '2026-12-04' })).toBe('2026-12-07');
		expect(expectedDeliveryOn({ ...base, shippedOn: '2026-12-04', service: 'two_day' })).toBe(
			'2026-12-08'
		);
	});

	it('skips Christmas Day and the weekend after it', () => {
		expect(expectedDeliveryOn({ ...base, shippedOn: '2026-12-24' })).toBe('2026-12-28');
	});

	it("skips the shop's own closed days", () => {
		expect(expectedDeliveryOn({ ...base, extraClosedDates: ['2026-12-03'] })).toBe('2026-12-04');
	});

	it('has a hand-delivered box arrive the day it goes', () => {
		expect(expectedDeliveryOn({ ...base, carrier: 'hand', shippedOn: '2026-12-05' })).toBe(
			'2026-12-05'
		);
	});
});
