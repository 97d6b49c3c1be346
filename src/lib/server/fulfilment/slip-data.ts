// What a packing slip and its care cards say about each order, read in a few queries
// for any number of orders (a ship day of 200 boxes is one batch). The PDF module only
// draws these objects; the rules of who may have a slip are in $lib/fulfilment/slip-rules.
import type { Kysely } from 'kysely';
import { careSheet, type CareSheet } from '$lib/care/care-sheet';
import type { IsoDate } from '$lib/format/dates';
import {
	SHIP_DAY_SLIP_STATES,
	animalCount,
	compareShipOrder,
	slipRefusal,
	unitsToPack
} from '$lib/fulfilment/slip-rules';
import { lookUpZip } from '../accounts/zip';
import type {
	ClutchStage,
	Database,
	OrderState,
	Pack,
	Service,
	Sex,
	SlipPaper
} from '../db/schema';

export interface SlipLine {
	/** An animal listing (counted in animals) or a supply (a culture, substrate, leaves). */
	kind: 'animal' | 'supply';
	/** The line's words as sold, e.g. "House substrate mix, 4 quarts". */
	description: string;
	commonName: string | null;
	scientificName: string | null;
	stage: ClutchStage | null;
	sex: Sex;
	/** Animals per unit (1 for each, 2 for a pair, 10 for a group of 10). */
	unitSize: number;
	/** Units to put in the box: sold less refunded and restocked. */
	units: number;
	/** Units taken off by a refund before the box left: not to be packed. */
	refundedUnits: number;
	/** units × unit size on an animal line; null for supplies. */
	animals: number | null;
	/** The clutch the packer takes them from. */
	clutchCode: string | null;
	isLive: boolean;
}

export interface SlipOrder {
	orderId: number;
	orderNumber: string;
	state: OrderState;
	shop: {
		name: string;
		/** Where the boxes leave from, city and ZIP only: "Knoxville, TN 37902". */
		origin: string;
	};
	/** Who ordered: the account's name, else the name on the box. */
	customer: { name: string; email: string };
	shipTo: { name: string; line1: string; line2: string; city: string; state: string; zip: string };
	service: Service;
	lines: SlipLine[];
	/** Live animals (or a live culture) still go in the box: the handling panel and guarantee apply. */
	hasLive: boolean;
	/** From the shipment when packed, else from the ship check that said ship. */
	packs: Pack[];
	shipDate: IsoDate | null;
	expectedDelivery: IsoDate | null;
	/** The ship check advises holding the box at a staffed carrier facility for pickup. */
	facilityPickup: boolean;
	claimUrl: string;
	/** The buyer's page of the order (for a box with nothing live, where no claim applies). */
	orderUrl: string;
	claimWindowHours: number;
	/** One per species of live animal in the box, in the order the lines name them. */
	careSheets: CareSheet[];
}

export interface SlipRefusal {
	orderId: number;
	orderNumber: string | null;
	/** 404: no such order; 409: the order may not have a slip in its state. */
	status: 404 | 409;
	reason: string;
}

/** Thrown when any of the asked orders may not have a slip; nothing is drawn. */
export class SlipRefused extends Error {
	constructor(readonly refusals: SlipRefusal[]) {
		super(refusals.map((refusal) => refusal.reason).join(' '));
		this.name = 'SlipRefused';
	}
}

/** Where the slip's claim link points: the shop's public origin. */
export type SlipLinks = { origin: string };

// Routes pass the app's origin; this fallback serves scripts and tests outside SvelteKit.
const defaultLinks = (): SlipLinks => ({
	origin: (process.env.ORIGIN ?? 'http://127.0.0.1:3000').replace(/\/$/, '')
});

/** The buyer's page of an order. */
export function orderUrlFor(links: SlipLinks, orderNumber: string): string {
	return `${links.origin.replace(/\/$/, '')}/account/orders/${encodeURIComponent(orderNumber)}`;
}

