// The one Database interface: every table of the migrations, typed as the pg
// driver hands values over (see connect.ts for the type parsers).
import type {
	ColumnType,
	Generated,
	GeneratedAlways,
	Insertable,
	Selectable,
	Updateable
} from 'kysely';

/** timestamptz: a Date out, a Date or ISO string in. */
export type Timestamp = ColumnType<Date, Date | string, Date | string>;
/** date: always 'YYYY-MM-DD' text (never a JS Date, which would shift with the server's zone). */
export type DateOnly = string;
/** numeric: exact decimal text; parse it deliberately, never through a float by accident. */
export type Numeric = ColumnType<string, string | number, string | number>;
type Id = GeneratedAlways<number>;
type CreatedAt = ColumnType<Date, Date | string | undefined, Date | string>;
type UpdatedAt = ColumnType<Date, Date | string | undefined, Date | string>;

export type Role = 'customer' | 'keeper' | 'admin';
export type AnimalGroup = 'millipede' | 'isopod' | 'springtail' | 'beetle' | 'roach';
export type MoistureLevel = 'drier' | 'moist' | 'humid';
export type MoistureReading = 'dry' | 'right' | 'wet';
export type CareEntryKind =
	| 'substrate_refresh_half'
	| 'substrate_refresh_full'
	| 'leaf_top_up'
	| 'moisture_check'
	| 'protein'
	| 'calcium'
	| 'molt_seen'
	| 'census'
	| 'pest_note';
export type TubState = 'resting' | 'yielded' | 'cleared';
export type ClutchStage = 'hatchling' | 'juvenile' | 'sub_adult' | 'adult';
export type SizeClass = 'tiny' | 'small' | 'medium' | 'large';
export type ClutchState = 'growing' | 'ready' | 'listed' | 'sold_out' | 'paused';
export type ClutchOrigin = 'tub' | 'bought_in' | 'split' | 'merge';
export type ClutchEventKind =
	| 'found'
	| 'stage'
	| 'size_class'
	| 'count'
	| 'loss'
	| 'pause'
	| 'unpause'
	| 'merge_in'
	| 'merge_out'
	| 'split_in'
	| 'split_out'
	| 'state';
export type ListingKind = 'animal' | 'supply';
export type Sex = 'unsexed' | 'male' | 'female' | 'pair';
export type ListingState = 'draft' | 'live' | 'withdrawn' | 'sold_out';
export type Service = 'overnight' | 'two_day';
export type OrderState =
	| 'awaiting_payment'
	| 'paid'
	| 'scheduled'
	| 'weather_hold'
	| 'packed'
	| 'shipped'
	| 'delivered'
	| 'cancelled'
	| 'refunded'
	| 'part_refunded';
export type ReservationState = 'held' | 'converted' | 'released';
export type ActorKind = 'user' | 'system' | 'webhook';
export type Pack = 'heat' | 'cold';
export type PaymentStatus = 'pending' | 'succeeded' | 'failed' | 'expired';
export type RefundStatus = 'pending' | 'succeeded' | 'failed';
export type ClaimState = 'open' | 'refunded' | 'reshipped' | 'declined';

