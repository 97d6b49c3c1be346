// Indexes for the owner's reports: each report sums one range of rows in PostgreSQL, so
// each gets an index that starts at the column its range is on. No table changes.
import { sql, type Kysely } from 'kysely';

// A migration sees the database as it was at its time, not as the app types it today.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyDb = Kysely<any>;

const INDEXES: { name: string; create: string }[] = [
	// sales: a payment's updated_at is the moment it succeeded (nothing writes it after).
	{
		name: 'payment_succeeded_idx',
		create: `create index payment_succeeded_idx on payment (updated_at, order_id) include (amount_cents) where status = 'succeeded'`
	},
	{
		name: 'refund_succeeded_idx',
		create: `create index refund_succeeded_idx on refund (created_at) include (amount_cents) where status = 'succeeded'`
	},
	// survival and tub yield: clutches are found by found_on (clutch_found_idx already);
	// their losses and moves-in are few rows of clutch_event, read per clutch; tubs by
	// the day they were set aside. The kind lists match the reports' literal predicates.
	{
		name: 'clutch_event_loss_idx',
		create: `create index clutch_event_loss_idx on clutch_event (clutch_id, happened_on) include (count_delta) where kind in ('loss', 'count') and count_delta < 0`
	},
	{
		name: 'clutch_event_moved_in_idx',
		create: `create index clutch_event_moved_in_idx on clutch_event (clutch_id) include (count_delta) where kind in ('split_in', 'merge_in')`
	},
	{
		name: 'resting_tub_started_idx',
		create: `create index resting_tub_started_idx on resting_tub (started_on)`
	},
	// colony health: care-log entries of some kinds over a range of days; refreshes and
	// moisture checks are read from the index alone. Stock and demand reads all that is
	// listed and waited for, with no range: no index of its own.
	{
		name: 'care_log_kind_day_idx',
		create: `create index care_log_kind_day_idx on care_log_entry (kind, logged_on) include (colony_id, moisture_reading)`
	},
	// shipping: boxes by shipped_at (only shipped ones), weather holds by when they began
	// (the hold's lift is found per order through order_event_order_idx), claims by filing.
	{
		name: 'shipment_shipped_idx',
		create: `create index shipment_shipped_idx on shipment (shipped_at) include (order_id, packs) where shipped_at is not null`
	},
	{
		name: 'order_event_hold_idx',
		create: `create index order_event_hold_idx on order_event (created_at) include (order_id, from_state) where to_state = 'weather_hold'`
	},
	{
		name: 'claim_filed_idx',
		create: `create index claim_filed_idx on claim (filed_at) include (order_id, state, refund_id)`
	}
];

export async function up(db: AnyDb): Promise<void> {
	for (const index of INDEXES) await sql.raw(index.create).execute(db);
}

export async function down(db: AnyDb): Promise<void> {
	for (const index of [...INDEXES].reverse())
		await sql.raw(`drop index if exists ${index.name}`).execute(db);
}
