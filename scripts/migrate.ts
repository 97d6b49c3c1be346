// npm run migrate [latest|down|up]: migrate DATABASE_URL with Kysely's Migrator.
import { createDb } from '../src/lib/server/db/connect';
import { assertMigrated, migratorFor } from '../src/lib/server/db/migrator';
import { installJobSchema } from '../src/lib/server/jobs';

const direction = process.argv[2] ?? 'latest';
const url = process.env.DATABASE_URL;
if (!url) {
	console.error(
		'[hatchlot] DATABASE_URL is not set; run through npm start or npm test, or copy .env.example to .env.'
	);
	process.exit(1);
}
const db = createDb(url, 2);
const migrator = migratorFor(db);
try {
	const result =
		direction === 'down'
			? await migrator.migrateDown()
			: direction === 'up'
				? await migrator.migrateUp()
				: await migrator.migrateToLatest();
	assertMigrated(result);
	const done = result.results ?? [];
	if (done.length === 0) console.log('[hatchlot] database schema is up to date');
	for (const r of done)
		console.log(`[hatchlot] migration ${r.migrationName}: ${r.direction} ${r.status}`);
	if (direction === 'latest') {
		// pg-boss's tables and our queues, so mail can be queued from the first request on.
		await installJobSchema(url);
		console.log('[hatchlot] job queues are ready');
	}
} catch (error) {
	console.error(`[hatchlot] ${error instanceof Error ? error.message : String(error)}`);
	process.exitCode = 1;
} finally {
	await db.destroy();
}
