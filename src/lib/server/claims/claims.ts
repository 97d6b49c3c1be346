// Dead-on-arrival claims: the one module that writes claim and claim_line rows.
// A customer files against their own delivered order, within the shop's window
// after delivery, with the dead counts per line and photos of the animals as they
// arrived; the shop then decides. Photos go through the upload module, which
// strips their metadata.
import { DECLINE_REASON_MIN } from '$lib/claims/decision-form';
import { CLAIMABLE_STATES, claimWindowProblem } from '$lib/claims/window';
import type { IsoDate } from '$lib/format/dates';
import { sql, type Kysely } from 'kysely';
import { writeAudit, type Actor } from '../audit';
import type { Db } from '../db/connect';
import type { ClaimState, Database } from '../db/schema';
import { adminAddresses, queueMail } from '../mail';
import { moveOrder } from '../orders/transitions';
import { checkOrder, type OrderCheckOutcome } from '../shipping/order-checks';
import type { ClientPhoto } from '$lib/photos/urls';
import { listPhotos, savePhotos, type UploadedPhotoFile } from '../uploads/photos';
import type { ForecastSource } from '../weather/source';

export type ClaimRefusal = {
	ok: false;
	status: 400 | 404 | 409;
	/** The form field the problem belongs beside, when it is one field's. */
	field?: 'lines' | 'photos' | 'note' | 'reason' | 'amount';
	problem: string;
};

export interface FileClaimInput {
	orderNumber: string;
	lines: { orderLineId: number; deadCount: number }[];
	note: string;
	photos: readonly UploadedPhotoFile[];
}

export { claimWindowProblem };

export const MIN_DECLINE_REASON = DECLINE_REASON_MIN;

/** Where the links in claim mail point: the shop's public origin, e.g. https://shop.example.com. */
export type ClaimLinks = { origin: string };

// Routes pass the app's origin; this fallback serves scripts and tests outside SvelteKit.
const defaultLinks = (): ClaimLinks => ({
	origin: (process.env.ORIGIN ?? 'http://127.0.0.1:3000').replace(/\/$/, '')
});

const customerOrderUrl = (links: ClaimLinks, orderNumber: string) =>
	`${links.origin}/account/orders/${encodeURIComponent(orderNumber)}`;
const notFound: ClaimRefusal = { ok: false, status: 404, problem: 'Order not found.' };

/**
 * Files a claim for the actor's own delivered order. Nothing is written when any
 * check fails; a refused photo leaves no claim behind.
 */
