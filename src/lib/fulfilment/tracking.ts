// Whether a tracking number has a shape its carrier publishes, and the carrier's
// tracking page for it. Formats and check digits come from ts-tracking-number (a
// general-purpose library of published carrier formats), never from regexes of our
// own. Pure, but meant for the server: pages name carriers through ./carriers.ts, so
// the format data never ships to the browser.
import { fedex, getTracking, ups, usps, type TrackingCourier } from 'ts-tracking-number';
import {
	carrierLabels,
	needsTrackingNumber,
	normalizeTrackingNumber,
	TRACKING_NUMBER_MAX_CHARACTERS,
	TRACKING_NUMBER_MAX_LENGTH,
	type Carrier,
	type TrackedCarrier
} from './carriers';

export * from './carriers';

const COURIERS: Record<TrackedCarrier, TrackingCourier> = { UPS: ups, USPS: usps, FedEx: fedex };

/**
 * Why `number` cannot be the tracking number of a box sent with `carrier`, or null when
 * it matches one of the carrier's published formats, check digit included. Hand
 * delivery takes none, so anything (or nothing) passes for it.
 */
export function trackingProblem(carrier: Carrier, number: string): string | null {
	if (!needsTrackingNumber(carrier)) return null;
	const normalized = normalizeTrackingNumber(number);
	if (normalized === '')
		return `Enter the ${carrierLabels[carrier]} tracking number from the label (only hand delivery goes without one).`;
	if (
		number.length > TRACKING_NUMBER_MAX_LENGTH ||
		normalized.length > TRACKING_NUMBER_MAX_CHARACTERS
	)
		return `That is longer than any ${carrierLabels[carrier]} tracking number.`;
	if (!/^[A-Z0-9]+$/.test(normalized))
		return 'A tracking number has only letters and digits (spaces and dashes are fine).';
	if (!getTracking(normalized, [COURIERS[carrier]]))
		return `That does not match any published ${carrierLabels[carrier]} tracking number format, or its check digit is off. Copy it again from the label.`;
	return null;
}

/**
 * The carrier's public tracking page for a number, or null for hand delivery. The
 * address is the one the library publishes for the matching format, else the
 * carrier's usual one (numbers stored before formats were checked still get a link).
 */
export function trackingLink(carrier: Carrier, number: string | null): string | null {
	if (!needsTrackingNumber(carrier) || !number) return null;
	const normalized = normalizeTrackingNumber(number);
	if (normalized === '') return null;
	const courier = COURIERS[carrier];
	const template =
		getTracking(normalized, [courier])?.trackingUrl ??
		courier.tracking_numbers.find((format) => format.tracking_url)?.tracking_url ??
		null;
	return template ? template.replace('%s', encodeURIComponent(normalized)) : null;
}
