// Reads the shop's one settings row (shop_setting). Writes arrive with the settings form.
import type { Db } from '$lib/server/db';
import type { ShopSetting } from '$lib/server/db/schema';
import { todayInZone } from '$lib/format/dates';

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
