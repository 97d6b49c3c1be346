import Holidays from 'date-holidays';
import { describe, expect, it } from 'vitest';
import zipcodes from 'zipcodes';
import { lineTotalCents } from '../src/lib/money/pricing';
import { DEFAULT_SHIP_WEEKDAYS, DEFAULT_THRESHOLDS } from '../src/lib/shipping/defaults';
import { shipCheck } from '../src/lib/shipping/ship-check';
import {
	planBenchOrders,
	startOfDayInZone,
	type OfferListing,
	type PlannedOrder,
	type ShopRules
} from './bench-order-plan';
import { addDays, daysBetween } from './dates';

const TODAY = '2026-03-10';
const SHOP: ShopRules = {
	timeZone: 'America/New_York',
	originZip: '37902',
	shipWeekdays: { ...DEFAULT_SHIP_WEEKDAYS },
	feeCents: { overnight: 4500, two_day: 2800 },
	thresholds: { ...DEFAULT_THRESHOLDS },
	extraClosedDates: [],
	forecastHorizonDays: 10,
	claimWindowHours: 2
};

function animal(id: number, clutchId: number, unitSize: number, tiers: [number, number][]) {
	return {
		id,
		kind: 'animal',
		title: `Listing ${id}`,
		clutchId,
		clutchCode: `NAR-C${clutchId}`,
		speciesId: 1,
		stage: 'juvenile',
		unitSize,
		sex: 'unsexed',
		isLive: true,
		tiers: tiers.map(([minQuantity, priceCents]) => ({ minQuantity, priceCents }))
	} satisfies OfferListing;
}

function supply(id: number, isLive: boolean, priceCents: number) {
	return {
		id,
		kind: 'supply',
		title: `Supply ${id}`,
		clutchId: null,
		clutchCode: null,
		speciesId: isLive ? 7 : null,
		stage: null,
		unitSize: 1,
		sex: 'unsexed',
		isLive,
		tiers: [{ minQuantity: 1, priceCents }]
	} satisfies OfferListing;
}

const LISTINGS: OfferListing[] = [
	...Array.from({ length: 40 }, (_, i) =>
		animal(100 + i, 10 + Math.floor(i / 2), i % 3 === 0 ? 10 : 1, [
			[1, 1400],
			[5, 6000]
		])
	),
	supply(900, false, 1500),
	supply(901, false, 800),
	supply(902, true, 1200)
];
const FREE = new Map(Array.from({ length: 20 }, (_, i) => [10 + i, 400] as [number, number]));
const SHARE = 0.8;

const plan = planBenchOrders(LISTINGS, FREE, SHOP, {
	today: TODAY,
	orders: 4000,
	firstNumber: 1_000_001,
	shareOfFree: SHARE
});
const paidOrders = plan.orders.filter((o) => o.payment !== null);
const byNumber = new Map(plan.orders.map((o) => [o.number, o]));
const listingById = new Map(LISTINGS.map((l) => [l.id, l]));

// Reference: the date-holidays package's US public (federal) holidays, and the carriers'
// rule that nothing moves on weekends.
const holidays = new Holidays('US');
const publicHolidays = new Set<string>();
for (const year of [2022, 2023, 2024, 2025, 2026, 2027])
	for (const h of holidays.getHolidays(year))
		if (h.type === 'public') publicHolidays.add(h.date.slice(0, 10));
function carrierDay(date: string): boolean {
	const weekday = new Date(`${date}T12:00:00Z`).getUTCDay();
	return weekday !== 0 && weekday !== 6 && !publicHolidays.has(date);
}

describe('startOfDayInZone', () => {
	it('finds midnight in New York in summer and winter time', () => {
		// Reference: the tz database: New York keeps UTC−4 in summer (EDT), UTC−5 in winter (EST).
		expect(new Date(startOfDayInZone('2026-07-01', 'America/New_York')).toISOString()).toBe(
			'2026-07-01T04:00:00.000Z'
		);
		expect(new Date(startOfDayInZone('2026-12-01', 'America/New_York')).toISOString()).toBe(
			'2026-12-01T05:00:00.000Z'
		);
	});

	it('finds midnight in a zone half an hour off the hour', () => {
		// Reference: the tz database: Kolkata keeps UTC+5:30 all year.
		expect(new Date(startOfDayInZone('2026-07-01', 'Asia/Kolkata')).toISOString()).toBe(
			'2026-06-30T18:30:00.000Z'
		);
	});
});

