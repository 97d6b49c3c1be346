// Loads what the "due today" list is computed from: active colonies with their last
// refresh, moisture check and molt; resting tubs with their last check; growing
// clutches near their projection. One aggregate query each; the rules are pure.
import type { Db } from '$lib/server/db';
import type { IsoDate } from '$lib/format/dates';
import { clutchesDueSoon } from '$lib/server/stock/pipeline';
import { dueToday, SALE_READY_WINDOW_DAYS, type DueToday } from '$lib/care/due-today';

export async function loadDueToday(db: Db, today: IsoDate): Promise<DueToday> {
	const [colonies, tubs, clutches] = await Promise.all([
		db
			.selectFrom('colony as c')
			.innerJoin('species as s', 's.id', 'c.species_id')
			.leftJoin('care_log_entry as e', 'e.colony_id', 'c.id')
			.select((eb) => [
				'c.code',
				'c.name',
				'c.started_on',
				's.common_name',
				's.refresh_interval_days',
				's.molt_quiet_days',
				eb.fn
					.max<IsoDate | null>('e.logged_on')
					.filterWhere('e.kind', 'in', ['substrate_refresh_half', 'substrate_refresh_full'])
					.as('last_refresh'),
				eb.fn
					.max<IsoDate | null>('e.logged_on')
					.filterWhere('e.kind', '=', 'moisture_check')
					.as('last_moisture'),
				eb.fn
					.max<IsoDate | null>('e.logged_on')
					.filterWhere('e.kind', '=', 'molt_seen')
					.as('last_molt')
			])
			.where('c.retired_on', 'is', null)
			.groupBy(['c.id', 's.id'])
			.execute(),
		db
			.selectFrom('resting_tub as t')
			.innerJoin('colony as c', 'c.id', 't.colony_id')
			.innerJoin('species as s', 's.id', 'c.species_id')
			.leftJoin('tub_check as k', 'k.tub_id', 't.id')
			.select((eb) => [
				't.code',
				'c.code as colony_code',
				's.common_name',
				't.started_on',
				't.hold_until',
				eb.fn.max<IsoDate | null>('k.checked_on').as('last_check')
			])
			.where('t.state', '=', 'resting')
			.groupBy(['t.id', 'c.id', 's.id'])
			.execute(),
		clutchesDueSoon(db, today, SALE_READY_WINDOW_DAYS)
	]);
	return dueToday(
		{
			colonies: colonies.map((row) => ({
				code: row.code,
				name: row.name,
				speciesName: row.common_name,
				startedOn: row.started_on,
				refreshIntervalDays: row.refresh_interval_days,
				moltQuietDays: row.molt_quiet_days,
				lastRefreshOn: row.last_refresh,
				lastMoistureCheckOn: row.last_moisture,
				lastMoltSeenOn: row.last_molt
			})),
			tubs: tubs.map((row) => ({
				code: row.code,
				colonyCode: row.colony_code,
				speciesName: row.common_name,
				startedOn: row.started_on,
				holdUntil: row.hold_until,
				lastCheckOn: row.last_check
			})),
			clutches: clutches.map((row) => ({
				code: row.code,
				speciesName: row.speciesCommonName,
				countAlive: row.countAlive,
				saleReadyOn: row.saleReadyOn
			}))
		},
		today
	);
}
