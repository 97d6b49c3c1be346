import { describe, expect, it } from 'vitest';
import {
	formatCount,
	formatGroupList,
	formatIsoWeekdays,
	sizeClassLabel,
	stageLabel,
	stateLabel,
	statesOf
} from './labels';

describe('state labels', () => {
	it('names every order state in life-cycle order', () => {
		expect(statesOf('order').map((state) => stateLabel('order', state))).toEqual([
			'Awaiting payment',
			'Paid',
			'Scheduled',
			'Weather hold',
			'Packed',
			'Shipped',
			'Delivered',
			'Cancelled',
			'Refunded',
			'Part refunded'
		]);
	});

	it('turns stored codes into words', () => {
		expect(stateLabel('clutch', 'sold_out')).toBe('Sold out');
		expect(stateLabel('tub', 'yielded')).toBe('Yielded');
		expect(stateLabel('claim', 'declined')).toBe('Declined');
		expect(stageLabel('sub_adult')).toBe('Sub-adult');
		expect(sizeClassLabel('tiny')).toBe('Tiny');
	});
});

describe('formatGroupList', () => {
	it('lists the groups kept, in a fixed order, joined as a sentence', () => {
		expect(formatGroupList(['springtail', 'isopod', 'millipede', 'isopod'])).toBe(
			'millipedes, isopods and springtails'
		);
		expect(formatGroupList(['roach', 'beetle'])).toBe('beetles and roaches');
		expect(formatGroupList(['isopod'])).toBe('isopods');
		expect(formatGroupList([])).toBe('');
	});
});

describe('formatIsoWeekdays', () => {
	it('reads ISO 8601 weekday numbers, Monday = 1', () => {
		// ISO 8601 numbers the days of the week 1 (Monday) to 7 (Sunday) (from memory).
		expect(formatIsoWeekdays([1, 2, 3])).toBe('Mon, Tue, Wed');
		expect(formatIsoWeekdays([7, 1, 1])).toBe('Mon, Sun');
		expect(formatIsoWeekdays([])).toBe('');
	});

	it('refuses numbers that are not weekdays', () => {
		expect(() => formatIsoWeekdays([0])).toThrow(RangeError);
		expect(() => formatIsoWeekdays([8])).toThrow(RangeError);
	});
});

describe('formatCount', () => {
	it('picks the noun by count', () => {
		expect(formatCount(1, 'colony', 'colonies')).toBe('1 colony');
		expect(formatCount(1200, 'animal')).toBe('1,200 animals');
		expect(formatCount(0, 'tub')).toBe('0 tubs');
	});
});
