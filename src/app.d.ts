// See https://svelte.dev/docs/kit/types#app.d.ts for what each interface does.
declare global {
	namespace App {
		/** Thrown by error() and shown by +error.svelte: a plain message, nothing internal. */
		interface Error {
			message: string;
		}
		// The accounts issue fills this with the signed-in user and role, resolved once in hooks.server.ts.
		// eslint-disable-next-line @typescript-eslint/no-empty-object-type -- deliberately empty until then
		interface Locals {}
		// interface PageData {}
		// interface PageState {}
		// interface Platform {}
	}
}

export {};
