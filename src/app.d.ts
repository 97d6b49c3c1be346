// See https://svelte.dev/docs/kit/types#app.d.ts for what each interface does.
import type { SessionUser } from '$lib/server/auth/guard';

declare global {
	namespace App {
		/** Thrown by error() and shown by +error.svelte: a plain message, nothing internal. */
		interface Error {
			message: string;
		}
		interface Locals {
			/** Resolved once per request in hooks.server.ts from the session and our user_role table. */
			user: SessionUser | null;
			/** The session cookie's token when it named a live session, for sign-out. */
			sessionToken: string | null;
		}
		// interface PageData {}
		// interface PageState {}
		// interface Platform {}
	}
}

export {};