export async function fileClaim(
	db: Kysely<Database>,
	actor: Actor,
	input: FileClaimInput,
	now: Date = new Date(),
	links: ClaimLinks = defaultLinks()
): Promise<{ ok: true; claimId: number } | ClaimRefusal> {
	const lines = input.lines.filter((l) => l.deadCount > 0);
	if (lines.length === 0)
		return {
			ok: false,
			status: 400,
			field: 'lines',
			problem: 'Say how many arrived dead on at least one line.'
		};
	if (input.photos.length === 0)
		return {
			ok: false,
			status: 400,
			field: 'photos',
			problem: 'Add at least one photo of the animals as they arrived.'
		};

	const created = await db
		.transaction()
		.execute(async (trx): Promise<{ ok: true; claimId: number } | ClaimRefusal> => {
			// The order row's lock makes "one open claim per order" hold under double submits.
			const order = await trx
				.selectFrom('customer_order')
				.select(['id', 'state', 'delivered_at', 'user_id'])
				.where('order_number', '=', input.orderNumber)
				.where('user_id', '=', actor.userId)
				.forUpdate()
				.executeTakeFirst();
			if (!order) return notFound;
			if (!CLAIMABLE_STATES.includes(order.state) || !order.delivered_at)
				return {
					ok: false,
					status: 409,
					problem: 'Claims can be filed once the order is delivered.'
				};
			const setting = await trx
				.selectFrom('shop_setting')
				.select(['claim_window_hours', 'time_zone'])
				.executeTakeFirstOrThrow();
			const late = claimWindowProblem(
				new Date(order.delivered_at),
				now,
				setting.claim_window_hours,
				setting.time_zone
			);
			if (late) return { ok: false, status: 409, problem: late };
			const open = await trx
				.selectFrom('claim')
				.select('id')
				.where('order_id', '=', order.id)
				.where('state', '=', 'open')
				.executeTakeFirst();
			if (open)
				return {
					ok: false,
					status: 409,
					problem: 'This order already has a claim waiting for the shop.'
				};

			const orderLines = await trx
				.selectFrom('order_line')
				.select(['id', 'quantity', 'unit_size', 'is_live', 'description'])
				.where('order_id', '=', order.id)
				.execute();
			const byId = new Map(orderLines.map((l) => [l.id, l]));
			for (const line of lines) {
				const known = byId.get(line.orderLineId);
				if (!known || !known.is_live)
					return {
						ok: false,
						status: 400,
						field: 'lines',
						problem: 'That line is not one of this order’s animals.'
					};
				// Counted in animals: a line of 3 groups of 10 sent 30.
				const sent = known.quantity * known.unit_size;
				if (!Number.isInteger(line.deadCount) || line.deadCount > sent)
					return {
						ok: false,
						status: 400,
						field: 'lines',
						problem: `${known.description}: ${sent === 1 ? '1 animal was' : `${sent} animals were`} sent, so at most ${sent} can be claimed.`
					};
			}

			const claim = await trx
				.insertInto('claim')
				.values({
					order_id: order.id,
					user_id: actor.userId,
					note: input.note.trim(),
					filed_at: now
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			await trx
				.insertInto('claim_line')
				.values(
					lines.map((l) => ({
						claim_id: claim.id,
						order_line_id: l.orderLineId,
						dead_count: l.deadCount
					}))
				)
				.execute();
			await writeAudit(trx, {
				actorUserId: actor.userId,
				actorIp: actor.ip,
				action: 'claim.file',
				entity: 'claim',
				entityId: claim.id,
				detail: { orderNumber: input.orderNumber, lines }
			});
			return { ok: true, claimId: claim.id };
		});
	if (!created.ok) return created;

	// The upload module runs its own transaction; a refused photo takes the claim back out.
	const saved = await savePhotos(db, actor, { kind: 'claim', id: created.claimId }, input.photos, {
		altText: 'Animals as they arrived'
	});
	if (!saved.ok) {
		await db.transaction().execute(async (trx) => {
			await trx.deleteFrom('claim_line').where('claim_id', '=', created.claimId).execute();
			await trx.deleteFrom('claim').where('id', '=', created.claimId).execute();
			await writeAudit(trx, {
				actorUserId: actor.userId,
				actorIp: actor.ip,
				action: 'claim.withdrawn_photo_refused',
				entity: 'claim',
				entityId: created.claimId
			});
		});
		const reasons = saved.refusals.map((r) => (r.file ? `${r.file}: ${r.reason}` : r.reason));
		return { ok: false, status: 400, field: 'photos', problem: reasons.join(' ') };
	}
	await db.transaction().execute(async (trx) => {
		const buyer = await trx
			.selectFrom('customer_order as o')
			.leftJoin('User as u', 'u.id', 'o.user_id')
			.select(['o.email', 'u.name'])
			.where('o.order_number', '=', input.orderNumber)
			.executeTakeFirstOrThrow();
		const dead = await claimDeadLines(trx, created.claimId);
		await queueMail(trx, {
			kind: 'claim_received',
			to: buyer.email,
			name: buyer.name,
			orderNumber: input.orderNumber,
			lines: dead.map((l) => ({ description: l.description, deadCount: l.dead_count })),
			photoCount: input.photos.length,
			orderUrl: customerOrderUrl(links, input.orderNumber)
		});
		for (const admin of await adminAddresses(trx))
			await queueMail(trx, {
				kind: 'claim_filed',
				to: admin,
				orderNumber: input.orderNumber,
				customer: buyer.name ? `${buyer.name}, ${buyer.email}` : buyer.email,
				deadCount: dead.reduce((sum, l) => sum + l.dead_count, 0),
				claimUrl: `${links.origin}/admin/claims/${created.claimId}`
			});
	});
	return created;
}

/** The buyer of a claim's order, for the decision mail. */
async function claimBuyer(trx: Kysely<Database>, claimId: number) {
	return trx
		.selectFrom('claim')
		.innerJoin('customer_order as o', 'o.id', 'claim.order_id')
		.leftJoin('User as u', 'u.id', 'o.user_id')
		.select(['o.email', 'o.order_number', 'u.name'])
		.where('claim.id', '=', claimId)
		.executeTakeFirstOrThrow();
}

/** Declines an open claim with the reason the customer will read. */
export async function declineClaim(
	db: Kysely<Database>,
	actor: Actor,
	input: { claimId: number; reason: string },
	now: Date = new Date(),
	links: ClaimLinks = defaultLinks()
): Promise<{ ok: true } | ClaimRefusal> {
	const reason = input.reason.trim();
	if (reason.length < MIN_DECLINE_REASON)
		return {
			ok: false,
			status: 400,
			field: 'reason',
			problem: `Give the customer a reason of at least ${MIN_DECLINE_REASON} characters.`
		};
	return db.transaction().execute(async (trx): Promise<{ ok: true } | ClaimRefusal> => {
		const decided = await trx
			.updateTable('claim')
			.set({ state: 'declined', decided_at: now, decided_by: actor.userId, decision_note: reason })
			.where('id', '=', input.claimId)
			.where('state', '=', 'open')
			.returning('id')
			.executeTakeFirst();
		if (!decided) return { ok: false, status: 409, problem: 'This claim is not open any more.' };
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'claim.decline',
			entity: 'claim',
			entityId: input.claimId,
			detail: { reason }
		});
		const buyer = await claimBuyer(trx, input.claimId);
		await queueMail(trx, {
			kind: 'claim_decided',
			to: buyer.email,
			name: buyer.name,
			orderNumber: buyer.order_number,
			outcome: 'decline',
			note: reason,
			reshipOrderNumber: null,
			orderUrl: customerOrderUrl(links, buyer.order_number)
		});
		return { ok: true };
	});
}

