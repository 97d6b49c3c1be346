// Resolving a shortfall by substitution: a sold line moves to another clutch of the same
// species and stage that has the animals free. The buyer gets the same animals from
// another tub; the line's price and count stay as sold.
import { sql, type Kysely } from 'kysely';
import { writeAudit, type Actor } from '../audit';
import type { Database } from '../db/schema';
import { syncClutchSoldOut } from '../listings/listings';
import { clutchFreeAnimalsSql } from '../listings/offer';
import { noteOrder } from '../orders/transitions';
import { UNSHIPPED_STATES } from './shortfall';

export interface SubstituteChoice {
	clutchId: number;
	clutchCode: string;
	free: number;
}

/** Clutches that could take a line: same species and stage, not paused, enough animals free. */
export async function substituteChoices(
	db: Kysely<Database>,
	orderLineId: number
): Promise<SubstituteChoice[]> {
	const line = await db
		.selectFrom('order_line')
		.select(['clutch_id', 'species_id', 'stage', 'quantity', 'restocked_quantity', 'unit_size'])
		.where('id', '=', orderLineId)
		.executeTakeFirst();
	if (!line?.clutch_id || !line.species_id || !line.stage) return [];
	const needed = (line.quantity - line.restocked_quantity) * line.unit_size;
	const rows = await db
		.selectFrom('clutch as c')
		.select(['c.id', 'c.code', clutchFreeAnimalsSql(sql.ref('c.id')).as('free')])
		.where('c.species_id', '=', line.species_id)
		.where('c.stage', '=', line.stage)
		.where('c.id', '<>', line.clutch_id)
		.where('c.state', 'in', ['ready', 'listed'])
		.orderBy('c.code')
		.execute();
	return rows
		.filter((row) => row.free >= needed)
		.map((row) => ({ clutchId: row.id, clutchCode: row.code, free: row.free }));
}

export type SubstituteOutcome = { ok: true } | { ok: false; problem: string };

/** Moves one unshipped order line to another clutch; audited and on the order's history. */
export async function substituteClutch(
	db: Kysely<Database>,
	actor: Actor,
	input: { orderLineId: number; clutchId: number }
): Promise<SubstituteOutcome> {
	return db.transaction().execute(async (trx): Promise<SubstituteOutcome> => {
		const line = await trx
			.selectFrom('order_line as l')
			.innerJoin('customer_order as o', 'o.id', 'l.order_id')
			.select([
				'l.id',
				'l.order_id',
				'l.clutch_id',
				'l.species_id',
				'l.stage',
				'l.description',
				'l.quantity',
				'l.restocked_quantity',
				'l.unit_size',
				'o.state',
				'o.order_number'
			])
			.where('l.id', '=', input.orderLineId)
			.forUpdate()
			.executeTakeFirst();
		if (!line?.clutch_id) return { ok: false, problem: 'That line is not an animal line.' };
		if (!(UNSHIPPED_STATES as readonly string[]).includes(line.state))
			return {
				ok: false,
				problem: `${line.order_number} has gone out; its lines stay as shipped.`
			};
		// Both clutch rows, in id order, as every stock change locks them.
		const ids = [line.clutch_id, input.clutchId].sort((a, b) => a - b);
		const clutches = await trx
			.selectFrom('clutch')
			.select(['id', 'code', 'species_id', 'stage', 'state'])
			.where('id', 'in', ids)
			.orderBy('id')
			.forUpdate()
			.execute();
		const from = clutches.find((c) => c.id === line.clutch_id);
		const to = clutches.find((c) => c.id === input.clutchId);
		if (!from || !to || to.id === from.id)
			return { ok: false, problem: 'Pick another clutch to take this line.' };
		if (to.species_id !== line.species_id || to.stage !== line.stage)
			return { ok: false, problem: `${to.code} is not the same species and stage as this line.` };
		if (to.state !== 'ready' && to.state !== 'listed')
			return {
				ok: false,
				problem: `${to.code} is ${to.state.replaceAll('_', ' ')}: it cannot take a sale.`
			};
		const needed = (line.quantity - line.restocked_quantity) * line.unit_size;
		const free = await trx
			.selectNoFrom(clutchFreeAnimalsSql(sql.lit(to.id)).as('free'))
			.executeTakeFirstOrThrow();
		if (free.free < needed)
			return {
				ok: false,
				problem: `${to.code} has ${free.free} animals free; this line needs ${needed}.`
			};
		await trx
			.updateTable('order_line')
			.set({
				clutch_id: to.id,
				description: line.description.replace(from.code, to.code)
			})
			.where('id', '=', line.id)
			.execute();
		await noteOrder(
			trx,
			line.order_id,
			{ kind: 'user', userId: actor.userId, ip: actor.ip },
			`Line moved from clutch ${from.code} to ${to.code} (${needed} animals): ${from.code} fell short.`
		);
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'order_line.substitute',
			entity: 'order_line',
			entityId: line.id,
			detail: { orderNumber: line.order_number, from: from.code, to: to.code, animals: needed }
		});
		// Taking animals may leave the new clutch with none free.
		await syncClutchSoldOut(trx, to.id, actor);
		return { ok: true };
	});
}