/** The page where the buyer reports animals that arrived dead. */
export function claimUrlFor(links: SlipLinks, orderNumber: string): string {
	return `${orderUrlFor(links, orderNumber)}/claim`;
}

/** The paper the shop prints slips on (Letter until the owner picks A4). */
export async function slipPaperOf(db: Kysely<Database>): Promise<SlipPaper> {
	const row = await db
		.selectFrom('shop_setting')
		.select('slip_paper')
		.where('id', '=', true)
		.executeTakeFirst();
	return row?.slip_paper ?? 'letter';
}

/** A ship day's boxes to print, in ship order: scheduled or packed for `date`. */
export async function slipOrderIdsForDay(db: Kysely<Database>, date: IsoDate): Promise<number[]> {
	const rows = await db
		.selectFrom('customer_order')
		.select(['id', 'service', 'order_number'])
		.where('ship_on', '=', date)
		.where('state', 'in', SHIP_DAY_SLIP_STATES)
		.execute();
	return rows
		.map((row) => ({ id: row.id, service: row.service, orderNumber: row.order_number }))
		.sort(compareShipOrder)
		.map((row) => row.id);
}

/** The order's id from its number, or null. */
export async function orderIdByNumber(
	db: Kysely<Database>,
	orderNumber: string
): Promise<number | null> {
	const row = await db
		.selectFrom('customer_order')
		.select('id')
		.where('order_number', '=', orderNumber)
		.executeTakeFirst();
	return row?.id ?? null;
}

/**
 * Everything the slips of `orderIds` show, in the order given. Throws `SlipRefused`
 * (listing every order refused, with the reason) when any id is unknown or its order may
 * not have a slip; a batch is all or nothing, so no box goes out with a slip missing.
 */
