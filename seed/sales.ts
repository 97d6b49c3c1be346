// The demo's shop side: listings with price tiers, orders in every state with their
// full history (payments, ship checks, shipments, refunds, claims) and a waitlist.
// Pure: every date is laid out from `today`; the builder refuses a plan that would
// sell more than a clutch has or break the money rules.
import type {
	ActorKind,
	ClutchStage,
	ListingKind,
	ListingState,
	OrderState,
	Pack,
	PaymentStatus,
	Service,
	Sex
} from '../src/lib/server/db/schema';
import { lineTotalCents } from '../src/lib/money/pricing';
import { DEMO_ACCOUNTS, DEMO_SHIP_ADDRESSES, type DemoClimate } from './accounts';
import {
	addDays,
	daysBetween,
	instantOn,
	isoWeekday,
	weekdayOnOrAfter,
	weekdayOnOrBefore
} from './dates';
import { speciesBySlug, stageOn, TEO, WREN, type DemoClutch, type DemoStock } from './stock';

/** The shop's settings as the demo seeds them; the rest are the table's defaults. */
export const DEMO_SHOP = {
	name: 'Mossback Hollow Inverts',
	originZip: '37902',
	timeZone: 'America/New_York',
	// These mirror shop_setting's column defaults, which the seed leaves in place.
	shipWeekdays: { overnight: [1, 2, 3], two_day: [1, 2] } as Record<Service, number[]>,
	transitDays: { overnight: 1, two_day: 2 } as Record<Service, number>,
	feeCents: { overnight: 4500, two_day: 2800 } as Record<Service, number>,
	thresholds: { heatPackBelowF: 50, holdBelowF: 25, coldPackAboveF: 85, holdAboveF: 95 }
} as const;

const BUSINESS_DAYS = [1, 2, 3, 4, 5];

export interface DemoPriceTier {
	minQuantity: number;
	priceCents: number;
}

export interface DemoListing {
	slug: string;
	kind: ListingKind;
	speciesSlug: string | null;
	clutchCode: string | null;
	title: string;
	description: string;
	unitSize: number;
	sex: Sex;
	isLive: boolean;
	state: ListingState;
	supplyStock: number | null;
	publishedAt: string | null;
	createdAt: string;
	tiers: DemoPriceTier[];
}

export interface DemoOrderLine {
	listingSlug: string;
	clutchCode: string | null;
	speciesSlug: string | null;
	description: string;
	stage: ClutchStage | null;
	sex: Sex;
	unitSize: number;
	quantity: number;
	lineTotalCents: number;
	isLive: boolean;
	restockedQuantity: number;
}

export interface DemoOrderEvent {
	fromState: OrderState | null;
	toState: OrderState;
	actorKind: ActorKind;
	actorEmail: string | null;
	note: string;
	at: string;
}

export interface DemoPayment {
	checkoutSessionId: string;
	paymentIntentId: string | null;
	amountCents: number;
	status: PaymentStatus;
	createdAt: string;
	updatedAt: string;
}

export interface DemoShipCheck {
	firstDate: string;
	service: Service;
	decision: 'ship' | 'hold';
	shipDate: string | null;
	deliveryDate: string | null;
	recheckDate: string | null;
	packs: Pack[];
	facilityPickup: boolean;
	reasons: ShipReason[];
	inputs: Record<string, unknown>;
	checkedAt: string;
}

export interface ShipReason {
	// The rule names of src/lib/shipping/ship-check.ts, so the pages describe demo checks too.
	rule: 'heat_pack' | 'cold_pack' | 'hold_below' | 'facility_pickup_cold' | 'facility_pickup_heat';
	place: 'origin' | 'destination';
	zip: string;
	date: string;
	valueF: number;
	limitF: number;
	text: string;
}

export interface DemoShipment {
	carrier: string;
	trackingNumber: string | null;
	packs: Pack[];
	packedAt: string;
	shippedAt: string | null;
	expectedDeliveryOn: string;
	deliveredAt: string | null;
	byEmail: string;
	createdAt: string;
}

export interface DemoRefund {
	stripeRefundId: string;
	idempotencyKey: string;
	amountCents: number;
	reason: string;
	byEmail: string;
	at: string;
	/** Lines given back to stock; by index into the order's lines. */
	lines: Array<{ lineIndex: number; quantity: number; restock: boolean }>;
}

export interface DemoClaim {
	userEmail: string;
	note: string;
	state: 'open' | 'refunded';
	filedAt: string;
	decidedAt: string | null;
	decidedByEmail: string | null;
	decisionNote: string;
	/** Decided claims point at the order's refund. */
	usesRefund: boolean;
	lines: Array<{ lineIndex: number; deadCount: number }>;
}

export interface DemoOrder {
	number: string;
	userEmail: string;
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
	termsAcceptedAt: string;
	createdAt: string;
	updatedAt: string;
	lines: DemoOrderLine[];
	events: DemoOrderEvent[];
	payment: DemoPayment;
	shipChecks: DemoShipCheck[];
	shipment: DemoShipment | null;
	refund: DemoRefund | null;
	claim: DemoClaim | null;
}

export interface DemoWaitlistEntry {
	speciesSlug: string;
	email: string;
	createdAt: string;
	confirmedAt: string;
}

