import zipcodes from 'zipcodes';
import { describe, expect, it } from 'vitest';
import { SHIPPING_AREA_STATES, shippingAreaProblem } from './area';

describe('shipping area', () => {
	it('is the 48 contiguous states and DC', () => {
		// 50 states less Alaska and Hawaii, plus the District: 49 (USPS state codes; the count is from memory).
		expect(SHIPPING_AREA_STATES.size).toBe(49);
		expect(SHIPPING_AREA_STATES.has('AK')).toBe(false);
		expect(SHIPPING_AREA_STATES.has('HI')).toBe(false);
	});

	it('agrees with the ZIP dataset of the zipcodes package', () => {
		// Outside reference: the states the `zipcodes` dataset files these ZIPs under.
		const inside = ['37902', '55805', '85719', '97103', '20001', '04101'];
		const outside = ['99501', '96813', '00901', '09001'];
		for (const zip of inside) {
			const place = zipcodes.lookup(zip)!;
			expect(shippingAreaProblem(zip, place.state)).toBeNull();
		}
		for (const zip of outside) {
			const place = zipcodes.lookup(zip)!;
			expect(shippingAreaProblem(zip, place.state)).toMatch(/outside our shipping area/);
		}
	});
});
