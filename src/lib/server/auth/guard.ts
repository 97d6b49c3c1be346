// requireRole: the check every manage/, admin/ and api/ load, action and
// endpoint makes on the server, whatever links the page did or did not show.
import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import type { Role } from '../db/schema';
import { roleAtLeast } from './roles';

export type SessionUser = { id: string; name: string | null; email: string; role: Role };

function isApi(event: Pick<RequestEvent, 'url'>): boolean {
	return event.url.pathname.startsWith('/api/');
}

/** The signed-in user, or a redirect to sign-in (pages) / 401 (API). */
export function requireUser(event: Pick<RequestEvent, 'locals' | 'url'>): SessionUser {
	const user = event.locals.user;
	if (user) return user;
	if (isApi(event)) error(401, 'Sign in first.');
	const next = event.url.pathname + event.url.search;
	redirect(303, `/signin?next=${encodeURIComponent(next)}`);
}

/** The signed-in user holding at least `minimum`, or 401/redirect, or 403. */
export function requireRole(
	event: Pick<RequestEvent, 'locals' | 'url'>,
	minimum: Role
): SessionUser {
	const user = requireUser(event);
	if (!roleAtLeast(user.role, minimum)) {
		error(
			403,
			minimum === 'admin' ? 'Only the shop owner can open this.' : "This is the shop's back office."
		);
	}
	return user;
}
