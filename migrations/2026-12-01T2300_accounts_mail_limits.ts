// Accounts, round two: the mail the shop sends (so failed sends are visible to
// the admin) and the counters the abuse limits keep.
import { sql, type Kysely } from 'kysely';

// A migration sees the database as it was at its time, not as the app types it today.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyDb = Kysely<any>;

export async function up(db: AnyDb): Promise<void> {
	await sql`create table outgoing_mail (
		id integer generated always as identity primary key,
		kind text not null,
		to_address text not null check (position('@' in to_address) > 1),
		subject text not null,
		html_body text not null,
		text_body text not null,
		status text not null default 'queued' check (status in ('queued', 'sent', 'failed')),
		attempts integer not null default 0 check (attempts >= 0),
		last_error text,
		created_at timestamptz not null default now(),
		sent_at timestamptz,
		updated_at timestamptz not null default now()
	)`.execute(db);
	await sql`create index outgoing_mail_status_idx on outgoing_mail (status, created_at desc)`.execute(
		db
	);
	await sql`create index outgoing_mail_to_idx on outgoing_mail (to_address, created_at desc)`.execute(
		db
	);
	// The shape rate-limiter-flexible's PostgreSQL store reads and writes.
	await sql`create table rate_limit (
		key varchar(255) primary key,
		points integer not null default 0,
		expire bigint
	)`.execute(db);
	// One-time links of our own (e-mail verification, password reset), stored hashed.
	await sql`create table account_token (
		token_hash text primary key check (token_hash ~ '^[0-9a-f]{64}$'),
		purpose text not null check (purpose in ('verify_email', 'reset_password')),
		user_id uuid not null references "User"(id) on delete cascade,
		expires_at timestamptz not null,
		used_at timestamptz,
		created_at timestamptz not null default now()
	)`.execute(db);
	await sql`create index account_token_user_idx on account_token (user_id, purpose)`.execute(db);
}

export async function down(db: AnyDb): Promise<void> {
	await sql`drop table if exists account_token`.execute(db);
	await sql`drop table if exists rate_limit`.execute(db);
	await sql`drop table if exists outgoing_mail`.execute(db);
}
