import { sql, type Kysely, type Migration, Migrator, NO_MIGRATIONS } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { assertMigrated, migratorFor } from '../../src/lib/server/db/migrator';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- introspection queries run on an untyped schema
async function tablesIn(db: Kysely<any>): Promise<string[]> {
	const { rows } = await sql<{ table_name: string }>`
		select table_name from information_schema.tables
		where table_schema = 'public' and table_name not like 'kysely_%' order by table_name`.execute(db);
	return rows.map((r) => r.table_name);
}

describe('migrations on a real database', () => {
	let scratch: ScratchDatabase;
	beforeAll(async () => {
		scratch = await scratchDatabase('empty');
	});
	afterAll(async () => {
		await scratch.drop();
	});

	it('go up, all the way down, and up again', async () => {
		const migrator = migratorFor(scratch.db);
		assertMigrated(await migrator.migrateToLatest());
		const afterUp = await tablesIn(scratch.db);
		for (const table of [
			'User',
			'user_role',
			'species',
			'colony',
			'care_log_entry',
			'resting_tub',
			'clutch',
			'listing',
			'price_tier',
			'customer_order',
			'order_line',
			'order_event',
			'ship_check',
			'payment',
			'payment_event',
			'refund',
			'claim',
			'waitlist_entry',
			'audit_log',
			'reservation',
			'photo',
			'shipment'
		]) {
			expect(afterUp).toContain(table);
		}

		assertMigrated(await migrator.migrateTo(NO_MIGRATIONS));
		expect(await tablesIn(scratch.db)).toEqual([]);

		assertMigrated(await migrator.migrateToLatest());
		expect(await tablesIn(scratch.db)).toEqual(afterUp);
	});

	it('roll a failed migration back and name it', async () => {
		const failing: Record<string, Migration> = {
			'2999-01-01_breaks_halfway': {
				async up(db) {
					await sql`create table half_done (id integer)`.execute(db);
					await sql`select * from table_that_does_not_exist`.execute(db);
				}
			}
		};
		const migrator = new Migrator({
			db: scratch.db,
			provider: { getMigrations: async () => failing },
			migrationTableName: 'failing_migration',
			migrationLockTableName: 'failing_migration_lock'
		});
		const result = await migrator.migrateToLatest();
		expect(() => assertMigrated(result)).toThrow(
			/2999-01-01_breaks_halfway failed and was rolled back/
		);
		expect(await tablesIn(scratch.db)).not.toContain('half_done');
	});
});

describe('migrations/index.ts', () => {
	it('lists every migration file in the folder, under its file name', async () => {
		const { readdir } = await import('node:fs/promises');
		const { migrations } = await import('../../migrations/index');
		const files = (await readdir(new URL('../../migrations/', import.meta.url)))
			.filter((f) => f.endsWith('.ts') && f !== 'index.ts')
			.map((f) => f.replace(/\.ts$/, ''))
			.sort();
		expect(Object.keys(migrations).sort()).toEqual(files);
	});
});
