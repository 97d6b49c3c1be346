// Stripe's events about the shop's Checkout Sessions. Each event is verified against
// the signing secret, then stored under its unique id in the same transaction as what
// it does, so a repeat (Stripe retries, or sends twice) finds the id taken and changes
// nothing. Events only move an order forward; a payment that arrives after its stock
// was sold to someone else is refunded, never oversold.
import { sql, type Transaction } from 'kysely';
import type Stripe from 'stripe';
import type { Db } from '$lib/server/db';
import type { Database } from '$lib/server/db/schema';
import { writeAudit } from '$lib/server/audit';
import { moveOrder, noteOrder } from '$lib/server/orders/transitions';
import { syncClutchSoldOut } from '$lib/server/listings/listings';
import { queueMail } from '$lib/server/mail';
import { lockStockOf } from '$lib/server/cart/cart';
import { refundTurnedBack } from './refunds';
import { isDatabaseUnavailable } from '../db/unavailable';
import { logger } from '../log';

type Trx = Transaction<Database>;

export type WebhookAnswer = {
	status: 200 | 400 | 500 | 503;
	body: { received: boolean; note?: string };
};

/** What a handled event asks for once its transaction has committed (the ship check). */
export type AfterCommit = { paidOrderId: number | null };

export interface WebhookDeps {
	db: Db;
	stripe: Stripe;
	secret: string;
	/** Runs after a payment committed: the ship check. Its failure never un-pays an order. */
	afterPaid?: (orderId: number) => Promise<void>;
	/** The shop's address, for the receipt's link back. */
	origin: string;
	log?: (line: string) => void;
}

/** Handles one delivery: `rawBody` exactly as received, `signature` the Stripe-Signature header. */
export async function handleStripeWebhook(
	deps: WebhookDeps,
	rawBody: string,
	signature: string | null
): Promise<WebhookAnswer> {
	const log = deps.log ?? ((line: string) => logger.info(line));
	let event: Stripe.Event;
	try {
		if (!signature) throw new Error('No Stripe-Signature header.');
		// Default tolerance: Stripe's 300 seconds between signing and receipt.
		event = deps.stripe.webhooks.constructEvent(rawBody, signature, deps.secret);
	} catch (failure) {
		const why = failure instanceof Error ? failure.message : String(failure);
		log(`stripe webhook refused: ${why}`);
		return { status: 400, body: { received: false, note: 'The signature does not verify.' } };
	}
	let after: AfterCommit;
	try {
		after = await deps.db.transaction().execute((trx) => applyEvent(trx, deps, event, log));
	} catch (failure) {
		// Nothing committed; Stripe delivers again later and the event is applied then.
		if (isDatabaseUnavailable(failure)) {
			log(`stripe webhook ${event.id} (${event.type}) waits: the database is unreachable`);
			return { status: 503, body: { received: false } };
		}
		const why = failure instanceof Error ? failure.message : String(failure);
		log(`stripe webhook ${event.id} (${event.type}) failed: ${why}`);
		return { status: 500, body: { received: false } };
	}
	if (after.paidOrderId !== null && deps.afterPaid) {
		try {
			await deps.afterPaid(after.paidOrderId);
		} catch (failure) {
			// The daily ship-check job picks the order up; the payment stands.
			log(`ship check after payment of order ${after.paidOrderId} failed: ${String(failure)}`);
		}
	}
	return { status: 200, body: { received: true } };
}

const nothing: AfterCommit = { paidOrderId: null };

