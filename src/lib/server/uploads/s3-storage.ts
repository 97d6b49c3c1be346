// Photo files in an S3-compatible bucket (AWS S3, MinIO, Cloudflare R2, Backblaze B2,
// …) instead of a local folder, for several app processes on several machines. Same
// contract as the folder: one object per stored width, named by the content hash,
// written once (a conditional PUT, If-None-Match: *) and removed with its hash.
// Requests are signed with AWS Signature Version 4 by aws4fetch over Node's fetch.
import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import type { ReadableStream as NodeReadableStream } from 'node:stream/web';
import { AwsClient } from 'aws4fetch';
import { isPhotoHash, photoFileName } from '$lib/photos/urls';
import type { PhotoStorage } from './storage';

export interface S3PhotoConfig {
	/**
	 * The bucket's own URL; objects are under it. Path style
	 * (`https://s3.us-east-1.amazonaws.com/my-bucket`, `http://127.0.0.1:9000/photos`) or
	 * virtual-hosted style (`https://my-bucket.s3.us-east-1.amazonaws.com`).
	 */
	bucketUrl: string;
	/** The signing region: the bucket's AWS region, `auto` for R2, what MinIO is set to. */
	region: string;
	accessKeyId: string;
	secretAccessKey: string;
	/** Put before every object name, e.g. `photos/` to share a bucket; empty by default. */
	prefix: string;
	/** One request's limit; a store that does not answer is a failed upload, not a hung one. */
	timeoutMs: number;
}

/** The bucket settings from the environment, or null when PHOTO_S3_URL is not set. */
export function s3ConfigFrom(env: Record<string, string | undefined>): S3PhotoConfig | null {
	const bucketUrl = env.PHOTO_S3_URL?.trim();
	if (!bucketUrl) return null;
	const accessKeyId = env.PHOTO_S3_ACCESS_KEY_ID?.trim();
	const secretAccessKey = env.PHOTO_S3_SECRET_ACCESS_KEY?.trim();
	if (!accessKeyId || !secretAccessKey)
		throw new Error(
			'PHOTO_S3_URL is set, so PHOTO_S3_ACCESS_KEY_ID and PHOTO_S3_SECRET_ACCESS_KEY must be too.'
		);
	const url = new URL(bucketUrl);
	if (url.protocol !== 'https:' && url.protocol !== 'http:')
		throw new Error(`PHOTO_S3_URL must be an http(s) URL, not ${url.protocol}`);
	const timeoutMs = Number(env.PHOTO_S3_TIMEOUT_MS?.trim() || 15_000);
	return {
		bucketUrl: url.toString().replace(/\/+$/, ''),
		region: env.PHOTO_S3_REGION?.trim() || 'us-east-1',
		accessKeyId,
		secretAccessKey,
		prefix: env.PHOTO_S3_PREFIX?.trim() ?? '',
		timeoutMs: Number.isFinite(timeoutMs) && timeoutMs > 0 ? timeoutMs : 15_000
	};
}

/** A refusal or failure from the store, with its HTTP status and S3 error code. */
export class PhotoStoreError extends Error {
	constructor(
		readonly operation: string,
		readonly status: number,
		readonly code: string | null
	) {
		super(`photo store ${operation} failed: ${status}${code ? ` ${code}` : ''}`);
		this.name = 'PhotoStoreError';
	}
}

async function failure(operation: string, response: Response): Promise<PhotoStoreError> {
	const text = await response.text().catch(() => '');
	return new PhotoStoreError(
		operation,
		response.status,
		/<Code>([^<]+)<\/Code>/.exec(text)?.[1] ?? null
	);
}

function unescapeXml(text: string): string {
	return text.replace(/&(lt|gt|quot|apos|amp);/g, (_m, name: string) =>
		name === 'lt' ? '<' : name === 'gt' ? '>' : name === 'quot' ? '"' : name === 'apos' ? "'" : '&'
	);
}

