// The shop's one settings row (shop_setting): reads for every page, and the writes of
// the admin settings form, each in a transaction under a row lock with its audit entry.
import type { Db } from '$lib/server/db';
import type { ShopSetting } from '$lib/server/db/schema';
import { todayInZone } from '$lib/format/dates';
import { writeAudit, type Actor } from '$lib/server/audit';
import { lookUpZip } from '$lib/server/accounts/zip';
import {
	SETTINGS_LIMITS,
	FIELD_OF_COLUMN,
	normalizeWeekdays,
	readCalendarDate,
	rowThresholdProblems,
	settingChanges,
	shippingDefaults,
	type SettingChanges,
	type SettingsFormField,
	type ShopSettingValues
} from '$lib/shipping/settings-schema';

/** The column default of shop_setting.time_zone, used when no row exists yet. */
export const DEFAULT_SHOP_TIME_ZONE = 'America/New_York';

export async function readShopSetting(db: Db): Promise<ShopSetting | undefined> {
	return db.selectFrom('shop_setting').selectAll().where('id', '=', true).executeTakeFirst();
}

/** True when Intl knows the IANA zone name, so dates can be shown in it. */
export function isKnownTimeZone(timeZone: string): boolean {
	try {
		new Intl.DateTimeFormat('en-US', { timeZone });
		return true;
	} catch {
		return false;
	}
}

/**
 * The zone the shop shows times in: its setting, else the given fallback (the
 * SHOP_TIME_ZONE of .env), else the column default.
 */
export async function resolveShopTimeZone(db: Db, fallback?: string): Promise<string> {
	const row = await db
		.selectFrom('shop_setting')
		.select('time_zone')
		.where('id', '=', true)
		.executeTakeFirst();
	for (const candidate of [row?.time_zone, fallback]) {
		if (candidate && isKnownTimeZone(candidate)) return candidate;
	}
	return DEFAULT_SHOP_TIME_ZONE;
}

/** The shop's zone and the calendar date it is there now: "today" for every back-office form. */
export async function shopClock(
	db: Db,
	fallback?: string,
	now: Date = new Date()
): Promise<{ timeZone: string; today: string }> {
	const timeZone = await resolveShopTimeZone(db, fallback);
	return { timeZone, today: todayInZone(timeZone, now) };
}

export type SettingFieldErrors = Partial<Record<SettingsFormField, string>>;

export type SettingSaveOutcome =
	| { ok: true; setting: ShopSetting; changes: SettingChanges; created: boolean }
	| { ok: false; fieldErrors: SettingFieldErrors };

function within(value: number, range: { min: number; max: number }): boolean {
	return Number.isSafeInteger(value) && value >= range.min && value <= range.max;
}

function weekdaysProblem(days: readonly number[]): string | null {
	if (days.length === 0) return 'Tick at least one ship day.';
	return days.every((day) => within(day, { min: 1, max: 7 }))
		? null
		: 'Pick days from Monday to Sunday.';
}

/**
 * What the table's CHECKs would refuse, plus what only the server can know (a ZIP the
 * carrier and the forecast can place), as field errors: the form checks the same
 * things, and this keeps a caller that skipped it from a 500.
 */
export function settingValueProblems(values: ShopSettingValues): SettingFieldErrors {
	const errors: SettingFieldErrors = {};
	const { thresholdF, forecastHorizonDays, feeCents, reservationMinutes, claimWindowHours } =
		SETTINGS_LIMITS;
	if (values.shop_name.trim() === '') errors.shopName = 'Enter the shop’s name, as buyers see it.';
	if (!/^\d{5}$/.test(values.origin_zip)) {
		errors.originZip = 'Enter the five-digit ZIP code the boxes leave from.';
	} else if (!lookUpZip(values.origin_zip)) {
		errors.originZip = `ZIP ${values.origin_zip} is not a US ZIP code the ship check can place on the map.`;
	}
	if (!isKnownTimeZone(values.time_zone)) errors.timeZone = 'Choose a time zone from the list.';
	const overnight = weekdaysProblem(values.ship_weekdays_overnight);
	if (overnight) errors.shipWeekdaysOvernight = overnight;
	const twoDay = weekdaysProblem(values.ship_weekdays_two_day);
	if (twoDay) errors.shipWeekdaysTwoDay = twoDay;
	const badDate = values.extra_closed_dates.find((date) => readCalendarDate(date) !== date);
	if (badDate !== undefined) errors.extraClosedDates = `“${badDate}” is not a calendar date.`;
	for (const entry of [
		'hold_below_f',
		'heat_pack_below_f',
		'cold_pack_above_f',
		'hold_above_f'
	] as const) {
		if (!within(values[entry], thresholdF))
			errors[FIELD_OF_COLUMN[entry]] = `Enter ${thresholdF.min} to ${thresholdF.max} °F.`;
	}
	for (const problem of rowThresholdProblems(values)) errors[problem.field] ??= problem.message;
	if (!within(values.forecast_horizon_days, forecastHorizonDays))
		errors.forecastHorizonDays = `Enter ${forecastHorizonDays.min} to ${forecastHorizonDays.max} days.`;
	if (!within(values.fee_overnight_cents, feeCents))
		errors.feeOvernight = 'Enter the fee in dollars and cents, e.g. 45.00.';
	if (!within(values.fee_two_day_cents, feeCents))
		errors.feeTwoDay = 'Enter the fee in dollars and cents, e.g. 28.00.';
	if (!within(values.reservation_minutes, reservationMinutes))
		errors.reservationMinutes = `Enter ${reservationMinutes.min} to ${reservationMinutes.max} minutes.`;
	if (!within(values.claim_window_hours, claimWindowHours))
		errors.claimWindowHours = `Enter ${claimWindowHours.min} to ${claimWindowHours.max} hours.`;
	if (values.slip_paper !== 'letter' && values.slip_paper !== 'a4')
		errors.slipPaper = 'Choose US Letter or A4.';
	return errors;
}

