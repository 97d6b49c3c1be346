// The keeper's overview: how many colonies, tubs, clutches and orders stand in each state.
import type { Db } from '$lib/server/db';
import type { ClutchState, OrderState, TubState } from '$lib/server/db/schema';
import { statesOf } from '$lib/format/labels';
import { todayInZone, type IsoDate } from '$lib/format/dates';
import { resolveShopTimeZone } from './settings';

export interface StateCount<S extends string> {
	state: S;
	count: number;
}

export interface KeeperOverview {
	timeZone: string;
	today: IsoDate;
	speciesCount: number;
	activeColonies: number;
	retiredColonies: number;
	/** Resting tubs whose hold period has ended: they are due a last check. */
	tubsPastHold: number;
	/** Juveniles counted alive in clutches not yet sold out. */
	animalsGrowing: number;
	tubs: StateCount<TubState>[];
	clutches: StateCount<ClutchState>[];
	orders: StateCount<OrderState>[];
}

/** Every state of a kind in life-cycle order, with zero where the database has none. */
function fillStates<S extends string>(
	states: readonly S[],
	rows: readonly { state: S; count: number | string }[]
): StateCount<S>[] {
	const counts = new Map(rows.map((row) => [row.state, Number(row.count)]));
	return states.map((state) => ({ state, count: counts.get(state) ?? 0 }));
}

export async function loadKeeperOverview(
	db: Db,
	options: { now?: Date; fallbackTimeZone?: string } = {}
): Promise<KeeperOverview> {
	const timeZone = await resolveShopTimeZone(db, options.fallbackTimeZone);
	const today = todayInZone(timeZone, options.now);

	const [species, colonies, tubRows, pastHold, clutchRows, growing, orderRows] = await Promise.all([
		db
			.selectFrom('species')
			.select((eb) => eb.fn.countAll<number>().as('count'))
			.executeTakeFirstOrThrow(),
		db
			.selectFrom('colony')
			.select((eb) => [
				eb.fn.countAll<number>().filterWhere('retired_on', 'is', null).as('active'),
				eb.fn.countAll<number>().filterWhere('retired_on', 'is not', null).as('retired')
			])
			.executeTakeFirstOrThrow(),
		db
			.selectFrom('resting_tub')
			.select((eb) => ['state', eb.fn.countAll<number>().as('count')])
			.groupBy('state')
			.execute(),
		db
			.selectFrom('resting_tub')
			.select((eb) => eb.fn.countAll<number>().as('count'))
			.where('state', '=', 'resting')
			.where('hold_until', '<=', today)
			.executeTakeFirstOrThrow(),
		db
			.selectFrom('clutch')
			.select((eb) => ['state', eb.fn.countAll<number>().as('count')])
			.groupBy('state')
			.execute(),
		db
			.selectFrom('clutch')
			.select((eb) => eb.fn.coalesce(eb.fn.sum<number>('count_alive'), eb.lit(0)).as('alive'))
			.where('state', '!=', 'sold_out')
			.executeTakeFirstOrThrow(),
		db
			.selectFrom('customer_order')
			.select((eb) => ['state', eb.fn.countAll<number>().as('count')])
			.groupBy('state')
			.execute()
	]);

	return {
		timeZone,
		today,
		speciesCount: Number(species.count),
		activeColonies: Number(colonies.active),
		retiredColonies: Number(colonies.retired),
		tubsPastHold: Number(pastHold.count),
		animalsGrowing: Number(growing.alive),
		tubs: fillStates(statesOf('tub'), tubRows),
		clutches: fillStates(statesOf('clutch'), clutchRows),
		orders: fillStates(statesOf('order'), orderRows)
	};
}
