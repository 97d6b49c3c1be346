// The one writer of customer_order.state and of order_event. Every state change goes
// through `moveOrder` inside the caller's transaction: it locks the order row, asks
// the state machine (src/lib/orders/state-machine.ts), and only then writes the new
// state, the order's history and the audit entry. A refusal writes nothing.
import type { Kysely, Transaction } from 'kysely';
import { writeAudit } from '$lib/server/audit';
import { activeRole } from '$lib/server/auth/active-role';
import type { CustomerOrderTable, Database, OrderState } from '$lib/server/db/schema';
import { moveProblem, type MoveActor } from '$lib/orders/state-machine';
import type { Updateable } from 'kysely';

type Trx = Transaction<Database>;

/** Who moves an order: a signed-in user (role read here), a job of the shop, or an event. */
export type OrderActor =
	{ kind: 'user'; userId: string; ip: string | null } | { kind: 'system' } | { kind: 'webhook' };

/** Columns that change together with a state (a ship date set, a delivery time cleared). */
export type MoveColumns = Pick<Updateable<CustomerOrderTable>, 'ship_on' | 'delivered_at'>;

export type MoveOptions = {
	/** Written in the same statement as the state. */
	set?: MoveColumns;
	/**
	 * The caller's own audit action and detail for this change, so one change makes one
	 * audit entry ('order.move' when not given). The from/to states are always added.
	 */
	audit?: { action: string; detail?: Record<string, unknown> };
	/** Refuse unless the order is still in this state (an event that expects one). */
	expectFrom?: OrderState;
};

export type MoveOutcome =
	| {
			ok: true;
			orderId: number;
			orderNumber: string;
			from: OrderState;
			to: OrderState;
			eventId: number;
	  }
	| { ok: false; orderId: number; from: OrderState | null; problem: string };

async function moverOf(trx: Trx, actor: OrderActor): Promise<MoveActor | null> {
	if (actor.kind !== 'user') return actor;
	const role = await activeRole(trx, actor.userId);
	return role ? { kind: 'user', role } : null;
}

/** Whether an order has anything live in it (only live animals are weather-gated). */
export async function hasLiveLine(db: Kysely<Database>, orderId: number): Promise<boolean> {
	const live = await db
		.selectFrom('order_line')
		.select('id')
		.where('order_id', '=', orderId)
		.where('is_live', '=', true)
		.limit(1)
		.executeTakeFirst();
	return live !== undefined;
}

function refused(orderId: number, from: OrderState | null, problem: string): MoveOutcome {
	return { ok: false, orderId, from, problem };
}

/**
 * Moves one order to `to` for `actor`, with `note` as the order history's words (a
 * reversal's or a cancel's reason). Must run in the caller's transaction, so the move
 * commits or rolls back with whatever caused it; the row lock makes two moves from the
 * same state take turns, and the second is judged from the state the first left.
 */
export async function moveOrder(
	trx: Trx,
	orderId: number,
	to: OrderState,
	actor: OrderActor,
	note: string,
	options: MoveOptions = {}
): Promise<MoveOutcome> {
	if (!trx.isTransaction) throw new Error('moveOrder must run inside the caller’s transaction');
	const order = await trx
		.selectFrom('customer_order')
		.select(['id', 'order_number', 'state', 'paid_cents', 'refunded_cents'])
		.where('id', '=', orderId)
		.forUpdate()
		.executeTakeFirst();
	if (!order) return refused(orderId, null, `There is no order #${orderId}.`);
	if (options.expectFrom && order.state !== options.expectFrom) {
		return refused(
			orderId,
			order.state,
			`${order.order_number} is no longer ${options.expectFrom.replaceAll('_', ' ')}; nothing was changed.`
		);
	}
	const mover = await moverOf(trx, actor);
	if (!mover) return refused(orderId, order.state, 'That account cannot change orders.');
	const problem = moveProblem(order.state, to, mover, {
		reason: note,
		live: await hasLiveLine(trx, orderId),
		heldCents: order.paid_cents - order.refunded_cents
	});
	if (problem) return refused(orderId, order.state, `${order.order_number}: ${problem}`);

	await trx
		.updateTable('customer_order')
		.set({ ...options.set, state: to, updated_at: new Date() })
		.where('id', '=', orderId)
		.execute();
	const actorUserId = actor.kind === 'user' ? actor.userId : null;
	const event = await trx
		.insertInto('order_event')
		.values({
			order_id: orderId,
			from_state: order.state,
			to_state: to,
			actor_kind: actor.kind,
			actor_user_id: actorUserId,
			note
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	await writeAudit(trx, {
		actorUserId,
		actorIp: actor.kind === 'user' ? actor.ip : null,
		action: options.audit?.action ?? 'order.move',
		entity: 'customer_order',
		entityId: orderId,
		detail: {
			...options.audit?.detail,
			fromState: order.state,
			toState: to,
			actorKind: actor.kind,
			orderEventId: event.id
		}
	});
	return {
		ok: true,
		orderId,
		orderNumber: order.order_number,
		from: order.state,
		to,
		eventId: event.id
	};
}

/**
 * A line in an order's history that is not a state change (a ship date moved, a
 * partial refund before delivery). Runs in the caller's transaction, which has
 * already locked the order; the caller writes its own audit entry.
 */
export async function noteOrder(
	trx: Trx,
	orderId: number,
	actor: OrderActor,
	note: string
): Promise<number> {
	if (!trx.isTransaction) throw new Error('noteOrder must run inside the caller’s transaction');
	const order = await trx
		.selectFrom('customer_order')
		.select('state')
		.where('id', '=', orderId)
		.executeTakeFirstOrThrow();
	const event = await trx
		.insertInto('order_event')
		.values({
			order_id: orderId,
			from_state: order.state,
			to_state: order.state,
			actor_kind: actor.kind,
			actor_user_id: actor.kind === 'user' ? actor.userId : null,
			note
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	return event.id;
}
