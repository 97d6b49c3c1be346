// The local stand-in for an SMTP relay: it accepts every message on loopback, keeps
// it, and shows it through a small JSON API that the /outbox pages and the tests read.
//
//   npx tsx tests/fakes/mail-catcher.ts
//
// env: MAIL_CATCHER_SMTP_PORT (2525), MAIL_CATCHER_HTTP_PORT (2580) and
// MAIL_CATCHER_STORE (.data/mail/caught.jsonl: one JSON line per message, reloaded on start).
//
// HTTP: GET /messages (newest first), GET /messages/:id, DELETE /messages,
// POST /control {"accepting": false|true} (refuse mail with 421, as a relay that is
// down would), GET /health.
import { randomBytes } from 'node:crypto';
import { appendFile, mkdir, readFile, writeFile } from 'node:fs/promises';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer, type SMTPServerError } from 'smtp-server';
import type { CaughtMessage, CaughtSummary } from '../../src/lib/server/mail/catcher';
import { runFake, stopOnSignal } from './stop-on-signal';

const HOST = '127.0.0.1';
/** Larger than any shop mail; a runaway client must not fill the disk. */
const MAX_MESSAGE_BYTES = 10 * 1024 * 1024;

export interface MailCatcherOptions {
	/** 0 picks a free port; the returned smtpPort is the real one. */
	smtpPort: number;
	httpPort: number;
	/** Append each message to this JSON-lines file and reload it on start; none = memory only. */
	storeFile?: string;
	/** One line per received message; silent unless given. */
	log?: (line: string) => void;
}

export interface MailCatcher {
	smtpPort: number;
	httpPort: number;
	/** While false, every SMTP connection is refused with 421. */
	setAccepting(accepting: boolean): void;
	close(): Promise<void>;
}

function refusal(): SMTPServerError {
	const error: SMTPServerError = new Error(
		'Mail catcher is not accepting mail right now, try again later'
	);
	error.responseCode = 421;
	return error;
}

function addressesOf(field: AddressObject | AddressObject[] | undefined): string[] {
	const objects = field === undefined ? [] : Array.isArray(field) ? field : [field];
	return objects.flatMap((object) =>
		object.value.flatMap((entry) => (entry.address ? [entry.address] : []))
	);
}

