// npm run backup and npm run restore, run as the scripts themselves on a seeded scratch
// database: the archive restores into a fresh database with every order and every
// table's rows, the live database and an existing one are not overwritten unless told,
// and a damaged archive leaves everything as it was.
import { execFile } from 'node:child_process';
import { copyFile, mkdtemp, readFile, readdir, rm, stat, truncate } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { createDb, type Db } from '../../src/lib/server/db/connect';
import { scratchDatabase, withAdmin, type ScratchDatabase } from './support/databases';
import { testClusterUrl } from './support/env';

const ROOT = path.resolve(import.meta.dirname, '../..');
// Each restore makes and drops whole databases; on a busy machine that takes a while.
const SLOW = 120_000;

type Run = { code: number; stdout: string; stderr: string };

/** One of the npm scripts, as `npm run backup|restore -- args` runs it, with the app's database set. */
function runScript(
	script: 'backup' | 'restore',
	args: string[],
	databaseUrl: string
): Promise<Run> {
	return new Promise((resolve) => {
		execFile(
			'bash',
			[path.join(ROOT, 'scripts', `${script}.sh`), ...args],
			{ cwd: ROOT, env: { ...process.env, DATABASE_URL: databaseUrl }, timeout: 120_000 },
			(error, stdout, stderr) => {
				const code = error ? (typeof error.code === 'number' ? error.code : 1) : 0;
				resolve({ code, stdout, stderr });
			}
		);
	});
}

async function databaseExists(name: string): Promise<boolean> {
	return withAdmin(async (client) => {
		const found = await client.query('select 1 from pg_database where datname = $1', [name]);
		return found.rowCount === 1;
	});
}

/** Every ordinary table outside the system schemas with its row count, by schema.table. */
async function rowCounts(db: Db): Promise<Record<string, number>> {
	const tables = await sql<{ schema: string; name: string }>`
		select n.nspname as schema, c.relname as name
		from pg_class c join pg_namespace n on n.oid = c.relnamespace
		where c.relkind in ('r', 'p')
			and n.nspname not in ('pg_catalog', 'information_schema')
			and n.nspname not like 'pg_toast%'
		order by 1, 2`.execute(db);
	const counts: Record<string, number> = {};
	for (const { schema, name } of tables.rows) {
		const { rows } = await sql<{
			n: string;
		}>`select count(*)::text as n from ${sql.id(schema, name)}`.execute(db);
		counts[`${schema}.${name}`] = Number(rows[0]!.n);
	}
	return counts;
}

/** Each order as an owner would check it: number, state, money and how many lines. */
async function orders(db: Db) {
	return db
		.selectFrom('customer_order as o')
		.select((eb) => [
			'o.order_number',
			'o.state',
			'o.email',
			'o.total_cents',
			'o.paid_cents',
			'o.refunded_cents',
			'o.created_at',
			eb
				.selectFrom('order_line as l')
				.whereRef('l.order_id', '=', 'o.id')
				.select((inner) => inner.fn.countAll<string>().as('n'))
				.as('lines')
		])
		.orderBy('o.order_number')
		.execute();
}

