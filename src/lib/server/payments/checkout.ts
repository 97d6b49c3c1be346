// Checkout: from a cart to an order awaiting payment and one Stripe Checkout Session.
// The cart row's lock serialises a buyer's clicks and tabs: the second finds the open
// order the first made and gets the same session back (Stripe replays a request made
// with the same idempotency key), so one cart never pays twice.
import { sql, type Transaction } from 'kysely';
import type Stripe from 'stripe';
import type { Db } from '$lib/server/db';
import type { Database, Service } from '$lib/server/db/schema';
import { writeAudit } from '$lib/server/audit';
import {
	cartSettings,
	findCartId,
	holdCartIn,
	HoldRefused,
	readCart,
	type CartOwner
} from '$lib/server/cart/cart';
import { moveOrder } from '$lib/server/orders/transitions';
import { zipProblem } from '$lib/server/accounts/zip';
import { shippingAreaProblem } from '$lib/shipping/area';
import type { CheckoutForm } from '$lib/checkout/schema';
import { logger } from '../log';
import { isDatabaseUnavailable } from '$lib/server/db/unavailable';

type Trx = Transaction<Database>;

export type CheckoutField = keyof CheckoutForm;

export type CheckoutOutcome =
	| {
			ok: true;
			orderId: number;
			orderNumber: string;
			sessionId: string;
			url: string;
			reused: boolean;
	  }
	| {
			ok: false;
			/** The field the refusal belongs beside; null for the cart as a whole. */
			field: CheckoutField | null;
			problem: string;
			/** Per listing, when stock moved under the cart. */
			lines: Array<{ listingId: number; problem: string; available: number }>;
	  };

/** Stripe's lower bound on a session's `expires_at`: 30 minutes after it is made. */
const SESSION_MIN_MINUTES = 30;

/** Why this address cannot take a box, with the field it belongs beside, or null. */
export function addressProblem(
	zip: string,
	state: string
): { field: CheckoutField; problem: string } | null {
	const zipped = zipProblem(zip, state);
	if (zipped) return { field: 'ship_zip', problem: zipped };
	const area = shippingAreaProblem(zip, state);
	if (area) return { field: 'ship_state', problem: area };
	return null;
}

/** The idempotency key of an order's one Checkout Session. */
export function sessionKey(orderId: number): string {
	return `hatchlot-checkout-order-${orderId}`;
}

interface OpenOrder {
	id: number;
	order_number: string;
	service: Service;
	email: string;
	ship_zip: string;
	ship_line1: string;
	ship_line2: string;
	ship_city: string;
	ship_state: string;
	ship_name: string;
}

/**
 * The order this cart last started that still waits for payment, if any, whether or not
 * its holds have run out: an old one is cancelled before a new one starts, so a buyer
 * never has two payable sessions for one cart.
 */
async function openOrderOf(trx: Trx, cartId: string): Promise<OpenOrder | undefined> {
	return trx
		.selectFrom('customer_order')
		.select([
			'id',
			'order_number',
			'service',
			'email',
			'ship_zip',
			'ship_line1',
			'ship_line2',
			'ship_city',
			'ship_state',
			'ship_name'
		])
		.where('state', '=', 'awaiting_payment')
		.where((eb) =>
			eb.exists(
				eb
					.selectFrom('reservation')
					.select('reservation.id')
					.whereRef('reservation.order_id', '=', 'customer_order.id')
					.where('reservation.cart_id', '=', cartId)
			)
		)
		.orderBy('id', 'desc')
		.executeTakeFirst();
}