export interface DemoSales {
	listings: DemoListing[];
	orders: DemoOrder[];
	waitlist: DemoWaitlistEntry[];
}

// Lines are priced by the shop's own rule, so demo orders add up as real ones do.
export { lineTotalCents };

function fToC(f: number): string {
	return ((f - 32) * (5 / 9)).toFixed(1);
}

// ---------------------------------------------------------------- listings

const CHECK_STATE_RULES =
	"Check your state's rules on keeping and moving invertebrates before you order.";
const MILLIPEDE_LISTING_CAUTION =
	'Millipedes release a defensive fluid that can stain and irritate: handle low over a soft ' +
	'surface and wash hands afterwards.';

interface ListingPlan {
	slug: string;
	kind: ListingKind;
	speciesSlug?: string;
	clutchCode?: string;
	title: string;
	description: string;
	unitSize?: number;
	sex?: Sex;
	isLive: boolean;
	state: ListingState;
	supplyStock?: number;
	/** Supplies only; animal listings go live when their clutch is listed. */
	publishedDaysAgo?: number;
	tiers: Array<[minQuantity: number, priceCents: number]>;
}

const LISTING_PLANS: ReadonlyArray<ListingPlan> = [
	{
		slug: 'narceus-americanus-juveniles-nar-c1',
		kind: 'animal',
		clutchCode: 'NAR-C1',
		title: 'American giant millipede (Narceus americanus), juvenile, each',
		description:
			'Captive-bred F2 juveniles from our NAR-01 colony, about 2 in long. They grow to around 4 in. ' +
			`Sent with a care sheet. ${MILLIPEDE_LISTING_CAUTION} ${CHECK_STATE_RULES}`,
		isLive: true,
		state: 'live',
		tiers: [
			[1, 1400],
			[5, 6000],
			[10, 11000]
		]
	},
	{
		slug: 'bumblebee-millipedes-group-of-5-ana-c2',
		kind: 'animal',
		clutchCode: 'ANA-C2',
		title: 'Bumblebee millipedes (Anadenobolus monilicornis), sub-adult, group of 5',
		description:
			'Five captive-bred F3 sub-adults from ANA-01, already showing their yellow rings. ' +
			`Sent with a care sheet. ${MILLIPEDE_LISTING_CAUTION} ${CHECK_STATE_RULES}`,
		unitSize: 5,
		isLive: true,
		state: 'live',
		tiers: [
			[1, 3200],
			[3, 9000]
		]
	},
	{
		slug: 'bumblebee-millipedes-group-of-5-ana-c1',
		kind: 'animal',
		clutchCode: 'ANA-C1',
		title: 'Bumblebee millipedes (Anadenobolus monilicornis), sub-adult, group of 5',
		description:
			'Five captive-bred F3 sub-adults from ANA-01. ' +
			`${MILLIPEDE_LISTING_CAUTION} ${CHECK_STATE_RULES}`,
		unitSize: 5,
		isLive: true,
		state: 'sold_out',
		tiers: [
			[1, 3200],
			[3, 9000]
		]
	},
	{
		slug: 'smooth-slater-adults-group-of-10-pla-c1',
		kind: 'animal',
		clutchCode: 'PLA-C1',
		title: 'Smooth slaters (Porcellio laevis), adult, group of 10',
		description: `Ten captive-bred F4 adults, ready to breed. Sent with a care sheet. ${CHECK_STATE_RULES}`,
		unitSize: 10,
		isLive: true,
		state: 'sold_out',
		tiers: [
			[1, 2200],
			[3, 6000]
		]
	},
	{
		slug: 'smooth-slaters-group-of-10-pla-c2',
		kind: 'animal',
		clutchCode: 'PLA-C2',
		title: 'Smooth slaters (Porcellio laevis), sub-adult, group of 10',
		description: `Ten captive-bred F4 sub-adults from PLA-01. Sent with a care sheet. ${CHECK_STATE_RULES}`,
		unitSize: 10,
		isLive: true,
		state: 'live',
		tiers: [
			[1, 2000],
			[3, 5400]
		]
	},
	{
		slug: 'smooth-slaters-pair-pla-c2',
		kind: 'animal',
		clutchCode: 'PLA-C2',
		title: 'Smooth slaters (Porcellio laevis), sub-adult pair',
		description:
			'One male and one female, sexed by eye from the underside, to start a colony of your own. ' +
			CHECK_STATE_RULES,
		unitSize: 2,
		sex: 'pair',
		isLive: true,
		state: 'live',
		tiers: [[1, 900]]
	},
	{
		slug: 'common-pill-bug-adults-group-of-10-arm-c1',
		kind: 'animal',
		clutchCode: 'ARM-C1',
		title: 'Common pill bugs (Armadillidium vulgare), adult, group of 10',
		description: `Ten captive-bred F3 adults from ARM-01. Sent with a care sheet. ${CHECK_STATE_RULES}`,
		unitSize: 10,
		isLive: true,
		state: 'live',
		tiers: [
			[1, 1800],
			[3, 4800]
		]
	},
	{
		slug: 'little-sea-isopods-each-cub-c1',
		kind: 'animal',
		clutchCode: 'CUB-C1',
		title: 'Little sea isopods (Cubaris murina), sub-adult, each',
		description:
			'Captive-bred F2 sub-adults from CUB-01; small broods, so stock is limited. ' +
			CHECK_STATE_RULES,
		isLive: true,
		state: 'live',
		tiers: [
			[1, 600],
			[5, 2600],
			[10, 4800]
		]
	},
	{
		slug: 'smooth-slaters-group-of-10-pla-c3',
		kind: 'animal',
		clutchCode: 'PLA-C3',
		title: 'Smooth slaters (Porcellio laevis), juvenile, group of 10',
		description: `Ten captive-bred F5 juveniles from PLA-02. ${CHECK_STATE_RULES}`,
		unitSize: 10,
		isLive: true,
		state: 'draft',
		tiers: [
			[1, 1800],
			[3, 4800]
		]
	},
	{
		slug: 'white-springtail-starter-culture',
		kind: 'supply',
		speciesSlug: 'folsomia-candida',
		title: 'White springtail (Folsomia candida) starter culture',
		description:
			'A vented box of damp culture with hundreds of springtails, enough to seed a tub or start ' +
			'your own culture. Shipped live, so it waits for safe weather like the animals do.',
		isLive: true,
		state: 'live',
		supplyStock: 14,
		publishedDaysAgo: 230,
		tiers: [
			[1, 1200],
			[3, 3000]
		]
	},
	{
		slug: 'house-substrate-mix-4-quarts',
		kind: 'supply',
		title: 'House substrate mix, 4 quarts',
		description:
			'Our own mix, heat-treated: 1 part compost, 1 part soaked hardwood pellets, 1/3 part ' +
			'crushed hardwood leaves and a little calcium. Sent dry-ish; moisten to "right" by the ' +
			'squeeze test before use.',
		isLive: false,
		state: 'live',
		supplyStock: 25,
		publishedDaysAgo: 300,
		tiers: [
			[1, 1500],
			[3, 3900]
		]
	},
	{
		slug: 'crushed-hardwood-leaf-litter-1-gallon',
		kind: 'supply',
		title: 'Crushed hardwood leaf litter, 1 gallon',
		description:
			'Fallen oak and maple leaves, crushed and heat-treated: the staple food of millipedes and ' +
			'isopods, and the top layer of every tub.',
		isLive: false,
		state: 'live',
		supplyStock: 40,
		publishedDaysAgo: 300,
		tiers: [
			[1, 800],
			[3, 2100]
		]
	}
];

