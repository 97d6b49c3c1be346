// The app's one database handle, opened lazily so the server starts (and
// answers /api/health with 503) even while PostgreSQL is still down.
import { env } from '$env/dynamic/private';
import { createDb, type Db } from './connect';

let instance: Db | undefined;

export function getDb(): Db {
	if (!instance) {
		const url = env.DATABASE_URL;
		if (!url) throw new Error('DATABASE_URL is not set; copy .env.example to .env');
		instance = createDb(url);
	}
	return instance;
}

export type { Db } from './connect';

/** Ends the pool so the process can exit at once on shutdown. */
export async function closeDb(): Promise<void> {
	const open = instance;
	instance = undefined;
	await open?.destroy();
}