type DecisionActor = Actor;

/** An open claim under its row lock, with its order's number. */
export async function openClaim(trx: Kysely<Database>, claimId: number) {
	return trx
		.selectFrom('claim')
		.innerJoin('customer_order as o', 'o.id', 'claim.order_id')
		.select(['claim.id', 'claim.state', 'claim.order_id', 'o.order_number'])
		.where('claim.id', '=', claimId)
		.forUpdate()
		.executeTakeFirst();
}

/** The dead lines of a claim with what each sold for, for the refund suggestion and a reship. */
export async function claimDeadLines(db: Kysely<Database>, claimId: number) {
	return db
		.selectFrom('claim_line as cl')
		.innerJoin('order_line as l', 'l.id', 'cl.order_line_id')
		.selectAll('l')
		.select('cl.dead_count')
		.where('cl.claim_id', '=', claimId)
		.orderBy('l.id')
		.execute();
}

/**
 * Settles an open claim by sending the dead animals again: a new order at no charge,
 * linked to the claim, with one line per dead line, put straight into `paid` so the
 * ship check (run here, after the commit) gives it a ship date or holds it for weather.
 */
export async function reshipClaim(
	db: Db,
	actor: DecisionActor,
	input: { claimId: number; note: string },
	source: ForecastSource,
	options: { now?: Date; today?: IsoDate; links?: ClaimLinks } = {}
): Promise<
	{ ok: true; orderId: number; orderNumber: string; check: OrderCheckOutcome } | ClaimRefusal