// ---------------------------------------------------------------- orders

interface OrderStory {
	number: string;
	email: string;
	service: Service;
	createdOn: string;
	lines: Array<[listingSlug: string, quantity: number]>;
	state: OrderState;
	/** Ship day for scheduled and later (or proposed, for a paid order). */
	shipOn?: string;
	/** Packing day, when not the ship day itself (supplies only). */
	packedOn?: string;
	/** Days a hold decision was made on; the order sits in weather_hold from the first. */
	holdCheckDays?: string[];
	cancelledOn?: string;
	refundedOn?: string;
	claim?: {
		filedMinutesAfterDelivery: number;
		note: string;
		dead: Array<{ lineIndex: number; deadCount: number }>;
		decision?: { note: string };
	};
}

/**
 * Ship day of the order shown in transit: the last overnight ship day before today, or
 * today itself when that one would already have been delivered (a Monday). From Friday to
 * Sunday nothing ships, so the parcel shows as awaiting the carrier's delivery scan.
 */
function inTransitShipDay(today: string): string {
	const days = DEMO_SHOP.shipWeekdays.overnight;
	const previous = weekdayOnOrBefore(addDays(today, -1), days);
	const delivered = daysBetween(addDays(previous, DEMO_SHOP.transitDays.overnight), today) > 0;
	return delivered && days.includes(isoWeekday(today)) ? today : previous;
}

