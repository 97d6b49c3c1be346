// Refunds an admin gives on a paid order: all of it or part, by amount or by lines.
// The refundable amount is checked under the order's row lock and the refund is
// written `pending` with its idempotency key before Stripe is asked, so two clicks at
// once cannot both pass the check, and a retry asks Stripe with the same key. Money
// counts as refunded only once Stripe has said yes.
import { randomUUID } from 'node:crypto';
import { sql, type Transaction } from 'kysely';
import type Stripe from 'stripe';
import type { Db } from '$lib/server/db';
import type { Database, OrderState, RefundStatus } from '$lib/server/db/schema';
import { writeAudit, type Actor } from '$lib/server/audit';
import { hasActiveRole } from '$lib/server/auth/active-role';
import { moveOrder, noteOrder, type OrderActor } from '$lib/server/orders/transitions';
import { adminAddresses, queueMail } from '$lib/server/mail';
import { stateAfterRefund } from '$lib/orders/state-machine';
import { lineRefundCents } from '$lib/orders/refund-amount';
import { formatCents } from '$lib/format/money';

type Trx = Transaction<Database>;

export const REFUND_REASON_MAX_LENGTH = 500;

export type RefundLineInput = { orderLineId: number; quantity: number; restock: boolean };

export type RefundInput = {
	orderNumber: string;
	/** Whole cents; when left out, the lines' share of their prices. */
	amountCents?: number;
	lines?: RefundLineInput[];
	reason: string;
	/** The DOA claim this refund settles, kept in the audit entry. */
	claimId?: number;
};

export type RefundOutcome =
	| { ok: true; refundId: number; amountCents: number }
	| { ok: false; field?: 'amountCents' | 'lines' | 'reason'; problem: string };

export type RefundOptions = {
	/** The Stripe client; the app's own when left out (tests pass one for their stand-in). */
	stripe?: Stripe;
};

async function defaultStripe(): Promise<Stripe> {
	// Loaded on use, so tests that pass their own client never read the app's environment.
	const { stripeClient } = await import('./stripe');
	return stripeClient();
}

const refusal = (
	problem: string,
	field?: 'amountCents' | 'lines' | 'reason'
): Extract<RefundOutcome, { ok: false }> =>
	field ? { ok: false, field, problem } : { ok: false, problem };

/** Paid less what is refunded or on its way back; never below 0. */
async function refundableIn(
	db: Db | Trx,
	order: { id: number; paid_cents: number; refunded_cents: number }
): Promise<number> {
	const pending = await db
		.selectFrom('refund')
		.select(sql<string>`coalesce(sum(amount_cents), 0)`.as('cents'))
		.where('order_id', '=', order.id)
		.where('status', '=', 'pending')
		.executeTakeFirstOrThrow();
	return Math.max(0, order.paid_cents - order.refunded_cents - Number(pending.cents));
}

/** What can still be refunded on an order, in cents (0 for an unknown or unpaid order). */
export async function refundableCents(db: Db, orderNumber: string): Promise<number> {
	const order = await db
		.selectFrom('customer_order')
		.select(['id', 'paid_cents', 'refunded_cents'])
		.where('order_number', '=', orderNumber)
		.executeTakeFirst();
	return order ? refundableIn(db, order) : 0;
}

/** Per order line: how many were refunded (or are pending) and how many went back to stock. */
export type RefundedLine = {
	orderLineId: number;
	refundedQuantity: number;
	restockedQuantity: number;
};

async function linesTaken(trx: Db | Trx, orderId: number): Promise<Map<number, RefundedLine>> {
	const rows = await trx
		.selectFrom('refund_line')
		.innerJoin('refund', 'refund.id', 'refund_line.refund_id')
		.select([
			'refund_line.order_line_id',
			sql<string>`sum(refund_line.quantity)`.as('refunded'),
			sql<string>`sum(case when refund_line.restock and refund.status = 'pending' then refund_line.quantity else 0 end)`.as(
				'restock_pending'
			)
		])
		.where('refund.order_id', '=', orderId)
		.where('refund.status', 'in', ['pending', 'succeeded'])
		.groupBy('refund_line.order_line_id')
		.execute();
	return new Map(
		rows.map((row) => [
			row.order_line_id,
			{
				orderLineId: row.order_line_id,
				refundedQuantity: Number(row.refunded),
				restockedQuantity: Number(row.restock_pending)
			}
		])
	);
}