describe('planBenchOrders', () => {
	it('plans the paid orders asked for, and a reship per reshipped claim on top', () => {
		expect(paidOrders).toHaveLength(4000);
		const reshipped = plan.orders.filter((o) => o.claim?.state === 'reshipped');
		expect(plan.orders.length).toBe(4000 + reshipped.length);
	});

	it('plans the same history every time', () => {
		const again = planBenchOrders(LISTINGS, FREE, SHOP, {
			today: TODAY,
			orders: 4000,
			firstNumber: 1_000_001,
			shareOfFree: SHARE
		});
		expect(JSON.stringify(again.orders)).toBe(JSON.stringify(plan.orders));
	});

	it('numbers orders by the time they were placed, as order_number allows', () => {
		const numbers = plan.orders.map((o) => Number(o.number.slice(3)));
		expect(numbers).toEqual(numbers.map((_, i) => 1_000_001 + i));
		for (const o of plan.orders) expect(o.number).toMatch(/^HL-[0-9]{5,}$/);
		const placed = plan.orders.map((o) => o.createdAt);
		expect(placed).toEqual([...placed].sort());
	});

	it('places every order in the three years before today, none from today on', () => {
		const cutoff = plan.cutoff;
		// Reference: the tz database: New York moved to EDT (UTC−4) on 8 March 2026.
		expect(cutoff).toBe('2026-03-10T04:00:00.000Z');
		for (const o of plan.orders) {
			expect(o.createdAt < cutoff).toBe(true);
			for (const e of o.events) expect(e.at < cutoff).toBe(true);
		}
		const oldest = paidOrders[0]?.createdAt.slice(0, 10) ?? '';
		expect(daysBetween(oldest, TODAY)).toBeLessThanOrEqual(1096);
		expect(daysBetween(oldest, TODAY)).toBeGreaterThan(1000);
	});

	it('prices lines by their tiers and adds the service fee to the total', () => {
		for (const o of plan.orders) {
			expect(o.lines.length).toBeGreaterThanOrEqual(1);
			expect(o.lines.length).toBeLessThanOrEqual(3);
			expect(new Set(o.lines.map((l) => l.listingId)).size).toBe(o.lines.length);
			if (o.payment === null) {
				// A reship is free of charge.
				expect(o.totalCents).toBe(0);
				continue;
			}
			for (const l of o.lines) {
				const listing = listingById.get(l.listingId);
				expect(l.lineTotalCents).toBe(lineTotalCents(listing?.tiers ?? [], l.quantity));
			}
			expect(o.subtotalCents).toBe(o.lines.reduce((s, l) => s + l.lineTotalCents, 0));
			expect(o.shippingCents).toBe(SHOP.feeCents[o.service]);
			expect(o.totalCents).toBe(o.subtotalCents + o.shippingCents);
			expect(o.paidCents).toBe(o.totalCents);
			expect(o.refundedCents).toBe(o.refund?.amountCents ?? 0);
			expect(o.refundedCents).toBeLessThanOrEqual(o.paidCents);
			if (o.refund) expect(o.refund.amountCents).toBeGreaterThan(0);
		}
	});

	it('sells no clutch past its share of the free animals', () => {
		const sold = new Map<number, number>();
		for (const o of plan.orders)
			for (const l of o.lines)
				if (l.clutchId !== null)
					sold.set(l.clutchId, (sold.get(l.clutchId) ?? 0) + l.quantity * l.unitSize);
		for (const [clutchId, animals] of sold)
			expect(animals).toBeLessThanOrEqual(Math.floor((FREE.get(clutchId) ?? 0) * SHARE));
		expect(paidOrders.some((o) => o.lines.some((l) => l.clutchId !== null))).toBe(true);
		expect(paidOrders.some((o) => o.lines.some((l) => l.clutchId === null))).toBe(true);
	});

	it('tells each order its story in order, ending in its state', () => {
		for (const o of plan.orders) {
			const [first] = o.events;
			if (o.payment) {
				expect(first?.fromState).toBeNull();
				expect(first?.toState).toBe('awaiting_payment');
				expect(o.events[1]?.toState).toBe('paid');
				expect(o.events[1]?.at).toBe(o.payment.paidAt);
			} else {
				expect(first?.toState).toBe('paid');
			}
			for (let i = 1; i < o.events.length; i++) {
				expect(o.events[i]?.fromState).toBe(o.events[i - 1]?.toState);
				expect((o.events[i]?.at ?? '') >= (o.events[i - 1]?.at ?? '')).toBe(true);
			}
			expect(o.events.at(-1)?.toState).toBe(o.state);
		}
	});

	it('ships boxes on ship weekdays that are carrier days, delivering 1 or 2 carrier days later', () => {
		const boxes = plan.orders.filter((o) => o.shipment?.shippedAt);
		expect(boxes.length).toBeGreaterThan(3000);
		for (const o of boxes) {
			const shipOn = o.shipOn as string;
			const arrives = o.shipment?.expectedDeliveryOn as string;
			const transit = o.service === 'overnight' ? 1 : 2;
			expect(daysBetween(shipOn, arrives)).toBe(transit);
			for (let d = 0; d <= transit; d++) expect(carrierDay(addDays(shipOn, d)), shipOn).toBe(true);
			if (o.lines.some((l) => l.isLive)) {
				const weekday = new Date(`${shipOn}T12:00:00Z`).getUTCDay();
				expect(SHOP.shipWeekdays[o.service]).toContain(weekday === 0 ? 7 : weekday);
			}
		}
	});

	it('stores ship checks that the app’s own check decides the same way again', () => {
		const checks = plan.orders.flatMap((o) => o.shipChecks);
		expect(checks.some((c) => c.decision === 'hold')).toBe(true);
		for (const c of checks) {
			const again = shipCheck(c.inputs);
			expect(again.decision).toBe(c.decision);
			if (again.decision === 'ship') {
				expect(again.shipDate).toBe(c.shipDate);
				expect(again.packs).toEqual(c.packs);
			} else expect(again.recheckDate).toBe(c.recheckDate);
		}
	});

	it('packs heat only under 50 °F and cold only over 85 °F on the route', () => {
		// PRODUCT.md, Computations 1 (general practice): heat pack under 50 °F, cold pack over 85 °F.
		for (const o of plan.orders) {
			const check = o.shipChecks.at(-1);
			if (!o.shipment || !check) continue;
			const route = [...check.inputs.origin, ...check.inputs.destination];
			if (o.shipment.packs.includes('heat')) expect(route.some((f) => f.lowF < 50)).toBe(true);
			if (o.shipment.packs.includes('cold')) expect(route.some((f) => f.highF > 85)).toBe(true);
		}
	});

	it('sends each box to a real ZIP code of its state', () => {
		// Reference: the zipcodes package's US ZIP data.
		for (const o of plan.orders.slice(0, 500)) {
			const place = zipcodes.lookup(o.shipZip);
			expect(place?.state).toBe(o.shipState);
			expect(place?.city).toBe(o.shipCity);
			expect(o.email).toMatch(/@example\.test$/);
		}
	});

	it('files claims on delivered boxes within the claim window, no more dead than sent', () => {
		const claimed = plan.orders.filter((o) => o.claim !== null);
		expect(claimed.length).toBeGreaterThan(0);
		for (const o of claimed) {
			const claim = o.claim as NonNullable<PlannedOrder['claim']>;
			const delivered = Date.parse(o.deliveredAt as string);
			const filed = Date.parse(claim.filedAt);
			expect(filed).toBeGreaterThan(delivered);
			// PRODUCT.md guarantee (general practice): report within 2 hours of delivery.
			expect(filed - delivered).toBeLessThanOrEqual(2 * 3600_000);
			for (const dead of claim.lines) {
				const line = o.lines.find((l) => l.listingId === dead.listingId);
				expect(line?.isLive).toBe(true);
				expect(dead.deadCount).toBeLessThanOrEqual((line?.quantity ?? 0) * (line?.unitSize ?? 0));
			}
			if (claim.state === 'refunded') expect(o.refund?.amountCents).toBeGreaterThan(0);
			if (claim.state === 'reshipped') {
				const reship = byNumber.get(claim.reshipNumber ?? '');
				expect(reship?.reshipOf).toBe(o.number);
				expect(reship?.payment).toBeNull();
				expect(reship?.lines.map((l) => l.quantity)).toEqual(claim.lines.map((l) => l.deadCount));
			}
			if (claim.state === 'open') expect(claim.decidedAt).toBeNull();
		}
	});

	it('refunds about 3 % of orders and sees claims on about 1 %', () => {
		const share = (n: number) => n / paidOrders.length;
		expect(share(paidOrders.filter((o) => o.refund).length)).toBeGreaterThan(0.015);
		expect(share(paidOrders.filter((o) => o.refund).length)).toBeLessThan(0.05);
		expect(share(paidOrders.filter((o) => o.claim).length)).toBeGreaterThan(0.004);
		expect(share(paidOrders.filter((o) => o.claim).length)).toBeLessThan(0.02);
		// Full refunds give everything back to stock.
		for (const o of paidOrders.filter((x) => x.state === 'refunded')) {
			expect(o.refundedCents).toBe(o.totalCents);
			for (const l of o.lines) expect(l.restockedQuantity).toBe(l.quantity);
			expect(o.shipment).toBeNull();
		}
	});
});
