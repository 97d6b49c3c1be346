// The first handle: gives each request its id (x-request-id, sent back on the
// response), logs every line of the request under it, and writes one line when the
// request is answered. Put it first in the sequence so the other handles' lines
// carry the id too.
import { isHttpError, isRedirect, type Handle, type RequestEvent } from '@sveltejs/kit';
import { currentLogContext, logger, requestIdFor, withLogContext } from '../log';

export const REQUEST_ID_HEADER = 'x-request-id';

// By the Request object, which every handle and handleError see unchanged: a failure
// thrown out of the handles is logged by handleError outside this handle's context.
const requestIds = new WeakMap<Request, string>();

export function requestIdOf(event: Pick<RequestEvent, 'request'>): string | undefined {
	return requestIds.get(event.request);
}

/** Route parameters that carry a one-time secret (a reset or confirm link) are never logged. */
const SECRET_PARAM = /token|secret|key/i;

/** The path as logged: no query string, and secret route parameters masked. */
export function loggedPath(event: Pick<RequestEvent, 'url' | 'params'>): string {
	const hidden = new Map<string, string>();
	for (const [name, value] of Object.entries(event.params)) {
		if (value && SECRET_PARAM.test(name)) hidden.set(value, `[${name}]`);
	}
	if (!hidden.size) return event.url.pathname;
	return event.url.pathname
		.split('/')
		.map((segment) => {
			let decoded = segment;
			try {
				decoded = decodeURIComponent(segment);
			} catch {
				// A malformed escape cannot be a parameter SvelteKit matched.
			}
			return hidden.get(decoded) ?? segment;
		})
		.join('/');
}

function withRequestId(response: Response, requestId: string): Response {
	try {
		response.headers.set(REQUEST_ID_HEADER, requestId);
		return response;
	} catch {
		// A fetched Response has immutable headers: answer with a copy that can take one.
		const copy = new Response(response.body, response);
		copy.headers.set(REQUEST_ID_HEADER, requestId);
		return copy;
	}
}

export const requestLog: Handle = async ({ event, resolve }) => {
	// A load's fetch to one of our own routes is part of the page's request: same id.
	const outer = currentLogContext();
	const requestId =
		event.isSubRequest && outer && 'requestId' in outer
			? outer.requestId
			: requestIdFor(event.request.headers.get(REQUEST_ID_HEADER));
	requestIds.set(event.request, requestId);

	return withLogContext({ requestId }, async () => {
		const started = performance.now();
		const line = () => ({
			method: event.request.method,
			path: loggedPath(event),
			route: event.route.id,
			ms: Math.round((performance.now() - started) * 10) / 10,
			...(event.isSubRequest ? { subRequest: true } : {})
		});
		let response: Response;
		try {
			response = await resolve(event);
		} catch (thrown) {
			// A later handle threw: SvelteKit turns a redirect or an error() into the answer.
			const status = isRedirect(thrown) || isHttpError(thrown) ? thrown.status : 500;
			logger.info({ ...line(), status }, 'request');
			throw thrown;
		}
		logger.info({ ...line(), status: response.status }, 'request');
		return withRequestId(response, requestId);
	});
};
