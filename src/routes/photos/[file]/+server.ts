// Serves one stored WebP variant by its content-hash name. A name never changes
// content, so browsers may keep it for a year. Colony photos are the back office's
// own (a keeper's enclosures and shelves): only keepers get them, and nobody's
// shared cache keeps them. Claim photos go to the customer who filed the claim and
// to keepers and admins, never to anyone else.
import { error } from '@sveltejs/kit';
import { Readable } from 'node:stream';
import { parsePhotoFileName } from '$lib/photos/urls';
import { roleAtLeast } from '$lib/server/auth/roles';
import { getDb } from '$lib/server/db';
import { photoVisibility } from '$lib/server/uploads/photos';
import { photoStorage } from '$lib/server/uploads/storage';
import type { RequestHandler } from './$types';

const YEAR_SECONDS = 31_536_000;

export const GET: RequestHandler = async ({ params, locals, request }) => {
	const name = parsePhotoFileName(params.file);
	if (!name) error(404, 'Not found.');
	const visibility = await photoVisibility(getDb(), name.hash, name.width, locals.user?.id ?? null);
	const isKeeper = locals.user ? roleAtLeast(locals.user.role, 'keeper') : false;
	// 404, not 403: a colony photo's existence is nobody else's business either.
	if (!visibility || (visibility === 'keeper' && !isKeeper)) error(404, 'Not found.');
	const file = await photoStorage().open(name.hash, name.width);
	if (!file) error(404, 'Not found.');

	const etag = `"${name.hash}-${name.width}"`;
	const headers: Record<string, string> = {
		'Cache-Control': `${visibility === 'public' ? 'public' : 'private'}, max-age=${YEAR_SECONDS}, immutable`,
		'Content-Type': 'image/webp',
		'X-Content-Type-Options': 'nosniff',
		ETag: etag
	};
	if (visibility !== 'public') headers.Vary = 'Cookie';
	const asked = request.headers.get('if-none-match');
	if (asked && asked.split(',').some((tag) => tag.trim().replace(/^W\//, '') === etag)) {
		return new Response(null, { status: 304, headers });
	}
	headers['Content-Length'] = String(file.size);
	// Node's stream becomes the web stream a Response takes; it is read as it is sent.
	const body = Readable.toWeb(file.stream()) as ReadableStream<Uint8Array>;
	return new Response(body, { status: 200, headers });
};
