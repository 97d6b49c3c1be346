// The shop, round one: species words for the catalogue's text search, guest waitlist
// confirmation, and the indexes the catalogue, carts and reservations walk.
import { sql, type Kysely } from 'kysely';

// A migration sees the database as it was at its time, not as the app types it today.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyDb = Kysely<any>;

export async function up(db: AnyDb): Promise<void> {
	// The catalogue searches listing words and the species' names together.
	await sql`alter table species add column search tsvector generated always as (
		setweight(to_tsvector('simple', coalesce(scientific_name, '')), 'A') ||
		setweight(to_tsvector('english', coalesce(common_name, '')), 'A') ||
		setweight(to_tsvector('english', coalesce(summary, '')), 'C')
	) stored`.execute(db);
	await sql`create index species_search_idx on species using gin (search)`.execute(db);

	// A guest joins a waitlist by e-mail and confirms by a one-time link (stored hashed);
	// the notice goes out once, and says which listing it was for.
	await sql`alter table waitlist_entry add column confirm_token_hash text unique
		check (confirm_token_hash ~ '^[0-9a-f]{64}$')`.execute(db);
	await sql`alter table waitlist_entry add column notified_listing_id integer
		references listing(id) on delete set null`.execute(db);

	// Keyset paging of the catalogue by price per animal walks the cheapest tier's rate.
	await sql`alter table listing add column base_price_cents integer check (base_price_cents >= 0)`.execute(
		db
	);
	await sql`update listing set base_price_cents = (
		select min(round(t.price_cents::numeric / (t.min_quantity * listing.unit_size)))::integer
		from price_tier t where t.listing_id = listing.id
	)`.execute(db);
	await sql`create index listing_price_idx on listing (state, base_price_cents, id)`.execute(db);

	// Held reservations of a cart, and a cart's lines by listing (stock moved checks).
	await sql`create index reservation_cart_idx on reservation (cart_id) where state = 'held'`.execute(
		db
	);
	await sql`create index cart_line_listing_idx on cart_line (listing_id)`.execute(db);
	await sql`create index cart_updated_idx on cart (updated_at) where user_id is null`.execute(db);

	// Quantity on offer is derived, never typed. A clutch's count_alive is not reduced by a
	// sale, so its free animals are the alive count less what paid orders took (and did not
	// give back) and less what unexpired holds keep; expired holds count for nothing the
	// moment they expire, whether or not the job has released them yet.
	await sql`create function clutch_free_animals(p_clutch integer) returns integer
		language sql stable as $fn$
		select c.count_alive
			- coalesce((select sum((ol.quantity - ol.restocked_quantity) * ol.unit_size)
				from order_line ol join customer_order o on o.id = ol.order_id
				where ol.clutch_id = c.id and o.state not in ('cancelled', 'awaiting_payment')), 0)::integer
			- coalesce((select sum(r.quantity * l.unit_size)
				from reservation r join listing l on l.id = r.listing_id
				where l.clutch_id = c.id and r.state = 'held' and r.expires_at > now()), 0)::integer
		from clutch c where c.id = p_clutch
	$fn$`.execute(db);
	// Units a listing can sell now: none unless live (and, for animals, unless the clutch is
	// listed: a paused clutch is never sold); a supply's shelf count less its holds.
	await sql`create function listing_on_offer(p_listing integer) returns integer
		language sql stable as $fn$
		select case
			when l.state <> 'live' then 0
			when l.kind = 'animal' then coalesce((
				select case when c.state = 'listed'
					then greatest(0, clutch_free_animals(c.id)) / l.unit_size else 0 end
				from clutch c where c.id = l.clutch_id), 0)
			else greatest(0, l.supply_stock - coalesce((select sum(r.quantity)
				from reservation r
				where r.listing_id = l.id and r.state = 'held' and r.expires_at > now()), 0)::integer)
		end
		from listing l where l.id = p_listing
	$fn$`.execute(db);
}

export async function down(db: AnyDb): Promise<void> {
	await sql`drop function if exists listing_on_offer(integer)`.execute(db);
	await sql`drop function if exists clutch_free_animals(integer)`.execute(db);
	await sql`drop index if exists cart_updated_idx`.execute(db);
	await sql`drop index if exists cart_line_listing_idx`.execute(db);
	await sql`drop index if exists reservation_cart_idx`.execute(db);
	await sql`drop index if exists listing_price_idx`.execute(db);
	await sql`alter table listing drop column base_price_cents`.execute(db);
	await sql`alter table waitlist_entry drop column notified_listing_id`.execute(db);
	await sql`alter table waitlist_entry drop column confirm_token_hash`.execute(db);
	await sql`drop index if exists species_search_idx`.execute(db);
	await sql`alter table species drop column search`.execute(db);
}