> {
	const made = await db
		.transaction()
		.execute(
			async (trx): Promise<{ ok: true; orderId: number; orderNumber: string } | ClaimRefusal> => {
				const claim = await openClaim(trx, input.claimId);
				if (!claim) return { ok: false, status: 404, problem: 'Claim not found.' };
				if (claim.state !== 'open')
					return { ok: false, status: 409, problem: 'This claim is not open any more.' };
				const original = await trx
					.selectFrom('customer_order')
					.selectAll()
					.where('id', '=', claim.order_id)
					.executeTakeFirstOrThrow();
				const dead = await claimDeadLines(trx, input.claimId);
				const orderNumber = await nextReshipNumber(trx);
				const order = await trx
					.insertInto('customer_order')
					.values({
						order_number: orderNumber,
						user_id: original.user_id,
						email: original.email,
						ship_name: original.ship_name,
						ship_line1: original.ship_line1,
						ship_line2: original.ship_line2,
						ship_city: original.ship_city,
						ship_state: original.ship_state,
						ship_zip: original.ship_zip,
						service: original.service,
						subtotal_cents: 0,
						shipping_cents: 0,
						total_cents: 0,
						terms_accepted_at: original.terms_accepted_at,
						reship_of_claim_id: input.claimId
					})
					.returning('id')
					.executeTakeFirstOrThrow();
				await trx
					.insertInto('order_line')
					.values(
						// Dead counts are animals, so the reship sends them one by one.
						dead.map((l) => ({
							order_id: order.id,
							listing_id: l.listing_id,
							clutch_id: l.clutch_id,
							species_id: l.species_id,
							description:
								l.unit_size > 1 ? `${l.description} (replacements, one by one)` : l.description,
							stage: l.stage,
							sex: l.sex,
							unit_size: 1,
							quantity: l.dead_count,
							line_total_cents: 0,
							is_live: l.is_live
						}))
					)
					.execute();
				const moved = await moveOrder(
					trx,
					order.id,
					'paid',
					{ kind: 'system' },
					`No-charge reship for the claim on ${claim.order_number}.`
				);
				if (!moved.ok) throw new Error(moved.problem);
				await trx
					.updateTable('claim')
					.set({
						state: 'reshipped',
						decided_at: options.now ?? new Date(),
						decided_by: actor.userId,
						decision_note: input.note.trim(),
						reship_order_id: order.id
					})
					.where('id', '=', input.claimId)
					.execute();
				await writeAudit(trx, {
					actorUserId: actor.userId,
					actorIp: actor.ip,
					action: 'claim.reship',
					entity: 'claim',
					entityId: input.claimId,
					detail: { reshipOrderId: order.id, orderNumber }
				});
				const buyer = await claimBuyer(trx, input.claimId);
				await queueMail(trx, {
					kind: 'claim_decided',
					to: buyer.email,
					name: buyer.name,
					orderNumber: buyer.order_number,
					outcome: 'reship',
					note: input.note.trim(),
					reshipOrderNumber: orderNumber,
					orderUrl: customerOrderUrl(options.links ?? defaultLinks(), buyer.order_number)
				});
				return { ok: true, orderId: order.id, orderNumber };
			}
		);
	if (!made.ok) return made;
	const check = await checkOrder(
		db,
		source,
		made.orderId,
		{ kind: 'user', userId: actor.userId, ip: actor.ip },
		{ today: options.today }
	);
	return { ...made, check };
}

/** The next order number in the same HL- series checkout draws from, under the same lock. */
async function nextReshipNumber(trx: Kysely<Database>): Promise<string> {
	await sql`select pg_advisory_xact_lock(hashtext('customer_order.order_number'))`.execute(trx);
	const row = await trx
		.selectFrom('customer_order')
		.select(
			sql<string>`coalesce(max(substring(order_number from 4)::bigint), 10000)::text`.as('top')
		)
		.executeTakeFirstOrThrow();
	return `HL-${BigInt(row.top) + 1n}`;
}

/** A claim as its customer reads it on the order page: no staff names. */
export type CustomerClaim = {
	id: number;
	state: ClaimState;
	filedAt: Date;
	decidedAt: Date | null;
	decisionNote: string;
	note: string;
	lines: { description: string; deadCount: number }[];
	refundCents: number | null;
	reshipOrderNumber: string | null;
	photos: ClientPhoto[];
};

/** The claims filed on one order, newest first, with their photos and decisions. */
export async function claimsOfOrder(
	db: Kysely<Database>,
	orderId: number
): Promise<CustomerClaim[]> {
	const rows = await db
		.selectFrom('claim')
		.leftJoin('refund', 'refund.id', 'claim.refund_id')
		.leftJoin('customer_order as reship', 'reship.id', 'claim.reship_order_id')
		.select([
			'claim.id',
			'claim.state',
			'claim.filed_at',
			'claim.decided_at',
			'claim.decision_note',
			'claim.note',
			'refund.amount_cents',
			'reship.order_number as reship_number'
		])
		.where('claim.order_id', '=', orderId)
		.orderBy('claim.id', 'desc')
		.execute();
	return Promise.all(
		rows.map(async (row) => ({
			id: row.id,
			state: row.state,
			filedAt: row.filed_at,
			decidedAt: row.decided_at,
			decisionNote: row.decision_note,
			note: row.note,
			lines: (await claimDeadLines(db, row.id)).map((l) => ({
				description: l.description,
				deadCount: l.dead_count
			})),
			refundCents: row.amount_cents,
			reshipOrderNumber: row.reship_number,
			photos: await listPhotos(db, { kind: 'claim', id: row.id })
		}))
	);
}