/** True when the open order still asks for exactly what the cart and the form ask for. */
async function stillMatches(
	trx: Trx,
	order: OpenOrder,
	cartId: string,
	input: CheckoutForm
): Promise<boolean> {
	const same =
		order.service === input.service &&
		order.email === input.email &&
		order.ship_zip === input.ship_zip &&
		order.ship_state === input.ship_state &&
		order.ship_city === input.ship_city &&
		order.ship_line1 === input.ship_line1 &&
		order.ship_line2 === input.ship_line2 &&
		order.ship_name === input.ship_name;
	if (!same) return false;
	const cart = await trx
		.selectFrom('cart_line')
		.select(['listing_id', 'quantity'])
		.where('cart_id', '=', cartId)
		.orderBy('listing_id')
		.execute();
	const held = await trx
		.selectFrom('reservation')
		.select(['listing_id', 'quantity', 'expires_at'])
		.where('order_id', '=', order.id)
		.where('state', '=', 'held')
		.orderBy('listing_id')
		.execute();
	const now = Date.now();
	if (held.some((h) => new Date(h.expires_at).getTime() <= now)) return false;
	return (
		cart.length === held.length &&
		cart.every((c, i) => c.listing_id === held[i]!.listing_id && c.quantity === held[i]!.quantity)
	);
}

/** Lets an open order go: its holds back on offer, the order cancelled (it holds no money). */
async function dropOpenOrder(trx: Trx, orderId: number, why: string): Promise<void> {
	await trx
		.updateTable('reservation')
		.set({ state: 'released', updated_at: sql`now()` })
		.where('order_id', '=', orderId)
		.where('state', '=', 'held')
		.execute();
	await moveOrder(trx, orderId, 'cancelled', { kind: 'system' }, why, {
		expectFrom: 'awaiting_payment',
		audit: { action: 'order.checkout_replaced' }
	});
}

/** The next order number: HL- and at least five digits, one higher than any so far. */
async function nextOrderNumber(trx: Trx): Promise<string> {
	// Two checkouts at once take turns here, so no two orders draw the same number.
	await sql`select pg_advisory_xact_lock(hashtext('customer_order.order_number'))`.execute(trx);
	const row = await trx
		.selectFrom('customer_order')
		.select(
			sql<string>`coalesce(max(substring(order_number from 4)::bigint), 10000)::text`.as('top')
		)
		.executeTakeFirstOrThrow();
	return `HL-${BigInt(row.top) + 1n}`;
}

type Prepared =
	| { kind: 'refused'; field: CheckoutField | null; problem: string; lines: CheckoutLines }
	| { kind: 'order'; orderId: number; orderNumber: string; reused: boolean; dropped: string[] };
type CheckoutLines = Array<{ listingId: number; problem: string; available: number }>;

/**
 * Starts (or resumes) checkout for the cart of `owner`: re-prices the cart on the
 * server, holds its stock, makes the order awaiting payment and its one Checkout
 * Session. `origin` is the shop's own address, for Stripe's return links.
 */