function orderStories(today: string): OrderStory[] {
	const day = (offset: number) => addDays(today, offset);
	const dagny = 'dagny.halvorsen@example.com';
	const marisol = 'marisol.ocampo@example.com';
	const jory = 'jory.whitfield@example.test';
	const ines = 'ines.farrow@example.test';
	return [
		{
			number: 'HL-10001',
			email: jory,
			service: 'two_day',
			createdOn: day(-250),
			lines: [
				['smooth-slater-adults-group-of-10-pla-c1', 3],
				['crushed-hardwood-leaf-litter-1-gallon', 1]
			],
			state: 'delivered'
		},
		{
			number: 'HL-10002',
			email: dagny,
			service: 'overnight',
			createdOn: day(-200),
			lines: [
				['smooth-slater-adults-group-of-10-pla-c1', 3],
				['white-springtail-starter-culture', 1]
			],
			state: 'delivered'
		},
		{
			number: 'HL-10003',
			email: marisol,
			service: 'overnight',
			createdOn: day(-150),
			lines: [
				['bumblebee-millipedes-group-of-5-ana-c1', 3],
				['smooth-slater-adults-group-of-10-pla-c1', 2]
			],
			state: 'delivered'
		},
		{
			number: 'HL-10004',
			email: ines,
			service: 'two_day',
			createdOn: day(-120),
			lines: [
				['bumblebee-millipedes-group-of-5-ana-c1', 4],
				['smooth-slater-adults-group-of-10-pla-c1', 2]
			],
			state: 'delivered'
		},
		{
			number: 'HL-10005',
			email: jory,
			service: 'overnight',
			createdOn: day(-90),
			lines: [
				['bumblebee-millipedes-group-of-5-ana-c1', 3],
				['house-substrate-mix-4-quarts', 1]
			],
			state: 'part_refunded',
			claim: {
				filedMinutesAfterDelivery: 50,
				note: 'Two of the fifteen were dead when I opened the box, about half an hour after it came.',
				dead: [{ lineIndex: 0, deadCount: 2 }],
				decision: {
					note: 'Filed within the window; two dead on arrival. Refund for two animals; shipping is not refunded under the guarantee.'
				}
			}
		},
		{
			number: 'HL-10006',
			email: dagny,
			service: 'overnight',
			createdOn: day(-60),
			lines: [
				['common-pill-bug-adults-group-of-10-arm-c1', 1],
				['white-springtail-starter-culture', 1]
			],
			state: 'refunded',
			holdCheckDays: [day(-60), day(-58), day(-56)],
			refundedOn: day(-56)
		},
		{
			number: 'HL-10007',
			email: marisol,
			service: 'two_day',
			createdOn: day(-30),
			lines: [['little-sea-isopods-each-cub-c1', 5]],
			state: 'cancelled',
			cancelledOn: day(-29)
		},
		{
			number: 'HL-10008',
			email: marisol,
			service: 'overnight',
			createdOn: day(-9),
			lines: [['narceus-americanus-juveniles-nar-c1', 5]],
			state: 'delivered',
			claim: {
				filedMinutesAfterDelivery: 40,
				note: 'One of the five juveniles was dead and dried out when I opened the box, about half an hour after delivery. The other four are moving well.',
				dead: [{ lineIndex: 0, deadCount: 1 }]
			}
		},
		{
			number: 'HL-10009',
			email: jory,
			service: 'overnight',
			createdOn: day(-7),
			lines: [
				['bumblebee-millipedes-group-of-5-ana-c2', 2],
				['little-sea-isopods-each-cub-c1', 1]
			],
			state: 'shipped',
			shipOn: inTransitShipDay(today)
		},
		{
			number: 'HL-10010',
			email: ines,
			service: 'two_day',
			createdOn: day(-3),
			lines: [
				['house-substrate-mix-4-quarts', 2],
				['crushed-hardwood-leaf-litter-1-gallon', 3]
			],
			state: 'packed',
			// Nothing live in it, so it goes out on the next business day, weather or not.
			shipOn: weekdayOnOrAfter(today, BUSINESS_DAYS),
			packedOn: today
		},
		{
			number: 'HL-10011',
			email: marisol,
			service: 'overnight',
			createdOn: day(-2),
			lines: [
				['smooth-slaters-pair-pla-c2', 1],
				['smooth-slaters-group-of-10-pla-c2', 1]
			],
			state: 'scheduled',
			shipOn: weekdayOnOrAfter(day(1), DEMO_SHOP.shipWeekdays.overnight)
		},
		{
			number: 'HL-10012',
			email: dagny,
			service: 'overnight',
			createdOn: day(-2),
			lines: [
				['narceus-americanus-juveniles-nar-c1', 1],
				['white-springtail-starter-culture', 1]
			],
			state: 'weather_hold',
			holdCheckDays: [day(-2), today]
		},
		{
			number: 'HL-10013',
			email: ines,
			service: 'two_day',
			createdOn: day(-1),
			lines: [['common-pill-bug-adults-group-of-10-arm-c1', 1]],
			state: 'paid',
			shipOn: weekdayOnOrAfter(day(1), DEMO_SHOP.shipWeekdays.two_day)
		},
		{
			// A second box on the same ship day, so the demo's next ship morning has two to pack.
			number: 'HL-10015',
			email: jory,
			service: 'overnight',
			createdOn: day(-1),
			lines: [['narceus-americanus-juveniles-nar-c1', 2]],
			state: 'scheduled',
			shipOn: weekdayOnOrAfter(day(1), DEMO_SHOP.shipWeekdays.overnight)
		},
		{
			number: 'HL-10014',
			email: jory,
			service: 'overnight',
			createdOn: today,
			lines: [['little-sea-isopods-each-cub-c1', 2]],
			state: 'awaiting_payment'
		}
	];
}

const STAGE_LABEL: Readonly<Record<ClutchStage, string>> = {
	hatchling: 'hatchling',
	juvenile: 'juvenile',
	sub_adult: 'sub-adult',
	adult: 'adult'
};
const SEX_LABEL: Readonly<Record<Sex, string>> = {
	unsexed: 'unsexed',
	male: 'male',
	female: 'female',
	pair: 'pair (1 male, 1 female)'
};

/** Demo forecasts per destination climate, in °F; the origin (Knoxville) is mild throughout. */
const ORIGIN_FORECAST = { lowF: 52, highF: 70 };
const DESTINATION_FORECAST: Readonly<
	Record<DemoClimate | 'cold_snap', { lowF: number; highF: number }>
> = {
	cold: { lowF: 31, highF: 40 },
	cold_snap: { lowF: 14, highF: 22 },
	hot: { lowF: 74, highF: 92 },
	mild: { lowF: 52, highF: 63 }
};

interface ShipContext {
	zip: string;
	climate: DemoClimate;
	service: Service;
}