export function s3PhotoStorage(config: S3PhotoConfig): PhotoStorage {
	const aws = new AwsClient({
		accessKeyId: config.accessKeyId,
		secretAccessKey: config.secretAccessKey,
		service: 's3',
		region: config.region,
		// The library retries 5xx and 429 itself; a few tries, not its default ten.
		retries: 2
	});
	const keyFor = (hash: string, width: number) => `${config.prefix}${photoFileName(hash, width)}`;
	const objectUrl = (key: string) =>
		`${config.bucketUrl}/${key.split('/').map(encodeURIComponent).join('/')}`;
	const send = (url: string, init: RequestInit) =>
		aws.fetch(url, { ...init, signal: AbortSignal.timeout(config.timeoutMs) });

	async function remove(key: string): Promise<void> {
		const response = await send(objectUrl(key), { method: 'DELETE' });
		// S3 answers 204 whether or not the object was there.
		if (!response.ok && response.status !== 404) throw await failure('delete', response);
	}

	return {
		async write(hash, width, bytes) {
			const key = keyFor(hash, width);
			const response = await send(objectUrl(key), {
				method: 'PUT',
				// A copy on its own ArrayBuffer: what fetch's body type accepts.
				body: new Uint8Array(bytes),
				headers: {
					'content-type': 'image/webp',
					// Write-once: the store refuses to replace an object that is already there.
					'if-none-match': '*',
					'x-amz-content-sha256': createHash('sha256').update(bytes).digest('hex')
				}
			});
			if (response.ok) {
				await response.body?.cancel();
				return true;
			}
			// 412: already there. 409: another writer of the same object won just now.
			if (response.status === 412 || response.status === 409) {
				await response.body?.cancel();
				return false;
			}
			throw await failure('write', response);
		},

		async exists(hash, width) {
			const response = await send(objectUrl(keyFor(hash, width)), { method: 'HEAD' });
			if (response.ok) return true;
			if (response.status === 404) return false;
			throw await failure('exists', response);
		},

		async open(hash, width) {
			const url = objectUrl(keyFor(hash, width));
			// HEAD now, GET when the body is read: a 304 to the browser never opens a download.
			const head = await send(url, { method: 'HEAD' });
			if (head.status === 404) return null;
			if (!head.ok) throw await failure('open', head);
			const size = Number(head.headers.get('content-length') ?? 0);
			return {
				size,
				stream: () =>
					Readable.from(
						(async function* () {
							const response = await send(url, { method: 'GET' });
							if (!response.ok || !response.body) throw await failure('read', response);
							// fetch's web stream as Node's stream/web type, which Readable.fromWeb takes.
							yield* Readable.fromWeb(response.body as NodeReadableStream<Uint8Array>);
						})()
					)
			};
		},

		async removeAll(hash) {
			if (!isPhotoHash(hash)) throw new RangeError(`not a photo hash: ${hash}`);
			const prefix = `${config.prefix}${hash}-`;
			const keys: string[] = [];
			let continuation: string | null = null;
			do {
				const query = new URLSearchParams({ 'list-type': '2', prefix });
				if (continuation) query.set('continuation-token', continuation);
				const response = await send(`${config.bucketUrl}?${query}`, { method: 'GET' });
				if (!response.ok) throw await failure('list', response);
				const xml = await response.text();
				for (const [, key] of xml.matchAll(/<Key>([^<]*)<\/Key>/g)) keys.push(unescapeXml(key!));
				continuation = /<IsTruncated>true<\/IsTruncated>/.test(xml)
					? unescapeXml(/<NextContinuationToken>([^<]*)</.exec(xml)?.[1] ?? '') || null
					: null;
			} while (continuation);
			const ours = keys.filter((key) => key.startsWith(prefix) && key.endsWith('.webp'));
			for (const key of ours) await remove(key);
			return ours.length;
		}
	};
}
