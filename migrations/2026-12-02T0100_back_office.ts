// The back office, round one: how long a colony is left alone after a molt, photo
// variants on disk, and which tub check a clutch was found in.
import { sql, type Kysely } from 'kysely';

// A migration sees the database as it was at its time, not as the app types it today.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyDb = Kysely<any>;

export async function up(db: AnyDb): Promise<void> {
	// Molting animals burrow and die if dug up: the colony is not dug for this many days
	// after a molt is seen. 21 is our default (from memory: a molt and hardening take
	// one to a few weeks in these animals); it is adjustable per species.
	await sql`alter table species add column molt_quiet_days integer not null default 21
		check (molt_quiet_days between 7 and 90)`.execute(db);

	// The WebP widths written for a photo, and what the upload was before it was re-encoded.
	await sql`alter table photo add column widths integer[] not null default '{}'`.execute(db);
	await sql`alter table photo add column source_format text not null default 'jpeg'
		check (source_format in ('jpeg', 'png', 'webp', 'avif'))`.execute(db);

	// The check that found a clutch's young, for the lineage line on the clutch page.
	await sql`alter table clutch add column tub_check_id integer references tub_check(id)`.execute(
		db
	);
	await sql`create index clutch_tub_check_idx on clutch (tub_check_id)`.execute(db);
	// Keyset paging of the back-office tables walks these.
	await sql`create index colony_code_idx on colony (code, id)`.execute(db);
	await sql`create index resting_tub_hold_idx on resting_tub (hold_until, id)`.execute(db);
	await sql`create index clutch_found_idx on clutch (found_on desc, id desc)`.execute(db);
	await sql`create index care_log_logged_idx on care_log_entry (logged_on desc, id desc)`.execute(
		db
	);
}

export async function down(db: AnyDb): Promise<void> {
	await sql`drop index if exists care_log_logged_idx`.execute(db);
	await sql`drop index if exists clutch_found_idx`.execute(db);
	await sql`drop index if exists resting_tub_hold_idx`.execute(db);
	await sql`drop index if exists colony_code_idx`.execute(db);
	await sql`alter table clutch drop column tub_check_id`.execute(db);
	await sql`alter table photo drop column source_format`.execute(db);
	await sql`alter table photo drop column widths`.execute(db);
	await sql`alter table species drop column molt_quiet_days`.execute(db);
}