async function lockedSetting(trx: Db): Promise<ShopSetting | undefined> {
	return trx
		.selectFrom('shop_setting')
		.selectAll()
		.where('id', '=', true)
		.forUpdate()
		.executeTakeFirst();
}

/** Writes only the columns in `changes`, and records them; nothing changed writes nothing. */
async function applyChanges(
	trx: Db,
	actor: Actor,
	before: ShopSetting,
	values: Partial<ShopSettingValues>,
	action: string
): Promise<{ setting: ShopSetting; changes: SettingChanges }> {
	const changes = settingChanges(before, values);
	const columns = Object.keys(changes) as Array<keyof ShopSettingValues>;
	if (columns.length === 0) return { setting: before, changes };
	const patch = Object.fromEntries(columns.map((column) => [column, values[column]]));
	const setting = await trx
		.updateTable('shop_setting')
		.set({ ...patch, updated_at: new Date() })
		.where('id', '=', true)
		.returningAll()
		.executeTakeFirstOrThrow();
	await writeAudit(trx, {
		actorUserId: actor.userId,
		actorIp: actor.ip,
		action,
		entity: 'shop_setting',
		entityId: null,
		detail: { changes }
	});
	return { setting, changes };
}

/**
 * Saves the settings form. Under a lock on the row, compares with what is stored and
 * writes (and audits as 'settings.update', with from/to of each changed column) only
 * what changed. A shop with no row yet gets one.
 */
export async function updateShopSetting(
	db: Db,
	actor: Actor,
	values: ShopSettingValues
): Promise<SettingSaveOutcome> {
	const fieldErrors = settingValueProblems(values);
	if (Object.keys(fieldErrors).length > 0) return { ok: false, fieldErrors };
	// Weekdays and dates are sets: stored each once, in order, however they came.
	const normalized: ShopSettingValues = {
		...values,
		ship_weekdays_overnight: normalizeWeekdays(values.ship_weekdays_overnight),
		ship_weekdays_two_day: normalizeWeekdays(values.ship_weekdays_two_day),
		extra_closed_dates: [...new Set(values.extra_closed_dates)].sort()
	};
	return db.transaction().execute(async (trx): Promise<SettingSaveOutcome> => {
		let before = await lockedSetting(trx);
		if (!before) {
			const created = await trx
				.insertInto('shop_setting')
				.values({ id: true, ...normalized })
				.onConflict((oc) => oc.column('id').doNothing())
				.returningAll()
				.executeTakeFirst();
			if (created) {
				const changes: SettingChanges = Object.fromEntries(
					Object.entries(normalized).map(([column, value]) => [column, { from: null, to: value }])
				);
				await writeAudit(trx, {
					actorUserId: actor.userId,
					actorIp: actor.ip,
					action: 'settings.update',
					entity: 'shop_setting',
					entityId: null,
					detail: { created: true, changes }
				});
				return { ok: true, setting: created, changes, created: true };
			}
			// Another admin created the row a moment ago: save over theirs like any edit.
			before = await lockedSetting(trx);
			if (!before) throw new Error('shop_setting vanished while being created');
		}
		const saved = await applyChanges(trx, actor, before, normalized, 'settings.update');
		return { ok: true, ...saved, created: false };
	});
}

/**
 * Puts the four weather limits and both services' ship weekdays back to the general-
 * practice defaults (src/lib/shipping/defaults.ts), audited as 'settings.restore_defaults'.
 * Null when the shop has no settings row to change.
 */
export async function restoreShippingDefaults(
	db: Db,
	actor: Actor
): Promise<{ setting: ShopSetting; changes: SettingChanges } | null> {
	return db.transaction().execute(async (trx) => {
		const before = await lockedSetting(trx);
		if (!before) return null;
		return applyChanges(trx, actor, before, shippingDefaults(), 'settings.restore_defaults');
	});
}
