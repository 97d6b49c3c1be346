// The benchmark's order history: years of paid customer orders with everything that
// hangs off them (payment, ship checks, box, events, refunds, DOA claims and their
// no-charge reships), laid out before `today` from a seeded generator. Pure: the caller
// loads the catalogue and the shop's rules, and inserts what this plans.
//
// A fixture, not a simulation: the catalogue's listed clutches stand in for the clutches
// sold in past years, so a line may be dated before its listing was published. What
// holds is what the shop's own rules guarantee: lines priced by the tiers, totals that
// add up, each clutch selling no more than it has free, boxes that leave on ship days
// after the real ship check passed on the generated weather, claims inside the window.
import zipcodes from 'zipcodes';
import { lineTotalCents, type PriceTier } from '../src/lib/money/pricing';
import type {
	ActorKind,
	ClaimState,
	ClutchStage,
	OrderState,
	Pack,
	Service,
	Sex
} from '../src/lib/server/db/schema';
import { deliveryDateFor } from '../src/lib/shipping/calendar';
import {
	shipCheck,
	type DailyForecast,
	type Reason,
	type ShipCheckResult,
	type ShipThresholds
} from '../src/lib/shipping/ship-check';
import { BenchWeather, normalOn, STATE_CLIMATES } from './bench-weather';
import { addDays, isoWeekday } from './dates';
import { demoRandom, type DemoRandom } from './random';

/** A listing on offer, as the planner needs it. */
export interface OfferListing {
	id: number;
	kind: 'animal' | 'supply';
	title: string;
	clutchId: number | null;
	clutchCode: string | null;
	speciesId: number | null;
	stage: ClutchStage | null;
	unitSize: number;
	sex: Sex;
	isLive: boolean;
	tiers: PriceTier[];
}

/** The shop's settings the history follows. */
export interface ShopRules {
	timeZone: string;
	originZip: string;
	shipWeekdays: Record<Service, readonly number[]>;
	feeCents: Record<Service, number>;
	thresholds: ShipThresholds;
	extraClosedDates: readonly string[];
	forecastHorizonDays: number;
	claimWindowHours: number;
}

export interface PlanOptions {
	today: string;
	/** Paid customer orders to plan; no-charge reships for claims come on top. */
	orders: number;
	/** The number of the oldest order: HL-<firstNumber>, the rest counting up by time placed. */
	firstNumber: number;
	/** Calendar years of history before `today`. */
	years?: number;
	/** Share of each clutch's free animals the history may sell; the rest stays on offer. */
	shareOfFree?: number;
}

/** Who did it: the buyer (a guest), a keeper or the admin; the inserter finds the people. */
export type BenchActor = 'buyer' | 'keeper' | 'admin' | null;

export interface PlannedEvent {
	fromState: OrderState | null;
	toState: OrderState;
	actorKind: ActorKind;
	actor: BenchActor;
	note: string;
	/** ISO instant. */
	at: string;
}

export interface PlannedLine {
	listingId: number;
	clutchId: number | null;
	speciesId: number | null;
	description: string;
	stage: ClutchStage | null;
	sex: Sex;
	unitSize: number;
	quantity: number;
	lineTotalCents: number;
	isLive: boolean;
	restockedQuantity: number;
}

/** The ship_check.inputs snapshot, in the shape the app stores. */
export interface PlannedCheckInputs {
	today: string;
	service: Service;
	shipWeekdays: readonly number[];
	thresholds: ShipThresholds;
	origin: DailyForecast[];
	destination: DailyForecast[];
	extraClosedDates: readonly string[];
	originZip: string;
	destinationZip: string;
	horizonDays: number;
	forecastProblems: Record<string, never>;
}

export interface PlannedShipCheck {
	firstDate: string;
	decision: 'ship' | 'hold';
	shipDate: string | null;
	deliveryDate: string | null;
	recheckDate: string | null;
	packs: Pack[];
	facilityPickup: boolean;
	reasons: Reason[];
	inputs: PlannedCheckInputs;
	checkedAt: string;
}

export interface PlannedShipment {
	carrier: string;
	trackingNumber: string | null;
	packs: Pack[];
	packedAt: string;
	shippedAt: string | null;
	expectedDeliveryOn: string;
	deliveredAt: string | null;
}

export interface PlannedRefund {
	stripeRefundId: string;
	idempotencyKey: string;
	amountCents: number;
	reason: string;
	at: string;
	lines: { listingId: number; quantity: number; restock: boolean }[];
}

export interface PlannedClaim {
	state: ClaimState;
	note: string;
	filedAt: string;
	decidedAt: string | null;
	decisionNote: string;
	/** Refunded claims point at the order's refund. */
	usesRefund: boolean;
	/** The number of the no-charge order that reships the dead animals. */
	reshipNumber: string | null;
	lines: { listingId: number; deadCount: number }[];
}