export async function startCheckout(
	db: Db,
	stripe: Stripe,
	owner: CartOwner,
	input: CheckoutForm,
	options: { origin: string; clientIp: string | null }
): Promise<CheckoutOutcome> {
	const address = addressProblem(input.ship_zip, input.ship_state);
	if (address) return { ok: false, ...address, lines: [] };
	const cartId = await findCartId(db, owner);
	if (!cartId) return { ok: false, field: null, problem: 'Your cart is empty.', lines: [] };
	const { holdMinutes } = await cartSettings(db);

	const prepared: Prepared = await db
		.transaction()
		.execute(async (trx): Promise<Prepared> => {
			await trx.selectFrom('cart').select('id').where('id', '=', cartId).forUpdate().execute();
			const dropped: string[] = [];
			const open = await openOrderOf(trx, cartId);
			if (open) {
				if (await stillMatches(trx, open, cartId, input))
					return {
						kind: 'order',
						orderId: open.id,
						orderNumber: open.order_number,
						reused: true,
						dropped
					};
				await dropOpenOrder(
					trx,
					open.id,
					'The buyer changed the cart or the address and started checkout again.'
				);
				dropped.push(open.order_number);
			}
			const held = await holdCartIn(trx, cartId, owner, options.clientIp, holdMinutes);
			if (!held.ok) return { kind: 'refused', field: null, problem: held.problem, lines: [] };
			// Priced now, on the server, inside the lock: the browser's figures count for nothing.
			const cart = await readCart(trx, cartId, input.service);
			const buying = cart.lines.filter((line) => line.quantityToBuy > 0);
			if (buying.length === 0 || buying.some((line) => line.quantityToBuy !== line.quantity))
				throw new HoldRefused(
					cart.lines
						.filter((line) => line.quantityToBuy !== line.quantity)
						.map((line) => ({
							listingId: line.listingId,
							problem: line.problem?.text ?? 'This line cannot be bought as it stands.',
							available: line.available
						}))
				);
			const details = await trx
				.selectFrom('listing')
				.select(['id', 'clutch_id', 'species_id'])
				.where(
					'id',
					'in',
					buying.map((line) => line.listingId)
				)
				.execute();
			const byId = new Map(details.map((d) => [d.id, d]));
			const orderNumber = await nextOrderNumber(trx);
			const order = await trx
				.insertInto('customer_order')
				.values({
					order_number: orderNumber,
					user_id: owner.userId,
					email: input.email,
					ship_name: input.ship_name,
					ship_line1: input.ship_line1,
					ship_line2: input.ship_line2,
					ship_city: input.ship_city,
					ship_state: input.ship_state,
					ship_zip: input.ship_zip,
					service: input.service,
					subtotal_cents: cart.subtotalCents,
					shipping_cents: cart.shippingCents,
					total_cents: cart.totalCents,
					terms_accepted_at: new Date()
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			await trx
				.insertInto('order_line')
				.values(
					buying.map((line) => ({
						order_id: order.id,
						listing_id: line.listingId,
						clutch_id: byId.get(line.listingId)?.clutch_id ?? null,
						species_id: byId.get(line.listingId)?.species_id ?? null,
						description: line.title,
						stage: line.stage,
						sex: line.sex,
						unit_size: line.unitSize,
						quantity: line.quantityToBuy,
						line_total_cents: line.lineTotalCents,
						is_live: line.isLive
					}))
				)
				.execute();
			await trx
				.updateTable('reservation')
				.set({ order_id: order.id, updated_at: sql`now()` })
				.where('cart_id', '=', cartId)
				.where('state', '=', 'held')
				.where('order_id', 'is', null)
				.execute();
			await writeAudit(trx, {
				actorUserId: owner.userId,
				actorIp: options.clientIp,
				action: 'order.checkout',
				entity: 'customer_order',
				entityId: order.id,
				detail: { orderNumber, totalCents: cart.totalCents, cartId, replaced: dropped }
			});
			return { kind: 'order', orderId: order.id, orderNumber, reused: false, dropped };
		})
		.catch((failure: unknown): Prepared => {
			if (failure instanceof HoldRefused)
				return { kind: 'refused', field: null, problem: failure.message, lines: failure.lines };
			throw failure;
		});
	if (prepared.kind === 'refused')
		return { ok: false, field: prepared.field, problem: prepared.problem, lines: prepared.lines };

	for (const number of prepared.dropped) await expireSessionsOf(db, stripe, number);
	try {
		const session = await createSession(db, stripe, prepared.orderId, options.origin, holdMinutes);
		return {
			ok: true,
			orderId: prepared.orderId,
			orderNumber: prepared.orderNumber,
			sessionId: session.id,
			url: session.url,
			reused: prepared.reused
		};
	} catch (failure) {
		// The database went away, perhaps after Stripe made the session: keep the order, so
		// the buyer's next try reuses it and gets that same session (same idempotency key).
		if (isDatabaseUnavailable(failure)) throw failure;
		// No session, so nobody can pay this order: let its stock go rather than sit held.
		await db.transaction().execute(async (trx) => {
			await dropOpenOrder(trx, prepared.orderId, 'The payment service could not be reached.');
		});
		const message = failure instanceof Error ? failure.message : String(failure);
		logger.error(`checkout: no Checkout Session for ${prepared.orderNumber}: ${message}`);
		return {
			ok: false,
			field: null,
			problem:
				'The card payment service did not answer, so nothing was charged and your cart is as it was. Please try again in a minute.',
			lines: []
		};
	}
}

/**
 * The order's one Checkout Session: every parameter comes from the stored order, so a
 * repeat with the same idempotency key is the same request and Stripe returns the same
 * session. Amounts are integer cents (USD has two minor units, ISO 4217).
 */
async function createSession(
	db: Db,
	stripe: Stripe,
	orderId: number,
	origin: string,
	holdMinutes: number
): Promise<{ id: string; url: string }> {
	const order = await db
		.selectFrom('customer_order')
		.select([
			'id',
			'order_number',
			'email',
			'shipping_cents',
			'total_cents',
			'service',
			'created_at'
		])
		.where('id', '=', orderId)
		.executeTakeFirstOrThrow();
	const lines = await db
		.selectFrom('order_line')
		.select(['description', 'quantity', 'line_total_cents'])
		.where('order_id', '=', orderId)
		.orderBy('id')
		.execute();
	const createdSeconds = Math.floor(new Date(order.created_at).getTime() / 1000);
	const session = await stripe.checkout.sessions.create(
		{
			mode: 'payment',
			customer_email: order.email,
			client_reference_id: order.order_number,
			metadata: { order_id: String(order.id), order_number: order.order_number },
			// A tier price need not divide evenly by the count: such a line is one item at its total.
			line_items: [
				...lines.map((line) =>
					line.line_total_cents % line.quantity === 0
						? {
								quantity: line.quantity,
								price_data: {
									currency: 'usd',
									unit_amount: line.line_total_cents / line.quantity,
									product_data: { name: line.description }
								}
							}
						: {
								quantity: 1,
								price_data: {
									currency: 'usd',
									unit_amount: line.line_total_cents,
									product_data: { name: `${line.quantity} × ${line.description}` }
								}
							}
				),
				{
					quantity: 1,
					price_data: {
						currency: 'usd',
						unit_amount: order.shipping_cents,
						product_data: {
							name: order.service === 'overnight' ? 'Overnight shipping' : 'Two-day shipping'
						}
					}
				}
			],
			// Pay within the hold where Stripe allows it; a later payment is checked by the webhook.
			expires_at: createdSeconds + 60 * Math.max(SESSION_MIN_MINUTES + 1, holdMinutes),
			success_url: `${origin}/checkout/done?session_id={CHECKOUT_SESSION_ID}`,
			cancel_url: `${origin}/cart`
		},
		{ idempotencyKey: sessionKey(order.id) }
	);
	if (!session.url) throw new Error(`Checkout Session ${session.id} has no pay page address`);
	if (session.amount_total !== order.total_cents)
		throw new Error(
			`Checkout Session ${session.id} totals ${session.amount_total}, the order ${order.total_cents}`
		);
	await db
		.insertInto('payment')
		.values({
			order_id: order.id,
			stripe_checkout_session_id: session.id,
			amount_cents: order.total_cents,
			currency: 'usd'
		})
		.onConflict((oc) => oc.column('stripe_checkout_session_id').doNothing())
		.execute();
	return { id: session.id, url: session.url };
}

/** A replaced order's open session is closed at Stripe, so it cannot be paid any more. */
async function expireSessionsOf(db: Db, stripe: Stripe, orderNumber: string): Promise<void> {
	const rows = await db
		.selectFrom('payment')
		.innerJoin('customer_order', 'customer_order.id', 'payment.order_id')
		.select('payment.stripe_checkout_session_id')
		.where('customer_order.order_number', '=', orderNumber)
		.where('payment.status', '=', 'pending')
		.execute();
	for (const row of rows) {
		try {
			await stripe.checkout.sessions.expire(row.stripe_checkout_session_id);
		} catch (failure) {
			// Already paid or expired: the webhook settles it (a late payment is refunded).
			logger.warn({ err: failure }, `checkout: could not expire ${row.stripe_checkout_session_id}`);
		}
	}
}
