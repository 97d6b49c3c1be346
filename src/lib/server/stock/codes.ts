// The short codes keepers write on tub lids and clutch cups: NAR-01 (a colony),
// NAR-01-T3 (its third resting tub), NAR-C7 (the seventh Narceus clutch).
// Codes are handed out inside the caller's transaction under an advisory lock, so two
// keepers saving at the same moment never draw the same number.
import { sql } from 'kysely';
import type { Db } from '$lib/server/db';

/** Three letters from the genus: "Narceus americanus" → "NAR". */
export function genusPrefix(scientificName: string): string {
	const letters = scientificName.replace(/[^A-Za-z]/g, '').slice(0, 3);
	return (letters.padEnd(3, 'X') || 'SPX').toUpperCase();
}

async function lockCodes(trx: Db, scope: string): Promise<void> {
	await sql`select pg_advisory_xact_lock(hashtext(${'code:' + scope}))`.execute(trx);
}

/** The prefix this species' colonies already use, else one from its genus. */
export async function speciesPrefix(trx: Db, speciesId: number): Promise<string> {
	const existing = await trx
		.selectFrom('colony')
		.select('code')
		.where('species_id', '=', speciesId)
		.orderBy('id')
		.executeTakeFirst();
	if (existing) return existing.code.split('-')[0] ?? existing.code;
	const clutch = await trx
		.selectFrom('clutch')
		.select('code')
		.where('species_id', '=', speciesId)
		.orderBy('id')
		.executeTakeFirst();
	if (clutch) return clutch.code.split('-')[0] ?? clutch.code;
	const species = await trx
		.selectFrom('species')
		.select('scientific_name')
		.where('id', '=', speciesId)
		.executeTakeFirstOrThrow();
	return genusPrefix(species.scientific_name);
}

/** The highest number already used after `stem` (codes shaped stem + digits). */
async function highestAfter(
	trx: Db,
	table: 'colony' | 'resting_tub' | 'clutch',
	stem: string
): Promise<number> {
	const pattern = `^${stem.replace(/[^A-Za-z0-9-]/g, '')}[0-9]+$`;
	const row = await trx
		.selectFrom(table)
		.select(
			sql<number>`coalesce(max(substring(code from ${stem.length + 1}::int)::int), 0)`.as('top')
		)
		.where('code', '~', pattern)
		.executeTakeFirstOrThrow();
	return Number(row.top);
}

export async function nextColonyCode(trx: Db, speciesId: number): Promise<string> {
	const prefix = await speciesPrefix(trx, speciesId);
	await lockCodes(trx, `colony:${prefix}`);
	const next = (await highestAfter(trx, 'colony', `${prefix}-`)) + 1;
	return `${prefix}-${String(next).padStart(2, '0')}`;
}

export async function nextTubCode(trx: Db, colonyCode: string): Promise<string> {
	await lockCodes(trx, `tub:${colonyCode}`);
	return `${colonyCode}-T${(await highestAfter(trx, 'resting_tub', `${colonyCode}-T`)) + 1}`;
}

/** The next `count` clutch codes of a species, drawn under one lock for the whole batch. */
export async function nextClutchCodes(
	trx: Db,
	speciesId: number,
	count: number
): Promise<string[]> {
	const prefix = await speciesPrefix(trx, speciesId);
	await lockCodes(trx, `clutch:${prefix}`);
	const top = await highestAfter(trx, 'clutch', `${prefix}-C`);
	return Array.from({ length: count }, (_, index) => `${prefix}-C${top + index + 1}`);
}
