import type { Handle } from '@sveltejs/kit';
import { closeDb } from '$lib/server/db';

// adapter-node emits this on SIGINT/SIGTERM once requests have drained; an open
// pg pool would otherwise keep the process alive until its idle timeout.
process.on('sveltekit:shutdown', () => {
	void closeDb();
});

export const handle: Handle = async ({ event, resolve }) => resolve(event);
