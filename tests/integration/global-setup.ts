// Vitest global setup: migrate a template database once per run; every
// integration file then copies it (tests/integration/support/databases.ts).
import { createDb } from '../../src/lib/server/db/connect';
import { assertMigrated, migratorFor } from '../../src/lib/server/db/migrator';
import { installJobSchema } from '../../src/lib/server/jobs';
import { recreateDatabase } from './support/databases';
import { TEMPLATE_DATABASE, testClusterUrl } from './support/env';

export default async function setup(): Promise<void> {
	await recreateDatabase(TEMPLATE_DATABASE);
	const db = createDb(testClusterUrl(TEMPLATE_DATABASE), 1);
	try {
		assertMigrated(await migratorFor(db).migrateToLatest());
	} finally {
		// No connection may stay open on a template that others copy.
		await db.destroy();
	}
	// pg-boss's tables and our queues, so queueMail works in every copy.
	await installJobSchema(testClusterUrl(TEMPLATE_DATABASE));
}
