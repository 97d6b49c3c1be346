// Carrier tracking updates. Public (a carrier signs, it does not sign in): the
// signature over the raw body, under TRACKING_WEBHOOK_SECRET, is the only credential,
// checked in the handler before anything is read or written.
import { json } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { getDb } from '$lib/server/db';
import {
	handleTrackingUpdate,
	TRACKING_SIGNATURE_HEADER
} from '$lib/server/fulfilment/tracking-webhook';
import type { RequestHandler } from './$types';
import { logger } from '$lib/server/log';

export const POST: RequestHandler = async ({ request }) => {
	const secret = env.TRACKING_WEBHOOK_SECRET?.trim() ?? '';
	if (!secret) {
		logger.error('[tracking] TRACKING_WEBHOOK_SECRET is not set; tracking updates are refused');
		return json(
			{ received: false, note: 'Tracking updates are not set up on this shop.' },
			{ status: 503, headers: { 'cache-control': 'no-store' } }
		);
	}
	// The exact bytes the carrier signed: parsing first would change them.
	const raw = await request.text();
	const answer = await handleTrackingUpdate(
		{ db: getDb(), secret },
		raw,
		request.headers.get(TRACKING_SIGNATURE_HEADER)
	);
	return json(answer.body, { status: answer.status, headers: { 'cache-control': 'no-store' } });
};