type Prepared = {
	refundId: number;
	orderId: number;
	orderNumber: string;
	amountCents: number;
	paymentIntent: string;
	idempotencyKey: string;
};

/**
 * Refunds `input.amountCents` (or the lines' share) of a paid order through Stripe.
 * Every refusal comes before Stripe is called and writes nothing.
 */
export async function refundOrder(
	db: Db,
	actor: Actor,
	input: RefundInput,
	options: RefundOptions = {}
): Promise<RefundOutcome> {
	const reason = input.reason.trim();
	if (!reason) return refusal('Say why the money goes back: the buyer reads it.', 'reason');
	if (reason.length > REFUND_REASON_MAX_LENGTH)
		return refusal(`Keep the reason under ${REFUND_REASON_MAX_LENGTH} characters.`, 'reason');
	const lines = input.lines ?? [];
	if (input.amountCents !== undefined) {
		if (!Number.isInteger(input.amountCents))
			return refusal('A refund is a whole number of cents.', 'amountCents');
		if (input.amountCents <= 0) return refusal('A refund must be more than $0.00.', 'amountCents');
	} else if (lines.length === 0) {
		return refusal('Give an amount, or pick the lines the refund is for.', 'amountCents');
	}
	const seen = new Set<number>();
	for (const line of lines) {
		if (!Number.isInteger(line.quantity) || line.quantity <= 0)
			return refusal('Each line’s count is a whole number above 0.', 'lines');
		if (seen.has(line.orderLineId)) return refusal('A line is listed twice.', 'lines');
		seen.add(line.orderLineId);
	}
	if (!(await hasActiveRole(db, actor.userId, 'admin')))
		return refusal('Only an admin can refund an order.');

	const prepared = await db
		.transaction()
		.execute(async (trx): Promise<Prepared | RefundOutcome> => {
			const order = await trx
				.selectFrom('customer_order')
				.select(['id', 'order_number', 'state', 'paid_cents', 'refunded_cents'])
				.where('order_number', '=', input.orderNumber)
				.forUpdate()
				.executeTakeFirst();
			if (!order) return refusal(`There is no order ${input.orderNumber}.`);
			if (order.paid_cents <= 0)
				return refusal(`${order.order_number} has not been paid: there is nothing to refund.`);
			const payment = await trx
				.selectFrom('payment')
				.select(['id', 'stripe_payment_intent_id'])
				.where('order_id', '=', order.id)
				.where('status', '=', 'succeeded')
				.where('stripe_payment_intent_id', 'is not', null)
				.orderBy('id', 'desc')
				.executeTakeFirst();
			if (!payment?.stripe_payment_intent_id)
				return refusal(`${order.order_number} has no card payment to refund.`);

			const sold = await trx
				.selectFrom('order_line')
				.select(['id', 'quantity', 'line_total_cents', 'restocked_quantity'])
				.where('order_id', '=', order.id)
				.execute();
			const taken = await linesTaken(trx, order.id);
			let linesCents = 0;
			for (const line of lines) {
				const row = sold.find((s) => s.id === line.orderLineId);
				if (!row) return refusal('A line picked is not on this order.', 'lines');
				const before = taken.get(row.id);
				const left = row.quantity - (before?.refundedQuantity ?? 0);
				if (line.quantity > left)
					return refusal(
						left === 0
							? 'A line picked is already refunded in full.'
							: `Only ${left} of a line picked can still be refunded.`,
						'lines'
					);
				if (line.restock) {
					const inStock = row.restocked_quantity + (before?.restockedQuantity ?? 0);
					if (inStock + line.quantity > row.quantity)
						return refusal(
							'Those animals are already back in stock: a line is restocked only once.',
							'lines'
						);
				}
				linesCents += lineRefundCents(
					{ quantity: row.quantity, lineTotalCents: row.line_total_cents },
					line.quantity
				);
			}
			const amountCents = input.amountCents ?? linesCents;
			if (amountCents <= 0) return refusal('A refund must be more than $0.00.', 'amountCents');
			const refundable = await refundableIn(trx, order);
			if (amountCents > refundable)
				return refusal(
					refundable === 0
						? `${order.order_number} has nothing left to refund.`
						: `At most ${formatCents(refundable)} can still be refunded on ${order.order_number}.`,
					'amountCents'
				);

			const idempotencyKey = `hatchlot-refund-${order.order_number}-${randomUUID()}`;
			const refund = await trx
				.insertInto('refund')
				.values({
					order_id: order.id,
					payment_id: payment.id,
					idempotency_key: idempotencyKey,
					amount_cents: amountCents,
					reason,
					status: 'pending',
					created_by: actor.userId
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			if (lines.length)
				await trx
					.insertInto('refund_line')
					.values(
						lines.map((line) => ({
							refund_id: refund.id,
							order_line_id: line.orderLineId,
							quantity: line.quantity,
							restock: line.restock
						}))
					)
					.execute();
			await writeAudit(trx, {
				actorUserId: actor.userId,
				actorIp: actor.ip,
				action: 'refund.requested',
				entity: 'refund',
				entityId: refund.id,
				detail: {
					orderNumber: order.order_number,
					amountCents,
					reason,
					lines,
					claimId: input.claimId ?? null
				}
			});
			return {
				refundId: refund.id,
				orderId: order.id,
				orderNumber: order.order_number,
				amountCents,
				paymentIntent: payment.stripe_payment_intent_id,
				idempotencyKey
			};
		});
	if ('ok' in prepared) return prepared;

	let stripeRefund: Stripe.Refund;
	try {
		const stripe = options.stripe ?? (await defaultStripe());
		stripeRefund = await stripe.refunds.create(
			{ payment_intent: prepared.paymentIntent, amount: prepared.amountCents },
			{ idempotencyKey: prepared.idempotencyKey }
		);
	} catch (failure) {
		const why = failure instanceof Error ? failure.message : String(failure);
		await markFailed(db, actor, prepared, why);
		return refusal(`Stripe did not take the refund, so nothing was refunded: ${why}`);
	}
	if (stripeRefund.status === 'failed' || stripeRefund.status === 'canceled') {
		const why = `Stripe reports the refund ${stripeRefund.status}.`;
		await markFailed(db, actor, prepared, why, stripeRefund.id);
		return refusal(`${why} Nothing was refunded.`);
	}
	await db.transaction().execute((trx) => settle(trx, actor, prepared, stripeRefund.id, input));
	return { ok: true, refundId: prepared.refundId, amountCents: prepared.amountCents };
}

async function markFailed(
	db: Db,
	actor: Actor,
	prepared: Prepared,
	why: string,
	stripeRefundId: string | null = null
): Promise<void> {
	await db.transaction().execute(async (trx) => {
		await trx
			.updateTable('refund')
			.set({ status: 'failed', stripe_refund_id: stripeRefundId, updated_at: new Date() })
			.where('id', '=', prepared.refundId)
			.where('status', '=', 'pending')
			.execute();
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'refund.failed',
			entity: 'refund',
			entityId: prepared.refundId,
			detail: { orderNumber: prepared.orderNumber, amountCents: prepared.amountCents, error: why }
		});
	});
}