function shipCheckInputs(
	ctx: ShipContext,
	firstDate: string,
	days: string[],
	weather: DemoClimate | 'cold_snap'
) {
	const destination = DESTINATION_FORECAST[weather];
	return {
		originZip: DEMO_SHOP.originZip,
		destinationZip: ctx.zip,
		service: ctx.service,
		firstDate,
		shipWeekdays: DEMO_SHOP.shipWeekdays[ctx.service],
		transitDays: DEMO_SHOP.transitDays[ctx.service],
		thresholds: DEMO_SHOP.thresholds,
		forecast: days.flatMap((date) => [
			{ place: 'origin', zip: DEMO_SHOP.originZip, date, ...ORIGIN_FORECAST },
			{ place: 'destination', zip: ctx.zip, date, ...destination }
		]),
		source: 'demo snapshot'
	};
}

function transitDays(shipDate: string, service: Service): string[] {
	const days = [shipDate];
	for (let i = 1; i <= DEMO_SHOP.transitDays[service]; i++) days.push(addDays(shipDate, i));
	return days;
}

function shipDecision(
	ctx: ShipContext,
	checkedAt: string,
	checkedOn: string,
	shipDate: string
): DemoShipCheck {
	const days = transitDays(shipDate, ctx.service);
	const deliveryDate = days.at(-1) as string;
	const t = DEMO_SHOP.thresholds;
	const destination = DESTINATION_FORECAST[ctx.climate];
	const reasons: ShipReason[] = [];
	const packs: Pack[] = [];
	let facilityPickup = false;
	if (destination.lowF < t.heatPackBelowF) {
		packs.push('heat');
		reasons.push({
			rule: 'heat_pack',
			place: 'destination',
			zip: ctx.zip,
			date: deliveryDate,
			valueF: destination.lowF,
			limitF: t.heatPackBelowF,
			text: `Forecast low ${destination.lowF} °F (${fToC(destination.lowF)} °C) at ${ctx.zip} is under ${t.heatPackBelowF} °F: add a heat pack.`
		});
	}
	if (destination.highF > t.coldPackAboveF) {
		packs.push('cold');
		reasons.push({
			rule: 'cold_pack',
			place: 'destination',
			zip: ctx.zip,
			date: deliveryDate,
			valueF: destination.highF,
			limitF: t.coldPackAboveF,
			text: `Forecast high ${destination.highF} °F (${fToC(destination.highF)} °C) at ${ctx.zip} is over ${t.coldPackAboveF} °F: add a cold pack.`
		});
	}
	if (packs.length > 0) {
		facilityPickup = true;
		const cold = packs.includes('heat');
		const valueF = cold ? destination.lowF : destination.highF;
		reasons.push({
			rule: cold ? 'facility_pickup_cold' : 'facility_pickup_heat',
			place: 'destination',
			zip: ctx.zip,
			date: deliveryDate,
			valueF,
			limitF: cold ? t.heatPackBelowF : t.coldPackAboveF,
			text: `${valueF} °F (${fToC(valueF)} °C) is between the pack and hold limits: suggest pickup at a staffed carrier facility.`
		});
	}
	const firstDate = addDays(checkedOn, 1);
	return {
		firstDate,
		service: ctx.service,
		decision: 'ship',
		shipDate,
		deliveryDate,
		recheckDate: null,
		packs,
		facilityPickup,
		reasons,
		inputs: shipCheckInputs(ctx, firstDate, days, ctx.climate),
		checkedAt
	};
}

function holdDecision(
	ctx: ShipContext,
	checkedAt: string,
	checkedOn: string,
	recheckDate: string
): DemoShipCheck {
	const firstDate = weekdayOnOrAfter(addDays(checkedOn, 1), DEMO_SHOP.shipWeekdays[ctx.service]);
	const days = transitDays(firstDate, ctx.service);
	const snap = DESTINATION_FORECAST.cold_snap;
	const limit = DEMO_SHOP.thresholds.holdBelowF;
	const reasons: ShipReason[] = days.slice(1).map((date) => ({
		rule: 'hold_below',
		place: 'destination',
		zip: ctx.zip,
		date,
		valueF: snap.lowF,
		limitF: limit,
		text: `Forecast low ${snap.lowF} °F (${fToC(snap.lowF)} °C) at ${ctx.zip} on ${date} is under the ${limit} °F hold limit: no live shipping.`
	}));
	return {
		firstDate,
		service: ctx.service,
		decision: 'hold',
		shipDate: null,
		deliveryDate: null,
		recheckDate,
		packs: [],
		facilityPickup: false,
		reasons,
		inputs: shipCheckInputs(ctx, firstDate, days, 'cold_snap'),
		checkedAt
	};
}

const STATES_AFTER_SCHEDULED: readonly OrderState[] = [
	'scheduled',
	'packed',
	'shipped',
	'delivered',
	'part_refunded'
];

function trackingNumber(carrier: string, orderNumber: string): string {
	const digits = orderNumber.replace(/\D/g, '');
	// Shaped like the carriers' own numbers, with a DEMO marker so no one mistakes them.
	return carrier === 'UPS'
		? `1ZDEMO01${digits.padStart(10, '0')}`
		: `9400DEMO${digits.padStart(14, '0')}`;
}

