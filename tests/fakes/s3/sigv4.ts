// AWS Signature Version 4 as the S3 stand-in checks it: written here from AWS's
// description of the scheme (canonical request, string to sign, derived signing key),
// separately from the app's signer, so the app is checked against another reading of
// the same rules. sigv4.test.ts holds it to AWS's published S3 examples.
import { createHash, createHmac } from 'node:crypto';

export const ALGORITHM = 'AWS4-HMAC-SHA256';
export const EMPTY_SHA256 = 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855';

export function sha256Hex(data: string | Uint8Array): string {
	return createHash('sha256').update(data).digest('hex');
}

/** RFC 3986 unreserved characters stay; everything else is %XX with upper-case hex. */
export function uriEncode(text: string): string {
	return encodeURIComponent(text).replace(
		/[!'()*]/g,
		(c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`
	);
}

export interface SignedRequest {
	method: string;
	/** The path as sent, percent-encoded or not; S3 encodes each segment once. */
	path: string;
	/** The query string as sent, without the "?". */
	query: string;
	/** Header names in lower case. */
	headers: Record<string, string>;
	signedHeaders: string[];
	payloadHash: string;
}

export function canonicalRequest(request: SignedRequest): string {
	const path = request.path
		.split('/')
		.map((segment) => uriEncode(decodeURIComponent(segment)))
		.join('/');
	const pairs = request.query
		? request.query.split('&').map((pair) => {
				const at = pair.indexOf('=');
				const key = at < 0 ? pair : pair.slice(0, at);
				const value = at < 0 ? '' : pair.slice(at + 1);
				const decode = (text: string) => decodeURIComponent(text.replace(/\+/g, ' '));
				return [uriEncode(decode(key)), uriEncode(decode(value))] as const;
			})
		: [];
	pairs.sort(([k1, v1], [k2, v2]) => (k1 < k2 ? -1 : k1 > k2 ? 1 : v1 < v2 ? -1 : v1 > v2 ? 1 : 0));
	const names = [...request.signedHeaders].sort();
	const headerLines = names.map(
		(name) => `${name}:${(request.headers[name] ?? '').trim().replace(/\s+/g, ' ')}\n`
	);
	return [
		request.method.toUpperCase(),
		path,
		pairs.map(([key, value]) => `${key}=${value}`).join('&'),
		headerLines.join(''),
		names.join(';'),
		request.payloadHash
	].join('\n');
}

export interface Scope {
	/** YYYYMMDD */
	date: string;
	region: string;
	service: string;
}

export function scopeString(scope: Scope): string {
	return `${scope.date}/${scope.region}/${scope.service}/aws4_request`;
}

export function stringToSign(amzDate: string, scope: Scope, canonical: string): string {
	return [ALGORITHM, amzDate, scopeString(scope), sha256Hex(canonical)].join('\n');
}

export function signature(secretAccessKey: string, scope: Scope, toSign: string): string {
	const hmac = (key: string | Buffer, data: string) =>
		createHmac('sha256', key).update(data).digest();
	const dateKey = hmac(`AWS4${secretAccessKey}`, scope.date);
	const regionKey = hmac(dateKey, scope.region);
	const serviceKey = hmac(regionKey, scope.service);
	const signingKey = hmac(serviceKey, 'aws4_request');
	return createHmac('sha256', signingKey).update(toSign).digest('hex');
}

export interface AuthorizationHeader {
	accessKeyId: string;
	scope: Scope;
	signedHeaders: string[];
	signature: string;
}

/** "AWS4-HMAC-SHA256 Credential=AK/20130524/us-east-1/s3/aws4_request, SignedHeaders=…, Signature=…" */
export function parseAuthorization(header: string): AuthorizationHeader | null {
	const match =
		/^AWS4-HMAC-SHA256\s+Credential=([^/,\s]+)\/(\d{8})\/([^/,\s]+)\/([^/,\s]+)\/aws4_request,\s*SignedHeaders=([a-z0-9;-]+),\s*Signature=([0-9a-f]{64})$/.exec(
			header.trim()
		);
	if (!match) return null;
	const [, accessKeyId, date, region, service, signed, sig] = match;
	return {
		accessKeyId: accessKeyId!,
		scope: { date: date!, region: region!, service: service! },
		signedHeaders: signed!.split(';'),
		signature: sig!
	};
}