async function applyEvent(
	trx: Trx,
	deps: WebhookDeps,
	event: Stripe.Event,
	log: (line: string) => void
): Promise<AfterCommit> {
	// A second delivery waits here on the unique key until the first commits, then finds it.
	const stored = await trx
		.insertInto('payment_event')
		.values({ stripe_event_id: event.id, type: event.type, payload: JSON.stringify(event) })
		.onConflict((oc) => oc.column('stripe_event_id').doNothing())
		.returning('id')
		.executeTakeFirst();
	if (!stored) {
		log(`stripe webhook ${event.id} already handled`);
		return nothing;
	}
	let orderId: number | null = null;
	let after = nothing;
	switch (event.type) {
		case 'checkout.session.completed':
		case 'checkout.session.async_payment_succeeded': {
			const session = event.data.object;
			const payment = await paymentOf(trx, session.id);
			if (!payment) break;
			orderId = payment.order_id;
			if (session.payment_status !== 'paid') break;
			after = await completed(trx, deps, session, payment);
			break;
		}
		case 'checkout.session.expired':
		case 'checkout.session.async_payment_failed': {
			const session = event.data.object;
			const payment = await paymentOf(trx, session.id);
			if (!payment) break;
			orderId = payment.order_id;
			await lapsed(trx, payment, event.type === 'checkout.session.expired' ? 'expired' : 'failed');
			break;
		}
		case 'refund.updated':
			// A refund the card turned back puts the money back on the order, once.
			orderId = await refundTurnedBack(trx, event.data.object, deps.origin);
			break;
		default:
			// Other refund events only confirm what the refund flow recorded; the id is kept.
			break;
	}
	if (orderId === null && event.type.startsWith('checkout.session.') && 'id' in event.data.object)
		log(`stripe webhook ${event.id}: no order for session ${String(event.data.object.id)}`);
	await trx
		.updateTable('payment_event')
		.set({ order_id: orderId, processed_at: sql`now()` })
		.where('id', '=', stored.id)
		.execute();
	return after;
}

interface PaymentRow {
	id: number;
	order_id: number;
	status: string;
	amount_cents: number;
}

async function paymentOf(trx: Trx, sessionId: string): Promise<PaymentRow | undefined> {
	return trx
		.selectFrom('payment')
		.select(['id', 'order_id', 'status', 'amount_cents'])
		.where('stripe_checkout_session_id', '=', sessionId)
		.forUpdate()
		.executeTakeFirst();
}

const intentId = (session: Stripe.Checkout.Session): string | null =>
	typeof session.payment_intent === 'string'
		? session.payment_intent
		: (session.payment_intent?.id ?? null);