function buildOrder(
	story: OrderStory,
	index: number,
	today: string,
	listings: ReadonlyMap<string, DemoListing>,
	clutches: ReadonlyMap<string, DemoClutch>
): DemoOrder {
	const account = DEMO_ACCOUNTS.find((a) => a.email === story.email);
	const address = DEMO_SHIP_ADDRESSES[story.email];
	if (!account?.zip || !account.climate || !address)
		throw new Error(`${story.number}: no ship-to for ${story.email}`);
	const ctx: ShipContext = { zip: account.zip, climate: account.climate, service: story.service };
	const digits = story.number.replace(/\D/g, '');

	// Placed in the shop's working day; orders placed "today" early in the morning.
	const hour = story.createdOn === today ? 12 : 14 + (index % 6);
	const minute = (index * 13) % 45;
	const time = (extra: number) =>
		`${String(hour).padStart(2, '0')}:${String(minute + extra).padStart(2, '0')}`;
	const placedAt = instantOn(story.createdOn, time(0));
	const paidAt = instantOn(story.createdOn, time(3));
	const checkedAt = instantOn(story.createdOn, time(4));

	const lines: DemoOrderLine[] = story.lines.map(([slug, quantity]) => {
		const listing = listings.get(slug);
		if (!listing) throw new Error(`${story.number}: unknown listing ${slug}`);
		if (!listing.publishedAt || listing.publishedAt.slice(0, 10) > story.createdOn) {
			throw new Error(`${story.number}: ${slug} was not on sale on ${story.createdOn}`);
		}
		const lineTotal = lineTotalCents(listing.tiers, quantity);
		if (!listing.clutchCode) {
			return {
				listingSlug: slug,
				clutchCode: null,
				speciesSlug: listing.speciesSlug,
				description: listing.title,
				stage: null,
				sex: listing.sex,
				unitSize: listing.unitSize,
				quantity,
				lineTotalCents: lineTotal,
				isLive: listing.isLive,
				restockedQuantity: 0
			};
		}
		const clutch = clutches.get(listing.clutchCode);
		if (!clutch) throw new Error(`${slug}: unknown clutch ${listing.clutchCode}`);
		const species = speciesBySlug(clutch.speciesSlug);
		const stage = stageOn(clutch, story.createdOn);
		const unit = listing.unitSize === 1 ? 'each' : `group of ${listing.unitSize}`;
		const what =
			listing.sex === 'pair'
				? `${STAGE_LABEL[stage]} ${SEX_LABEL.pair}`
				: `${STAGE_LABEL[stage]}, ${SEX_LABEL[listing.sex]}, ${unit}`;
		return {
			listingSlug: slug,
			clutchCode: clutch.code,
			speciesSlug: clutch.speciesSlug,
			description: `${species.commonName} (${species.scientificName}), ${what}; clutch ${clutch.code}`,
			stage,
			sex: listing.sex,
			unitSize: listing.unitSize,
			quantity,
			lineTotalCents: lineTotal,
			isLive: true,
			restockedQuantity: 0
		};
	});
	const hasLive = lines.some((l) => l.isLive);
	const subtotalCents = lines.reduce((sum, l) => sum + l.lineTotalCents, 0);
	const shippingCents = DEMO_SHOP.feeCents[story.service];
	const totalCents = subtotalCents + shippingCents;

	const events: DemoOrderEvent[] = [
		{
			fromState: null,
			toState: 'awaiting_payment',
			actorKind: 'user',
			actorEmail: story.email,
			note: 'Placed at checkout.',
			at: placedAt
		}
	];
	const move = (
		toState: OrderState,
		at: string,
		actorKind: ActorKind,
		actorEmail: string | null,
		note = ''
	) => {
		const fromState = events.at(-1)?.toState ?? null;
		events.push({ fromState, toState, actorKind, actorEmail, note, at });
	};

	const paid = story.state !== 'awaiting_payment' && story.state !== 'cancelled';
	const payment: DemoPayment = {
		checkoutSessionId: `cs_test_demo_${digits}`,
		paymentIntentId: paid ? `pi_test_demo_${digits}` : null,
		amountCents: totalCents,
		status: paid ? 'succeeded' : story.state === 'cancelled' ? 'expired' : 'pending',
		createdAt: placedAt,
		updatedAt: paid ? paidAt : placedAt
	};
	if (story.state === 'cancelled') {
		if (!story.cancelledOn) throw new Error(`${story.number}: cancelled needs a day`);
		const at = instantOn(story.cancelledOn, time(0));
		payment.updatedAt = at;
		move('cancelled', at, 'system', null, 'Checkout expired unpaid; reserved stock released.');
	}
	if (paid) move('paid', paidAt, 'webhook', null, `Payment ${payment.paymentIntentId} succeeded.`);

	const shipChecks: DemoShipCheck[] = [];
	let shipment: DemoShipment | null = null;
	let deliveredAt: string | null = null;
	let refund: DemoRefund | null = null;
	let claim: DemoClaim | null = null;

	if (story.holdCheckDays) {
		story.holdCheckDays.forEach((day, i) => {
			const at = i === 0 ? checkedAt : instantOn(day, '11:00');
			const next = story.holdCheckDays?.[i + 1] ?? addDays(day, 1);
			shipChecks.push(holdDecision(ctx, at, day, next));
			if (i === 0)
				move('weather_hold', at, 'system', null, 'Ship check: hold for cold at the destination.');
		});
	}

	const scheduled = STATES_AFTER_SCHEDULED.includes(story.state);
	let shipOn: string | null = null;
	if (scheduled || story.state === 'paid') {
		const plannedShipOn =
			story.shipOn ??
			weekdayOnOrAfter(addDays(story.createdOn, 1), DEMO_SHOP.shipWeekdays[story.service]);
		if (daysBetween(story.createdOn, plannedShipOn) < 0) {
			throw new Error(`${story.number}: ships before it was placed`);
		}
		// A paid order has a proposed date from its ship check but no ship day set yet.
		if (scheduled) shipOn = plannedShipOn;
		if (hasLive) {
			const check = shipDecision(ctx, checkedAt, story.createdOn, plannedShipOn);
			shipChecks.push(check);
			if (scheduled) {
				const packNote = check.packs.length ? ` with a ${check.packs.join(' and ')} pack` : '';
				move(
					'scheduled',
					checkedAt,
					'system',
					null,
					`Ship check: ship on ${plannedShipOn}${packNote}.`
				);
			}
		} else if (scheduled) {
			move('scheduled', checkedAt, 'system', null, `Nothing live: ships on ${plannedShipOn}.`);
		}
		const expectedDeliveryOn = addDays(plannedShipOn, DEMO_SHOP.transitDays[story.service]);
		const packs = shipChecks.at(-1)?.packs ?? [];
		const carrier = story.service === 'overnight' ? 'UPS' : 'USPS';
		if (story.state !== 'scheduled' && story.state !== 'paid') {
			// Something going out "today" leaves in the morning, so the demo never shows a future pickup.
			const goesToday = plannedShipOn === today && story.state !== 'packed';
			const packedAt = instantOn(story.packedOn ?? plannedShipOn, goesToday ? '12:00' : '13:00');
			shipment = {
				carrier,
				trackingNumber: null,
				packs: [...packs],
				packedAt,
				shippedAt: null,
				expectedDeliveryOn,
				deliveredAt: null,
				byEmail: TEO,
				createdAt: packedAt
			};
			const packNote = packs.length ? `Packed with a ${packs.join(' and ')} pack.` : 'Packed.';
			move('packed', packedAt, 'user', TEO, packNote);
			if (story.state !== 'packed') {
				shipment.shippedAt = instantOn(plannedShipOn, goesToday ? '13:30' : '20:30');
				shipment.trackingNumber = trackingNumber(carrier, story.number);
				move('shipped', shipment.shippedAt, 'user', TEO, `${carrier} ${shipment.trackingNumber}`);
			}
			if (story.state === 'delivered' || story.state === 'part_refunded') {
				deliveredAt = instantOn(expectedDeliveryOn, '16:30');
				shipment.deliveredAt = deliveredAt;
				move('delivered', deliveredAt, 'system', null, 'Carrier reported delivery.');
			}
		}
	}

	if (story.claim) {
		if (!deliveredAt) throw new Error(`${story.number}: a claim needs a delivered order`);
		const delivered = new Date(deliveredAt).getTime();
		const filedAt = new Date(delivered + story.claim.filedMinutesAfterDelivery * 60_000)
			.toISOString()
			.replace('.000Z', 'Z');
		let decidedAt: string | null = null;
		if (story.claim.decision) {
			decidedAt = instantOn(addDays(deliveredAt.slice(0, 10), 1), '15:00');
			let amount = 0;
			for (const { lineIndex, deadCount } of story.claim.dead) {
				const line = lines[lineIndex];
				if (!line) throw new Error(`${story.number}: claim names line ${lineIndex}`);
				amount += Math.round(line.lineTotalCents / (line.quantity * line.unitSize)) * deadCount;
			}
			refund = {
				stripeRefundId: `re_test_demo_${digits}_1`,
				idempotencyKey: `demo-refund-${digits}-1`,
				amountCents: amount,
				reason: 'DOA claim: animals dead on arrival; shipping not refunded under the guarantee.',
				byEmail: WREN,
				at: decidedAt,
				lines: []
			};
			move('part_refunded', decidedAt, 'user', WREN, `Claim decided: refund of ${amount} cents.`);
		}
		claim = {
			userEmail: story.email,
			note: story.claim.note,
			state: story.claim.decision ? 'refunded' : 'open',
			filedAt,
			decidedAt,
			decidedByEmail: story.claim.decision ? WREN : null,
			decisionNote: story.claim.decision?.note ?? '',
			usesRefund: Boolean(story.claim.decision),
			lines: story.claim.dead
		};
	}

	if (story.state === 'refunded') {
		if (!story.refundedOn) throw new Error(`${story.number}: refunded needs a day`);
		const at = instantOn(story.refundedOn, '15:30');
		// Nothing left the shop, so everything goes back to stock and shipping is refunded too.
		for (const line of lines) line.restockedQuantity = line.quantity;
		refund = {
			stripeRefundId: `re_test_demo_${digits}_1`,
			idempotencyKey: `demo-refund-${digits}-1`,
			amountCents: totalCents,
			reason:
				'Held for cold at the destination for days; the customer asked to cancel. Nothing shipped.',
			byEmail: WREN,
			at,
			lines: lines.map((line, lineIndex) => ({ lineIndex, quantity: line.quantity, restock: true }))
		};
		move('refunded', at, 'user', WREN, 'Refunded in full, shipping included; stock restored.');
	}

	const finalState = events.at(-1)?.toState;
	if (finalState !== story.state) {
		throw new Error(`${story.number}: history ends in ${finalState}, not ${story.state}`);
	}
	const paidCents = paid ? totalCents : 0;
	const refundedCents = refund?.amountCents ?? 0;
	if (refundedCents > paidCents || paidCents > totalCents)
		throw new Error(`${story.number}: money does not add up`);
	const lastAt = events.reduce((latest, e) => (e.at > latest ? e.at : latest), placedAt);
	return {
		number: story.number,
		userEmail: story.email,
		shipName: account.name,
		shipLine1: address.line1,
		shipLine2: address.line2 ?? '',
		shipCity: address.city,
		shipState: address.state,
		shipZip: account.zip,
		service: story.service,
		state: story.state,
		subtotalCents,
		shippingCents,
		totalCents,
		paidCents,
		refundedCents,
		shipOn,
		deliveredAt,
		termsAcceptedAt: placedAt,
		createdAt: placedAt,
		updatedAt: claim && claim.filedAt > lastAt ? claim.filedAt : lastAt,
		lines,
		events,
		payment,
		shipChecks,
		shipment,
		refund,
		claim
	};
}

