// Carrier tracking updates posted to POST /api/shipments/tracking. The carrier has no
// account here: the only credential is the HMAC-SHA256 signature of "t.body" under the
// shared TRACKING_WEBHOOK_SECRET, in the Hatchlot-Tracking-Signature header as
// "t=<unix seconds>,v1=<hex>", fresh within 300 s and compared in constant time. A bad,
// stale or missing signature changes nothing. Each update is stored once (carrier,
// number, status and time are its key); "delivered" marks the box delivered in the same
// transaction, which opens the claim window. Numbers the shop never shipped are logged
// and acknowledged, so the carrier does not retry them forever.
import { z } from 'zod';
import { carrierFrom, normalizeTrackingNumber } from '$lib/fulfilment/tracking';
import type { Database, TrackingStatus } from '$lib/server/db/schema';
import type { Kysely } from 'kysely';
import { markDeliveredIn } from './marks';
import { TRACKING_TOLERANCE_SECONDS, verifyTrackingSignature } from './tracking-signature';
import { isDatabaseUnavailable } from '../db/unavailable';
import { logger } from '../log';

export { TRACKING_SIGNATURE_HEADER } from './tracking-signature';

/** An update is a few hundred bytes; anything much bigger is not one. */
export const TRACKING_BODY_MAX_BYTES = 16 * 1024;

export const TRACKING_STATUSES = [
	'in_transit',
	'out_for_delivery',
	'delivered',
	'exception'
] as const satisfies readonly TrackingStatus[];

const updateSchema = z.object({
	carrier: z.string().transform((text, ctx) => {
		const carrier = carrierFrom(text);
		if (!carrier || carrier === 'hand') {
			ctx.addIssue({ code: 'custom', message: 'carrier must be UPS, USPS or FedEx' });
			return z.NEVER;
		}
		return carrier;
	}),
	trackingNumber: z
		.string()
		.transform(normalizeTrackingNumber)
		.pipe(z.string().regex(/^[A-Z0-9]{1,40}$/, 'trackingNumber must be 1–40 letters and digits')),
	status: z.enum(TRACKING_STATUSES),
	occurredAt: z.iso.datetime({ offset: true }).transform((text) => new Date(text)),
	detail: z.string().max(500).optional()
});
export type TrackingUpdate = z.infer<typeof updateSchema>;

export type TrackingAnswer = {
	status: 200 | 400 | 500 | 503;
	body: {
		received: boolean;
		duplicate?: boolean;
		matched?: boolean;
		orderNumber?: string;
		delivered?: boolean;
		note?: string;
	};
};

export interface TrackingWebhookDeps {
	db: Kysely<Database>;
	secret: string;
	log?: (line: string) => void;
	/** The server's clock; tests move it. */
	now?: () => Date;
}

/** Handles one update: `rawBody` exactly as received, `signature` the header's value. */
export async function handleTrackingUpdate(
	deps: TrackingWebhookDeps,
	rawBody: string,
	signature: string | null
): Promise<TrackingAnswer> {
	const log = deps.log ?? ((line: string) => logger.info(line));
	const now = deps.now?.() ?? new Date();
	const refused = (note: string): TrackingAnswer => ({
		status: 400,
		body: { received: false, note }
	});
	if (Buffer.byteLength(rawBody, 'utf8') > TRACKING_BODY_MAX_BYTES)
		return refused('The update is too large.');
	const check = verifyTrackingSignature(
		rawBody,
		signature,
		deps.secret,
		Math.floor(now.getTime() / 1000)
	);
	if (!check.ok) {
		log(`[tracking] update refused: ${check.problem}`);
		// The carrier hears only that it did not verify; the log says why.
		return refused('The signature does not verify.');
	}
	let json: unknown;
	try {
		json = JSON.parse(rawBody);
	} catch {
		return refused('The body is not JSON.');
	}
	const parsed = updateSchema.safeParse(json);
	if (!parsed.success) return refused(parsed.error.issues.map((issue) => issue.message).join('; '));
	const update = parsed.data;
	if (update.occurredAt.getTime() > now.getTime() + TRACKING_TOLERANCE_SECONDS * 1000)
		return refused('occurredAt is in the future.');

	try {
		return await deps.db.transaction().execute(async (trx): Promise<TrackingAnswer> => {
			const shipment = await trx
				.selectFrom('shipment as s')
				.innerJoin('customer_order as o', 'o.id', 's.order_id')
				.select(['s.id', 's.order_id', 'o.order_number'])
				.where('s.carrier', '=', update.carrier)
				.where('s.tracking_number', '=', update.trackingNumber)
				.executeTakeFirst();
			// A second delivery of the same update waits on the unique key, then finds it taken.
			const stored = await trx
				.insertInto('tracking_event')
				.values({
					shipment_id: shipment?.id ?? null,
					carrier: update.carrier,
					tracking_number: update.trackingNumber,
					status: update.status,
					occurred_at: update.occurredAt,
					detail: update.detail ?? ''
				})
				.onConflict((conflict) =>
					conflict.columns(['carrier', 'tracking_number', 'status', 'occurred_at']).doNothing()
				)
				.returning('id')
				.executeTakeFirst();
			if (!stored) return { status: 200, body: { received: true, duplicate: true } };
			if (!shipment) {
				log(
					`[tracking] ${update.carrier} ${update.trackingNumber} (${update.status}) matches no shipment; stored and acknowledged`
				);
				return { status: 200, body: { received: true, matched: false } };
			}
			if (update.status !== 'delivered')
				return {
					status: 200,
					body: { received: true, matched: true, orderNumber: shipment.order_number }
				};
			const delivered = await markDeliveredIn(
				trx,
				{ kind: 'tracking', trackingEventId: stored.id },
				{ orderId: shipment.order_id, at: update.occurredAt },
				{ now }
			);
			if (!delivered.ok) {
				// Kept as the carrier's word; the order stays as it is (delivered already, say).
				log(`[tracking] ${shipment.order_number}: delivery not marked: ${delivered.problem}`);
				return {
					status: 200,
					body: {
						received: true,
						matched: true,
						orderNumber: shipment.order_number,
						delivered: false,
						note: delivered.problem
					}
				};
			}
			return {
				status: 200,
				body: {
					received: true,
					matched: true,
					orderNumber: shipment.order_number,
					delivered: true
				}
			};
		});
	} catch (failure) {
		// Nothing committed; the carrier sends it again and it is applied then.
		if (isDatabaseUnavailable(failure)) {
			log('[tracking] update waits: the database is unreachable');
			return { status: 503, body: { received: false } };
		}
		log(
			`[tracking] update failed: ${failure instanceof Error ? failure.message : String(failure)}`
		);
		return { status: 500, body: { received: false } };
	}
}
