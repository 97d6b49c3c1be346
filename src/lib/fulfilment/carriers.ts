// The carriers a box goes out with, as the ship form offers them. No imports, so a
// page can name carriers without shipping the tracking-format data to the browser
// (the format check is in ./tracking.ts, on the server).

/** How a box leaves: three carriers, or by hand (delivered or picked up; nothing to track). */
export const CARRIERS = ['UPS', 'USPS', 'FedEx', 'hand'] as const;
export type Carrier = (typeof CARRIERS)[number];
export type TrackedCarrier = Exclude<Carrier, 'hand'>;

export const carrierLabels = {
	UPS: 'UPS',
	USPS: 'USPS',
	FedEx: 'FedEx',
	hand: 'Hand delivery or pickup'
} as const satisfies Record<Carrier, string>;

/** What the ship form takes as typed: room for a 34-character number with a space between every character. */
export const TRACKING_NUMBER_MAX_LENGTH = 80;
/** Longer than any published format (the longest are 34 characters), once spaces and dashes are gone. */
export const TRACKING_NUMBER_MAX_CHARACTERS = 40;

export function isCarrier(value: unknown): value is Carrier {
	return typeof value === 'string' && (CARRIERS as readonly string[]).includes(value);
}

/** A carrier named in any case ("ups", "FEDEX", "Hand"), or null. */
export function carrierFrom(text: string): Carrier | null {
	const wanted = text.trim().toLowerCase();
	return CARRIERS.find((carrier) => carrier.toLowerCase() === wanted) ?? null;
}

export function needsTrackingNumber(carrier: Carrier): carrier is TrackedCarrier {
	return carrier !== 'hand';
}

/** As stored and compared: no spaces or dashes (labels print numbers in groups), upper case. */
export function normalizeTrackingNumber(text: string): string {
	return text.replace(/[\s-]+/g, '').toUpperCase();
}

/** "UPS 1Z5R89390357567127", or the hand-delivery words when there is nothing to track. */
export function describeCarrier(carrier: string, trackingNumber: string | null): string {
	const known = carrierFrom(carrier);
	if (known === 'hand') return carrierLabels.hand;
	const name = known ? carrierLabels[known] : carrier;
	return trackingNumber ? `${name} ${trackingNumber}` : name;
}
