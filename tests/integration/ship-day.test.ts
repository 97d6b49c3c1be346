// The ship-day read model on a scratch copy of the demo seeded on Tue 1 Dec 2026: its
// next ship day (Wed 2 Dec) holds two boxes to pack, its own day a packed box of supplies;
// the pick list counts
// animals; a forecast that turned cold flags the live boxes, and mild weather does not.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { addDays } from '../../src/lib/format/dates';
import { loadShipDay } from '../../src/lib/server/fulfilment/ship-day';
import type { ForecastSource } from '../../src/lib/server/weather/source';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const SEEDED = '2026-12-01';
const SHIP_DAY = '2026-12-02';
const ZONE = 'America/New_York';

/** The same low and high on every day from `from`, wherever asked. */
const steady = (from: string, lowF: number, highF: number): ForecastSource => ({
	async daily(_zip, days) {
		return {
			ok: true,
			from: 'service',
			days: Array.from({ length: days }, (_, i) => ({ date: addDays(from, i), lowF, highF }))
		};
	}
});

describe('a ship day', () => {
	let scratch: ScratchDatabase;
	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: SEEDED });
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	it('lists the boxes to pack and the packed ones, overnight first, with the pick list in animals', async () => {
		const day = await loadShipDay(scratch.db, SHIP_DAY, { today: SEEDED, timeZone: ZONE });
		expect(day.toPack.map((o) => o.orderNumber)).toEqual(['HL-10011', 'HL-10015']);
		expect(day.packed).toEqual([]);
		expect(day.shipped).toEqual([]);
		// HL-10011: a pair (2) and a group of 10 from PLA-C2; HL-10015: two Narceus juveniles.
		expect(
			day.pickList.species.map((s) => [
				s.speciesName,
				s.clutches.map((c) => [c.clutchCode, c.animals])
			])
		).toEqual([
			['American giant millipede (Narceus americanus)', [['NAR-C1', 2]]],
			['Smooth slater (Porcellio laevis)', [['PLA-C2', 12]]]
		]);
		expect(day.pickList.animals).toBe(14);
		expect(day.pickList.supplies).toEqual([]);
		expect(day.shortfalls).toEqual([]);
		expect(day.toPack.every((o) => o.change === null)).toBe(true);
	});

	it('flags every live box when the forecast turned too cold to ship, and none in mild weather', async () => {
		// 10 °F lows are below the demo's 25 °F hold limit (PRODUCT.md's example thresholds).
		const cold = await loadShipDay(scratch.db, SHIP_DAY, {
			today: SEEDED,
			timeZone: ZONE,
			source: steady(SEEDED, 10, 20)
		});
		expect(cold.toPack.map((o) => o.change?.kind)).toEqual(['hold', 'hold']);
		// Nothing live in the packed box of supplies on the seeded day: the weather does not gate it.
		const supplies = await loadShipDay(scratch.db, SEEDED, {
			today: SEEDED,
			timeZone: ZONE,
			source: steady(SEEDED, 10, 20)
		});
		expect(supplies.packed.map((o) => [o.orderNumber, o.change])).toEqual([['HL-10010', null]]);
		expect(supplies.pickList.animals).toBe(0);

		// 60–70 °F is inside every limit, so a mild day keeps each box as scheduled — except
		// where its packs were chosen for colder or hotter weather than this.
		const mild = await loadShipDay(scratch.db, SHIP_DAY, {
			today: SEEDED,
			timeZone: ZONE,
			source: steady(SEEDED, 60, 70)
		});
		for (const order of mild.toPack)
			expect(
				order.change === null || order.change.kind === 'packs' || order.change.kind === 'pickup'
			).toBe(true);
	});

	it('is empty on a day with no boxes', async () => {
		const day = await loadShipDay(scratch.db, '2026-12-05', { today: SEEDED, timeZone: ZONE });
		expect([day.toPack, day.packed, day.shipped]).toEqual([[], [], []]);
		expect(day.pickList.animals).toBe(0);
	});
});
