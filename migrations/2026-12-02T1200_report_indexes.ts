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
	}
	// survival and tub yield: (added with those reports)
	// colony health and stock and demand: (added with those reports)
	// shipping: (added with that report)
];

export async function up(db: AnyDb): Promise<void> {
	for (const index of INDEXES) await sql.raw(index.create).execute(db);
}

export async function down(db: AnyDb): Promise<void> {
	for (const index of [...INDEXES].reverse())
		await sql.raw(`drop index if exists ${index.name}`).execute(db);
}
