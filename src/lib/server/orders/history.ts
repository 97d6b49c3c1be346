// An order's history and its latest ship check, read the same way for the customer's
// order page and the keeper's: every order_event in the order it happened, and the
// newest ship_check row (the one the order's ship date came from).
import type { Db } from '$lib/server/db';
import type { ActorKind, OrderState, Pack } from '$lib/server/db/schema';
import type { IsoDate } from '$lib/format/dates';
import type { Reason } from '$lib/shipping/ship-check';
import { latestShipCheck as latestStoredCheck } from '$lib/server/shipping/order-checks';

export interface TimelineEvent {
	id: number;
	fromState: OrderState | null;
	toState: OrderState;
	actorKind: ActorKind;
	actorUserId: string | null;
	actorName: string | null;
	actorEmail: string | null;
	note: string;
	at: Date;
}

export interface OrderShipCheck {
	decision: 'ship' | 'hold';
	shipDate: IsoDate | null;
	deliveryDate: IsoDate | null;
	recheckDate: IsoDate | null;
	packs: Pack[];
	facilityPickup: boolean;
	reasons: Reason[];
	overrideReason: string | null;
	checkedAt: Date;
}

/** Every state change and note of one order, oldest first (id breaks a same-instant tie). */
export async function orderTimeline(db: Db, orderId: number): Promise<TimelineEvent[]> {
	const rows = await db
		.selectFrom('order_event as e')
		.leftJoin('User as u', 'u.id', 'e.actor_user_id')
		.select([
			'e.id',
			'e.from_state',
			'e.to_state',
			'e.actor_kind',
			'e.actor_user_id',
			'u.name',
			'u.email',
			'e.note',
			'e.created_at'
		])
		.where('e.order_id', '=', orderId)
		.orderBy('e.created_at')
		.orderBy('e.id')
		.execute();
	return rows.map((row) => ({
		id: row.id,
		fromState: row.from_state,
		toState: row.to_state,
		actorKind: row.actor_kind,
		actorUserId: row.actor_user_id,
		actorName: row.name,
		actorEmail: row.email,
		note: row.note,
		at: row.created_at
	}));
}

/**
 * The newest ship check of the order as the order pages show it, or null when none has
 * run yet: the stored check the ship-check module reads, without its inputs snapshot.
 */
export async function latestShipCheck(db: Db, orderId: number): Promise<OrderShipCheck | null> {
	const check = await latestStoredCheck(db, orderId);
	if (!check) return null;
	return {
		decision: check.decision,
		shipDate: check.shipDate,
		deliveryDate: check.deliveryDate,
		recheckDate: check.recheckDate,
		packs: check.packs,
		facilityPickup: check.facilityPickup,
		reasons: check.reasons,
		overrideReason: check.overrideReason,
		checkedAt: check.checkedAt
	};
}

/** The guarantee window customers are held to (shop_setting), 2 hours when unset (PRODUCT.md). */
export async function claimWindowHours(db: Db): Promise<number> {
	const row = await db
		.selectFrom('shop_setting')
		.select('claim_window_hours')
		.where('id', '=', true)
		.executeTakeFirst();
	return row?.claim_window_hours ?? 2;
}
