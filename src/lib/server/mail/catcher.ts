// Reading the local mail catcher (tests/fakes/mail-catcher.ts) for the /outbox pages.
// The catcher exists only on a developer's machine and in the test run.

/** One caught message in the list, newest first. */
export interface CaughtSummary {
	id: string;
	from: string;
	to: string[];
	subject: string;
	/** The Message-ID header, which a resend of the same row repeats (absent in older stores). */
	messageId?: string;
	/** ISO time the catcher received it. */
	date: string;
}

/** One caught message with both parts; `html` is null when it had no HTML part. */
export interface CaughtMessage extends CaughtSummary {
	html: string | null;
	text: string;
}

const LOOPBACK = /^(localhost|127(?:\.\d{1,3}){3}|\[::1\])$/i;

/**
 * The catcher's base URL from MAIL_CATCHER_URL, or null when unset. Only an
 * http:// address on this machine counts: the catcher never listens anywhere else,
 * so any other value is a mistake that must not open the outbox.
 */
export function catcherBaseUrl(value: string | undefined): URL | null {
	const trimmed = value?.trim();
	if (!trimmed) return null;
	let url: URL;
	try {
		url = new URL(trimmed);
	} catch {
		return null;
	}
	if (url.protocol !== 'http:' || !LOOPBACK.test(url.hostname)) return null;
	url.pathname = url.pathname.replace(/\/*$/, '/');
	url.search = '';
	url.hash = '';
	return url;
}

export class CatcherUnreachableError extends Error {
	constructor(base: URL, options?: { cause?: unknown }) {
		super(
			`The mail catcher does not answer at ${base.origin}. Start it with: npx tsx tests/fakes/mail-catcher.ts`,
			options
		);
		this.name = 'CatcherUnreachableError';
	}
}

type Fetch = typeof fetch;

async function getJson(base: URL, path: string, fetcher: Fetch): Promise<unknown | null> {
	let response: Response;
	try {
		response = await fetcher(new URL(path, base), { headers: { accept: 'application/json' } });
	} catch (cause) {
		throw new CatcherUnreachableError(base, { cause });
	}
	if (response.status === 404) return null;
	if (!response.ok) throw new CatcherUnreachableError(base);
	return response.json();
}

export async function listCaughtMail(base: URL, fetcher: Fetch = fetch): Promise<CaughtSummary[]> {
	const body = await getJson(base, 'messages', fetcher);
	return Array.isArray(body) ? (body as CaughtSummary[]) : [];
}

export async function readCaughtMail(
	base: URL,
	id: string,
	fetcher: Fetch = fetch
): Promise<CaughtMessage | null> {
	return (await getJson(
		base,
		`messages/${encodeURIComponent(id)}`,
		fetcher
	)) as CaughtMessage | null;
}

/** Deletes every caught message (DELETE /messages). */
export async function clearCaughtMail(base: URL, fetcher: Fetch = fetch): Promise<void> {
	let response: Response;
	try {
		response = await fetcher(new URL('messages', base), { method: 'DELETE' });
	} catch (cause) {
		throw new CatcherUnreachableError(base, { cause });
	}
	if (!response.ok) throw new CatcherUnreachableError(base);
}

const ENTITIES: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

function decodeEntities(value: string): string {
	return value.replace(/&(#x[0-9a-f]+|#\d+|[a-z]+);/gi, (whole, name: string) => {
		if (name[0] === '#') {
			const code =
				name[1] === 'x' || name[1] === 'X' ? parseInt(name.slice(2), 16) : Number(name.slice(1));
			return Number.isFinite(code) ? String.fromCodePoint(code) : whole;
		}
		return ENTITIES[name.toLowerCase()] ?? whole;
	});
}

/**
 * The web links of a message, in order of appearance and each once: the hrefs of its
 * HTML anchors, then any further http(s) address written in the text part.
 */
export function linksInMail(message: Pick<CaughtMessage, 'html' | 'text'>): string[] {
	const found: string[] = [];
	const add = (candidate: string) => {
		try {
			const url = new URL(candidate.trim());
			if ((url.protocol === 'http:' || url.protocol === 'https:') && !found.includes(url.href)) {
				found.push(url.href);
			}
		} catch {
			// Not an absolute address (an anchor to "#top", a mailto: typo): not a link to follow.
		}
	};
	const anchor = /<a\b[^>]*?\bhref\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s>]+))/gi;
	for (const match of (message.html ?? '').matchAll(anchor)) {
		add(decodeEntities(match[1] ?? match[2] ?? match[3] ?? ''));
	}
	for (const match of message.text.matchAll(/https?:\/\/[^\s<>"]+/g)) {
		// A sentence's full stop or closing bracket is not part of the address.
		add(match[0].replace(/[.,;:!?)\]]+$/, ''));
	}
	return found;
}