async function completed(
	trx: Trx,
	deps: WebhookDeps,
	session: Stripe.Checkout.Session,
	payment: PaymentRow
): Promise<AfterCommit> {
	const paidCents = session.amount_total ?? 0;
	const order = await trx
		.selectFrom('customer_order')
		.select(['id', 'order_number', 'state', 'email', 'user_id', 'total_cents'])
		.where('id', '=', payment.order_id)
		.forUpdate()
		.executeTakeFirstOrThrow();
	if (order.state !== 'awaiting_payment' && order.state !== 'cancelled') return nothing;
	const lines = await trx
		.selectFrom('order_line')
		.innerJoin('listing', 'listing.id', 'order_line.listing_id')
		.select([
			'order_line.listing_id',
			'order_line.clutch_id',
			'order_line.quantity',
			'order_line.description',
			'order_line.line_total_cents',
			'order_line.is_live',
			'listing.kind'
		])
		.where('order_line.order_id', '=', order.id)
		.orderBy('order_line.id')
		.execute();
	const clutchIds = await lockStockOf(trx, lines);

	const intent = intentId(session);
	const sellable =
		order.state === 'awaiting_payment' && (await stockStillOurs(trx, order.id, lines));
	if (!sellable) return refundLate(trx, deps, session, payment, order, intent, paidCents);

	await trx
		.updateTable('reservation')
		.set({ state: 'converted', updated_at: sql`now()` })
		.where('order_id', '=', order.id)
		.where('state', '=', 'held')
		.execute();
	// What was bought leaves the buyer's cart; anything added since stays there.
	const carts = await trx
		.selectFrom('reservation')
		.select('cart_id')
		.distinct()
		.where('order_id', '=', order.id)
		.where('cart_id', 'is not', null)
		.execute();
	const cartIds = carts.flatMap((c) => (c.cart_id ? [c.cart_id] : []));
	if (cartIds.length)
		await trx
			.deleteFrom('cart_line')
			.where('cart_id', 'in', cartIds)
			.where(
				'listing_id',
				'in',
				lines.map((l) => l.listing_id)
			)
			.execute();
	// A supply's shelf count is what is left to sell; an animal's comes from the clutch.
	for (const line of lines.filter((l) => l.kind === 'supply'))
		await trx
			.updateTable('listing')
			.set((eb) => ({ supply_stock: eb('supply_stock', '-', line.quantity) }))
			.where('id', '=', line.listing_id)
			.execute();
	await trx
		.updateTable('payment')
		.set({ status: 'succeeded', stripe_payment_intent_id: intent, updated_at: sql`now()` })
		.where('id', '=', payment.id)
		.execute();
	await trx
		.updateTable('customer_order')
		.set({ paid_cents: paidCents })
		.where('id', '=', order.id)
		.execute();
	const moved = await moveOrder(
		trx,
		order.id,
		'paid',
		{ kind: 'webhook' },
		'Paid by card through Stripe.',
		{
			expectFrom: 'awaiting_payment',
			audit: { action: 'order.paid', detail: { sessionId: session.id, paidCents } }
		}
	);
	if (!moved.ok) throw new Error(moved.problem);
	for (const clutchId of clutchIds)
		await syncClutchSoldOut(trx, clutchId, { userId: null, ip: null });
	const buyer = order.user_id
		? await trx.selectFrom('User').select('name').where('id', '=', order.user_id).executeTakeFirst()
		: undefined;
	const totals = await trx
		.selectFrom('customer_order')
		.select(['subtotal_cents', 'shipping_cents', 'total_cents', 'service'])
		.where('id', '=', order.id)
		.executeTakeFirstOrThrow();
	await queueMail(trx, {
		kind: 'order_receipt',
		to: order.email,
		name: buyer?.name ?? null,
		orderNumber: order.order_number,
		service: totals.service,
		lines: lines.map((l) => ({
			description: l.description,
			quantity: l.quantity,
			lineTotalCents: l.line_total_cents
		})),
		subtotalCents: totals.subtotal_cents,
		shippingCents: totals.shipping_cents,
		totalCents: totals.total_cents,
		hasLive: lines.some((l) => l.is_live),
		orderUrl: `${deps.origin}/checkout/done?session_id=${encodeURIComponent(session.id)}`
	});
	return { paidOrderId: order.id };
}

/**
 * True when the order can be filled: its holds are all still good, or, if they ran out,
 * every line is still on offer in full (nobody else took the stock in the meantime).
 */
async function stockStillOurs(
	trx: Trx,
	orderId: number,
	lines: Array<{ listing_id: number; quantity: number }>
): Promise<boolean> {
	const holds = await trx
		.selectFrom('reservation')
		.select(['listing_id', 'quantity', 'state', sql<boolean>`expires_at > now()`.as('good')])
		.where('order_id', '=', orderId)
		.execute();
	const goodHold = (listingId: number, quantity: number) =>
		holds.some(
			(h) => h.listing_id === listingId && h.state === 'held' && h.good && h.quantity >= quantity
		);
	if (lines.every((line) => goodHold(line.listing_id, line.quantity))) return true;
	// Expired holds count for nothing on offer, so this is what is free for anyone now.
	for (const line of lines) {
		const row = await sql<{
			on_offer: number;
		}>`select listing_on_offer(${line.listing_id}) as on_offer`.execute(trx);
		const onOffer = Number(row.rows[0]?.on_offer ?? 0);
		if (!goodHold(line.listing_id, line.quantity) && onOffer < line.quantity) return false;
	}
	return true;
}

/**
 * A payment for stock that is no longer there (or for an order already let go): the
 * money goes back in full, the order ends cancelled holding nothing, and the admin
 * finds it in the order's history and the audit log.
 */
