// The local stand-in for an S3-compatible object store, for the photo store's tests:
// path-style buckets on 127.0.0.1, objects kept in memory. It answers the calls the
// shop makes — PUT (with If-None-Match: * for write-once), HEAD, GET, DELETE and
// ListObjectsV2 — with S3's status codes and XML error bodies, and refuses any request
// whose Signature Version 4 does not verify (its own checker, sigv4.ts), whose payload
// hash does not match, or whose time is more than 15 minutes off.
//
// Test controls (in-process only): objects(), requests(), setDown(bool) to answer 503.
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { canonicalRequest, parseAuthorization, sha256Hex, signature, stringToSign } from './sigv4';

const HOST = '127.0.0.1';
const SKEW_MS = 15 * 60 * 1000;

export interface S3FakeOptions {
	/** 0 picks a free port. */
	port: number;
	bucket: string;
	accessKeyId: string;
	secretAccessKey: string;
	region: string;
	/** Keys per ListObjectsV2 page (S3's own is 1000); small values exercise continuation. */
	pageSize?: number;
}

export type StoredObject = { body: Buffer; contentType: string };

export interface S3Fake {
	url: string;
	/** The bucket's path-style URL, what PHOTO_S3_URL names. */
	bucketUrl: string;
	objects(): Map<string, StoredObject>;
	/** Method and path of every request, signed or not, oldest first. */
	requests(): string[];
	setDown(down: boolean): void;
	stop(): Promise<void>;
}