/** Stripe said yes: count the money, restock what the admin ticked, move and tell the buyer. */
async function settle(
	trx: Trx,
	actor: Actor,
	prepared: Prepared,
	stripeRefundId: string,
	input: RefundInput
): Promise<void> {
	const order = await trx
		.selectFrom('customer_order')
		.select(['id', 'order_number', 'state', 'email', 'user_id', 'paid_cents', 'refunded_cents'])
		.where('id', '=', prepared.orderId)
		.forUpdate()
		.executeTakeFirstOrThrow();
	const settled = await trx
		.updateTable('refund')
		.set({ status: 'succeeded', stripe_refund_id: stripeRefundId, updated_at: new Date() })
		.where('id', '=', prepared.refundId)
		.where('status', '=', 'pending')
		.returning('id')
		.executeTakeFirst();
	if (!settled) return;
	const refundedCents = order.refunded_cents + prepared.amountCents;
	await trx
		.updateTable('customer_order')
		.set({ refunded_cents: refundedCents, updated_at: new Date() })
		.where('id', '=', order.id)
		.execute();
	const lines = await trx
		.selectFrom('refund_line')
		.innerJoin('order_line', 'order_line.id', 'refund_line.order_line_id')
		.select([
			'refund_line.order_line_id',
			'refund_line.quantity',
			'refund_line.restock',
			'order_line.description'
		])
		.where('refund_line.refund_id', '=', prepared.refundId)
		.orderBy('order_line.id')
		.execute();
	for (const line of lines.filter((l) => l.restock)) {
		// The check under the lock made room; the guard keeps the column's own promise.
		const back = await trx
			.updateTable('order_line')
			.set((eb) => ({ restocked_quantity: eb('restocked_quantity', '+', line.quantity) }))
			.where('id', '=', line.order_line_id)
			.where(sql<boolean>`restocked_quantity + ${line.quantity} <= quantity`)
			.returning('id')
			.executeTakeFirst();
		if (!back) throw new Error(`order line ${line.order_line_id} would restock more than it sold`);
	}

	const who: OrderActor = { kind: 'user', userId: actor.userId, ip: actor.ip };
	const note = `Refunded ${formatCents(prepared.amountCents)} (${stripeRefundId}): ${input.reason.trim()}`;
	const detail = {
		refundId: prepared.refundId,
		stripeRefundId,
		amountCents: prepared.amountCents,
		refundedCents,
		restocked: lines
			.filter((l) => l.restock)
			.map((l) => ({ orderLineId: l.order_line_id, quantity: l.quantity })),
		claimId: input.claimId ?? null
	};
	const next = stateAfterRefund(order.state, refundedCents >= order.paid_cents);
	if (next && next !== order.state) {
		const moved = await moveOrder(trx, order.id, next, who, note, {
			audit: { action: 'refund.succeeded', detail }
		});
		if (!moved.ok) throw new Error(moved.problem);
	} else {
		await noteOrder(trx, order.id, who, note);
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'refund.succeeded',
			entity: 'customer_order',
			entityId: order.id,
			detail
		});
	}
	const buyer = order.user_id
		? await trx.selectFrom('User').select('name').where('id', '=', order.user_id).executeTakeFirst()
		: undefined;
	await queueMail(trx, {
		kind: 'refund_issued',
		to: order.email,
		name: buyer?.name ?? null,
		orderNumber: order.order_number,
		amountCents: prepared.amountCents,
		remainingCents: Math.max(0, order.paid_cents - refundedCents),
		reason: input.reason.trim(),
		lines: lines.map((l) => ({ description: l.description, quantity: l.quantity })),
		forClaim: input.claimId !== undefined
	});
}

