// What the seeded test database holds, read straight from PostgreSQL so the
// browser tests assert against the data rather than a copy of it.
import pg from 'pg';

export async function seededSpecies(): Promise<Array<{ scientific: string; common: string }>> {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		const { rows } = await client.query<{ scientific_name: string; common_name: string }>(
			'select scientific_name, common_name from species order by scientific_name'
		);
		return rows.map((r) => ({ scientific: r.scientific_name, common: r.common_name }));
	} finally {
		await client.end();
	}
}