describe('npm run backup and npm run restore', () => {
	let scratch: ScratchDatabase;
	let folder: string;
	let archive: string;
	const made: string[] = [];
	const opened: Db[] = [];

	const open = (name: string) => {
		const db = createDb(testClusterUrl(name), 2);
		opened.push(db);
		return db;
	};
	const nameFor = (suffix: string) => {
		const name = `${scratch.name}_${suffix}`;
		made.push(name);
		return name;
	};

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		folder = await mkdtemp(path.join(tmpdir(), 'hatchlot-backups-'));
	});
	afterAll(async () => {
		for (const db of opened) await db.destroy();
		await withAdmin(async (client) => {
			for (const name of made) await client.query(`drop database if exists "${name}" with (force)`);
		});
		await scratch?.drop();
		if (folder) await rm(folder, { recursive: true, force: true });
	});

	it(
		'writes one timestamped custom-format archive and prints its path',
		async () => {
			const run = await runScript('backup', ['--dir', folder], scratch.url);
			expect(run.code, run.stderr).toBe(0);
			archive = run.stdout.trim().split('\n').at(-1)!;
			expect(path.dirname(archive)).toBe(folder);
			expect(path.basename(archive)).toMatch(new RegExp(`^${scratch.name}-\\d{8}T\\d{6}Z\\.dump$`));
			expect(await readdir(folder)).toEqual([path.basename(archive)]);
			// pg_dump's custom format opens with the magic bytes "PGDMP" (PostgreSQL's pg_dump docs
			// and pg_backup_archiver.c; from memory).
			expect((await readFile(archive)).subarray(0, 5).toString('latin1')).toBe('PGDMP');
		},
		SLOW
	);

	it(
		'restores into a fresh database with every order and every table as it was',
		async () => {
			const target = nameFor('restored');
			const run = await runScript('restore', [archive, '--into', target], scratch.url);
			expect(run.code, run.stderr).toBe(0);
			expect(run.stdout.trim()).toBe(target);
			const restored = open(target);

			const before = await orders(scratch.db);
			// The demo scenario's order history (PRODUCT.md): far more than a handful.
			expect(before.length).toBeGreaterThan(10);
			expect(await orders(restored)).toEqual(before);

			const countsBefore = await rowCounts(scratch.db);
			// The shop's tables and pg-boss's queue tables both come back.
			expect(Object.keys(countsBefore)).toEqual(
				expect.arrayContaining(['public.customer_order', 'public.listing', 'pgboss.job'])
			);
			expect(await rowCounts(restored)).toEqual(countsBefore);
			expect(run.stderr).toContain(`${before.length} orders`);
		},
		SLOW
	);

	it(
		"refuses the app's own database unless told it is meant",
		async () => {
			const run = await runScript('restore', [archive, '--into', scratch.name], scratch.url);
			expect(run.code).not.toBe(0);
			expect(run.stderr).toContain("it is the app's own database");
			expect(await orders(scratch.db)).not.toHaveLength(0);
		},
		SLOW
	);

	it(
		'refuses an existing database without --replace, and replaces it with',
		async () => {
			const target = nameFor('replaced');
			expect((await runScript('restore', [archive, '--into', target], scratch.url)).code).toBe(0);
			const copy = open(target);
			await sql`delete from order_line`.execute(copy);

			const refused = await runScript('restore', [archive, '--into', target], scratch.url);
			expect(refused.code).not.toBe(0);
			expect(refused.stderr).toContain('already exists');
			expect(await rowCounts(copy)).toMatchObject({ 'public.order_line': 0 });

			await copy.destroy();
			opened.splice(opened.indexOf(copy), 1);
			const replaced = await runScript(
				'restore',
				[archive, '--into', target, '--replace'],
				scratch.url
			);
			expect(replaced.code, replaced.stderr).toBe(0);
			expect(await rowCounts(open(target))).toEqual(await rowCounts(scratch.db));
		},
		SLOW
	);

	it(
		'leaves the target as it was, and no half-restored database, when the archive is damaged',
		async () => {
			const target = nameFor('kept');
			expect((await runScript('restore', [archive, '--into', target], scratch.url)).code).toBe(0);
			const damaged = path.join(folder, 'damaged.dump');
			await copyFile(archive, damaged);
			// Cut the archive short: its table of contents still reads, its table data does not.
			await truncate(damaged, Math.floor((await stat(damaged)).size * 0.6));

			const run = await runScript('restore', [damaged, '--into', target, '--replace'], scratch.url);
			expect(run.code).not.toBe(0);
			expect(await rowCounts(open(target))).toEqual(await rowCounts(scratch.db));
			const leftovers = await withAdmin(async (client) => {
				const found = await client.query<{ datname: string }>(
					'select datname from pg_database where datname like $1',
					[`${target.slice(0, 40)}_restoring_%`]
				);
				return found.rows.map((row) => row.datname);
			});
			expect(leftovers).toEqual([]);
			expect(await databaseExists(target)).toBe(true);
		},
		SLOW
	);
});
