// Ship days: packing slips on the shop's paper, the ship check each box went out on,
// carrier tracking updates (stored once each), the day's batch PDFs made by a job, and
// a note of the late-delivery mail so a customer is told once.
import { sql, type Kysely } from 'kysely';

// A migration sees the database as it was at its time, not as the app types it today.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyDb = Kysely<any>;

export async function up(db: AnyDb): Promise<void> {
	for (const statement of [
		sql`alter table shop_setting
			add column slip_paper text not null default 'letter' check (slip_paper in ('letter', 'a4'))`,
		sql`alter table shipment
			add column ship_check_id integer references ship_check(id) on delete set null,
			add column delivered_by text check (delivered_by in ('keeper', 'tracking')),
			add column late_notice_sent_at timestamptz`,
		// One shipment per order: the box that goes out (a reship is its own order).
		sql`create unique index shipment_one_per_order on shipment (order_id)`,
		sql`create index shipment_in_transit_idx on shipment (expected_delivery_on)
			where delivered_at is null and shipped_at is not null`,
		sql`create table tracking_event (
			id integer generated always as identity primary key,
			shipment_id integer references shipment(id) on delete cascade,
			carrier text not null,
			tracking_number text not null,
			status text not null check (status in ('in_transit', 'out_for_delivery', 'delivered', 'exception')),
			occurred_at timestamptz not null,
			received_at timestamptz not null default now(),
			detail text not null default '' check (length(detail) <= 500),
			unique (carrier, tracking_number, status, occurred_at)
		)`,
		sql`create index tracking_event_shipment_idx on tracking_event (shipment_id)`,
		sql`create table slip_batch (
			id integer generated always as identity primary key,
			ship_on date not null,
			order_ids integer[] not null check (cardinality(order_ids) between 1 and 1000),
			paper text not null check (paper in ('letter', 'a4')),
			state text not null default 'queued' check (state in ('queued', 'running', 'done', 'failed')),
			done_count integer not null default 0 check (done_count >= 0),
			pdf bytea,
			error text,
			created_by uuid references "User"(id) on delete set null,
			created_at timestamptz not null default now(),
			finished_at timestamptz,
			check (done_count <= cardinality(order_ids)),
			check ((state = 'done') = (pdf is not null))
		)`
	])
		await statement.execute(db);
}

export async function down(db: AnyDb): Promise<void> {
	for (const statement of [
		sql`drop table if exists slip_batch`,
		sql`drop table if exists tracking_event`,
		sql`drop index if exists shipment_in_transit_idx`,
		sql`drop index if exists shipment_one_per_order`,
		sql`alter table shipment drop column if exists late_notice_sent_at,
			drop column if exists delivered_by, drop column if exists ship_check_id`,
		sql`alter table shop_setting drop column if exists slip_paper`
	])
		await statement.execute(db);
}