/** A refund of an order, as its page lists them. */
export type RefundRecord = {
	id: number;
	amountCents: number;
	reason: string;
	status: RefundStatus;
	stripeRefundId: string | null;
	createdAt: Date;
	createdBy: string | null;
	lines: Array<{ description: string; quantity: number; restock: boolean }>;
};

/** An order's refunds, newest first. */
export async function refundsOf(db: Db, orderId: number): Promise<RefundRecord[]> {
	const rows = await db
		.selectFrom('refund')
		.leftJoin('User', 'User.id', 'refund.created_by')
		.select([
			'refund.id',
			'refund.amount_cents',
			'refund.reason',
			'refund.status',
			'refund.stripe_refund_id',
			'refund.created_at',
			'User.name as created_by_name'
		])
		.where('refund.order_id', '=', orderId)
		.orderBy('refund.id', 'desc')
		.execute();
	const lines = rows.length
		? await db
				.selectFrom('refund_line')
				.innerJoin('order_line', 'order_line.id', 'refund_line.order_line_id')
				.select([
					'refund_line.refund_id',
					'refund_line.quantity',
					'refund_line.restock',
					'order_line.description'
				])
				.where(
					'refund_line.refund_id',
					'in',
					rows.map((r) => r.id)
				)
				.orderBy('order_line.id')
				.execute()
		: [];
	return rows.map((row) => ({
		id: row.id,
		amountCents: row.amount_cents,
		reason: row.reason,
		status: row.status,
		stripeRefundId: row.stripe_refund_id,
		createdAt: new Date(row.created_at),
		createdBy: row.created_by_name,
		lines: lines
			.filter((l) => l.refund_id === row.id)
			.map((l) => ({ description: l.description, quantity: l.quantity, restock: l.restock }))
	}));
}

/** Per line of an order: how many are refunded or pending, and how many went back to stock. */
export async function refundedLinesOf(db: Db, orderId: number): Promise<Map<number, RefundedLine>> {
	const taken = await linesTaken(db, orderId);
	const restocked = await db
		.selectFrom('order_line')
		.select(['id', 'restocked_quantity'])
		.where('order_id', '=', orderId)
		.execute();
	const out = new Map<number, RefundedLine>();
	for (const row of restocked) {
		const before = taken.get(row.id);
		out.set(row.id, {
			orderLineId: row.id,
			refundedQuantity: before?.refundedQuantity ?? 0,
			restockedQuantity: row.restocked_quantity + (before?.restockedQuantity ?? 0)
		});
	}
	return out;
}

