// Stripe's published webhook signature scheme: the header
//   Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<raw body>" under the
//   endpoint's whsec_ secret>
// (the whole secret string, prefix included, is the HMAC key).
import { createHmac } from 'node:crypto';

export function signaturePayload(payload: string, timestamp: number): string {
	return `${timestamp}.${payload}`;
}

export function stripeSignatureHeader(payload: string, secret: string, timestamp: number): string {
	if (!Number.isInteger(timestamp) || timestamp < 0) {
		throw new RangeError(`The timestamp must be whole unix seconds, got ${timestamp}`);
	}
	const v1 = createHmac('sha256', secret)
		.update(signaturePayload(payload, timestamp), 'utf8')
		.digest('hex');
	return `t=${timestamp},v1=${v1}`;
}
