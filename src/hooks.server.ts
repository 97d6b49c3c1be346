import { SvelteKitAuth } from '@auth/sveltekit';
import {
	json,
	redirect,
	type Handle,
	type HandleServerError,
	type ServerInit
} from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { authJsConfig, authSettings } from '$lib/server/auth';
import { roleAtLeast, requiredRoleForPath } from '$lib/server/auth/roles';
import { resolveSession, sessionCookieName } from '$lib/server/auth/sessions';
import { closeDb, getDb } from '$lib/server/db';
import { isDatabaseUnavailable } from '$lib/server/db/unavailable';
import { startJobs, type JobRunner } from '$lib/server/jobs';
import { jobsOptionsFromEnv } from '$lib/server/jobs/env';
import { fontPreload } from '$lib/server/http/font-preload';
import { requestIdOf, requestLog } from '$lib/server/http/request-log';
import { securityHeaders } from '$lib/server/http/security-headers';
import { describeFailure, logger } from '$lib/server/log';

let jobs: JobRunner | undefined;

// The mail worker and other jobs run in the server process; startJobs keeps
// retrying in the background while PostgreSQL is down, so start-up never waits.
export const init: ServerInit = async () => {
	jobs = await startJobs(jobsOptionsFromEnv());
};

// A stray rejection (a job library losing its connection mid-restart) is logged,
// not allowed to stop the whole shop.
process.on('unhandledRejection', (reason) => {
	logger.error({ err: reason }, '[unhandled rejection]');
});

// adapter-node emits this on SIGINT/SIGTERM once requests have drained; open
// pools would otherwise keep the process alive until their idle timeouts.
process.on('sveltekit:shutdown', () => {
	void (async () => {
		await jobs?.stop();
		await closeDb();
	})();
});

// Auth.js answers its own /auth/* endpoints (the sign-in link callback among them).
const { handle: authJsHandle } = SvelteKitAuth(async () => authJsConfig());

/** Who is asking, read on every request from the session and our user_role table. */
const resolveUser: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.sessionToken = null;
	const cookieName = sessionCookieName(authSettings().secure);
	const token = event.cookies.get(cookieName);
	if (token) {
		try {
			event.locals.user = await resolveSession(getDb(), token);
			if (event.locals.user) event.locals.sessionToken = token;
			// A token the database does not know (expired, signed out, disabled) is dropped.
			else event.cookies.delete(cookieName, { path: '/' });
		} catch (failure) {
			// Database down: who is asking cannot be known, so the request is told to come back
			// (503) rather than treated as signed out (a 401, or a bounce to the sign-in page).
			if (isDatabaseUnavailable(failure)) throw failure;
			logger.warn(`[auth] session lookup failed: ${describeFailure(failure)}`);
		}
	}
	return resolve(event);
};

/**
 * The first gate. Loads and actions check the role again themselves; this one
 * makes sure no API call, and no form post (actions run before loads), gets
 * through a route that forgot to.
 */
const gate: Handle = async ({ event, resolve }) => {
	const need = requiredRoleForPath(event.url.pathname);
	if (need === 'public') return resolve(event);
	const user = event.locals.user;
	const isApi = event.url.pathname.startsWith('/api/');
	const reading = event.request.method === 'GET' || event.request.method === 'HEAD';
	if (!user) {
		if (isApi) return json({ message: 'Sign in first.' }, { status: 401 });
		if (!reading) return new Response('Sign in first.', { status: 401 });
		redirect(303, `/signin?next=${encodeURIComponent(event.url.pathname + event.url.search)}`);
	}
	if (need !== 'signed_in' && !roleAtLeast(user.role, need)) {
		if (isApi) return json({ message: 'Not allowed.' }, { status: 403 });
		// A page renders its own 403 from its load; a form post is refused here.
		if (!reading) return new Response('Not allowed.', { status: 403 });
	}
	return resolve(event);
};

// The server accepts bodies up to BODY_SIZE_LIMIT (64M) because photo uploads need it;
// every other route keeps to a small body, so a big post elsewhere is refused at once.
const SMALL_BODY_BYTES = 512 * 1024;
const PHOTO_POSTS = new Set(['/api/manage/photos', '/manage/photos']);
const bodyLimit: Handle = async ({ event, resolve }) => {
	const length = Number(event.request.headers.get('content-length') ?? 0);
	// A claim carries the buyer's photos of the box (up to 15 MB each, checked by the upload module).
	const isClaim = /^\/account\/orders\/[^/]+\/claim$/.test(event.url.pathname);
	if (length > SMALL_BODY_BYTES && !PHOTO_POSTS.has(event.url.pathname) && !isClaim)
		return new Response('That request is too large.', { status: 413 });
	return resolve(event);
};

// The log's request id first, then the security headers, so every refusal after them
// (too large, cross-site, sign in first) is logged with its id and carries the headers.
export const handle: Handle = sequence(
	requestLog,
	securityHeaders,
	fontPreload,
	bodyLimit,
	authJsHandle,
	resolveUser,
	gate
);

// Unexpected errors: log the detail on the server, show a plain sentence.
export const handleError: HandleServerError = ({ error, event, status }) => {
	// The id by the request too: an error thrown out of the handles lands here outside their context.
	if (status !== 404)
		logger.error(
			{ err: error, status, route: event.route.id, requestId: requestIdOf(event) },
			'unexpected error'
		);
	return {
		message: status === 404 ? 'Not found.' : 'Something went wrong on our side. Please try again.'
	};
};
