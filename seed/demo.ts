// Writes the demo scenario of Mossback Hollow Inverts into the database, in one
// transaction. Idempotent: each parent row is found by its natural key and inserted only
// if missing, and child rows are added only under parents inserted by this same run.
import { basePriceCents } from '../src/lib/money/pricing';
import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../src/lib/server/db/schema';
import { hashPassword } from '../src/lib/server/auth/passwords';
import {
	DEMO_ACCOUNTS,
	DEMO_JOINED_DAYS_AGO,
	DEMO_PASSWORD,
	DEMO_SHIP_ADDRESSES
} from './accounts';
import { addDays, assertIsoDate, instantOn } from './dates';
import { buildSales, DEMO_SHOP } from './sales';
import { DEMO_SPECIES, HOUSE_MIX } from './species';
import { buildStock } from './stock';

/** Tables the demo writes, in the order it writes them; the result counts rows per table. */
export const DEMO_TABLES = [
	'User',
	'user_role',
	'user_profile',
	'user_password',
	'shop_setting',
	'species',
	'substrate_recipe',
	'substrate_recipe_part',
	'colony',
	'care_log_entry',
	'resting_tub',
	'tub_check',
	'clutch',
	'clutch_event',
	'listing',
	'price_tier',
	'customer_order',
	'order_line',
	'order_event',
	'payment',
	'ship_check',
	'shipment',
	'refund',
	'refund_line',
	'claim',
	'claim_line',
	'waitlist_entry'
] as const;
export type DemoTable = (typeof DEMO_TABLES)[number];

// Well under PostgreSQL's 65,535 bind parameters per statement for every table here.
const BATCH_ROWS = 500;

async function inBatches<T, R>(
	rows: readonly T[],
	insert: (batch: T[]) => Promise<R[]>
): Promise<R[]> {
	const inserted: R[] = [];
	for (let i = 0; i < rows.length; i += BATCH_ROWS) {
		inserted.push(...(await insert(rows.slice(i, i + BATCH_ROWS))));
	}
	return inserted;
}

/** created_at-style columns take a Date on insert; the ISO text is fixed by `today`, not the clock. */
function instant(iso: string): Date {
	return new Date(iso);
}

function required<K, V>(map: ReadonlyMap<K, V>, key: K, what: string): V {
	const value = map.get(key);
	if (value === undefined) throw new Error(`demo seed: no ${what} ${String(key)}`);
	return value;
}

export async function seedDemo(
	db: Kysely<Database>,
	opts: { today: string }
): Promise<Record<string, number>> {
	const today = assertIsoDate(opts.today);
	const stock = buildStock(today);
	const sales = buildSales(today, stock);
	return db.transaction().execute((trx) => writeDemo(trx, today, stock, sales));
}