/** Refuses any plan that sells more animals from a clutch than it had alive. */
function checkClutchStock(orders: readonly DemoOrder[], clutches: readonly DemoClutch[]): void {
	for (const clutch of clutches) {
		let ordered = 0;
		let kept = 0;
		for (const order of orders) {
			for (const line of order.lines) {
				if (line.clutchCode !== clutch.code) continue;
				ordered += line.quantity * line.unitSize;
				if (order.state !== 'cancelled')
					kept += (line.quantity - line.restockedQuantity) * line.unitSize;
			}
		}
		if (ordered > clutch.countAlive) {
			throw new Error(`${clutch.code}: orders take ${ordered} of ${clutch.countAlive} alive`);
		}
		if (clutch.state === 'sold_out' && kept !== clutch.countAlive) {
			throw new Error(`${clutch.code}: sold out but ${kept} of ${clutch.countAlive} sold`);
		}
	}
}

export function buildSales(today: string, stock: DemoStock): DemoSales {
	const clutchByCode = new Map(stock.clutches.map((c) => [c.code, c]));

	const listings: DemoListing[] = LISTING_PLANS.map((plan) => {
		let publishedOn: string | null;
		let speciesSlug = plan.speciesSlug ?? null;
		if (plan.kind === 'animal') {
			const clutch = plan.clutchCode ? clutchByCode.get(plan.clutchCode) : undefined;
			if (!clutch) throw new Error(`${plan.slug}: unknown clutch ${plan.clutchCode}`);
			speciesSlug = clutch.speciesSlug;
			const expected: ListingState =
				clutch.state === 'sold_out' ? 'sold_out' : clutch.state === 'listed' ? 'live' : 'draft';
			if (plan.state !== expected)
				throw new Error(`${plan.slug}: clutch ${clutch.code} is ${clutch.state}`);
			publishedOn = clutch.listedOn;
			const unitSize = plan.unitSize ?? 1;
			if (unitSize > clutch.countAlive)
				throw new Error(`${plan.slug}: unit larger than the clutch`);
		} else {
			publishedOn =
				plan.publishedDaysAgo === undefined ? null : addDays(today, -plan.publishedDaysAgo);
		}
		const createdOn = publishedOn ?? addDays(today, -1);
		return {
			slug: plan.slug,
			kind: plan.kind,
			speciesSlug,
			clutchCode: plan.clutchCode ?? null,
			title: plan.title,
			description: plan.description,
			unitSize: plan.unitSize ?? 1,
			sex: plan.sex ?? 'unsexed',
			isLive: plan.isLive,
			state: plan.state,
			supplyStock: plan.kind === 'supply' ? (plan.supplyStock ?? 0) : null,
			publishedAt: publishedOn ? instantOn(publishedOn, '13:30') : null,
			createdAt: instantOn(createdOn, '13:00'),
			tiers: plan.tiers.map(([minQuantity, priceCents]) => ({ minQuantity, priceCents }))
		};
	});
	const listingBySlug = new Map(listings.map((l) => [l.slug, l]));

	const orders = orderStories(today).map((story, i) =>
		buildOrder(story, i, today, listingBySlug, clutchByCode)
	);
	checkClutchStock(orders, stock.clutches);

	// Keepers waiting on the desert millipedes, the one species with nothing ready.
	const waiting = [
		{ email: 'dagny.halvorsen@example.com', daysAgo: 100 },
		{ email: 'marisol.ocampo@example.com', daysAgo: 61 },
		{ email: 'ines.farrow@example.test', daysAgo: 20 }
	];
	const waitlist: DemoWaitlistEntry[] = waiting.map(({ email, daysAgo }) => {
		const day = addDays(today, -daysAgo);
		return {
			speciesSlug: 'orthoporus-ornatus',
			email,
			createdAt: instantOn(day, '01:15'),
			confirmedAt: instantOn(day, '01:22')
		};
	});
	const waitedFor = stock.clutches.filter((c) => c.speciesSlug === 'orthoporus-ornatus');
	if (waitedFor.some((c) => c.state !== 'growing'))
		throw new Error('waitlisted species has stock ready');

	return { listings, orders, waitlist };
}
