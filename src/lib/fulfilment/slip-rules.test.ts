import { describe, expect, it } from 'vitest';
import { ORDER_STATES } from '$lib/orders/state-machine';
import {
	animalCount,
	compareShipOrder,
	packInstruction,
	slipRefusal,
	unitCountText,
	unitsToPack
} from './slip-rules';

describe('which orders get a slip', () => {
	it('refuses unpaid, cancelled and refunded orders, each with its reason', () => {
		const refusal = (state: (typeof ORDER_STATES)[number], hasLive = true) =>
			slipRefusal({ orderNumber: 'HL-10020', state, hasLive });
		expect(refusal('awaiting_payment')).toBe(
			'HL-10020 is not paid yet: a box is packed only for a paid order.'
		);
		expect(refusal('cancelled')).toBe('HL-10020 was cancelled: nothing goes out for it.');
		expect(refusal('refunded')).toBe('HL-10020 was refunded in full: nothing goes out for it.');
	});

	it('refuses boxes of animals that have no ship date yet, but not a box of supplies', () => {
		expect(slipRefusal({ orderNumber: 'HL-1', state: 'weather_hold', hasLive: true })).toMatch(
			/on weather hold/
		);
		expect(slipRefusal({ orderNumber: 'HL-1', state: 'paid', hasLive: true })).toMatch(
			/waiting for its ship check/
		);
		expect(slipRefusal({ orderNumber: 'HL-1', state: 'paid', hasLive: false })).toBeNull();
	});

	it('prints scheduled boxes, and again for boxes packed, shipped or delivered', () => {
		const printable = ORDER_STATES.filter(
			(state) => slipRefusal({ orderNumber: 'HL-1', state, hasLive: true }) === null
		);
		expect(printable).toEqual(['scheduled', 'packed', 'shipped', 'delivered', 'part_refunded']);
	});
});

describe('ship order', () => {
	it('puts overnight boxes first, then two-day, each by order number read as a number', () => {
		const orders = [
			{ service: 'two_day' as const, orderNumber: 'HL-10002' },
			{ service: 'overnight' as const, orderNumber: 'HL-10010' },
			{ service: 'overnight' as const, orderNumber: 'HL-9999' },
			{ service: 'two_day' as const, orderNumber: 'HL-10001' }
		];
		expect(orders.sort(compareShipOrder).map((o) => o.orderNumber)).toEqual([
			'HL-9999',
			'HL-10010',
			'HL-10001',
			'HL-10002'
		]);
	});
});

describe('line counts', () => {
	it('packs what was sold less what was refunded and restocked', () => {
		expect(unitsToPack({ quantity: 3, restockedQuantity: 1 })).toBe(2);
		expect(unitsToPack({ quantity: 3, restockedQuantity: 3 })).toBe(0);
	});

	it('says a line the way it was bought, and counts its animals', () => {
		expect(unitCountText(3, 10, 'unsexed')).toBe('3 × group of 10');
		expect(animalCount(3, 10)).toBe(30);
		expect(unitCountText(1, 2, 'pair')).toBe('1 × pair');
		expect(animalCount(1, 2)).toBe(2);
		expect(unitCountText(5, 1, 'unsexed')).toBe('5 animals');
		expect(unitCountText(1, 1, 'female')).toBe('1 animal');
	});

	it('names the packs to add, or none', () => {
		expect(packInstruction([])).toBeNull();
		expect(packInstruction(['heat'])).toBe('Add a heat pack');
		expect(packInstruction(['cold', 'cold'])).toBe('Add a cold pack');
		expect(packInstruction(['heat', 'cold'])).toBe('Add a heat pack and a cold pack');
	});
});
