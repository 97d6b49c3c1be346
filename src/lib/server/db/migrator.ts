// Runs the migrations in migrations/ with Kysely's Migrator. Used by
// scripts/migrate.ts and the tests; never by a request.
import { Migrator, type Kysely, type MigrationResultSet } from 'kysely';
import { migrations } from '../../../../migrations/index';

// The migrator works on any schema: migrations are frozen and untyped on purpose.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export function migratorFor(db: Kysely<any>): Migrator {
	return new Migrator({ db, provider: { getMigrations: async () => migrations } });
}

/** The newest migration this code knows, which a migrated database reports back. */
export const LATEST_MIGRATION = Object.keys(migrations).sort().at(-1) ?? null;

/** Throws one plain sentence naming the migration that failed; PostgreSQL rolled it back. */
export function assertMigrated({ error, results }: MigrationResultSet): void {
	if (!error) return;
	const failed = results?.find((r) => r.status === 'Error')?.migrationName ?? 'unknown';
	const message = error instanceof Error ? error.message : String(error);
	throw new Error(`migration ${failed} failed and was rolled back: ${message}`);
}
