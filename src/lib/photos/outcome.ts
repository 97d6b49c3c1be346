// Without JavaScript, a photo form posts to /manage/photos and is sent back to the
// page it came from with the outcome in the query string. This module writes and
// reads that query. It carries codes, never sentences, so a crafted link cannot put
// words of its own on our page; the sentences come from refusalReason().
import {
	isPhotoRefusalCode,
	MAX_ALT_LENGTH,
	MAX_PHOTOS_PER_BATCH,
	refusal,
	type PhotoRefusal
} from './limits';
import { PHOTO_TARGET_KINDS, type PhotoTarget, type PhotoTargetKind } from './urls';

/** Where a form goes when its return_to is missing or not allowed. */
export const PHOTOS_FALLBACK_PATH = '/manage/photos';

/** The return_to path if it is a back-office page on this site, else null. */
export function safeReturnPath(value: string | null | undefined): string | null {
	if (!value || value.length > 500) return null;
	// Refuse what a browser might read as another host: //host, /\host, control characters.
	if (!value.startsWith('/') || value.startsWith('//') || value.includes('\\')) return null;
	if ([...value].some((c) => c.charCodeAt(0) < 0x20 || c.charCodeAt(0) === 0x7f)) return null;
	const origin = 'http://return.invalid';
	let parsed: URL;
	try {
		parsed = new URL(value, origin);
	} catch {
		return null;
	}
	if (parsed.origin !== origin) return null;
	if (parsed.pathname !== '/manage' && !parsed.pathname.startsWith('/manage/')) return null;
	return parsed.pathname + parsed.search;
}

export type PhotoOutcomeStatus = 'saved' | 'deleted' | 'described' | 'refused';

export interface PhotoOutcome {
	status: PhotoOutcomeStatus;
	target: PhotoTarget | null;
	/** Photos saved by an upload. */
	count?: number;
	/** The photo a delete or description was about. */
	photoId?: number;
	refusals?: PhotoRefusal[];
	/** What was typed as the description, so a refused form gives it back. */
	altText?: string;
}

const PARAMS = [
	'photos',
	'photos_for',
	'photos_count',
	'photos_photo',
	'photos_refused',
	'photos_alt'
];

export function targetKey(target: PhotoTarget): string {
	return `${target.kind}:${target.id}`;
}

/** 'colony:12' back to its target, or null. */
export function parseTargetKey(value: string | null): PhotoTarget | null {
	const match = /^([a-z]+):([1-9][0-9]{0,9})$/.exec(value ?? '');
	if (!match || !(PHOTO_TARGET_KINDS as readonly string[]).includes(match[1]!)) return null;
	return { kind: match[1] as PhotoTargetKind, id: Number(match[2]) };
}

/** `path` with the outcome in its query; any earlier outcome there is replaced. */
export function outcomeUrl(path: string, outcome: PhotoOutcome): string {
	const url = new URL(path, 'http://return.invalid');
	for (const name of PARAMS) url.searchParams.delete(name);
	url.searchParams.set('photos', outcome.status);
	if (outcome.target) url.searchParams.set('photos_for', targetKey(outcome.target));
	if (outcome.count !== undefined) url.searchParams.set('photos_count', String(outcome.count));
	if (outcome.photoId !== undefined) url.searchParams.set('photos_photo', String(outcome.photoId));
	for (const r of (outcome.refusals ?? []).slice(0, MAX_PHOTOS_PER_BATCH + 2))
		url.searchParams.append('photos_refused', `${r.code}:${r.file.slice(0, 120)}`);
	if (outcome.altText) url.searchParams.set('photos_alt', outcome.altText.slice(0, MAX_ALT_LENGTH));
	return url.pathname + url.search;
}

function positiveInt(value: string | null): number | undefined {
	return value && /^[1-9][0-9]{0,9}$/.test(value) ? Number(value) : undefined;
}

/** The outcome in a returned page's URL, or null when there is none (or it is not well formed). */
export function readOutcome(url: URL): PhotoOutcome | null {
	const status = url.searchParams.get('photos');
	if (status !== 'saved' && status !== 'deleted' && status !== 'described' && status !== 'refused')
		return null;
	const refusals: PhotoRefusal[] = [];
	for (const entry of url.searchParams
		.getAll('photos_refused')
		.slice(0, MAX_PHOTOS_PER_BATCH + 2)) {
		const colon = entry.indexOf(':');
		const code = colon < 0 ? entry : entry.slice(0, colon);
		if (!isPhotoRefusalCode(code)) continue;
		refusals.push(refusal(colon < 0 ? '' : entry.slice(colon + 1, colon + 121), code));
	}
	const outcome: PhotoOutcome = {
		status,
		target: parseTargetKey(url.searchParams.get('photos_for'))
	};
	const count = positiveInt(url.searchParams.get('photos_count'));
	if (count !== undefined) outcome.count = count;
	const photoId = positiveInt(url.searchParams.get('photos_photo'));
	if (photoId !== undefined) outcome.photoId = photoId;
	if (refusals.length) outcome.refusals = refusals;
	const alt = url.searchParams.get('photos_alt');
	if (alt) outcome.altText = alt.slice(0, MAX_ALT_LENGTH);
	return outcome;
}

/**
 * The outcome if it is about this target or one of its photos, else null (a page
 * may hold more than one panel).
 */
export function outcomeFor(
	url: URL,
	target: PhotoTarget,
	photoIds: readonly number[] = []
): PhotoOutcome | null {
	const outcome = readOutcome(url);
	if (!outcome) return null;
	if (outcome.target && targetKey(outcome.target) === targetKey(target)) return outcome;
	if (!outcome.target && outcome.photoId !== undefined && photoIds.includes(outcome.photoId))
		return outcome;
	return null;
}

/** Refusals about the whole batch (file '') and about one file, for the form to place. */
export function splitRefusals(refusals: readonly PhotoRefusal[]): {
	batch: PhotoRefusal[];
	files: PhotoRefusal[];
} {
	return {
		batch: refusals.filter((r) => r.file === ''),
		files: refusals.filter((r) => r.file !== '')
	};
}