export interface UserTable {
	id: Generated<string>;
	name: string | null;
	email: string;
	emailVerified: Timestamp | null;
	image: string | null;
}
export interface AccountTable {
	id: Generated<string>;
	userId: string;
	type: string;
	provider: string;
	providerAccountId: string;
	refresh_token: string | null;
	access_token: string | null;
	expires_at: number | null;
	token_type: string | null;
	scope: string | null;
	id_token: string | null;
	session_state: string | null;
}
export interface SessionTable {
	id: Generated<string>;
	sessionToken: string;
	userId: string;
	expires: Timestamp;
}
export interface VerificationTokenTable {
	identifier: string;
	token: string;
	expires: Timestamp;
}
export interface UserRoleTable {
	user_id: string;
	role: Generated<Role>;
	disabled_at: Timestamp | null;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface UserPasswordTable {
	user_id: string;
	password_hash: string;
	updated_at: UpdatedAt;
}
export interface UserProfileTable {
	user_id: string;
	ship_name: string | null;
	ship_line1: string | null;
	ship_line2: string | null;
	ship_city: string | null;
	ship_state: string | null;
	ship_zip: string | null;
	wants_waitlist_mail: Generated<boolean>;
	wants_stock_news: Generated<boolean>;
	updated_at: UpdatedAt;
}
export interface ShopSettingTable {
	id: Generated<boolean>;
	shop_name: string;
	origin_zip: string;
	time_zone: Generated<string>;
	ship_weekdays_overnight: Generated<number[]>;
	ship_weekdays_two_day: Generated<number[]>;
	heat_pack_below_f: Generated<number>;
	hold_below_f: Generated<number>;
	cold_pack_above_f: Generated<number>;
	hold_above_f: Generated<number>;
	extra_closed_dates: Generated<DateOnly[]>;
	forecast_horizon_days: Generated<number>;
	fee_overnight_cents: Generated<number>;
	fee_two_day_cents: Generated<number>;
	reservation_minutes: Generated<number>;
	claim_window_hours: Generated<number>;
	/** Packing slips and care cards print on US Letter or A4. */
	slip_paper: Generated<SlipPaper>;
	updated_at: UpdatedAt;
}
export type SlipPaper = 'letter' | 'a4';
export interface SpeciesTable {
	id: Id;
	slug: string;
	scientific_name: string;
	common_name: string;
	animal_group: AnimalGroup;
	summary: Generated<string>;
	temp_low_f: number;
	temp_ideal_low_f: number;
	temp_ideal_high_f: number;
	temp_high_f: number;
	moisture_level: MoistureLevel;
	substrate_notes: Generated<string>;
	diet: Generated<string>;
	adult_length_mm: number;
	handling_notes: Generated<string>;
	cautions: Generated<string>;
	grow_out_weeks: number;
	refresh_interval_days: Generated<number>;
	tub_hold_days: Generated<number>;
	molt_quiet_days: Generated<number>;
	/** Maintained by PostgreSQL from the names and summary, for the catalogue search. */
	search: GeneratedAlways<string>;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface ColonyTable {
	id: Id;
	code: string;
	species_id: number;
	name: string;
	enclosure_length_in: Numeric;
	enclosure_width_in: Numeric;
	substrate_depth_in: Numeric;
	founders_count: Generated<number>;
	founders_note: Generated<string>;
	generation: Generated<number>;
	started_on: DateOnly;
	retired_on: DateOnly | null;
	notes: Generated<string>;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface CareLogEntryTable {
	id: Id;
	colony_id: number;
	kind: CareEntryKind;
	logged_on: DateOnly;
	moisture_reading: MoistureReading | null;
	census_count: number | null;
	note: Generated<string>;
	created_by: string | null;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface SubstrateRecipeTable {
	id: Id;
	name: string;
	is_default: Generated<boolean>;
	notes: Generated<string>;
	updated_at: UpdatedAt;
}
export interface SubstrateRecipePartTable {
	id: Id;
	recipe_id: number;
	position: number;
	ingredient: string;
	parts_numerator: number;
	parts_denominator: Generated<number>;
}
export interface RestingTubTable {
	id: Id;
	code: string;
	colony_id: number;
	source_entry_id: number | null;
	started_on: DateOnly;
	hold_until: DateOnly;
	state: Generated<TubState>;
	closed_on: DateOnly | null;
	note: Generated<string>;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface TubCheckTable {
	id: Id;
	tub_id: number;
	checked_on: DateOnly;
	young_found: Generated<number>;
	eggs_seen: Generated<boolean>;
	note: Generated<string>;
	created_by: string | null;
	created_at: CreatedAt;
}
export interface ClutchTable {
	id: Id;
	code: string;
	species_id: number;
	tub_id: number | null;
	origin: Generated<ClutchOrigin>;
	generation: number;
	found_on: DateOnly;
	stage: ClutchStage;
	size_class: SizeClass;
	count_found: number;
	count_alive: number;
	count_lost: Generated<number>;
	state: Generated<ClutchState>;
	paused_reason: 'molting' | 'unwell' | null;
	sale_ready_on: DateOnly;
	parent_clutch_id: number | null;
	tub_check_id: number | null;
	version: Generated<number>;
	note: Generated<string>;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface ClutchEventTable {
	id: Id;
	clutch_id: number;
	kind: ClutchEventKind;
	from_value: string | null;
	to_value: string | null;
	count_delta: Generated<number>;
	reason: Generated<string>;
	happened_on: DateOnly;
	actor_user_id: string | null;
	created_at: CreatedAt;
}
export interface ListingTable {
	id: Id;
	slug: string;
	kind: ListingKind;
	species_id: number | null;
	clutch_id: number | null;
	title: string;
	description: Generated<string>;
	unit_size: Generated<number>;
	sex: Generated<Sex>;
	is_live: Generated<boolean>;
	state: Generated<ListingState>;
	supply_stock: number | null;
	published_at: Timestamp | null;
	/** Maintained by PostgreSQL from title and description. */
	search: GeneratedAlways<string>;
	/** The cheapest tier's price per animal, kept by the listing writes for the catalogue's sort and filter. */
	base_price_cents: number | null;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface PriceTierTable {
	id: Id;
	listing_id: number;
	min_quantity: number;
	price_cents: number;
}
export interface PhotoTable {
	id: Id;
	content_hash: string;
	width: number;
	height: number;
	byte_size: number;
	alt_text: Generated<string>;
	position: Generated<number>;
	species_id: number | null;
	colony_id: number | null;
	clutch_id: number | null;
	listing_id: number | null;
	claim_id: number | null;
	uploaded_by: string | null;
	widths: Generated<number[]>;
	source_format: Generated<'jpeg' | 'png' | 'webp' | 'avif'>;
	created_at: CreatedAt;
}
export interface CartTable {
	id: Generated<string>;
	user_id: string | null;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface CartLineTable {
	id: Id;
	cart_id: string;
	listing_id: number;
	quantity: number;
	added_at: CreatedAt;
}
export interface CustomerOrderTable {
	id: Id;
	order_number: string;
	user_id: string | null;
	email: string;
	ship_name: string;
	ship_line1: string;
	ship_line2: Generated<string>;
	ship_city: string;
	ship_state: string;
	ship_zip: string;
	service: Service;
	state: Generated<OrderState>;
	subtotal_cents: number;
	shipping_cents: number;
	total_cents: number;
	paid_cents: Generated<number>;
	refunded_cents: Generated<number>;
	ship_on: DateOnly | null;
	delivered_at: Timestamp | null;
	terms_accepted_at: Timestamp | null;
	reship_of_claim_id: number | null;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface OrderLineTable {
	id: Id;
	order_id: number;
	listing_id: number;
	clutch_id: number | null;
	species_id: number | null;
	description: string;
	stage: ClutchStage | null;
	sex: Generated<Sex>;
	unit_size: Generated<number>;
	quantity: number;
	line_total_cents: number;
	is_live: boolean;
	restocked_quantity: Generated<number>;
}
export interface ReservationTable {
	id: Id;
	cart_id: string | null;
	order_id: number | null;
	listing_id: number;
	quantity: number;
	state: Generated<ReservationState>;
	expires_at: Timestamp;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface OrderEventTable {
	id: Id;
	order_id: number;
	from_state: OrderState | null;
	to_state: OrderState;
	actor_kind: ActorKind;
	actor_user_id: string | null;
	note: Generated<string>;
	created_at: CreatedAt;
}
export interface ShipCheckTable {
	id: Id;
	order_id: number | null;
	first_date: DateOnly;
	service: Service;
	decision: 'ship' | 'hold';
	ship_date: DateOnly | null;
	delivery_date: DateOnly | null;
	recheck_date: DateOnly | null;
	packs: Generated<Pack[]>;
	facility_pickup: Generated<boolean>;
	reasons: Generated<unknown>;
	inputs: unknown;
	rule_version: string;
	override_reason: string | null;
	overridden_by: string | null;
	checked_at: CreatedAt;
}
export interface ForecastCacheTable {
	location_key: string;
	latitude: Numeric;
	longitude: Numeric;
	daily: unknown;
	fetched_at: CreatedAt;
}
export interface ShipmentTable {
	id: Id;
	order_id: number;
	carrier: string;
	tracking_number: string | null;
	packs: Generated<Pack[]>;
	packed_at: Timestamp | null;
	shipped_at: Timestamp | null;
	expected_delivery_on: DateOnly | null;
	delivered_at: Timestamp | null;
	created_by: string | null;
	created_at: CreatedAt;
	/** The ship check the box was packed on. */
	ship_check_id: number | null;
	/** Who marked it delivered: a keeper, or a carrier tracking update. */
	delivered_by: 'keeper' | 'tracking' | null;
	/** When the customer was told the box is late (once per shipment). */
	late_notice_sent_at: Timestamp | null;
}
export type TrackingStatus = 'in_transit' | 'out_for_delivery' | 'delivered' | 'exception';
export interface TrackingEventTable {
	id: Id;
	shipment_id: number | null;
	carrier: string;
	tracking_number: string;
	status: TrackingStatus;
	occurred_at: Timestamp;
	received_at: CreatedAt;
	detail: Generated<string>;
}
export type SlipBatchState = 'queued' | 'running' | 'done' | 'failed';
export interface SlipBatchTable {
	id: Id;
	ship_on: DateOnly;
	order_ids: number[];
	paper: SlipPaper;
	state: Generated<SlipBatchState>;
	done_count: Generated<number>;
	pdf: Uint8Array | null;
	error: string | null;
	created_by: string | null;
	created_at: CreatedAt;
	finished_at: Timestamp | null;
}
export interface PaymentTable {
	id: Id;
	order_id: number;
	stripe_checkout_session_id: string;
	stripe_payment_intent_id: string | null;
	amount_cents: number;
	currency: Generated<string>;
	status: Generated<PaymentStatus>;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface PaymentEventTable {
	id: Id;
	stripe_event_id: string;
	type: string;
	order_id: number | null;
	payload: unknown;
	received_at: CreatedAt;
	processed_at: Timestamp | null;
}
export interface RefundTable {
	id: Id;
	order_id: number;
	payment_id: number;
	stripe_refund_id: string | null;
	idempotency_key: string;
	amount_cents: number;
	reason: string;
	status: Generated<RefundStatus>;
	created_by: string | null;
	created_at: CreatedAt;
	updated_at: UpdatedAt;
}
export interface RefundLineTable {
	refund_id: number;
	order_line_id: number;
	quantity: number;
	restock: Generated<boolean>;
}
export interface ClaimTable {
	id: Id;
	order_id: number;
	user_id: string | null;
	note: Generated<string>;
	state: Generated<ClaimState>;
	filed_at: CreatedAt;
	decided_at: Timestamp | null;
	decided_by: string | null;
	decision_note: Generated<string>;
	refund_id: number | null;
	reship_order_id: number | null;
}
export interface ClaimLineTable {
	claim_id: number;
	order_line_id: number;
	dead_count: number;
}
export interface WaitlistEntryTable {
	id: Id;
	species_id: number;
	user_id: string | null;
	email: string;
	confirmed_at: Timestamp | null;
	notified_at: Timestamp | null;
	/** sha-256 of a guest's confirmation link token; null once confirmed or for accounts. */
	confirm_token_hash: string | null;
	notified_listing_id: number | null;
	created_at: CreatedAt;
}
export interface AuditLogTable {
	/** bigint: parsed to a safe integer by connect.ts, never a float. */
	id: GeneratedAlways<number>;
	actor_user_id: string | null;
	actor_ip: string | null;
	action: string;
	entity: string;
	entity_id: string | null;
	detail: Generated<unknown>;
	created_at: CreatedAt;
}
export type MailStatus = 'queued' | 'sent' | 'failed';
export interface OutgoingMailTable {
	id: Id;
	kind: string;
	to_address: string;
	subject: string;
	html_body: string;
	text_body: string;
	status: Generated<MailStatus>;
	attempts: Generated<number>;
	last_error: string | null;
	created_at: CreatedAt;
	sent_at: Timestamp | null;
	updated_at: UpdatedAt;
}
/** Written only by rate-limiter-flexible. */
export interface RateLimitTable {
	key: string;
	points: number;
	expire: number | null;
}
export type AccountTokenPurpose = 'verify_email' | 'reset_password';
export interface AccountTokenTable {
	token_hash: string;
	purpose: AccountTokenPurpose;
	user_id: string;
	expires_at: Timestamp;
	used_at: Timestamp | null;
	created_at: CreatedAt;
}
/** Kysely's own bookkeeping, read by the health route. */
export interface KyselyMigrationTable {
	name: string;
	timestamp: string;
}

export interface Database {
	User: UserTable;
	Account: AccountTable;
	Session: SessionTable;
	VerificationToken: VerificationTokenTable;
	user_role: UserRoleTable;
	user_password: UserPasswordTable;
	user_profile: UserProfileTable;
	shop_setting: ShopSettingTable;
	species: SpeciesTable;
	colony: ColonyTable;
	care_log_entry: CareLogEntryTable;
	substrate_recipe: SubstrateRecipeTable;
	substrate_recipe_part: SubstrateRecipePartTable;
	resting_tub: RestingTubTable;
	tub_check: TubCheckTable;
	clutch: ClutchTable;
	clutch_event: ClutchEventTable;
	listing: ListingTable;
	price_tier: PriceTierTable;
	photo: PhotoTable;
	cart: CartTable;
	cart_line: CartLineTable;
	customer_order: CustomerOrderTable;
	order_line: OrderLineTable;
	reservation: ReservationTable;
	order_event: OrderEventTable;
	ship_check: ShipCheckTable;
	forecast_cache: ForecastCacheTable;
	shipment: ShipmentTable;
	tracking_event: TrackingEventTable;
	slip_batch: SlipBatchTable;
	payment: PaymentTable;
	payment_event: PaymentEventTable;
	refund: RefundTable;
	refund_line: RefundLineTable;
	claim: ClaimTable;
	claim_line: ClaimLineTable;
	waitlist_entry: WaitlistEntryTable;
	audit_log: AuditLogTable;
	outgoing_mail: OutgoingMailTable;
	rate_limit: RateLimitTable;
	account_token: AccountTokenTable;
	kysely_migration: KyselyMigrationTable;
}

export type Species = Selectable<SpeciesTable>;
export type NewSpecies = Insertable<SpeciesTable>;
export type SpeciesUpdate = Updateable<SpeciesTable>;
export type Colony = Selectable<ColonyTable>;
export type NewColony = Insertable<ColonyTable>;
export type ColonyUpdate = Updateable<ColonyTable>;
export type CareLogEntry = Selectable<CareLogEntryTable>;
export type NewCareLogEntry = Insertable<CareLogEntryTable>;
export type RestingTub = Selectable<RestingTubTable>;
export type NewRestingTub = Insertable<RestingTubTable>;
export type TubCheck = Selectable<TubCheckTable>;
export type Clutch = Selectable<ClutchTable>;
export type NewClutch = Insertable<ClutchTable>;
export type ClutchUpdate = Updateable<ClutchTable>;
export type Listing = Selectable<ListingTable>;
export type NewListing = Insertable<ListingTable>;
export type PriceTier = Selectable<PriceTierTable>;
export type CustomerOrder = Selectable<CustomerOrderTable>;
export type NewCustomerOrder = Insertable<CustomerOrderTable>;
export type OrderLine = Selectable<OrderLineTable>;
export type OrderEvent = Selectable<OrderEventTable>;
export type ShopSetting = Selectable<ShopSettingTable>;
export type AuditLogEntry = Selectable<AuditLogTable>;
export type NewAuditLogEntry = Insertable<AuditLogTable>;
