// Each integration test file works on its own database, copied from a template
// that global-setup migrated once, so files run in parallel on a fresh schema.
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { createDb, type Db } from '../../../src/lib/server/db/connect';
import { TEMPLATE_DATABASE, testClusterUrl } from './env';

/** Runs work on a connection to the cluster's `postgres` database, closed afterwards. */
export async function withAdmin<T>(work: (client: pg.Client) => Promise<T>): Promise<T> {
	const client = new pg.Client({ connectionString: testClusterUrl('postgres') });
	await client.connect();
	try {
		return await work(client);
	} finally {
		await client.end();
	}
}

export type ScratchDatabase = { name: string; url: string; db: Db; drop: () => Promise<void> };

/** A new database: migrated (from the template) or empty (from template0). */
export async function scratchDatabase(
	kind: 'migrated' | 'empty' = 'migrated'
): Promise<ScratchDatabase> {
	const name = `hl_t_${randomBytes(5).toString('hex')}`;
	const template = kind === 'migrated' ? TEMPLATE_DATABASE : 'template0';
	await withAdmin(async (client) => {
		// Two files copying the template at the same instant can collide; try again briefly.
		for (let attempt = 0; ; attempt++) {
			try {
				await client.query(`create database "${name}" template "${template}"`);
				return;
			} catch (error) {
				if (attempt >= 10) throw error;
				await new Promise((resolve) => setTimeout(resolve, 200 + attempt * 100));
			}
		}
	});
	const url = testClusterUrl(name);
	const db = createDb(url, 4);
	return {
		name,
		url,
		db,
		drop: async () => {
			await db.destroy();
			await withAdmin((client) => client.query(`drop database if exists "${name}" with (force)`));
		}
	};
}

export async function recreateDatabase(name: string, template = 'template0'): Promise<void> {
	await withAdmin(async (client) => {
		await client.query(`drop database if exists "${name}" with (force)`);
		await client.query(`create database "${name}" template "${template}"`);
	});
}