export interface PlannedOrder {
	number: string;
	email: string;
	shipName: string;
	shipLine1: string;
	shipLine2: string;
	shipCity: string;
	shipState: string;
	shipZip: string;
	service: Service;
	state: OrderState;
	subtotalCents: number;
	shippingCents: number;
	totalCents: number;
	paidCents: number;
	refundedCents: number;
	shipOn: string | null;
	deliveredAt: string | null;
	createdAt: string;
	updatedAt: string;
	lines: PlannedLine[];
	events: PlannedEvent[];
	/** Null for a no-charge reship. */
	payment: { checkoutSessionId: string; paymentIntentId: string; paidAt: string } | null;
	shipChecks: PlannedShipCheck[];
	shipment: PlannedShipment | null;
	refund: PlannedRefund | null;
	claim: PlannedClaim | null;
	/** For a reship: the number of the order whose claim it answers. */
	reshipOf: string | null;
}

export interface BenchOrderPlan {
	orders: PlannedOrder[];
	/** The instant the history stops: the start of `today` in the shop's zone. */
	cutoff: string;
}

// ---------------------------------------------------------------- the mix
// Invented, to look like a small live-animal shop: most orders are one or two lines, most
// lines are animals, a few boxes are held for weather, about 3 % of orders see a refund
// and about 1 % a DOA claim.

const LINES_PER_ORDER: readonly [number, number][] = [
	[1, 55],
	[2, 30],
	[3, 15]
];
const ANIMAL_LINE_SHARE = 0.72;
const ANIMAL_QUANTITY: readonly [number, number][] = [
	[1, 75],
	[2, 18],
	[3, 7]
];
const SUPPLY_QUANTITY: readonly [number, number][] = [
	[1, 80],
	[2, 15],
	[3, 5]
];
const OVERNIGHT_SHARE = 0.6;
/** Picks of an animal listing before the line falls back to a supply (its clutch is spoken for). */
const ANIMAL_PICK_TRIES = 6;
/** Daily re-checks of a held box before the buyer gives up and is refunded in full. */
const MAX_HOLD_CHECKS = 10;
/** A delivered box's chance of a line refunded without a claim (a damaged supply, a short count). */
const LINE_REFUND_SHARE = 0.01;
/** DOA claims per delivered box with animals: two days in a box is harder than one. */
const CLAIM_SHARE: Record<Service, number> = { overnight: 0.007, two_day: 0.013 };
/** A box that needed a pack or a facility pickup met weather: more claims. */
const CLAIM_WEATHER_FACTOR = 1.6;
const CLAIM_OUTCOMES: readonly [Exclude<ClaimState, 'open'>, number][] = [
	['refunded', 55],
	['reshipped', 25],
	['declined', 20]
];
/** Orders by month of the year: spring and autumn are the keepers' seasons. */
const MONTH_FACTOR = [0.6, 0.75, 1.05, 1.2, 1.2, 1, 0.8, 0.8, 1.05, 1.2, 1.1, 0.7];
/** Buyers per order: repeat buyers are common in a hobby shop. */
const BUYERS_PER_ORDER = 0.45;

// prettier-ignore
const FIRST_NAMES = [
	'Avery', 'Bea', 'Calder', 'Dana', 'Eli', 'Fern', 'Gus', 'Hollis', 'Ivy', 'Jonah', 'Kit',
	'Lena', 'Milo', 'Nell', 'Otis', 'Pia', 'Quinn', 'Rosa', 'Silas', 'Tess', 'Uma', 'Vern',
	'Wes', 'Xena', 'Yara', 'Zeke', 'Alma', 'Boone', 'Cleo', 'Dex', 'Edie', 'Flint', 'Greta',
	'Hank', 'Iris', 'Jude', 'Kora', 'Lyle', 'Mae', 'Nico'
];
// prettier-ignore
const LAST_NAMES = [
	'Ashdown', 'Birchall', 'Coldwater', 'Dunmore', 'Elsworth', 'Fairleigh', 'Greaves',
	'Holloway', 'Ingram', 'Jessup', 'Kettering', 'Lowell', 'Marchetti', 'Northcott', 'Oakes',
	'Pemberton', 'Quarry', 'Redfern', 'Stroud', 'Thackery', 'Underhill', 'Vance', 'Whitlock',
	'Yardley', 'Zeller', 'Amberley', 'Brannock', 'Crane', 'Delacroix', 'Everly'
];
// prettier-ignore
const STREETS = [
	'Maple', 'Cedar', 'Willow', 'Hickory', 'Juniper', 'Birch', 'Sycamore', 'Linden', 'Aspen',
	'Magnolia', 'Chestnut', 'Hawthorn', 'Laurel', 'Alder', 'Sassafras', 'Tupelo'
];
const STREET_KINDS = ['Street', 'Avenue', 'Lane', 'Road', 'Court', 'Drive', 'Way', 'Place'];
const CLAIM_NOTES = [
	'One was dead in the cup when I opened the box; photo attached.',
	'Two did not move after an hour on damp substrate. Photos of how they arrived.',
	'The cup was crushed in one corner and these were dead inside.',
	'Opened the box right at the door: this one was already gone.'
];