function xmlEscape(text: string): string {
	return text.replace(
		/[<>&'"]/g,
		(c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', "'": '&apos;', '"': '&quot;' })[c]!
	);
}

function sendError(response: ServerResponse, status: number, code: string, message: string) {
	response.writeHead(status, { 'content-type': 'application/xml' });
	response.end(
		`<?xml version="1.0" encoding="UTF-8"?>\n<Error><Code>${code}</Code><Message>${xmlEscape(message)}</Message></Error>`
	);
}

async function readBody(request: IncomingMessage): Promise<Buffer> {
	const chunks: Buffer[] = [];
	for await (const chunk of request) chunks.push(chunk as Buffer);
	return Buffer.concat(chunks);
}

/** "20130524T000000Z" as a time. */
function amzTime(amzDate: string): number {
	const m = /^(\d{4})(\d{2})(\d{2})T(\d{2})(\d{2})(\d{2})Z$/.exec(amzDate);
	return m ? Date.UTC(+m[1]!, +m[2]! - 1, +m[3]!, +m[4]!, +m[5]!, +m[6]!) : NaN;
}

export async function startS3Fake(options: S3FakeOptions): Promise<S3Fake> {
	const objects = new Map<string, StoredObject>();
	const seen: string[] = [];
	const pageSize = options.pageSize ?? 1000;
	let down = false;

	/** The reason to refuse the request's signature, or null when it verifies. */
	function refusal(request: IncomingMessage, body: Buffer): [number, string, string] | null {
		const auth = parseAuthorization(String(request.headers.authorization ?? ''));
		if (!auth) return [403, 'AccessDenied', 'No valid Authorization header.'];
		if (auth.accessKeyId !== options.accessKeyId)
			return [403, 'InvalidAccessKeyId', 'Unknown access key.'];
		if (auth.scope.region !== options.region || auth.scope.service !== 's3')
			return [400, 'AuthorizationHeaderMalformed', 'Wrong region or service.'];
		const amzDate = String(request.headers['x-amz-date'] ?? '');
		if (
			!auth.signedHeaders.includes('host') ||
			!auth.signedHeaders.includes('x-amz-date') ||
			amzDate.slice(0, 8) !== auth.scope.date
		)
			return [403, 'AccessDenied', 'Host and X-Amz-Date must be signed.'];
		if (!(Math.abs(Date.now() - amzTime(amzDate)) <= SKEW_MS))
			return [403, 'RequestTimeTooSkewed', 'The request time is too far off.'];
		const payloadHash = String(request.headers['x-amz-content-sha256'] ?? '');
		if (!payloadHash) return [400, 'InvalidRequest', 'Missing payload hash.'];
		if (payloadHash !== 'UNSIGNED-PAYLOAD' && payloadHash !== sha256Hex(body))
			return [400, 'XAmzContentSHA256Mismatch', 'Payload hash mismatch.'];
		const [path, query = ''] = (request.url ?? '/').split('?', 2) as [string, string?];
		const headers: Record<string, string> = {};
		for (const name of auth.signedHeaders) {
			const value = request.headers[name];
			headers[name] = Array.isArray(value) ? value.join(',') : (value ?? '');
		}
		const canonical = canonicalRequest({
			method: request.method ?? 'GET',
			path,
			query,
			headers,
			signedHeaders: auth.signedHeaders,
			payloadHash
		});
		const expected = signature(
			options.secretAccessKey,
			auth.scope,
			stringToSign(amzDate, auth.scope, canonical)
		);
		if (expected !== auth.signature)
			return [403, 'SignatureDoesNotMatch', 'The signature does not match.'];
		return null;
	}

	function list(url: URL, response: ServerResponse) {
		if (url.searchParams.get('list-type') !== '2')
			return sendError(response, 501, 'NotImplemented', 'Only ListObjectsV2 is here.');
		const prefix = url.searchParams.get('prefix') ?? '';
		const after = url.searchParams.get('continuation-token') ?? '';
		const keys = [...objects.keys()].filter((key) => key.startsWith(prefix) && key > after).sort();
		const page = keys.slice(0, pageSize);
		const truncated = keys.length > page.length;
		response.writeHead(200, { 'content-type': 'application/xml' });
		response.end(
			`<?xml version="1.0" encoding="UTF-8"?>\n<ListBucketResult><Name>${xmlEscape(options.bucket)}</Name>` +
				`<Prefix>${xmlEscape(prefix)}</Prefix><KeyCount>${page.length}</KeyCount>` +
				`<MaxKeys>${pageSize}</MaxKeys><IsTruncated>${truncated}</IsTruncated>` +
				page
					.map(
						(key) =>
							`<Contents><Key>${xmlEscape(key)}</Key><Size>${objects.get(key)!.body.length}</Size></Contents>`
					)
					.join('') +
				(truncated
					? `<NextContinuationToken>${xmlEscape(page.at(-1)!)}</NextContinuationToken>`
					: '') +
				'</ListBucketResult>'
		);
	}

	const server = createServer((request, response) => {
		void (async () => {
			const body = await readBody(request);
			const url = new URL(request.url ?? '/', `http://${HOST}`);
			seen.push(`${request.method} ${url.pathname}${url.search}`);
			if (down) return sendError(response, 503, 'SlowDown', 'The stand-in is down.');
			const refused = refusal(request, body);
			if (refused) return sendError(response, ...refused);
			const [, bucket, ...rest] = url.pathname.split('/');
			if (decodeURIComponent(bucket ?? '') !== options.bucket)
				return sendError(response, 404, 'NoSuchBucket', 'No such bucket.');
			const key = rest.map(decodeURIComponent).join('/');
			if (!key) {
				if (request.method === 'GET') return list(url, response);
				return sendError(response, 405, 'MethodNotAllowed', 'Not on a bucket.');
			}
			const stored = objects.get(key);
			switch (request.method) {
				case 'PUT':
					if (request.headers['if-none-match'] === '*' && stored)
						return sendError(response, 412, 'PreconditionFailed', 'The object exists.');
					objects.set(key, {
						body,
						contentType: String(request.headers['content-type'] ?? 'binary/octet-stream')
					});
					response.writeHead(200, { etag: `"${sha256Hex(body).slice(0, 32)}"` });
					return response.end();
				case 'HEAD':
					if (!stored) {
						response.writeHead(404);
						return response.end();
					}
					response.writeHead(200, {
						'content-length': stored.body.length,
						'content-type': stored.contentType
					});
					return response.end();
				case 'GET':
					if (!stored) return sendError(response, 404, 'NoSuchKey', 'No such key.');
					response.writeHead(200, {
						'content-length': stored.body.length,
						'content-type': stored.contentType
					});
					return response.end(stored.body);
				case 'DELETE':
					objects.delete(key);
					response.writeHead(204);
					return response.end();
				default:
					return sendError(response, 405, 'MethodNotAllowed', 'Not supported here.');
			}
		})().catch((error: unknown) => {
			if (!response.headersSent) sendError(response, 500, 'InternalError', String(error));
		});
	});
	await new Promise<void>((resolve) => server.listen(options.port, HOST, resolve));
	const { port } = server.address() as AddressInfo;
	const url = `http://${HOST}:${port}`;
	return {
		url,
		bucketUrl: `${url}/${options.bucket}`,
		objects: () => objects,
		requests: () => [...seen],
		setDown: (value) => {
			down = value;
		},
		stop: () =>
			new Promise<void>((resolve) => {
				server.closeAllConnections();
				server.close(() => resolve());
			})
	};
}