async function writeDemo(
	trx: Transaction<Database>,
	today: string,
	stock: ReturnType<typeof buildStock>,
	sales: ReturnType<typeof buildSales>
): Promise<Record<string, number>> {
	const counts = Object.fromEntries(DEMO_TABLES.map((t) => [t, 0])) as Record<DemoTable, number>;
	const daysAgoAt = (days: number, time: string) => instantOn(addDays(today, -days), time);

	// ---- people
	const joinedAt = (email: string) => daysAgoAt(DEMO_JOINED_DAYS_AGO[email] ?? 0, '15:00');
	const newUsers = await trx
		.insertInto('User')
		.values(
			DEMO_ACCOUNTS.map((a) => ({ email: a.email, name: a.name, emailVerified: joinedAt(a.email) }))
		)
		.onConflict((oc) => oc.column('email').doNothing())
		.returning(['id', 'email'])
		.execute();
	counts.User = newUsers.length;
	const userIdByEmail = new Map(
		(
			await trx
				.selectFrom('User')
				.select(['id', 'email'])
				.where(
					'email',
					'in',
					DEMO_ACCOUNTS.map((a) => a.email)
				)
				.execute()
		).map((u) => [u.email, u.id])
	);
	const userId = (email: string | null) => (email ? (userIdByEmail.get(email) ?? null) : null);
	const newUserEmails = new Set(newUsers.map((u) => u.email));
	const newAccounts = DEMO_ACCOUNTS.filter((a) => newUserEmails.has(a.email));
	const waitlisted = new Set(sales.waitlist.map((w) => w.email));

	if (newAccounts.length > 0) {
		const roles = await trx
			.insertInto('user_role')
			.values(
				newAccounts.map((a) => ({
					user_id: required(userIdByEmail, a.email, 'user'),
					role: a.role,
					created_at: instant(joinedAt(a.email)),
					updated_at: joinedAt(a.email)
				}))
			)
			.returning('user_id')
			.execute();
		counts.user_role = roles.length;
		// Every demo account signs in with the one demo password (README); hashed once, it keeps the seed quick.
		const passwordHash = await hashPassword(DEMO_PASSWORD);
		const passwords = await trx
			.insertInto('user_password')
			.values(
				newAccounts.map((a) => ({
					user_id: required(userIdByEmail, a.email, 'user'),
					password_hash: passwordHash,
					updated_at: joinedAt(a.email)
				}))
			)
			.returning('user_id')
			.execute();
		counts.user_password = passwords.length;
	}
	const newCustomers = newAccounts.filter((a) => a.role === 'customer' && a.zip);
	if (newCustomers.length > 0) {
		const profiles = await trx
			.insertInto('user_profile')
			.values(
				newCustomers.map((a) => {
					const address = DEMO_SHIP_ADDRESSES[a.email];
					return {
						user_id: required(userIdByEmail, a.email, 'user'),
						ship_name: a.name,
						ship_line1: address?.line1 ?? null,
						ship_line2: address?.line2 ?? null,
						ship_city: address?.city ?? null,
						ship_state: address?.state ?? null,
						ship_zip: a.zip ?? null,
						wants_waitlist_mail: waitlisted.has(a.email),
						wants_stock_news: a.climate === 'mild',
						updated_at: joinedAt(a.email)
					};
				})
			)
			.returning('user_id')
			.execute();
		counts.user_profile = profiles.length;
	}

	// ---- shop settings: one row; thresholds, ship days and fees stay at their defaults.
	const settings = await trx
		.insertInto('shop_setting')
		.values({
			shop_name: DEMO_SHOP.name,
			origin_zip: DEMO_SHOP.originZip,
			time_zone: DEMO_SHOP.timeZone,
			updated_at: daysAgoAt(560, '16:00')
		})
		.onConflict((oc) => oc.column('id').doNothing())
		.returning('id')
		.execute();
	counts.shop_setting = settings.length;

	// ---- species
	const speciesCreatedAt = daysAgoAt(560, '16:30');
	const newSpecies = await trx
		.insertInto('species')
		.values(
			DEMO_SPECIES.map((s) => ({
				slug: s.slug,
				scientific_name: s.scientificName,
				common_name: s.commonName,
				animal_group: s.group,
				summary: s.summary,
				temp_low_f: s.tempLowF,
				temp_ideal_low_f: s.tempIdealLowF,
				temp_ideal_high_f: s.tempIdealHighF,
				temp_high_f: s.tempHighF,
				moisture_level: s.moisture,
				substrate_notes: s.substrateNotes,
				diet: s.diet,
				adult_length_mm: s.adultLengthMm,
				handling_notes: s.handlingNotes,
				cautions: s.cautions,
				grow_out_weeks: s.growOutWeeks,
				refresh_interval_days: s.refreshIntervalDays,
				tub_hold_days: s.tubHoldDays,
				created_at: instant(speciesCreatedAt),
				updated_at: speciesCreatedAt
			}))
		)
		.onConflict((oc) => oc.column('slug').doNothing())
		.returning('id')
		.execute();
	counts.species = newSpecies.length;
	const speciesIdBySlug = new Map(
		(
			await trx
				.selectFrom('species')
				.select(['id', 'slug'])
				.where(
					'slug',
					'in',
					DEMO_SPECIES.map((s) => s.slug)
				)
				.execute()
		).map((s) => [s.slug, s.id])
	);
	const speciesId = (slug: string) => required(speciesIdBySlug, slug, 'species');

	// ---- the house substrate recipe (default only if the shop has no other default yet)
	const otherDefault = await trx
		.selectFrom('substrate_recipe')
		.select('id')
		.where('is_default', '=', true)
		.where('name', '<>', HOUSE_MIX.name)
		.executeTakeFirst();
	const recipe = await trx
		.insertInto('substrate_recipe')
		.values({
			name: HOUSE_MIX.name,
			is_default: !otherDefault,
			notes: HOUSE_MIX.notes,
			updated_at: speciesCreatedAt
		})
		.onConflict((oc) => oc.column('name').doNothing())
		.returning('id')
		.executeTakeFirst();
	if (recipe) {
		counts.substrate_recipe = 1;
		const parts = await trx
			.insertInto('substrate_recipe_part')
			.values(
				HOUSE_MIX.parts.map((p, position) => ({
					recipe_id: recipe.id,
					position,
					ingredient: p.ingredient,
					parts_numerator: p.numerator,
					parts_denominator: p.denominator
				}))
			)
			.returning('id')
			.execute();
		counts.substrate_recipe_part = parts.length;
	}

	// ---- colonies and their care log
	const newColonies = await trx
		.insertInto('colony')
		.values(
			stock.colonies.map((c) => ({
				code: c.code,
				species_id: speciesId(c.speciesSlug),
				name: c.name,
				enclosure_length_in: c.lengthIn,
				enclosure_width_in: c.widthIn,
				substrate_depth_in: c.depthIn,
				founders_count: c.foundersCount,
				founders_note: c.foundersNote,
				generation: c.generation,
				started_on: c.startedOn,
				retired_on: c.retiredOn,
				notes: c.notes,
				created_at: instant(c.createdAt),
				updated_at: c.createdAt
			}))
		)
		.onConflict((oc) => oc.column('code').doNothing())
		.returning('code')
		.execute();
	counts.colony = newColonies.length;
	const colonyIdByCode = new Map(
		(
			await trx
				.selectFrom('colony')
				.select(['id', 'code'])
				.where(
					'code',
					'in',
					stock.colonies.map((c) => c.code)
				)
				.execute()
		).map((c) => [c.code, c.id])
	);
	const colonyId = (code: string) => required(colonyIdByCode, code, 'colony');
	const newColonyCodes = new Set(newColonies.map((c) => c.code));
	const careRows = stock.careLog
		.filter((e) => newColonyCodes.has(e.colonyCode))
		.map((e) => ({
			colony_id: colonyId(e.colonyCode),
			kind: e.kind,
			logged_on: e.loggedOn,
			moisture_reading: e.moistureReading,
			census_count: e.censusCount,
			note: e.note,
			created_by: userId(e.byEmail),
			created_at: instant(e.at),
			updated_at: e.at
		}));
	counts.care_log_entry = (
		await inBatches(careRows, (batch) =>
			trx.insertInto('care_log_entry').values(batch).returning('id').execute()
		)
	).length;

	// ---- resting tubs, tied to the refresh entry their substrate came from
	const tubColonyIds = [...new Set(stock.tubs.map((t) => colonyId(t.colonyCode)))];
	const refreshEntries =
		tubColonyIds.length === 0
			? []
			: await trx
					.selectFrom('care_log_entry')
					.select(['id', 'colony_id', 'logged_on'])
					.where('kind', 'in', ['substrate_refresh_half', 'substrate_refresh_full'])
					.where('colony_id', 'in', tubColonyIds)
					.orderBy('id')
					.execute();
	const takenSources = new Set(
		(
			await trx
				.selectFrom('resting_tub')
				.select('source_entry_id')
				.where('source_entry_id', 'is not', null)
				.execute()
		).map((t) => t.source_entry_id)
	);
	const refreshEntryId = new Map<string, number>();
	for (const e of refreshEntries) {
		const key = `${e.colony_id}|${e.logged_on}`;
		if (!refreshEntryId.has(key) && !takenSources.has(e.id)) refreshEntryId.set(key, e.id);
	}
	const newTubs = await trx
		.insertInto('resting_tub')
		.values(
			stock.tubs.map((t) => ({
				code: t.code,
				colony_id: colonyId(t.colonyCode),
				source_entry_id:
					refreshEntryId.get(`${colonyId(t.colonyCode)}|${t.sourceRefreshOn}`) ?? null,
				started_on: t.startedOn,
				hold_until: t.holdUntil,
				state: t.state,
				closed_on: t.closedOn,
				note: t.note,
				created_at: instant(t.createdAt),
				updated_at: t.closedOn ? instantOn(t.closedOn, '15:05') : t.createdAt
			}))
		)
		.onConflict((oc) => oc.column('code').doNothing())
		.returning(['id', 'code'])
		.execute();
	counts.resting_tub = newTubs.length;
	const newTubIdByCode = new Map(newTubs.map((t) => [t.code, t.id]));
	const tubCheckRows = stock.tubs.flatMap((t) => {
		const tubId = newTubIdByCode.get(t.code);
		if (tubId === undefined) return [];
		return t.checks.map((c) => ({
			tub_id: tubId,
			checked_on: c.checkedOn,
			young_found: c.youngFound,
			eggs_seen: c.eggsSeen,
			note: c.note,
			created_by: userId(c.byEmail),
			created_at: instant(c.at)
		}));
	});
	if (tubCheckRows.length > 0) {
		counts.tub_check = (
			await trx.insertInto('tub_check').values(tubCheckRows).returning('id').execute()
		).length;
	}
	const tubIdByCode = new Map(
		(
			await trx
				.selectFrom('resting_tub')
				.select(['id', 'code'])
				.where(
					'code',
					'in',
					stock.tubs.map((t) => t.code)
				)
				.execute()
		).map((t) => [t.code, t.id])
	);

	// ---- clutches and their history
	const newClutches = await trx
		.insertInto('clutch')
		.values(
			stock.clutches.map((c) => ({
				code: c.code,
				species_id: speciesId(c.speciesSlug),
				tub_id: c.tubCode ? required(tubIdByCode, c.tubCode, 'resting tub') : null,
				origin: c.origin,
				generation: c.generation,
				found_on: c.foundOn,
				stage: c.stage,
				size_class: c.sizeClass,
				count_found: c.countFound,
				count_alive: c.countAlive,
				count_lost: c.countLost,
				state: c.state,
				paused_reason: c.pausedReason,
				sale_ready_on: c.saleReadyOn,
				note: c.note,
				created_at: instant(c.createdAt),
				updated_at: c.events.at(-1)?.at ?? c.createdAt
			}))
		)
		.onConflict((oc) => oc.column('code').doNothing())
		.returning(['id', 'code'])
		.execute();
	counts.clutch = newClutches.length;
	const newClutchIdByCode = new Map(newClutches.map((c) => [c.code, c.id]));
	const clutchEventRows = stock.clutches.flatMap((c) => {
		const clutchId = newClutchIdByCode.get(c.code);
		if (clutchId === undefined) return [];
		return c.events.map((e) => ({
			clutch_id: clutchId,
			kind: e.kind,
			from_value: e.fromValue,
			to_value: e.toValue,
			count_delta: e.countDelta,
			reason: e.reason,
			happened_on: e.happenedOn,
			actor_user_id: userId(e.byEmail),
			created_at: instant(e.at)
		}));
	});
	if (clutchEventRows.length > 0) {
		counts.clutch_event = (
			await trx.insertInto('clutch_event').values(clutchEventRows).returning('id').execute()
		).length;
	}
	const clutchIdByCode = new Map(
		(
			await trx
				.selectFrom('clutch')
				.select(['id', 'code'])
				.where(
					'code',
					'in',
					stock.clutches.map((c) => c.code)
				)
				.execute()
		).map((c) => [c.code, c.id])
	);
	const clutchId = (code: string | null) =>
		code === null ? null : required(clutchIdByCode, code, 'clutch');

	// ---- listings and price tiers
	const newListings = await trx
		.insertInto('listing')
		.values(
			sales.listings.map((l) => ({
				slug: l.slug,
				kind: l.kind,
				species_id: l.speciesSlug ? speciesId(l.speciesSlug) : null,
				clutch_id: clutchId(l.clutchCode),
				title: l.title,
				description: l.description,
				unit_size: l.unitSize,
				sex: l.sex,
				is_live: l.isLive,
				state: l.state,
				supply_stock: l.supplyStock,
				base_price_cents: basePriceCents(l.tiers, l.unitSize),
				published_at: l.publishedAt,
				created_at: instant(l.createdAt),
				updated_at: l.publishedAt ?? l.createdAt
			}))
		)
		.onConflict((oc) => oc.column('slug').doNothing())
		.returning(['id', 'slug'])
		.execute();
	counts.listing = newListings.length;
	const newListingIdBySlug = new Map(newListings.map((l) => [l.slug, l.id]));
	const tierRows = sales.listings.flatMap((l) => {
		const listingId = newListingIdBySlug.get(l.slug);
		if (listingId === undefined) return [];
		return l.tiers.map((t) => ({
			listing_id: listingId,
			min_quantity: t.minQuantity,
			price_cents: t.priceCents
		}));
	});
	if (tierRows.length > 0) {
		counts.price_tier = (
			await trx.insertInto('price_tier').values(tierRows).returning('id').execute()
		).length;
	}
	const listingIdBySlug = new Map(
		(
			await trx
				.selectFrom('listing')
				.select(['id', 'slug'])
				.where(
					'slug',
					'in',
					sales.listings.map((l) => l.slug)
				)
				.execute()
		).map((l) => [l.slug, l.id])
	);

	// ---- orders and everything that hangs off them
	const newOrders = await trx
		.insertInto('customer_order')
		.values(
			sales.orders.map((o) => ({
				order_number: o.number,
				user_id: userId(o.userEmail),
				email: o.userEmail,
				ship_name: o.shipName,
				ship_line1: o.shipLine1,
				ship_line2: o.shipLine2,
				ship_city: o.shipCity,
				ship_state: o.shipState,
				ship_zip: o.shipZip,
				service: o.service,
				state: o.state,
				subtotal_cents: o.subtotalCents,
				shipping_cents: o.shippingCents,
				total_cents: o.totalCents,
				paid_cents: o.paidCents,
				refunded_cents: o.refundedCents,
				ship_on: o.shipOn,
				delivered_at: o.deliveredAt,
				terms_accepted_at: o.termsAcceptedAt,
				created_at: instant(o.createdAt),
				updated_at: o.updatedAt
			}))
		)
		.onConflict((oc) => oc.column('order_number').doNothing())
		.returning(['id', 'order_number'])
		.execute();
	counts.customer_order = newOrders.length;
	const orderIdByNumber = new Map(newOrders.map((o) => [o.order_number, o.id]));
	const orders = sales.orders.flatMap((o) => {
		const id = orderIdByNumber.get(o.number);
		return id === undefined ? [] : [{ id, order: o }];
	});
	if (orders.length === 0) {
		return {
			...counts,
			waitlist_entry: await addWaitlist(trx, sales, newUserEmails, userId, speciesId)
		};
	}

	// A listing appears at most once per order, so (order, listing) finds each inserted line.
	const lineKey = (orderId: number, listingId: number) => `${orderId}:${listingId}`;
	const lineRows = orders.flatMap(({ id, order }) =>
		order.lines.map((l) => ({
			order_id: id,
			listing_id: required(listingIdBySlug, l.listingSlug, 'listing'),
			clutch_id: clutchId(l.clutchCode),
			species_id: l.speciesSlug ? speciesId(l.speciesSlug) : null,
			description: l.description,
			stage: l.stage,
			sex: l.sex,
			unit_size: l.unitSize,
			quantity: l.quantity,
			line_total_cents: l.lineTotalCents,
			is_live: l.isLive,
			restocked_quantity: l.restockedQuantity
		}))
	);
	if (new Set(lineRows.map((l) => lineKey(l.order_id, l.listing_id))).size !== lineRows.length) {
		throw new Error('demo seed: an order lists the same listing twice');
	}
	const insertedLines = await trx
		.insertInto('order_line')
		.values(lineRows)
		.returning(['id', 'order_id', 'listing_id'])
		.execute();
	counts.order_line = insertedLines.length;
	const lineIdByKey = new Map(insertedLines.map((l) => [lineKey(l.order_id, l.listing_id), l.id]));
	const lineId = (orderId: number, lineIndex: number, order: (typeof orders)[number]['order']) => {
		const line = order.lines[lineIndex];
		if (!line) throw new Error(`demo seed: ${order.number} has no line ${lineIndex}`);
		const listingId = required(listingIdBySlug, line.listingSlug, 'listing');
		return required(lineIdByKey, lineKey(orderId, listingId), 'order line');
	};

	counts.order_event = (
		await trx
			.insertInto('order_event')
			.values(
				orders.flatMap(({ id, order }) =>
					order.events.map((e) => ({
						order_id: id,
						from_state: e.fromState,
						to_state: e.toState,
						actor_kind: e.actorKind,
						actor_user_id: userId(e.actorEmail),
						note: e.note,
						created_at: instant(e.at)
					}))
				)
			)
			.returning('id')
			.execute()
	).length;

	const payments = await trx
		.insertInto('payment')
		.values(
			orders.map(({ id, order }) => ({
				order_id: id,
				stripe_checkout_session_id: order.payment.checkoutSessionId,
				stripe_payment_intent_id: order.payment.paymentIntentId,
				amount_cents: order.payment.amountCents,
				currency: 'usd',
				status: order.payment.status,
				created_at: instant(order.payment.createdAt),
				updated_at: order.payment.updatedAt
			}))
		)
		.returning(['id', 'order_id'])
		.execute();
	counts.payment = payments.length;
	const paymentIdByOrder = new Map(payments.map((p) => [p.order_id, p.id]));

	const shipCheckRows = orders.flatMap(({ id, order }) =>
		order.shipChecks.map((c) => ({
			order_id: id,
			first_date: c.firstDate,
			service: c.service,
			decision: c.decision,
			ship_date: c.shipDate,
			delivery_date: c.deliveryDate,
			recheck_date: c.recheckDate,
			packs: c.packs,
			facility_pickup: c.facilityPickup,
			// jsonb goes over the wire as text: pg would turn a JS array into a PostgreSQL array.
			reasons: JSON.stringify(c.reasons),
			inputs: JSON.stringify(c.inputs),
			rule_version: 'demo',
			checked_at: instant(c.checkedAt)
		}))
	);
	if (shipCheckRows.length > 0) {
		counts.ship_check = (
			await trx.insertInto('ship_check').values(shipCheckRows).returning('id').execute()
		).length;
	}

	const shipmentRows = orders.flatMap(({ id, order }) => {
		const s = order.shipment;
		if (!s) return [];
		return [
			{
				order_id: id,
				carrier: s.carrier,
				tracking_number: s.trackingNumber,
				packs: s.packs,
				packed_at: s.packedAt,
				shipped_at: s.shippedAt,
				expected_delivery_on: s.expectedDeliveryOn,
				delivered_at: s.deliveredAt,
				created_by: userId(s.byEmail),
				created_at: instant(s.createdAt)
			}
		];
	});
	if (shipmentRows.length > 0) {
		counts.shipment = (
			await trx.insertInto('shipment').values(shipmentRows).returning('id').execute()
		).length;
	}

	const refundOrders = orders.filter(({ order }) => order.refund !== null);
	const refundIdByOrder = new Map<number, number>();
	if (refundOrders.length > 0) {
		const refunds = await trx
			.insertInto('refund')
			.values(
				refundOrders.map(({ id, order }) => {
					const r = order.refund as NonNullable<typeof order.refund>;
					return {
						order_id: id,
						payment_id: required(paymentIdByOrder, id, 'payment of order'),
						stripe_refund_id: r.stripeRefundId,
						idempotency_key: r.idempotencyKey,
						amount_cents: r.amountCents,
						reason: r.reason,
						status: 'succeeded' as const,
						created_by: userId(r.byEmail),
						created_at: instant(r.at),
						updated_at: r.at
					};
				})
			)
			.returning(['id', 'order_id'])
			.execute();
		counts.refund = refunds.length;
		for (const r of refunds) refundIdByOrder.set(r.order_id, r.id);
		const refundLineRows = refundOrders.flatMap(({ id, order }) =>
			(order.refund?.lines ?? []).map((l) => ({
				refund_id: required(refundIdByOrder, id, 'refund of order'),
				order_line_id: lineId(id, l.lineIndex, order),
				quantity: l.quantity,
				restock: l.restock
			}))
		);
		if (refundLineRows.length > 0) {
			counts.refund_line = (
				await trx.insertInto('refund_line').values(refundLineRows).returning('refund_id').execute()
			).length;
		}
	}

	const claimOrders = orders.filter(({ order }) => order.claim !== null);
	if (claimOrders.length > 0) {
		const claims = await trx
			.insertInto('claim')
			.values(
				claimOrders.map(({ id, order }) => {
					const c = order.claim as NonNullable<typeof order.claim>;
					return {
						order_id: id,
						user_id: userId(c.userEmail),
						note: c.note,
						state: c.state,
						filed_at: instant(c.filedAt),
						decided_at: c.decidedAt,
						decided_by: userId(c.decidedByEmail),
						decision_note: c.decisionNote,
						refund_id: c.usesRefund ? required(refundIdByOrder, id, 'refund of order') : null
					};
				})
			)
			.returning(['id', 'order_id'])
			.execute();
		counts.claim = claims.length;
		const claimIdByOrder = new Map(claims.map((c) => [c.order_id, c.id]));
		const claimLineRows = claimOrders.flatMap(({ id, order }) =>
			(order.claim?.lines ?? []).map((l) => ({
				claim_id: required(claimIdByOrder, id, 'claim of order'),
				order_line_id: lineId(id, l.lineIndex, order),
				dead_count: l.deadCount
			}))
		);
		if (claimLineRows.length > 0) {
			counts.claim_line = (
				await trx.insertInto('claim_line').values(claimLineRows).returning('claim_id').execute()
			).length;
		}
	}

	counts.waitlist_entry = await addWaitlist(trx, sales, newUserEmails, userId, speciesId);
	return counts;
}

/** Waitlist entries belong to their customer: added only with a customer this run created. */
async function addWaitlist(
	trx: Transaction<Database>,
	sales: ReturnType<typeof buildSales>,
	newUserEmails: ReadonlySet<string>,
	userId: (email: string | null) => string | null,
	speciesId: (slug: string) => number
): Promise<number> {
	const rows = sales.waitlist
		.filter((w) => newUserEmails.has(w.email))
		.map((w) => ({
			species_id: speciesId(w.speciesSlug),
			user_id: userId(w.email),
			email: w.email,
			confirmed_at: w.confirmedAt,
			created_at: instant(w.createdAt)
		}));
	if (rows.length === 0) return 0;
	const inserted = await trx
		.insertInto('waitlist_entry')
		.values(rows)
		.onConflict((oc) => oc.columns(['species_id', 'email']).doNothing())
		.returning('id')
		.execute();
	return inserted.length;
}