// ---------------------------------------------------------------- helpers

function weighted<T>(rng: DemoRandom, choices: readonly (readonly [T, number])[]): T {
	const total = choices.reduce((sum, [, weight]) => sum + weight, 0);
	let roll = rng.next() * total;
	for (const [value, weight] of choices) {
		roll -= weight;
		if (roll < 0) return value;
	}
	return (choices.at(-1) as readonly [T, number])[0];
}

const MINUTE_MS = 60_000;
const iso = (ms: number) => new Date(ms).toISOString();
const atUtc = (day: string, hour: number, minute = 0) =>
	Date.parse(`${day}T00:00:00.000Z`) + (hour * 60 + minute) * MINUTE_MS;

/** The calendar day of an instant in `timeZone`, with one formatter for the whole plan. */
function dayInZone(timeZone: string): (ms: number) => string {
	const format = new Intl.DateTimeFormat('en-CA', {
		timeZone,
		year: 'numeric',
		month: '2-digit',
		day: '2-digit'
	});
	return (ms) => format.format(ms);
}

/** The first instant (to the quarter hour, as every zone's offset is) of `day` in the zone. */
export function startOfDayInZone(day: string, timeZone: string): number {
	const dayOf = dayInZone(timeZone);
	const quarter = 15 * MINUTE_MS;
	// Every zone's midnight lies within 14 hours of UTC midnight.
	let t = atUtc(day, 0) - 14 * 60 * MINUTE_MS;
	while (dayOf(t) < day) t += quarter;
	return t;
}

interface Buyer {
	email: string;
	name: string;
	line1: string;
	line2: string;
	city: string;
	state: string;
	zip: string;
}

/** ZIPs of a state from the `zipcodes` package's US data, listed once per state. */
const zipsOfState = new Map<string, zipcodes.ZipCode[]>();
function statePlaces(state: string): zipcodes.ZipCode[] {
	let places = zipsOfState.get(state);
	if (!places) {
		places = zipcodes.lookupByState(state).filter((p) => /^[0-9]{5}$/.test(p.zip));
		if (places.length === 0) throw new Error(`bench orders: no ZIP codes for ${state}`);
		zipsOfState.set(state, places);
	}
	return places;
}

function cumulative(weights: readonly number[]): Float64Array {
	const sums = new Float64Array(weights.length);
	let total = 0;
	weights.forEach((w, i) => {
		total += w;
		sums[i] = total;
	});
	return sums;
}

/** Index of the first cumulative sum above a uniform draw scaled to the total. */
function pickCumulative(rng: DemoRandom, sums: Float64Array): number {
	const target = rng.next() * (sums[sums.length - 1] ?? 0);
	let lo = 0;
	let hi = sums.length - 1;
	while (lo < hi) {
		const mid = (lo + hi) >> 1;
		if ((sums[mid] ?? 0) > target) hi = mid;
		else lo = mid + 1;
	}
	return lo;
}

function makeBuyers(rng: DemoRandom, count: number): Buyer[] {
	const stateSums = cumulative(STATE_CLIMATES.map((c) => c.populationM));
	const buyers: Buyer[] = [];
	for (let i = 0; i < count; i++) {
		const state = (STATE_CLIMATES[pickCumulative(rng, stateSums)] as (typeof STATE_CLIMATES)[0])
			.state;
		const place = rng.pick(statePlaces(state));
		const first = rng.pick(FIRST_NAMES);
		const last = rng.pick(LAST_NAMES);
		buyers.push({
			email: `${first}.${last}.${i + 1}@example.test`.toLowerCase(),
			name: `${first} ${last}`,
			line1: `${rng.int(10, 9899)} ${rng.pick(STREETS)} ${rng.pick(STREET_KINDS)}`,
			line2: rng.next() < 0.15 ? `Apt ${rng.int(1, 40)}` : '',
			city: place.city,
			state,
			zip: place.zip
		});
	}
	return buyers;
}

/** How likely a buyer orders on a day their weather allows live shipping only with luck. */
function willingness(state: string, day: string, t: ShipThresholds): number {
	const normal = normalOn(state, day);
	let factor = 1;
	if (normal.lowF < t.holdBelowF) factor *= 0.15;
	else if (normal.lowF < t.heatPackBelowF - 10) factor *= 0.7;
	if (normal.highF > t.holdAboveF) factor *= 0.3;
	else if (normal.highF > t.coldPackAboveF + 5) factor *= 0.8;
	return factor;
}