async function refundLate(
	trx: Trx,
	deps: WebhookDeps,
	session: Stripe.Checkout.Session,
	payment: PaymentRow,
	order: { id: number; order_number: string; state: string },
	intent: string | null,
	paidCents: number
): Promise<AfterCommit> {
	const key = `hatchlot-late-payment-${session.id}`;
	// Called inside the transaction: if it rolls back, the retry asks again with the same
	// key and Stripe answers with the same refund rather than making a second.
	const refund = await deps.stripe.refunds.create(
		{ payment_intent: intent ?? undefined, amount: paidCents, reason: 'requested_by_customer' },
		{ idempotencyKey: key }
	);
	await trx
		.updateTable('payment')
		.set({ status: 'succeeded', stripe_payment_intent_id: intent, updated_at: sql`now()` })
		.where('id', '=', payment.id)
		.execute();
	await trx
		.updateTable('customer_order')
		.set({ paid_cents: paidCents, refunded_cents: paidCents })
		.where('id', '=', order.id)
		.execute();
	await trx
		.insertInto('refund')
		.values({
			order_id: order.id,
			payment_id: payment.id,
			stripe_refund_id: refund.id,
			idempotency_key: key,
			amount_cents: paidCents,
			reason: 'Paid after the hold ran out and the stock was gone; refunded in full.',
			status: refund.status === 'succeeded' ? 'succeeded' : 'pending'
		})
		.execute();
	await trx
		.updateTable('reservation')
		.set({ state: 'released', updated_at: sql`now()` })
		.where('order_id', '=', order.id)
		.where('state', '=', 'held')
		.execute();
	const note = `Payment of ${(paidCents / 100).toFixed(2)} USD came after the hold ran out and the stock was gone: refunded in full (${refund.id}). Nothing was sold.`;
	if (order.state === 'awaiting_payment') {
		const moved = await moveOrder(trx, order.id, 'cancelled', { kind: 'webhook' }, note, {
			expectFrom: 'awaiting_payment',
			audit: { action: 'order.late_payment_refunded', detail: { refundId: refund.id } }
		});
		if (!moved.ok) throw new Error(moved.problem);
	} else {
		await noteOrder(trx, order.id, { kind: 'webhook' }, note);
	}
	// For the admin: the flag the back office's audit view shows.
	await writeAudit(trx, {
		actorUserId: null,
		actorIp: null,
		action: 'order.flag_late_payment',
		entity: 'customer_order',
		entityId: order.id,
		detail: {
			orderNumber: order.order_number,
			sessionId: session.id,
			refundId: refund.id,
			paidCents
		}
	});
	return nothing;
}

/** A session that ran out or whose delayed payment failed: its holds go back, once. */
async function lapsed(trx: Trx, payment: PaymentRow, status: 'expired' | 'failed'): Promise<void> {
	if (payment.status !== 'pending') return;
	await trx
		.updateTable('payment')
		.set({ status, updated_at: sql`now()` })
		.where('id', '=', payment.id)
		.execute();
	const order = await trx
		.selectFrom('customer_order')
		.select('state')
		.where('id', '=', payment.order_id)
		.forUpdate()
		.executeTakeFirstOrThrow();
	// Only an order still waiting lets go; a paid one is never pulled back by an event.
	if (order.state !== 'awaiting_payment') return;
	await trx
		.updateTable('reservation')
		.set({ state: 'released', updated_at: sql`now()` })
		.where('order_id', '=', payment.order_id)
		.where('state', '=', 'held')
		.execute();
	const moved = await moveOrder(
		trx,
		payment.order_id,
		'cancelled',
		{ kind: 'webhook' },
		status === 'expired'
			? 'The payment window closed without payment; the stock went back on offer.'
			: 'The delayed payment failed; the stock went back on offer.',
		{ expectFrom: 'awaiting_payment', audit: { action: `order.payment_${status}` } }
	);
	if (!moved.ok) throw new Error(moved.problem);
}
