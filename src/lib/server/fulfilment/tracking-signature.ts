// The signature on a carrier's tracking update: HMAC-SHA256 of "t.body" under the
// shared secret, sent as "Hatchlot-Tracking-Signature: t=<unix seconds>,v1=<hex>".
// The timestamp inside the signed text makes a captured update useless after the
// tolerance, and the comparison runs in constant time so timing gives nothing away.
import { createHmac, timingSafeEqual } from 'node:crypto';

export const TRACKING_SIGNATURE_HEADER = 'hatchlot-tracking-signature';
/** How old a signed update may be, either way, before it counts as a replay. */
export const TRACKING_TOLERANCE_SECONDS = 300;

/** Hex HMAC-SHA256 of `payload` under `secret`. */
export function hmacSha256Hex(secret: string, payload: string): string {
	return createHmac('sha256', secret).update(payload, 'utf8').digest('hex');
}

/** The header value for `body` signed at `timestamp` (unix seconds): what a carrier sends. */
export function trackingSignatureHeader(secret: string, body: string, timestamp: number): string {
	return `t=${timestamp},v1=${hmacSha256Hex(secret, `${timestamp}.${body}`)}`;
}

export type SignatureCheck = { ok: true; timestamp: number } | { ok: false; problem: string };

/**
 * Whether `header` signs `body` under `secret` within the tolerance of `nowSeconds`.
 * More than one v1 is allowed (a secret being changed); any one matching is enough.
 */
export function verifyTrackingSignature(
	body: string,
	header: string | null,
	secret: string,
	nowSeconds: number,
	toleranceSeconds = TRACKING_TOLERANCE_SECONDS
): SignatureCheck {
	if (!secret) return { ok: false, problem: 'No signing secret is set up.' };
	if (!header) return { ok: false, problem: 'No signature header.' };
	let timestamp: number | null = null;
	const signatures: string[] = [];
	for (const part of header.split(',')) {
		const [key, value = ''] = part.trim().split('=', 2);
		if (key === 't' && /^\d{1,12}$/.test(value)) timestamp = Number(value);
		if (key === 'v1' && /^[0-9a-f]{64}$/i.test(value)) signatures.push(value.toLowerCase());
	}
	if (timestamp === null) return { ok: false, problem: 'The signature has no timestamp.' };
	if (signatures.length === 0) return { ok: false, problem: 'The signature has no v1 value.' };
	if (Math.abs(nowSeconds - timestamp) > toleranceSeconds)
		return { ok: false, problem: 'The signature is too old (or from the future).' };
	const expected = Buffer.from(hmacSha256Hex(secret, `${timestamp}.${body}`), 'hex');
	const matches = signatures.some((signature) =>
		timingSafeEqual(Buffer.from(signature, 'hex'), expected)
	);
	return matches
		? { ok: true, timestamp }
		: { ok: false, problem: 'The signature does not match.' };
}