/** The first day on or after `from` a box of supplies only can go out on and arrive by. */
function supplyShipDay(from: string, service: Service, closed: readonly string[]) {
	let day = from;
	for (let i = 0; i < 30; i++) {
		const delivery = deliveryDateFor(day, service, closed);
		if (delivery !== null) return { shipDate: day, deliveryDate: delivery };
		day = addDays(day, 1);
	}
	throw new Error(`bench orders: no ship day within 30 days of ${from}`);
}

// ---------------------------------------------------------------- the plan

/** Records a step of an order's story, unless it would happen after the cutoff. */
type Move = (
	toState: OrderState,
	atMs: number,
	actorKind: ActorKind,
	actor: BenchActor,
	note: string
) => PlannedEvent | null;

interface Draft extends Omit<PlannedOrder, 'number'> {
	/** Filled in once every order is placed in time and numbered. */
	paidEvent: PlannedEvent | null;
	shippedEvent: PlannedEvent | null;
	reshipDraft: Draft | null;
	reshipOfDraft: Draft | null;
	buyerIndex: number;
	placedMs: number;
	seq: number;
}

export function planBenchOrders(
	listings: readonly OfferListing[],
	/** Animals free to sell per clutch id now (clutch_free_animals). */
	freeAnimals: ReadonlyMap<number, number>,
	shop: ShopRules,
	opts: PlanOptions
): BenchOrderPlan {
	const rng = demoRandom('bench-orders');
	const years = opts.years ?? 3;
	const shareOfFree = opts.shareOfFree ?? 0.8;
	const today = opts.today;
	const dayOf = dayInZone(shop.timeZone);
	const cutoffMs = startOfDayInZone(today, shop.timeZone);
	const historyDays = Math.round(years * 365.25);
	const firstDay = addDays(today, -historyDays);
	// Forecasts reach past the last order's ship checks and re-checks.
	const weather = new BenchWeather(addDays(firstDay, -1), historyDays + 60);
	const originPlace = zipcodes.lookup(shop.originZip);
	if (!originPlace) throw new Error(`bench orders: unknown origin ZIP ${shop.originZip}`);
	const originState = originPlace.state;

	// One decision per service, destination state and first day: every box on that route
	// that day meets the same weather, so the check runs once and its answer is shared.
	const checks = new Map<string, { result: ShipCheckResult; inputs: PlannedCheckInputs }>();
	function checkOn(service: Service, state: string, firstDate: string) {
		const key = `${service}|${state}|${firstDate}`;
		const known = checks.get(key);
		if (known) return known;
		const origin = weather.forecasts(originState, firstDate, shop.forecastHorizonDays);
		const destination = weather.forecasts(state, firstDate, shop.forecastHorizonDays);
		const result = shipCheck({
			today: firstDate,
			service,
			shipWeekdays: shop.shipWeekdays[service],
			thresholds: shop.thresholds,
			origin,
			destination,
			extraClosedDates: shop.extraClosedDates
		});
		// The snapshot keeps the days the decision read: a ship decision never looks past its
		// delivery day (earlier candidates deliver earlier), a hold read the whole horizon.
		const lastRead = result.decision === 'ship' ? result.deliveryDate : null;
		const read = (list: DailyForecast[]) =>
			lastRead === null ? list : list.filter((f) => f.date <= lastRead);
		const checked = {
			result,
			inputs: {
				today: firstDate,
				service,
				shipWeekdays: shop.shipWeekdays[service],
				thresholds: shop.thresholds,
				origin: read(origin),
				destination: read(destination),
				extraClosedDates: shop.extraClosedDates,
				originZip: shop.originZip,
				destinationZip: '',
				horizonDays: shop.forecastHorizonDays,
				forecastProblems: {}
			}
		};
		checks.set(key, checked);
		return checked;
	}

	const animals = listings.filter((l) => l.kind === 'animal' && l.clutchId !== null);
	const supplies = listings.filter((l) => l.kind === 'supply');
	if (supplies.length === 0) throw new Error('bench orders: no supplies on offer');
	const budget = new Map<number, number>();
	for (const [clutchId, free] of freeAnimals)
		budget.set(clutchId, Math.max(0, Math.floor(free * shareOfFree)));

	// Days before today, weighted by a growing shop, the season and the weekday.
	const days: string[] = [];
	const dayWeights: number[] = [];
	for (let back = historyDays; back >= 1; back--) {
		const day = addDays(today, -back);
		const growth = 0.55 + 0.9 * (1 - back / historyDays);
		const month = MONTH_FACTOR[Number(day.slice(5, 7)) - 1] ?? 1;
		const weekday = isoWeekday(day) === 7 || isoWeekday(day) === 1 ? 1.1 : 1;
		days.push(day);
		dayWeights.push(growth * month * weekday);
	}
	const daySums = cumulative(dayWeights);
	const willing = new Map<string, number>();
	const willingnessOn = (state: string, day: string) => {
		const key = `${state}|${day}`;
		let factor = willing.get(key);
		if (factor === undefined) {
			factor = willingness(state, day, shop.thresholds);
			willing.set(key, factor);
		}
		return factor;
	};
	const buyers = makeBuyers(rng, Math.max(1, Math.ceil(opts.orders * BUYERS_PER_ORDER)));

	// Placed instants first, oldest first, so the story of each order is told in time order.
	const placings: { day: string; ms: number; buyerIndex: number }[] = [];
	for (let i = 0; i < opts.orders; i++) {
		const day = days[pickCumulative(rng, daySums)] as string;
		// Orders come in from 12:00 to 03:59 UTC: daytime and evening across US zones.
		const ms = atUtc(day, 12, rng.int(0, 15 * 60 + 59)) + rng.int(0, 59) * 1000;
		let buyerIndex = 0;
		for (let tries = 0; tries < 12; tries++) {
			// Squaring the draw makes the first buyers the regulars.
			const u = rng.next();
			buyerIndex = Math.floor(u * u * buyers.length);
			const buyer = buyers[buyerIndex] as Buyer;
			if (rng.next() < willingnessOn(buyer.state, day)) break;
		}
		placings.push({ day, ms, buyerIndex });
	}
	placings.sort((a, b) => a.ms - b.ms);

	const drafts: Draft[] = [];
	let seq = 0;

	/** A box's way from paid to the buyer, each step only if it happened before the cutoff. */
	function fulfil(draft: Draft, buyer: Buyer, paidMs: number, moveFrom: OrderState) {
		const move: Move = (toState, atMs, actorKind, actor, note) => {
			if (atMs >= cutoffMs) return null;
			const last = draft.events.at(-1);
			const event: PlannedEvent = {
				fromState: last?.toState ?? moveFrom,
				toState,
				actorKind,
				actor,
				note,
				at: iso(atMs)
			};
			draft.events.push(event);
			draft.state = toState;
			return event;
		};
		const live = draft.lines.some((l) => l.isLive);
		const service = draft.service;
		let shipDate: string;
		let deliveryDate: string;
		let packs: Pack[] = [];
		let weatherMet = false;
		if (live) {
			let checkMs = paidMs + MINUTE_MS;
			let firstDate = addDays(dayOf(paidMs), 1);
			let holds = 0;
			for (;;) {
				if (checkMs >= cutoffMs) return;
				const { result, inputs: shared } = checkOn(service, buyer.state, firstDate);
				const inputs: PlannedCheckInputs = { ...shared, destinationZip: buyer.zip };
				if (result.decision === 'ship') {
					draft.shipChecks.push({
						firstDate,
						decision: 'ship',
						shipDate: result.shipDate,
						deliveryDate: result.deliveryDate,
						recheckDate: null,
						packs: result.packs,
						facilityPickup: result.facilityPickup,
						reasons: result.reasons,
						inputs,
						checkedAt: iso(checkMs)
					});
					shipDate = result.shipDate;
					deliveryDate = result.deliveryDate;
					packs = result.packs;
					weatherMet = packs.length > 0 || result.facilityPickup;
					const packNote = packs.length ? ` with a ${packs.join(' and ')} pack` : '';
					const said = holds > 0 ? 'Re-check' : 'Ship check';
					move('scheduled', checkMs, 'system', null, `${said}: ship on ${shipDate}${packNote}.`);
					break;
				}
				draft.shipChecks.push({
					firstDate,
					decision: 'hold',
					shipDate: null,
					deliveryDate: null,
					recheckDate: result.recheckDate,
					packs: [],
					facilityPickup: false,
					reasons: result.reasons,
					inputs,
					checkedAt: iso(checkMs)
				});
				holds++;
				if (holds === 1)
					move(
						'weather_hold',
						checkMs,
						'system',
						null,
						'Ship check: hold for weather on the route.'
					);
				// The daily job looks again early on the re-check day.
				const nextCheckMs = atUtc(result.recheckDate, 11, rng.int(0, 20));
				// A paying buyer gives up in the end; a no-charge reship waits for safe weather.
				if (holds >= MAX_HOLD_CHECKS && draft.payment !== null) {
					const refundMs = atUtc(result.recheckDate, 15, rng.int(0, 150));
					if (refundMs >= cutoffMs) return;
					for (const line of draft.lines) line.restockedQuantity = line.quantity;
					draft.refund = {
						stripeRefundId: '',
						idempotencyKey: '',
						amountCents: draft.totalCents,
						reason:
							'Held for weather for ten days; the buyer asked to cancel. Nothing shipped, so shipping is refunded too.',
						at: iso(refundMs),
						lines: draft.lines.map((l) => ({
							listingId: l.listingId,
							quantity: l.quantity,
							restock: true
						}))
					};
					draft.refundedCents = draft.totalCents;
					move(
						'refunded',
						refundMs,
						'user',
						'admin',
						'Refunded in full, shipping included; stock restored.'
					);
					return;
				}
				checkMs = nextCheckMs;
				firstDate = result.recheckDate;
			}
		} else {
			const day = supplyShipDay(addDays(dayOf(paidMs), 1), service, shop.extraClosedDates);
			shipDate = day.shipDate;
			deliveryDate = day.deliveryDate;
			move('scheduled', paidMs + MINUTE_MS, 'system', null, `Nothing live: ships on ${shipDate}.`);
		}
		if (draft.state !== 'scheduled') return;
		draft.shipOn = shipDate;

		const packedMs = atUtc(shipDate, 13, rng.int(0, 179));
		const packNote = packs.length ? `Packed with a ${packs.join(' and ')} pack.` : 'Packed.';
		if (!move('packed', packedMs, 'user', 'keeper', packNote)) return;
		const shipment: PlannedShipment = {
			carrier: service === 'overnight' ? 'UPS' : 'USPS',
			trackingNumber: null,
			packs,
			packedAt: iso(packedMs),
			shippedAt: null,
			expectedDeliveryOn: deliveryDate,
			deliveredAt: null
		};
		draft.shipment = shipment;
		const shippedMs = atUtc(shipDate, 19, 30 + rng.int(0, 149));
		const shipped = move('shipped', shippedMs, 'user', 'keeper', '');
		if (!shipped) return;
		shipment.shippedAt = iso(shippedMs);
		draft.shippedEvent = shipped;
		const deliveredMs = atUtc(deliveryDate, 15, rng.int(0, 419));
		if (!move('delivered', deliveredMs, 'system', null, 'Carrier reported delivery.')) return;
		shipment.deliveredAt = iso(deliveredMs);
		draft.deliveredAt = iso(deliveredMs);
		if (draft.reshipOfDraft) return;

		const animalLines = draft.lines.filter((l) => l.isLive && l.clutchId !== null);
		const claimChance = CLAIM_SHARE[service] * (weatherMet ? CLAIM_WEATHER_FACTOR : 1);
		if (animalLines.length > 0 && rng.next() < claimChance) {
			fileClaim(draft, buyer, deliveredMs, animalLines, move);
		} else if (rng.next() < LINE_REFUND_SHARE) {
			const line =
				draft.lines.find((l) => !l.isLive) ?? (draft.lines[draft.lines.length - 1] as PlannedLine);
			if (line.lineTotalCents <= 0) return;
			const refundMs = atUtc(addDays(deliveryDate, rng.int(1, 3)), 15, rng.int(0, 179));
			if (refundMs >= cutoffMs) return;
			draft.refund = {
				stripeRefundId: '',
				idempotencyKey: '',
				amountCents: line.lineTotalCents,
				reason: line.isLive
					? 'Packed one unit short: that line refunded.'
					: 'Arrived damaged: that line refunded, nothing to restock.',
				at: iso(refundMs),
				lines: [{ listingId: line.listingId, quantity: line.quantity, restock: false }]
			};
			draft.refundedCents = line.lineTotalCents;
			move(
				'part_refunded',
				refundMs,
				'user',
				'admin',
				`Refund of ${line.lineTotalCents} cents for one line.`
			);
		}
	}

	function fileClaim(
		draft: Draft,
		buyer: Buyer,
		deliveredMs: number,
		animalLines: PlannedLine[],
		move: Move
	) {
		const windowMinutes = shop.claimWindowHours * 60;
		const filedMs = deliveredMs + rng.int(10, Math.max(10, windowMinutes - 5)) * MINUTE_MS;
		if (filedMs >= cutoffMs) return;
		const claimed = rng.next() < 0.2 ? animalLines.slice(0, 2) : [rng.pick(animalLines)];
		const dead = claimed.map((line) => ({
			line,
			deadCount: rng.int(1, Math.min(3, line.quantity * line.unitSize))
		}));
		const claim: PlannedClaim = {
			state: 'open',
			note: rng.pick(CLAIM_NOTES),
			filedAt: iso(filedMs),
			decidedAt: null,
			decisionNote: '',
			usesRefund: false,
			reshipNumber: null,
			lines: dead.map((d) => ({ listingId: d.line.listingId, deadCount: d.deadCount }))
		};
		draft.claim = claim;
		const decidedMs = atUtc(dayOf(deliveredMs + 24 * 60 * MINUTE_MS), 15, rng.int(0, 120));
		if (decidedMs >= cutoffMs) return;
		let outcome = weighted(rng, CLAIM_OUTCOMES);
		// A reship takes the replacements from the same clutches; without them, refund.
		if (outcome === 'reshipped') {
			const fits = dead.every((d) => (budget.get(d.line.clutchId as number) ?? 0) >= d.deadCount);
			if (fits) {
				for (const d of dead)
					budget.set(
						d.line.clutchId as number,
						(budget.get(d.line.clutchId as number) ?? 0) - d.deadCount
					);
			} else outcome = 'refunded';
		}
		claim.state = outcome;
		claim.decidedAt = iso(decidedMs);
		if (outcome === 'declined') {
			claim.decisionNote = 'The photo does not show the animals as they arrived.';
		} else if (outcome === 'refunded') {
			// The animals' share of the line, as the guarantee pays it; shipping is not refunded.
			const amount = dead.reduce(
				(sum, d) =>
					sum +
					Math.round(d.line.lineTotalCents / (d.line.quantity * d.line.unitSize)) * d.deadCount,
				0
			);
			const refundable = Math.min(amount, draft.paidCents - draft.refundedCents);
			if (refundable <= 0) {
				claim.state = 'declined';
				claim.decisionNote = 'Nothing left to refund on this order.';
				return;
			}
			claim.decisionNote =
				'Refunded the dead animals; shipping is not refunded under the guarantee.';
			claim.usesRefund = true;
			draft.refund = {
				stripeRefundId: '',
				idempotencyKey: '',
				amountCents: refundable,
				reason: 'DOA claim: animals dead on arrival; shipping not refunded under the guarantee.',
				at: iso(decidedMs),
				lines: []
			};
			draft.refundedCents = refundable;
			move(
				'part_refunded',
				decidedMs,
				'user',
				'admin',
				`Claim decided: refund of ${refundable} cents.`
			);
		} else {
			claim.decisionNote = 'Replacements go out on the next safe ship day, no charge.';
			const reship = newDraft(draft.buyerIndex, buyer, draft.service, decidedMs + MINUTE_MS);
			reship.reshipOfDraft = draft;
			draft.reshipDraft = reship;
			// Dead counts are animals, so the reship sends them one by one.
			reship.lines = dead.map((d) => ({
				...d.line,
				description:
					d.line.unitSize > 1
						? `${d.line.description} (replacements, one by one)`
						: d.line.description,
				unitSize: 1,
				quantity: d.deadCount,
				lineTotalCents: 0,
				restockedQuantity: 0
			}));
			const paidMs = decidedMs + MINUTE_MS;
			const paid: PlannedEvent = {
				fromState: 'awaiting_payment',
				toState: 'paid',
				actorKind: 'system',
				actor: null,
				note: '',
				at: iso(paidMs)
			};
			if (paidMs >= cutoffMs) return;
			reship.events.push(paid);
			reship.paidEvent = paid;
			reship.state = 'paid';
			drafts.push(reship);
			fulfil(reship, buyer, paidMs, 'paid');
			finish(reship);
		}
	}

	function newDraft(buyerIndex: number, buyer: Buyer, service: Service, placedMs: number): Draft {
		return {
			email: buyer.email,
			shipName: buyer.name,
			shipLine1: buyer.line1,
			shipLine2: buyer.line2,
			shipCity: buyer.city,
			shipState: buyer.state,
			shipZip: buyer.zip,
			service,
			state: 'awaiting_payment',
			subtotalCents: 0,
			shippingCents: 0,
			totalCents: 0,
			paidCents: 0,
			refundedCents: 0,
			shipOn: null,
			deliveredAt: null,
			createdAt: iso(placedMs),
			updatedAt: iso(placedMs),
			lines: [],
			events: [],
			payment: null,
			shipChecks: [],
			shipment: null,
			refund: null,
			claim: null,
			reshipOf: null,
			paidEvent: null,
			shippedEvent: null,
			reshipDraft: null,
			reshipOfDraft: null,
			buyerIndex,
			placedMs,
			seq: seq++
		};
	}

	function finish(draft: Draft) {
		const lastEvent = draft.events.at(-1);
		const lastMs = Math.max(
			draft.placedMs,
			lastEvent ? Date.parse(lastEvent.at) : 0,
			draft.claim ? Date.parse(draft.claim.filedAt) : 0
		);
		draft.updatedAt = iso(lastMs);
	}

	function pickLines(used: Set<number>): PlannedLine[] {
		const lines: PlannedLine[] = [];
		const count = weighted(rng, LINES_PER_ORDER);
		for (let k = 0; k < count; k++) {
			let chosen: { listing: OfferListing; quantity: number } | null = null;
			if (animals.length > 0 && rng.next() < ANIMAL_LINE_SHARE) {
				for (let tries = 0; tries < ANIMAL_PICK_TRIES && !chosen; tries++) {
					const listing = rng.pick(animals);
					const quantity = weighted(rng, ANIMAL_QUANTITY);
					const left = budget.get(listing.clutchId as number) ?? 0;
					if (used.has(listing.id) || left < quantity * listing.unitSize) continue;
					budget.set(listing.clutchId as number, left - quantity * listing.unitSize);
					chosen = { listing, quantity };
				}
			}
			if (!chosen) {
				const listing = rng.pick(supplies);
				if (used.has(listing.id)) continue;
				chosen = { listing, quantity: weighted(rng, SUPPLY_QUANTITY) };
			}
			const { listing, quantity } = chosen;
			used.add(listing.id);
			lines.push({
				listingId: listing.id,
				clutchId: listing.clutchId,
				speciesId: listing.speciesId,
				description: listing.clutchCode
					? `${listing.title}; clutch ${listing.clutchCode}`
					: listing.title,
				stage: listing.stage,
				sex: listing.sex,
				unitSize: listing.unitSize,
				quantity,
				lineTotalCents: lineTotalCents(listing.tiers, quantity),
				isLive: listing.isLive,
				restockedQuantity: 0
			});
		}
		return lines;
	}

	for (const placing of placings) {
		const buyer = buyers[placing.buyerIndex] as Buyer;
		const service: Service = rng.next() < OVERNIGHT_SHARE ? 'overnight' : 'two_day';
		const draft = newDraft(placing.buyerIndex, buyer, service, placing.ms);
		draft.lines = pickLines(new Set());
		draft.subtotalCents = draft.lines.reduce((sum, l) => sum + l.lineTotalCents, 0);
		draft.shippingCents = shop.feeCents[service];
		draft.totalCents = draft.subtotalCents + draft.shippingCents;
		draft.paidCents = draft.totalCents;
		drafts.push(draft);
		draft.events.push({
			fromState: null,
			toState: 'awaiting_payment',
			actorKind: 'user',
			actor: 'buyer',
			note: 'Placed at checkout.',
			at: iso(placing.ms)
		});
		// Card payments clear within minutes; the webhook marks the order paid.
		const paidMs = placing.ms + rng.int(2, 6) * MINUTE_MS + rng.int(0, 59) * 1000;
		const paid: PlannedEvent = {
			fromState: 'awaiting_payment',
			toState: 'paid',
			actorKind: 'webhook',
			actor: null,
			note: '',
			at: iso(paidMs)
		};
		draft.events.push(paid);
		draft.paidEvent = paid;
		draft.state = 'paid';
		draft.payment = { checkoutSessionId: '', paymentIntentId: '', paidAt: iso(paidMs) };
		fulfil(draft, buyer, paidMs, 'paid');
		finish(draft);
	}

	// Numbers follow the time each order was placed, reships among them, as checkout draws them.
	drafts.sort((a, b) => a.placedMs - b.placedMs || a.seq - b.seq);
	const numbered = new Map<Draft, string>();
	drafts.forEach((draft, index) => numbered.set(draft, `HL-${opts.firstNumber + index}`));
	const orders = drafts.map((draft): PlannedOrder => {
		const number = numbered.get(draft) as string;
		const digits = number.slice(3);
		if (draft.payment) {
			draft.payment.checkoutSessionId = `cs_test_bench_${digits}`;
			draft.payment.paymentIntentId = `pi_test_bench_${digits}`;
		}
		if (draft.paidEvent)
			draft.paidEvent.note = draft.reshipOfDraft
				? `No-charge reship for the claim on ${numbered.get(draft.reshipOfDraft)}.`
				: `Payment ${draft.payment?.paymentIntentId} succeeded.`;
		if (draft.shipment && draft.shippedEvent) {
			// Shaped like the carriers' numbers, with a BNCH marker so no one mistakes them.
			draft.shipment.trackingNumber =
				draft.shipment.carrier === 'UPS'
					? `1ZBNCH01${digits.padStart(10, '0')}`
					: `9400BNCH${digits.padStart(14, '0')}`;
			draft.shippedEvent.note = `${draft.shipment.carrier} ${draft.shipment.trackingNumber}`;
		}
		if (draft.refund) {
			draft.refund.stripeRefundId = `re_test_bench_${digits}_1`;
			draft.refund.idempotencyKey = `bench-refund-${digits}-1`;
		}
		if (draft.claim && draft.reshipDraft)
			draft.claim.reshipNumber = numbered.get(draft.reshipDraft) ?? null;
		return {
			number,
			email: draft.email,
			shipName: draft.shipName,
			shipLine1: draft.shipLine1,
			shipLine2: draft.shipLine2,
			shipCity: draft.shipCity,
			shipState: draft.shipState,
			shipZip: draft.shipZip,
			service: draft.service,
			state: draft.state,
			subtotalCents: draft.subtotalCents,
			shippingCents: draft.shippingCents,
			totalCents: draft.totalCents,
			paidCents: draft.paidCents,
			refundedCents: draft.refundedCents,
			shipOn: draft.shipOn,
			deliveredAt: draft.deliveredAt,
			createdAt: draft.createdAt,
			updatedAt: draft.updatedAt,
			lines: draft.lines,
			events: draft.events,
			payment: draft.payment,
			shipChecks: draft.shipChecks,
			shipment: draft.shipment,
			refund: draft.refund,
			claim: draft.claim,
			reshipOf: draft.reshipOfDraft ? (numbered.get(draft.reshipOfDraft) ?? null) : null
		};
	});
	return { orders, cutoff: iso(cutoffMs) };
}
