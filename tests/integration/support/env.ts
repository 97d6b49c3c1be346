// Connection details for the test cluster, from the environment that
// scripts/test.sh (or a developer's shell with .env loaded) provides.
export function testClusterUrl(database: string): string {
	const base = process.env.DATABASE_URL;
	if (!base) {
		throw new Error('DATABASE_URL is not set: run the tests through `npm test` (it loads .env).');
	}
	const url = new URL(base);
	url.pathname = `/${database}`;
	return url.toString();
}

export const TEMPLATE_DATABASE = `${process.env.PG_TEST_DATABASE ?? 'hatchlot_test'}_template`;
