// Data model, version 1. Frozen once landed: later changes go in new migrations.
// Migrations never import app code, so they keep meaning the same thing forever.
import { sql, type Kysely } from 'kysely';

// A migration sees the database as it was at its time, not as the app types it today.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyDb = Kysely<any>;

const statements = [
	// ---- Accounts. The four Auth.js tables keep the names and columns its Kysely adapter expects.
	sql`create table "User" (
		id uuid primary key default gen_random_uuid(),
		name text,
		email text not null unique check (email = lower(email) and position('@' in email) > 1),
		"emailVerified" timestamptz,
		image text
	)`,
	sql`create table "Account" (
		id uuid primary key default gen_random_uuid(),
		"userId" uuid not null references "User"(id) on delete cascade,
		type text not null,
		provider text not null,
		"providerAccountId" text not null,
		refresh_token text,
		access_token text,
		expires_at bigint,
		token_type text,
		scope text,
		id_token text,
		session_state text,
		unique (provider, "providerAccountId")
	)`,
	sql`create index account_user_idx on "Account" ("userId")`,
	sql`create table "Session" (
		id uuid primary key default gen_random_uuid(),
		"sessionToken" text not null unique,
		"userId" uuid not null references "User"(id) on delete cascade,
		expires timestamptz not null
	)`,
	sql`create index session_user_idx on "Session" ("userId")`,
	sql`create table "VerificationToken" (
		identifier text not null,
		token text not null,
		expires timestamptz not null,
		primary key (identifier, token)
	)`,
	// Roles live in our own table and are read on every request, never only from a token.
	sql`create table user_role (
		user_id uuid primary key references "User"(id) on delete cascade,
		role text not null default 'customer' check (role in ('customer', 'keeper', 'admin')),
		disabled_at timestamptz,
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now()
	)`,
	sql`create index user_role_role_idx on user_role (role)`,
	sql`create table user_password (
		user_id uuid primary key references "User"(id) on delete cascade,
		password_hash text not null,
		updated_at timestamptz not null default now()
	)`,
	sql`create table user_profile (
		user_id uuid primary key references "User"(id) on delete cascade,
		ship_name text,
		ship_line1 text,
		ship_line2 text,
		ship_city text,
		ship_state char(2),
		ship_zip char(5) check (ship_zip ~ '^[0-9]{5}$'),
		wants_waitlist_mail boolean not null default false,
		wants_stock_news boolean not null default false,
		updated_at timestamptz not null default now()
	)`,

	// ---- Shop settings: one row, typed, defaults from the product brief.
	sql`create table shop_setting (
		id boolean primary key default true check (id),
		shop_name text not null,
		origin_zip char(5) not null check (origin_zip ~ '^[0-9]{5}$'),
		time_zone text not null default 'America/New_York',
		ship_weekdays_overnight smallint[] not null default '{1,2,3}',
		ship_weekdays_two_day smallint[] not null default '{1,2}',
		heat_pack_below_f integer not null default 50,
		hold_below_f integer not null default 25,
		cold_pack_above_f integer not null default 85,
		hold_above_f integer not null default 95,
		extra_closed_dates date[] not null default '{}',
		forecast_horizon_days integer not null default 10 check (forecast_horizon_days between 1 and 16),
		fee_overnight_cents integer not null default 4500 check (fee_overnight_cents >= 0),
		fee_two_day_cents integer not null default 2800 check (fee_two_day_cents >= 0),
		reservation_minutes integer not null default 15 check (reservation_minutes between 1 and 240),
		claim_window_hours integer not null default 2 check (claim_window_hours between 1 and 168),
		updated_at timestamptz not null default now(),
		check (hold_below_f < heat_pack_below_f and heat_pack_below_f < cold_pack_above_f and cold_pack_above_f < hold_above_f),
		check (ship_weekdays_overnight <@ '{1,2,3,4,5,6,7}' and ship_weekdays_two_day <@ '{1,2,3,4,5,6,7}')
	)`,

	// ---- Species and their care profile (°F; °C is derived for display).
	sql`create table species (
		id integer generated always as identity primary key,
		slug text not null unique check (slug ~ '^[a-z0-9]+(-[a-z0-9]+)*$'),
		scientific_name text not null unique,
		common_name text not null,
		animal_group text not null check (animal_group in ('millipede', 'isopod', 'springtail', 'beetle', 'roach')),
		summary text not null default '',
		temp_low_f integer not null,
		temp_ideal_low_f integer not null,
		temp_ideal_high_f integer not null,
		temp_high_f integer not null,
		moisture_level text not null check (moisture_level in ('drier', 'moist', 'humid')),
		substrate_notes text not null default '',
		diet text not null default '',
		adult_length_mm integer not null check (adult_length_mm > 0 and adult_length_mm < 1000),
		handling_notes text not null default '',
		cautions text not null default '',
		grow_out_weeks integer not null check (grow_out_weeks between 1 and 260),
		refresh_interval_days integer not null default 120 check (refresh_interval_days between 90 and 184),
		tub_hold_days integer not null default 42 check (tub_hold_days between 28 and 56),
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now(),
		check (temp_low_f <= temp_ideal_low_f and temp_ideal_low_f <= temp_ideal_high_f and temp_ideal_high_f <= temp_high_f)
	)`,

	// ---- Colonies and their care log.
	sql`create table colony (
		id integer generated always as identity primary key,
		code text not null unique,
		species_id integer not null references species(id),
		name text not null,
		enclosure_length_in numeric(5,1) not null check (enclosure_length_in > 0 and enclosure_length_in <= 120),
		enclosure_width_in numeric(5,1) not null check (enclosure_width_in > 0 and enclosure_width_in <= 120),
		substrate_depth_in numeric(4,1) not null check (substrate_depth_in > 0 and substrate_depth_in <= 48),
		founders_count integer not null default 0 check (founders_count >= 0),
		founders_note text not null default '',
		generation integer not null default 1 check (generation >= 0),
		started_on date not null,
		retired_on date check (retired_on is null or retired_on >= started_on),
		notes text not null default '',
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now()
	)`,
	sql`create index colony_species_idx on colony (species_id)`,
	sql`create index colony_active_idx on colony (retired_on) where retired_on is null`,
	sql`create table care_log_entry (
		id integer generated always as identity primary key,
		colony_id integer not null references colony(id) on delete cascade,
		kind text not null check (kind in ('substrate_refresh_half', 'substrate_refresh_full', 'leaf_top_up',
			'moisture_check', 'protein', 'calcium', 'molt_seen', 'census', 'pest_note')),
		logged_on date not null,
		moisture_reading text check (moisture_reading in ('dry', 'right', 'wet')),
		census_count integer check (census_count >= 0),
		note text not null default '',
		created_by uuid references "User"(id) on delete set null,
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now(),
		check ((kind = 'moisture_check') = (moisture_reading is not null)),
		check ((kind = 'census') = (census_count is not null))
	)`,
	sql`create index care_log_colony_idx on care_log_entry (colony_id, logged_on desc, id desc)`,
	sql`create index care_log_kind_idx on care_log_entry (kind, colony_id, logged_on desc)`,

	// ---- Substrate recipes: parts as exact fractions (1/3 part stays 1/3).
	sql`create table substrate_recipe (
		id integer generated always as identity primary key,
		name text not null unique,
		is_default boolean not null default false,
		notes text not null default '',
		updated_at timestamptz not null default now()
	)`,
	sql`create unique index substrate_recipe_one_default on substrate_recipe (is_default) where is_default`,
	sql`create table substrate_recipe_part (
		id integer generated always as identity primary key,
		recipe_id integer not null references substrate_recipe(id) on delete cascade,
		position integer not null check (position >= 0),
		ingredient text not null,
		parts_numerator integer not null check (parts_numerator >= 0),
		parts_denominator integer not null default 1 check (parts_denominator > 0),
		unique (recipe_id, position)
	)`,

	// ---- Resting tubs: removed substrate held and checked for young.
	sql`create table resting_tub (
		id integer generated always as identity primary key,
		code text not null unique,
		colony_id integer not null references colony(id),
		source_entry_id integer unique references care_log_entry(id) on delete set null,
		started_on date not null,
		hold_until date not null,
		state text not null default 'resting' check (state in ('resting', 'yielded', 'cleared')),
		closed_on date,
		note text not null default '',
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now(),
		check (hold_until > started_on),
		check ((state = 'resting') = (closed_on is null)),
		check (closed_on is null or closed_on >= started_on)
	)`,
	sql`create index resting_tub_state_idx on resting_tub (state, hold_until)`,
	sql`create index resting_tub_colony_idx on resting_tub (colony_id, started_on desc)`,
	sql`create table tub_check (
		id integer generated always as identity primary key,
		tub_id integer not null references resting_tub(id) on delete cascade,
		checked_on date not null,
		young_found integer not null default 0 check (young_found >= 0),
		eggs_seen boolean not null default false,
		note text not null default '',
		created_by uuid references "User"(id) on delete set null,
		created_at timestamptz not null default now()
	)`,
	sql`create index tub_check_tub_idx on tub_check (tub_id, checked_on desc)`,

	// ---- Clutches: juveniles counted from found to sold.
	sql`create table clutch (
		id integer generated always as identity primary key,
		code text not null unique,
		species_id integer not null references species(id),
		tub_id integer references resting_tub(id),
		origin text not null default 'tub' check (origin in ('tub', 'bought_in', 'split', 'merge')),
		generation integer not null check (generation >= 0),
		found_on date not null,
		stage text not null check (stage in ('hatchling', 'juvenile', 'sub_adult', 'adult')),
		size_class text not null check (size_class in ('tiny', 'small', 'medium', 'large')),
		count_found integer not null check (count_found >= 0),
		count_alive integer not null check (count_alive >= 0),
		count_lost integer not null default 0 check (count_lost >= 0),
		state text not null default 'growing' check (state in ('growing', 'ready', 'listed', 'sold_out', 'paused')),
		paused_reason text check (paused_reason in ('molting', 'unwell')),
		sale_ready_on date not null,
		parent_clutch_id integer references clutch(id),
		version integer not null default 0,
		note text not null default '',
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now(),
		check (count_alive + count_lost <= count_found),
		check ((state = 'paused') = (paused_reason is not null)),
		check ((origin = 'tub') = (tub_id is not null)),
		check (sale_ready_on >= found_on)
	)`,
	sql`create index clutch_species_idx on clutch (species_id, state, sale_ready_on)`,
	sql`create index clutch_tub_idx on clutch (tub_id)`,
	sql`create index clutch_ready_idx on clutch (sale_ready_on) where state in ('growing', 'ready')`,
	sql`create table clutch_event (
		id integer generated always as identity primary key,
		clutch_id integer not null references clutch(id) on delete cascade,
		kind text not null check (kind in ('found', 'stage', 'size_class', 'count', 'loss', 'pause', 'unpause',
			'merge_in', 'merge_out', 'split_in', 'split_out', 'state')),
		from_value text,
		to_value text,
		count_delta integer not null default 0,
		reason text not null default '',
		happened_on date not null,
		actor_user_id uuid references "User"(id) on delete set null,
		created_at timestamptz not null default now()
	)`,
	sql`create index clutch_event_clutch_idx on clutch_event (clutch_id, happened_on, id)`,

	// ---- Listings and price tiers (integer cents; a tier is a total price for a quantity).
	sql`create table listing (
		id integer generated always as identity primary key,
		slug text not null unique check (slug ~ '^[a-z0-9]+(-[a-z0-9]+)*$'),
		kind text not null check (kind in ('animal', 'supply')),
		species_id integer references species(id),
		clutch_id integer references clutch(id),
		title text not null,
		description text not null default '',
		unit_size integer not null default 1 check (unit_size between 1 and 1000),
		sex text not null default 'unsexed' check (sex in ('unsexed', 'male', 'female', 'pair')),
		is_live boolean not null default true,
		state text not null default 'draft' check (state in ('draft', 'live', 'withdrawn', 'sold_out')),
		supply_stock integer check (supply_stock >= 0),
		published_at timestamptz,
		search tsvector generated always as (
			setweight(to_tsvector('english', coalesce(title, '')), 'A') ||
			setweight(to_tsvector('english', coalesce(description, '')), 'B')
		) stored,
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now(),
		check ((kind = 'animal') = (clutch_id is not null)),
		check (kind = 'animal' or supply_stock is not null),
		check (kind = 'supply' or species_id is not null)
	)`,
	sql`create index listing_catalogue_idx on listing (state, published_at desc, id desc)`,
	sql`create index listing_species_idx on listing (species_id, state)`,
	sql`create index listing_clutch_idx on listing (clutch_id)`,
	sql`create index listing_search_idx on listing using gin (search)`,
	sql`create table price_tier (
		id integer generated always as identity primary key,
		listing_id integer not null references listing(id) on delete cascade,
		min_quantity integer not null check (min_quantity >= 1),
		price_cents integer not null check (price_cents >= 0),
		unique (listing_id, min_quantity)
	)`,

	// ---- Photos: one subject each, stored by content hash outside static/.
	sql`create table photo (
		id integer generated always as identity primary key,
		content_hash text not null check (content_hash ~ '^[0-9a-f]{64}$'),
		width integer not null check (width > 0),
		height integer not null check (height > 0),
		byte_size integer not null check (byte_size > 0),
		alt_text text not null default '',
		position integer not null default 0,
		species_id integer references species(id) on delete cascade,
		colony_id integer references colony(id) on delete cascade,
		clutch_id integer references clutch(id) on delete cascade,
		listing_id integer references listing(id) on delete cascade,
		claim_id integer,
		uploaded_by uuid references "User"(id) on delete set null,
		created_at timestamptz not null default now(),
		check (num_nonnulls(species_id, colony_id, clutch_id, listing_id, claim_id) = 1)
	)`,
	sql`create index photo_species_idx on photo (species_id, position) where species_id is not null`,
	sql`create index photo_colony_idx on photo (colony_id, position) where colony_id is not null`,
	sql`create index photo_clutch_idx on photo (clutch_id, position) where clutch_id is not null`,
	sql`create index photo_listing_idx on photo (listing_id, position) where listing_id is not null`,
	sql`create index photo_hash_idx on photo (content_hash)`,

	// ---- Carts and reservations.
	sql`create table cart (
		id uuid primary key default gen_random_uuid(),
		user_id uuid unique references "User"(id) on delete cascade,
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now()
	)`,
	sql`create table cart_line (
		id integer generated always as identity primary key,
		cart_id uuid not null references cart(id) on delete cascade,
		listing_id integer not null references listing(id),
		quantity integer not null check (quantity between 1 and 1000),
		added_at timestamptz not null default now(),
		unique (cart_id, listing_id)
	)`,

	// ---- Orders ("order" is a reserved word, so the table says whose it is).
	sql`create table customer_order (
		id integer generated always as identity primary key,
		order_number text not null unique check (order_number ~ '^HL-[0-9]{5,}$'),
		user_id uuid references "User"(id) on delete set null,
		email text not null check (position('@' in email) > 1),
		ship_name text not null,
		ship_line1 text not null,
		ship_line2 text not null default '',
		ship_city text not null,
		ship_state char(2) not null,
		ship_zip char(5) not null check (ship_zip ~ '^[0-9]{5}$'),
		service text not null check (service in ('overnight', 'two_day')),
		state text not null default 'awaiting_payment' check (state in ('awaiting_payment', 'paid', 'scheduled',
			'weather_hold', 'packed', 'shipped', 'delivered', 'cancelled', 'refunded', 'part_refunded')),
		subtotal_cents integer not null check (subtotal_cents >= 0),
		shipping_cents integer not null check (shipping_cents >= 0),
		total_cents integer not null check (total_cents >= 0),
		paid_cents integer not null default 0 check (paid_cents >= 0),
		refunded_cents integer not null default 0 check (refunded_cents >= 0),
		ship_on date,
		delivered_at timestamptz,
		terms_accepted_at timestamptz,
		reship_of_claim_id integer,
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now(),
		check (total_cents = subtotal_cents + shipping_cents),
		check (paid_cents <= total_cents),
		check (refunded_cents <= paid_cents)
	)`,
	sql`create index order_user_idx on customer_order (user_id, created_at desc)`,
	sql`create index order_state_idx on customer_order (state, ship_on)`,
	sql`create index order_email_idx on customer_order (email)`,
	sql`create index order_created_idx on customer_order (created_at desc, id desc)`,
	sql`create table order_line (
		id integer generated always as identity primary key,
		order_id integer not null references customer_order(id) on delete cascade,
		listing_id integer not null references listing(id),
		clutch_id integer references clutch(id),
		species_id integer references species(id),
		description text not null,
		stage text check (stage in ('hatchling', 'juvenile', 'sub_adult', 'adult')),
		sex text not null default 'unsexed' check (sex in ('unsexed', 'male', 'female', 'pair')),
		unit_size integer not null default 1 check (unit_size >= 1),
		quantity integer not null check (quantity >= 1),
		line_total_cents integer not null check (line_total_cents >= 0),
		is_live boolean not null,
		restocked_quantity integer not null default 0 check (restocked_quantity >= 0),
		check (restocked_quantity <= quantity)
	)`,
	sql`create index order_line_order_idx on order_line (order_id)`,
	sql`create index order_line_listing_idx on order_line (listing_id)`,
	sql`create index order_line_clutch_idx on order_line (clutch_id)`,
	sql`create table reservation (
		id integer generated always as identity primary key,
		cart_id uuid references cart(id) on delete set null,
		order_id integer references customer_order(id) on delete cascade,
		listing_id integer not null references listing(id),
		quantity integer not null check (quantity >= 1),
		state text not null default 'held' check (state in ('held', 'converted', 'released')),
		expires_at timestamptz not null,
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now()
	)`,
	sql`create index reservation_held_idx on reservation (listing_id, expires_at) where state = 'held'`,
	sql`create index reservation_order_idx on reservation (order_id)`,
	sql`create table order_event (
		id integer generated always as identity primary key,
		order_id integer not null references customer_order(id) on delete cascade,
		from_state text,
		to_state text not null,
		actor_kind text not null check (actor_kind in ('user', 'system', 'webhook')),
		actor_user_id uuid references "User"(id) on delete set null,
		note text not null default '',
		created_at timestamptz not null default now()
	)`,
	sql`create index order_event_order_idx on order_event (order_id, created_at, id)`,

	// ---- Ship checks: every decision kept with its inputs.
	sql`create table ship_check (
		id integer generated always as identity primary key,
		order_id integer references customer_order(id) on delete cascade,
		first_date date not null,
		service text not null check (service in ('overnight', 'two_day')),
		decision text not null check (decision in ('ship', 'hold')),
		ship_date date,
		delivery_date date,
		recheck_date date,
		packs text[] not null default '{}',
		facility_pickup boolean not null default false,
		reasons jsonb not null default '[]',
		inputs jsonb not null,
		rule_version text not null,
		override_reason text,
		overridden_by uuid references "User"(id) on delete set null,
		checked_at timestamptz not null default now(),
		check ((decision = 'ship') = (ship_date is not null and delivery_date is not null)),
		check (decision = 'ship' or recheck_date is not null),
		check (packs <@ '{heat,cold}')
	)`,
	sql`create index ship_check_order_idx on ship_check (order_id, checked_at desc)`,
	sql`create table forecast_cache (
		location_key text primary key,
		latitude numeric(8,5) not null,
		longitude numeric(8,5) not null,
		daily jsonb not null,
		fetched_at timestamptz not null default now()
	)`,
	sql`create table shipment (
		id integer generated always as identity primary key,
		order_id integer not null references customer_order(id) on delete cascade,
		carrier text not null,
		tracking_number text,
		packs text[] not null default '{}',
		packed_at timestamptz,
		shipped_at timestamptz,
		expected_delivery_on date,
		delivered_at timestamptz,
		created_by uuid references "User"(id) on delete set null,
		created_at timestamptz not null default now(),
		unique (carrier, tracking_number),
		check (packs <@ '{heat,cold}'),
		check (delivered_at is null or shipped_at is not null)
	)`,
	sql`create index shipment_order_idx on shipment (order_id)`,

	// ---- Payments through Stripe, and every webhook event once.
	sql`create table payment (
		id integer generated always as identity primary key,
		order_id integer not null references customer_order(id) on delete cascade,
		stripe_checkout_session_id text not null unique,
		stripe_payment_intent_id text unique,
		amount_cents integer not null check (amount_cents >= 0),
		currency char(3) not null default 'usd' check (currency = lower(currency)),
		status text not null default 'pending' check (status in ('pending', 'succeeded', 'failed', 'expired')),
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now()
	)`,
	sql`create index payment_order_idx on payment (order_id)`,
	sql`create table payment_event (
		id integer generated always as identity primary key,
		stripe_event_id text not null unique,
		type text not null,
		order_id integer references customer_order(id) on delete set null,
		payload jsonb not null,
		received_at timestamptz not null default now(),
		processed_at timestamptz
	)`,
	sql`create index payment_event_order_idx on payment_event (order_id)`,
	sql`create table refund (
		id integer generated always as identity primary key,
		order_id integer not null references customer_order(id) on delete cascade,
		payment_id integer not null references payment(id),
		stripe_refund_id text unique,
		idempotency_key text not null unique,
		amount_cents integer not null check (amount_cents > 0),
		reason text not null,
		status text not null default 'pending' check (status in ('pending', 'succeeded', 'failed')),
		created_by uuid references "User"(id) on delete set null,
		created_at timestamptz not null default now(),
		updated_at timestamptz not null default now()
	)`,
	sql`create index refund_order_idx on refund (order_id)`,
	sql`create table refund_line (
		refund_id integer not null references refund(id) on delete cascade,
		order_line_id integer not null references order_line(id) on delete cascade,
		quantity integer not null check (quantity >= 1),
		restock boolean not null default false,
		primary key (refund_id, order_line_id)
	)`,

	// ---- DOA claims.
	sql`create table claim (
		id integer generated always as identity primary key,
		order_id integer not null references customer_order(id) on delete cascade,
		user_id uuid references "User"(id) on delete set null,
		note text not null default '',
		state text not null default 'open' check (state in ('open', 'refunded', 'reshipped', 'declined')),
		filed_at timestamptz not null default now(),
		decided_at timestamptz,
		decided_by uuid references "User"(id) on delete set null,
		decision_note text not null default '',
		refund_id integer references refund(id),
		reship_order_id integer references customer_order(id),
		check ((state = 'open') = (decided_at is null)),
		check (state <> 'refunded' or refund_id is not null),
		check (state <> 'reshipped' or reship_order_id is not null)
	)`,
	sql`create index claim_order_idx on claim (order_id)`,
	sql`create index claim_state_idx on claim (state, filed_at)`,
	sql`create table claim_line (
		claim_id integer not null references claim(id) on delete cascade,
		order_line_id integer not null references order_line(id) on delete cascade,
		dead_count integer not null check (dead_count >= 1),
		primary key (claim_id, order_line_id)
	)`,
	sql`alter table photo add constraint photo_claim_fk foreign key (claim_id) references claim(id) on delete cascade`,
	sql`create index photo_claim_idx on photo (claim_id, position) where claim_id is not null`,
	sql`alter table customer_order add constraint order_reship_claim_fk foreign key (reship_of_claim_id) references claim(id)`,

	// ---- Waitlist.
	sql`create table waitlist_entry (
		id integer generated always as identity primary key,
		species_id integer not null references species(id) on delete cascade,
		user_id uuid references "User"(id) on delete cascade,
		email text not null check (email = lower(email) and position('@' in email) > 1),
		confirmed_at timestamptz,
		notified_at timestamptz,
		created_at timestamptz not null default now(),
		unique (species_id, email)
	)`,
	sql`create index waitlist_species_idx on waitlist_entry (species_id, created_at)`,

	// ---- Audit log: who did what, when, and from where.
	sql`create table audit_log (
		id bigint generated always as identity primary key,
		actor_user_id uuid references "User"(id) on delete set null,
		actor_ip inet,
		action text not null,
		entity text not null,
		entity_id text,
		detail jsonb not null default '{}',
		created_at timestamptz not null default now()
	)`,
	sql`create index audit_log_created_idx on audit_log (created_at desc, id desc)`,
	sql`create index audit_log_entity_idx on audit_log (entity, entity_id)`,
	sql`create index audit_log_actor_idx on audit_log (actor_user_id, created_at desc)`
];

const tablesNewestFirst = [
	'audit_log',
	'waitlist_entry',
	'claim_line',
	'refund_line',
	'refund',
	'payment_event',
	'payment',
	'shipment',
	'forecast_cache',
	'ship_check',
	'order_event',
	'reservation',
	'order_line',
	'claim',
	'customer_order',
	'cart_line',
	'cart',
	'photo',
	'price_tier',
	'listing',
	'clutch_event',
	'clutch',
	'tub_check',
	'resting_tub',
	'substrate_recipe_part',
	'substrate_recipe',
	'care_log_entry',
	'colony',
	'species',
	'shop_setting',
	'user_profile',
	'user_password',
	'user_role',
	'VerificationToken',
	'Session',
	'Account',
	'User'
];

export async function up(db: AnyDb): Promise<void> {
	for (const statement of statements) await statement.execute(db);
}

export async function down(db: AnyDb): Promise<void> {
	// claim and customer_order point at each other, so cascade breaks the cycle.
	for (const table of tablesNewestFirst) {
		await sql`drop table if exists ${sql.table(table)} cascade`.execute(db);
	}
}