/**
 * Stripe turned a refund back (`refund.updated` to failed): the money counts as paid
 * again, the order goes back to the state it had before, animals restocked by it come
 * off the shelf again, and the shop's admins are told. Runs in the webhook's
 * transaction, which stored the event's id, so a repeat of the event does nothing;
 * a refund already failed does nothing either.
 */
export async function refundTurnedBack(
	trx: Trx,
	stripeRefund: Stripe.Refund,
	origin: string
): Promise<number | null> {
	if (stripeRefund.status !== 'failed') return null;
	const refund = await trx
		.selectFrom('refund')
		.select(['id', 'order_id', 'amount_cents', 'status'])
		.where('stripe_refund_id', '=', stripeRefund.id)
		.executeTakeFirst();
	if (!refund) return null;
	const order = await trx
		.selectFrom('customer_order')
		.select(['id', 'order_number', 'state', 'refunded_cents'])
		.where('id', '=', refund.order_id)
		.forUpdate()
		.executeTakeFirstOrThrow();
	const turned = await trx
		.updateTable('refund')
		.set({ status: 'failed', updated_at: new Date() })
		.where('id', '=', refund.id)
		.where('status', '=', 'succeeded')
		.returning('id')
		.executeTakeFirst();
	if (!turned) return order.id;
	await trx
		.updateTable('customer_order')
		.set({
			refunded_cents: Math.max(0, order.refunded_cents - refund.amount_cents),
			updated_at: new Date()
		})
		.where('id', '=', order.id)
		.execute();
	const restocked = await trx
		.selectFrom('refund_line')
		.select(['order_line_id', 'quantity'])
		.where('refund_id', '=', refund.id)
		.where('restock', '=', true)
		.execute();
	for (const line of restocked)
		await trx
			.updateTable('order_line')
			.set((eb) => ({
				restocked_quantity: sql<number>`greatest(0, ${eb.ref('restocked_quantity')} - ${line.quantity})`
			}))
			.where('id', '=', line.order_line_id)
			.execute();

	const note = `Refund ${stripeRefund.id} of ${formatCents(refund.amount_cents)} failed at the card: the amount counts as paid again.`;
	// The move this refund made, if any: the latest history row it wrote names its Stripe id.
	const moved = await trx
		.selectFrom('order_event')
		.select(['from_state', 'to_state'])
		.where('order_id', '=', order.id)
		.where('note', 'like', `Refunded %(${stripeRefund.id})%`)
		.orderBy('id', 'desc')
		.executeTakeFirst();
	let restoredTo: OrderState | null = null;
	if (
		moved &&
		moved.from_state &&
		moved.from_state !== moved.to_state &&
		order.state === moved.to_state
	) {
		// The refund never happened, so the order never truly left its state; this is the one
		// write of a state outside moveOrder, as `refunded` is otherwise final.
		restoredTo = moved.from_state;
		await trx
			.updateTable('customer_order')
			.set({ state: restoredTo, updated_at: new Date() })
			.where('id', '=', order.id)
			.execute();
		await trx
			.insertInto('order_event')
			.values({
				order_id: order.id,
				from_state: order.state,
				to_state: restoredTo,
				actor_kind: 'webhook',
				actor_user_id: null,
				note
			})
			.execute();
	} else {
		await noteOrder(trx, order.id, { kind: 'webhook' }, note);
	}
	await writeAudit(trx, {
		actorUserId: null,
		actorIp: null,
		action: 'refund.turned_back',
		entity: 'refund',
		entityId: refund.id,
		detail: {
			orderNumber: order.order_number,
			stripeRefundId: stripeRefund.id,
			amountCents: refund.amount_cents,
			failureReason: stripeRefund.failure_reason ?? null,
			fromState: order.state,
			restoredTo
		}
	});
	for (const admin of await adminAddresses(trx))
		await queueMail(trx, {
			kind: 'refund_failed',
			to: admin,
			orderNumber: order.order_number,
			amountCents: refund.amount_cents,
			stripeRefundId: stripeRefund.id,
			orderUrl: `${origin}/manage/orders/${encodeURIComponent(order.order_number)}`
		});
	return order.id;
}
