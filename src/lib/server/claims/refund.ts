// Settling a dead-on-arrival claim with money: kept apart from claims.ts because it
// leans on the refund module (Stripe) and the shared refund arithmetic.
import { suggestedRefundCents } from '$lib/orders/refund-amount';
import type { Kysely } from 'kysely';
import { writeAudit, type Actor } from '../audit';
import type { Db } from '../db/connect';
import type { Database } from '../db/schema';
import { refundOrder, type RefundOptions } from '../payments/refunds';
import { claimDeadLines, type ClaimRefusal } from './claims';

/** The refund a claim suggests: the dead animals' share of their lines' prices, no shipping. */
export async function suggestedClaimRefundCents(
	db: Kysely<Database>,
	claimId: number
): Promise<number> {
	const dead = await claimDeadLines(db, claimId);
	// Dead counts are animals; a line's price is spread over every animal it sent.
	return suggestedRefundCents(
		dead.map((l) => ({
			line: { quantity: l.quantity * l.unit_size, lineTotalCents: l.line_total_cents },
			quantity: l.dead_count
		}))
	);
}

/**
 * Settles an open claim with a refund for the dead animals (never restocked: they died),
 * by the amount given or the dead animals' share of their lines' prices. The refund module talks to
 * Stripe; the claim is marked refunded with the refund's id once it is recorded.
 */
export async function refundClaim(
	db: Db,
	actor: Actor,
	input: { claimId: number; amountCents?: number; note: string },
	options: RefundOptions & { now?: Date } = {}
): Promise<{ ok: true; refundId: number; amountCents: number } | ClaimRefusal> {
	const claim = await db
		.selectFrom('claim')
		.innerJoin('customer_order as o', 'o.id', 'claim.order_id')
		.select(['claim.state', 'o.order_number'])
		.where('claim.id', '=', input.claimId)
		.executeTakeFirst();
	if (!claim) return { ok: false, status: 404, problem: 'Claim not found.' };
	if (claim.state !== 'open')
		return { ok: false, status: 409, problem: 'This claim is not open any more.' };
	// By amount, not by refund lines: refund lines count units (a group of 10 is one) and
	// the claim counts animals; the claim keeps which lines it was for.
	const refunded = await refundOrder(
		db,
		actor,
		{
			orderNumber: claim.order_number,
			amountCents: input.amountCents ?? (await suggestedClaimRefundCents(db, input.claimId)),
			reason: input.note.trim() || 'Refund for animals that arrived dead.',
			claimId: input.claimId
		},
		{ stripe: options.stripe }
	);
	if (!refunded.ok)
		return {
			ok: false,
			status: 400,
			field:
				refunded.field === 'reason'
					? 'reason'
					: refunded.field === 'amountCents'
						? 'amount'
						: undefined,
			problem: refunded.problem
		};
	const settled = await db.transaction().execute(async (trx) => {
		const row = await trx
			.updateTable('claim')
			.set({
				state: 'refunded',
				decided_at: options.now ?? new Date(),
				decided_by: actor.userId,
				decision_note: input.note.trim(),
				refund_id: refunded.refundId
			})
			.where('id', '=', input.claimId)
			.where('state', '=', 'open')
			.returning('id')
			.executeTakeFirst();
		if (!row) return false;
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'claim.refund',
			entity: 'claim',
			entityId: input.claimId,
			detail: { refundId: refunded.refundId, amountCents: refunded.amountCents }
		});
		return true;
	});
	if (!settled)
		return {
			ok: false,
			status: 409,
			problem: 'This claim was decided while the refund went through.'
		};
	return refunded;
}
