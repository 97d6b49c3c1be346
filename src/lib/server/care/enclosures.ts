// Enclosure sizes of the colonies, for the substrate batch calculator (read only).
import type { Db } from '$lib/server/db';

export interface ColonyEnclosure {
	code: string;
	name: string;
	speciesCommonName: string;
	/** Exact decimal text as PostgreSQL keeps it (numeric(5,1)), e.g. "18.0". */
	lengthIn: string;
	widthIn: string;
	depthIn: string;
}

/** Colonies still kept (not retired), by code. */
export async function listColonyEnclosures(db: Db): Promise<ColonyEnclosure[]> {
	const rows = await db
		.selectFrom('colony as c')
		.innerJoin('species as s', 's.id', 'c.species_id')
		.select([
			'c.code',
			'c.name',
			's.common_name',
			'c.enclosure_length_in',
			'c.enclosure_width_in',
			'c.substrate_depth_in'
		])
		.where('c.retired_on', 'is', null)
		.orderBy('c.code')
		.execute();
	return rows.map((r) => ({
		code: r.code,
		name: r.name,
		speciesCommonName: r.common_name,
		lengthIn: r.enclosure_length_in,
		widthIn: r.enclosure_width_in,
		depthIn: r.substrate_depth_in
	}));
}
