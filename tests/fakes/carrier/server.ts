// The local stand-in for a carrier's tracking updates: it posts signed updates about a
// tracking number to the shop's POST /api/shipments/tracking, as a carrier's webhook
// would, when a test (or a person trying the demo) asks it to. It signs on its own —
// HMAC-SHA256 of "t.body" under the shared secret, sent as
// "Hatchlot-Tracking-Signature: t=<unix seconds>,v1=<hex>" — so the shop's check is
// tried against a separate signer, not against itself.
//
// Test controls (this fake only):
//   POST /test/updates {carrier, trackingNumber, status, occurredAt?, detail?,
//        signWith?, ageSeconds?, tamper?}
//        signs and posts one update and answers {appStatus, appBody, sent}: the app's
//        own status and answer. occurredAt defaults to now; signWith signs under another
//        secret, ageSeconds back-dates the signature, tamper changes the body after
//        signing (each to see a refusal). 502 when the app cannot be reached.
//   GET  /test/updates   every update posted since start or the last reset, oldest first
//   POST /test/reset     forgets them
// GET /health answers while it runs.
import { createHmac } from 'node:crypto';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { z } from 'zod';

const HOST = '127.0.0.1';
export const SIGNATURE_HEADER = 'Hatchlot-Tracking-Signature';
/** What the fake uses when it is given no secret: the local default of scripts/lib.sh. */
export const DEFAULT_TRACKING_SECRET = 'tracking_local_fake_hatchlot';

export interface CarrierFakeOptions {
	/** 0 picks a free port; `url` has the real one. */
	port: number;
	/** The shop's tracking endpoint; updates are refused (502) without one. */
	webhookUrl?: string;
	/** Signs every update. */
	webhookSecret: string;
	/** How long to wait for the shop's answer (10 s unless given). */
	timeoutMs?: number;
	/** One line per update posted; silent unless given. */
	log?: (line: string) => void;
}

export type SentUpdate = {
	body: string;
	signature: string;
	appStatus: number | null;
	appBody: unknown;
};

export interface CarrierFake {
	url: string;
	port: number;
	/** Posts one update to the shop and returns what happened. */
	send(update: UpdateRequest): Promise<SentUpdate>;
	sent(): SentUpdate[];
	reset(): void;
	stop(): Promise<void>;
}

const updateRequest = z.object({
	carrier: z.string().min(1),
	trackingNumber: z.string().min(1),
	status: z.enum(['in_transit', 'out_for_delivery', 'delivered', 'exception']),
	occurredAt: z.string().optional(),
	detail: z.string().max(500).optional(),
	signWith: z.string().min(1).optional(),
	ageSeconds: z
		.number()
		.int()
		.min(0)
		.max(10 * 365 * 86_400)
		.optional(),
	tamper: z.boolean().optional()
});
export type UpdateRequest = z.infer<typeof updateRequest>;

/** The signature header value for `body` at `timestamp`, under `secret`. */
export function signUpdate(secret: string, body: string, timestamp: number): string {
	const digest = createHmac('sha256', secret).update(`${timestamp}.${body}`).digest('hex');
	return `t=${timestamp},v1=${digest}`;
}

function sendJson(response: ServerResponse, status: number, body: unknown): void {
	const text = JSON.stringify(body);
	response.writeHead(status, {
		'content-type': 'application/json; charset=utf-8',
		'content-length': Buffer.byteLength(text),
		'cache-control': 'no-store'
	});
	response.end(text);
}

async function readJson(request: IncomingMessage): Promise<unknown> {
	const chunks: Buffer[] = [];
	let size = 0;
	for await (const chunk of request) {
		size += (chunk as Buffer).length;
		if (size > 64 * 1024) throw new Error('control body too large');
		chunks.push(chunk as Buffer);
	}
	return JSON.parse(Buffer.concat(chunks).toString('utf8') || '{}');
}

export async function startCarrierFake(options: CarrierFakeOptions): Promise<CarrierFake> {
	const log = options.log ?? (() => undefined);
	const timeoutMs = options.timeoutMs ?? 10_000;
	let history: SentUpdate[] = [];

	async function send(update: UpdateRequest): Promise<SentUpdate> {
		if (!options.webhookUrl) throw new Error('the carrier fake has no TRACKING_WEBHOOK_URL');
		const body = JSON.stringify({
			carrier: update.carrier,
			trackingNumber: update.trackingNumber,
			status: update.status,
			occurredAt: update.occurredAt ?? new Date().toISOString(),
			...(update.detail === undefined ? {} : { detail: update.detail })
		});
		const timestamp = Math.floor(Date.now() / 1000) - (update.ageSeconds ?? 0);
		const signature = signUpdate(update.signWith ?? options.webhookSecret, body, timestamp);
		// Tampered: a byte added after signing, which must be enough for the shop to refuse it.
		const posted = update.tamper ? body.replace('{', '{ ') : body;
		const answer = await fetch(options.webhookUrl, {
			method: 'POST',
			headers: { 'content-type': 'application/json', [SIGNATURE_HEADER]: signature },
			body: posted,
			signal: AbortSignal.timeout(timeoutMs)
		});
		const text = await answer.text();
		let appBody: unknown = text;
		try {
			appBody = JSON.parse(text);
		} catch {
			// Not JSON (an HTML error page, say): kept as text.
		}
		const sent: SentUpdate = { body: posted, signature, appStatus: answer.status, appBody };
		history.push(sent);
		log(
			`[carrier-fake] ${update.carrier} ${update.trackingNumber} ${update.status} → ${answer.status}`
		);
		return sent;
	}

	const http = createServer((request, response) => {
		const url = new URL(request.url ?? '/', `http://${HOST}`);
		const route = `${request.method ?? 'GET'} ${url.pathname.replace(/\/+$/, '') || '/'}`;
		const handle = async () => {
			if (route === 'GET /health') return sendJson(response, 200, { status: 'ok' });
			if (route === 'GET /test/updates') return sendJson(response, 200, { sent: history });
			if (route === 'POST /test/reset') {
				history = [];
				return sendJson(response, 200, { reset: true });
			}
			if (route === 'POST /test/updates') {
				const parsed = updateRequest.safeParse(await readJson(request));
				if (!parsed.success)
					return sendJson(response, 400, {
						error:
							'send JSON: {"carrier", "trackingNumber", "status": "in_transit"|"out_for_delivery"|"delivered"|"exception", "occurredAt"?, "detail"?}'
					});
				try {
					const sent = await send(parsed.data);
					return sendJson(response, 200, sent);
				} catch (error) {
					return sendJson(response, 502, {
						error: `the shop could not be reached: ${error instanceof Error ? error.message : String(error)}`
					});
				}
			}
			return sendJson(response, 404, { error: `No route ${route}` });
		};
		handle().catch((error: Error) => {
			if (!response.headersSent) sendJson(response, 400, { error: error.message });
			else response.destroy();
		});
	});

	await new Promise<void>((resolve, reject) => {
		http.once('error', reject);
		http.listen(options.port, HOST, () => resolve());
	});
	const port = (http.address() as AddressInfo).port;
	return {
		url: `http://${HOST}:${port}`,
		port,
		send,
		sent: () => [...history],
		reset: () => {
			history = [];
		},
		async stop() {
			http.closeAllConnections();
			await new Promise<void>((resolve) => http.close(() => resolve()));
		}
	};
}