export async function loadSlipOrders(
	db: Kysely<Database>,
	orderIds: readonly number[],
	links: SlipLinks = defaultLinks()
): Promise<SlipOrder[]> {
	if (orderIds.length === 0) return [];
	const ids = [...new Set(orderIds)];
	const [orders, lines, checks, settings] = await Promise.all([
		db
			.selectFrom('customer_order as o')
			.leftJoin('User as u', 'u.id', 'o.user_id')
			.leftJoin('shipment as s', 's.order_id', 'o.id')
			.select([
				'o.id',
				'o.order_number',
				'o.state',
				'o.email',
				'o.ship_name',
				'o.ship_line1',
				'o.ship_line2',
				'o.ship_city',
				'o.ship_state',
				'o.ship_zip',
				'o.service',
				'o.ship_on',
				'u.name as account_name',
				's.packs as shipment_packs',
				's.ship_check_id',
				's.expected_delivery_on'
			])
			.where('o.id', 'in', ids)
			.execute(),
		db
			.selectFrom('order_line as l')
			.innerJoin('listing', 'listing.id', 'l.listing_id')
			.leftJoin('clutch as c', 'c.id', 'l.clutch_id')
			.leftJoin('species as sp', 'sp.id', 'l.species_id')
			.select([
				'l.order_id',
				'l.description',
				'l.stage',
				'l.sex',
				'l.unit_size',
				'l.quantity',
				'l.restocked_quantity',
				'l.is_live',
				'l.species_id',
				'listing.kind',
				'c.code as clutch_code',
				'sp.common_name',
				'sp.scientific_name'
			])
			.where('l.order_id', 'in', ids)
			.orderBy('l.order_id')
			.orderBy('l.id')
			.execute(),
		// Every check that said ship, newest first per order: the slip shows the one the
		// box was packed on, else the latest (the one that scheduled it).
		db
			.selectFrom('ship_check')
			.select(['id', 'order_id', 'ship_date', 'delivery_date', 'packs', 'facility_pickup'])
			.where('order_id', 'in', ids)
			.where('decision', '=', 'ship')
			.orderBy('order_id')
			.orderBy('id', 'desc')
			.execute(),
		db
			.selectFrom('shop_setting')
			.select(['shop_name', 'origin_zip', 'claim_window_hours'])
			.where('id', '=', true)
			.executeTakeFirst()
	]);
	if (!settings) throw new Error('shop_setting has no row: the shop settings must exist first');

	const byId = new Map(orders.map((order) => [order.id, order]));
	const refusals: SlipRefusal[] = [];
	for (const id of ids) {
		const order = byId.get(id);
		if (!order) {
			refusals.push({ orderId: id, orderNumber: null, status: 404, reason: `No order #${id}.` });
			continue;
		}
		const reason = slipRefusal({
			orderNumber: order.order_number,
			state: order.state,
			hasLive: lines.some((line) => line.order_id === id && line.is_live)
		});
		if (reason)
			refusals.push({ orderId: id, orderNumber: order.order_number, status: 409, reason });
	}
	if (refusals.length > 0) throw new SlipRefused(refusals);

	const speciesIds = [
		...new Set(
			lines
				.filter((line) => line.is_live && line.species_id !== null)
				.map((line) => line.species_id as number)
		)
	];
	const speciesRows =
		speciesIds.length === 0
			? []
			: await db.selectFrom('species').selectAll().where('id', 'in', speciesIds).execute();
	const sheets = new Map(speciesRows.map((row) => [row.id, careSheet(row)]));

	const place = lookUpZip(settings.origin_zip);
	const shop = {
		name: settings.shop_name,
		origin: place ? `${place.city}, ${place.state} ${settings.origin_zip}` : settings.origin_zip
	};

	return orderIds.map((id): SlipOrder => {
		const order = byId.get(id)!;
		const orderChecks = checks.filter((check) => check.order_id === id);
		const check =
			orderChecks.find((candidate) => candidate.id === order.ship_check_id) ?? orderChecks[0];
		const orderLines = lines
			.filter((line) => line.order_id === id)
			.map((line): SlipLine & { speciesId: number | null } => {
				const units = unitsToPack({
					quantity: line.quantity,
					restockedQuantity: line.restocked_quantity
				});
				return {
					kind: line.kind,
					description: line.description,
					commonName: line.common_name,
					scientificName: line.scientific_name,
					stage: line.stage,
					sex: line.sex,
					unitSize: line.unit_size,
					units,
					refundedUnits: line.quantity - units,
					animals: line.kind === 'animal' ? animalCount(units, line.unit_size) : null,
					clutchCode: line.clutch_code,
					isLive: line.is_live,
					speciesId: line.species_id
				};
			});
		// A care card for each species still going in the box, in the order of its lines.
		const careSheets = [
			...new Set(
				orderLines
					.filter((line) => line.isLive && line.units > 0 && line.speciesId !== null)
					.map((line) => line.speciesId as number)
			)
		]
			.map((speciesId) => sheets.get(speciesId))
			.filter((sheet): sheet is CareSheet => sheet !== undefined);
		return {
			orderId: id,
			orderNumber: order.order_number,
			state: order.state,
			shop,
			customer: { name: order.account_name?.trim() || order.ship_name, email: order.email },
			shipTo: {
				name: order.ship_name,
				line1: order.ship_line1,
				line2: order.ship_line2,
				city: order.ship_city,
				state: order.ship_state,
				zip: order.ship_zip
			},
			service: order.service,
			lines: orderLines.map(({ speciesId: _speciesId, ...line }) => line),
			hasLive: orderLines.some((line) => line.isLive && line.units > 0),
			packs: order.shipment_packs ?? check?.packs ?? [],
			shipDate: order.ship_on ?? check?.ship_date ?? null,
			expectedDelivery: order.expected_delivery_on ?? check?.delivery_date ?? null,
			facilityPickup: check?.facility_pickup ?? false,
			claimUrl: claimUrlFor(links, order.order_number),
			orderUrl: orderUrlFor(links, order.order_number),
			claimWindowHours: settings.claim_window_hours,
			careSheets
		};
	});
}