async function loadStore(storeFile: string | undefined): Promise<CaughtMessage[]> {
	if (!storeFile) return [];
	let content: string;
	try {
		content = await readFile(storeFile, 'utf8');
	} catch (error) {
		if ((error as NodeJS.ErrnoException).code === 'ENOENT') return [];
		throw error;
	}
	const messages: CaughtMessage[] = [];
	for (const line of content.split('\n')) {
		if (!line.trim()) continue;
		try {
			messages.push(JSON.parse(line) as CaughtMessage);
		} catch {
			// A line cut short by a crash mid-write: skip it, keep the rest.
		}
	}
	return messages;
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

async function readBody(request: IncomingMessage): Promise<string> {
	const chunks: Buffer[] = [];
	let size = 0;
	for await (const chunk of request) {
		size += (chunk as Buffer).length;
		if (size > 64 * 1024) throw new Error('control body too large');
		chunks.push(chunk as Buffer);
	}
	return Buffer.concat(chunks).toString('utf8');
}

function summaryOf(message: CaughtMessage): CaughtSummary {
	return {
		id: message.id,
		from: message.from,
		to: message.to,
		subject: message.subject,
		...(message.messageId ? { messageId: message.messageId } : {}),
		date: message.date
	};
}

export async function startMailCatcher(options: MailCatcherOptions): Promise<MailCatcher> {
	const log = options.log ?? (() => undefined);
	const messages = await loadStore(options.storeFile);
	if (options.storeFile) await mkdir(path.dirname(options.storeFile), { recursive: true });
	let accepting = true;
	// Appends run one after another so two messages never interleave in the file.
	let writes: Promise<void> = Promise.resolve();

	const smtp = new SMTPServer({
		banner: 'Hatchlot mail catcher (local only)',
		disabledCommands: ['STARTTLS', 'AUTH'],
		authOptional: true,
		logger: false,
		size: MAX_MESSAGE_BYTES,
		onConnect(_session, callback) {
			callback(accepting ? null : refusal());
		},
		onMailFrom(_address, _session, callback) {
			callback(accepting ? null : refusal());
		},
		onData(stream, session, callback) {
			simpleParser(stream)
				.then((parsed) => {
					if (stream.sizeExceeded) {
						const error: SMTPServerError = new Error('Message exceeds the catcher size limit');
						error.responseCode = 552;
						callback(error);
						return;
					}
					const envelopeTo = session.envelope.rcptTo.map((recipient) => recipient.address);
					const message: CaughtMessage = {
						id: randomBytes(6).toString('hex'),
						from:
							parsed.from?.text ||
							(session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
						to: envelopeTo.length ? envelopeTo : addressesOf(parsed.to),
						subject: parsed.subject ?? '',
						...(parsed.messageId ? { messageId: parsed.messageId } : {}),
						// The time it arrived here: the Date header is the sender's claim.
						date: new Date().toISOString(),
						html: typeof parsed.html === 'string' ? parsed.html : null,
						text: parsed.text ?? ''
					};
					messages.push(message);
					if (options.storeFile) {
						const line = `${JSON.stringify(message)}\n`;
						const storeFile = options.storeFile;
						writes = writes.then(() => appendFile(storeFile, line, 'utf8')).catch(() => undefined);
					}
					log(`[mail-catcher] caught "${message.subject}" for ${message.to.join(', ')}`);
					callback();
				})
				.catch((error: Error) => callback(error));
		}
	});
	smtp.on('error', (error) => log(`[mail-catcher] smtp: ${error.message}`));

	const http = createServer((request, response) => {
		const url = new URL(request.url ?? '/', `http://${HOST}`);
		const route = `${request.method ?? 'GET'} ${url.pathname.replace(/\/+$/, '') || '/'}`;
		const handle = async () => {
			if (route === 'GET /health') {
				return sendJson(response, 200, { status: 'ok', accepting, messages: messages.length });
			}
			if (route === 'GET /messages') {
				return sendJson(response, 200, messages.map(summaryOf).reverse());
			}
			if (route === 'DELETE /messages') {
				messages.length = 0;
				if (options.storeFile) {
					const storeFile = options.storeFile;
					writes = writes.then(() => writeFile(storeFile, '', 'utf8'));
					await writes;
				}
				response.writeHead(204).end();
				return;
			}
			if (route === 'POST /control') {
				let body: unknown;
				try {
					body = JSON.parse(await readBody(request));
				} catch {
					return sendJson(response, 400, { error: 'send JSON: {"accepting": true|false}' });
				}
				const wanted = (body as { accepting?: unknown } | null)?.accepting;
				if (typeof wanted !== 'boolean') {
					return sendJson(response, 400, { error: '"accepting" must be true or false' });
				}
				accepting = wanted;
				return sendJson(response, 200, { accepting });
			}
			const one = /^GET \/messages\/([^/]+)$/.exec(route);
			if (one) {
				const id = decodeURIComponent(one[1] ?? '');
				const message = messages.find((candidate) => candidate.id === id);
				return message
					? sendJson(response, 200, message)
					: sendJson(response, 404, { error: `no message ${id}` });
			}
			return sendJson(response, 404, { error: `no route ${route}` });
		};
		handle().catch((error: Error) => {
			if (!response.headersSent) sendJson(response, 500, { error: error.message });
			else response.destroy();
		});
	});

	await new Promise<void>((resolve, reject) => {
		smtp.server.once('error', reject);
		smtp.listen(options.smtpPort, HOST, () => resolve());
	});
	try {
		await new Promise<void>((resolve, reject) => {
			http.once('error', reject);
			http.listen(options.httpPort, HOST, () => resolve());
		});
	} catch (error) {
		await new Promise<void>((resolve) => smtp.close(() => resolve()));
		throw error;
	}

	return {
		smtpPort: (smtp.server.address() as AddressInfo).port,
		httpPort: (http.address() as AddressInfo).port,
		setAccepting(next) {
			accepting = next;
		},
		async close() {
			http.closeAllConnections();
			await Promise.all([
				new Promise<void>((resolve) => http.close(() => resolve())),
				new Promise<void>((resolve) => smtp.close(() => resolve()))
			]);
			await writes.catch(() => undefined);
		}
	};
}

function portFrom(value: string | undefined, fallback: number, name: string): number {
	if (value === undefined || value.trim() === '') return fallback;
	const port = Number(value);
	if (!Number.isInteger(port) || port < 0 || port > 65535) {
		throw new RangeError(`${name} must be a port number, got ${value}`);
	}
	return port;
}

async function main(): Promise<void> {
	const catcher = await startMailCatcher({
		smtpPort: portFrom(process.env.MAIL_CATCHER_SMTP_PORT, 2525, 'MAIL_CATCHER_SMTP_PORT'),
		httpPort: portFrom(process.env.MAIL_CATCHER_HTTP_PORT, 2580, 'MAIL_CATCHER_HTTP_PORT'),
		storeFile: path.resolve(process.env.MAIL_CATCHER_STORE || '.data/mail/caught.jsonl'),
		log: (line) => console.log(line)
	});
	console.log(
		`[mail-catcher] SMTP on smtp://${HOST}:${catcher.smtpPort} · messages on http://${HOST}:${catcher.httpPort}/messages`
	);
	stopOnSignal('mail-catcher', { stop: () => catcher.close() });
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
	runFake('mail-catcher', main);
}
