// An order's box once handed over, as its pages show it: carrier, tracking number and
// link, and when it left, is due and arrived. The link is worked out on the server so
// the carriers' format data never reaches the browser.
import type { Kysely } from 'kysely';
import { carrierFrom, describeCarrier, trackingLink } from '$lib/fulfilment/tracking';
import type { IsoDate } from '$lib/format/dates';
import type { Database } from '../db/schema';

export interface HandedOverBox {
	carrier: string;
	trackingNumber: string | null;
	trackingUrl: string | null;
	shippedAt: Date;
	expectedDeliveryOn: IsoDate | null;
	deliveredAt: Date | null;
}

/** The order's shipment once shipped, or null while it has not left. */
export async function handedOverBox(
	db: Kysely<Database>,
	orderId: number
): Promise<HandedOverBox | null> {
	const shipment = await db
		.selectFrom('shipment')
		.select(['carrier', 'tracking_number', 'shipped_at', 'expected_delivery_on', 'delivered_at'])
		.where('order_id', '=', orderId)
		.where('shipped_at', 'is not', null)
		.executeTakeFirst();
	if (!shipment) return null;
	const carrier = carrierFrom(shipment.carrier);
	return {
		carrier: describeCarrier(shipment.carrier, null),
		trackingNumber: shipment.tracking_number,
		trackingUrl: carrier ? trackingLink(carrier, shipment.tracking_number) : null,
		shippedAt: shipment.shipped_at as Date,
		expectedDeliveryOn: shipment.expected_delivery_on,
		deliveredAt: shipment.delivered_at
	};
}
