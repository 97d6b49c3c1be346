import { describe, expect, it } from 'vitest';
import {
	deliverSchema,
	deliveredAtFrom,
	lateNoticeSchema,
	packItemsFrom,
	packSchema,
	reverseSchema,
	shipSchema
} from './mark-forms';

const fieldOf = (result: { error?: { issues: { path: PropertyKey[] }[] } }) =>
	result.error?.issues[0]?.path.join('.');

describe('packSchema', () => {
	it('needs at least one order, and defaults to no confirmed changes', () => {
		expect(fieldOf(packSchema.safeParse({ orderIds: [] }))).toBe('orderIds');
		expect(packSchema.parse({ orderIds: [3, 4] })).toEqual({
			orderIds: [3, 4],
			confirmChangedCheck: []
		});
	});

	it('turns the form into one item per order with the page verdict and the tick', () => {
		const form = packSchema.parse({ orderIds: [3, 4, 3], confirmChangedCheck: [4] });
		expect(packItemsFrom(form, (id) => id === 4)).toEqual([
			{ orderId: 3, checkChanged: false, confirmChangedCheck: false },
			{ orderId: 4, checkChanged: true, confirmChangedCheck: true }
		]);
	});
});

describe('shipSchema', () => {
	it('asks for the tracking number on the tracking-number field unless the box goes by hand', () => {
		const missing = shipSchema.safeParse({ orderId: 1, carrier: 'UPS', trackingNumber: '  ' });
		expect(fieldOf(missing)).toBe('trackingNumber');
		expect(missing.error?.issues[0]?.message).toMatch(/only hand delivery/);
		expect(shipSchema.parse({ orderId: 1, carrier: 'hand' })).toEqual({
			orderId: 1,
			carrier: 'hand',
			trackingNumber: '',
			confirmOffDay: false
		});
	});

	it('refuses a carrier it does not offer, on the carrier field', () => {
		const other = shipSchema.safeParse({ orderId: 1, carrier: 'DHL', trackingNumber: '123' });
		expect(fieldOf(other)).toBe('carrier');
		expect(other.error?.issues[0]?.message).toBe('Pick the carrier, or hand delivery.');
	});

	it('keeps the number as typed, trimmed', () => {
		expect(
			shipSchema.parse({ orderId: 1, carrier: 'USPS', trackingNumber: ' 9400 1112 0255 ' })
		).toMatchObject({ trackingNumber: '9400 1112 0255' });
	});
});

describe('reverseSchema', () => {
	it('needs a written reason and a mark that can be undone', () => {
		expect(fieldOf(reverseSchema.safeParse({ orderId: 1, from: 'shipped', reason: 'oops' }))).toBe(
			'reason'
		);
		expect(
			fieldOf(
				reverseSchema.safeParse({
					orderId: 1,
					from: 'paid',
					reason: 'Marked the wrong box in the rush.'
				})
			)
		).toBe('from');
		expect(
			reverseSchema.parse({
				orderId: 1,
				from: 'delivered',
				reason: '  Carrier scanned the wrong door.  '
			})
		).toEqual({ orderId: 1, from: 'delivered', reason: 'Carrier scanned the wrong door.' });
	});
});

describe('deliverSchema and deliveredAtFrom', () => {
	const now = new Date('2026-12-02T22:00:00Z');

	it('takes an empty time as now', () => {
		const form = deliverSchema.parse({ orderId: 1 });
		expect(deliveredAtFrom(form.deliveredAt, 'America/New_York', now)).toEqual({
			ok: true,
			at: now
		});
	});

	it("reads the time on the shop's clock", () => {
		// 16:30 EST is 21:30 UTC (GNU date over the IANA zone database).
		expect(deliveredAtFrom('2026-12-02T16:30', 'America/New_York', now)).toEqual({
			ok: true,
			at: new Date('2026-12-02T21:30:00Z')
		});
	});

	it('refuses a time in the future or one the clocks skipped', () => {
		expect(deliveredAtFrom('2026-12-02T18:00', 'America/New_York', now)).toMatchObject({
			ok: false,
			problem: expect.stringMatching(/future/)
		});
		expect(deliveredAtFrom('2026-03-08T02:30', 'America/New_York', now)).toMatchObject({
			ok: false,
			problem: expect.stringMatching(/does not exist/)
		});
	});

	it('refuses text that is not a time', () => {
		expect(fieldOf(deliverSchema.safeParse({ orderId: 1, deliveredAt: 'yesterday' }))).toBe(
			'deliveredAt'
		);
	});
});

describe('lateNoticeSchema', () => {
	it('needs an order', () => {
		expect(fieldOf(lateNoticeSchema.safeParse({}))).toBe('orderId');
		expect(lateNoticeSchema.parse({ orderId: 9 })).toEqual({ orderId: 9 });
	});
});
