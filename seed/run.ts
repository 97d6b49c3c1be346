// npm run seed: lays the demo scenario into DATABASE_URL around SEED_TODAY (a
// YYYY-MM-DD day; empty means today in the shop's time zone). Safe to run again.
import { createDb } from '../src/lib/server/db/connect';
import { assertIsoDate, dateInTimeZone } from './dates';
import { seedDemo } from './demo';
import { DEMO_SHOP } from './sales';

const url = process.env.DATABASE_URL;
if (!url) {
	console.error('[hatchlot] DATABASE_URL is not set; copy .env.example to .env and load it.');
	process.exit(1);
}
const given = process.env.SEED_TODAY?.trim() ?? '';
let today: string;
try {
	today = given ? assertIsoDate(given) : dateInTimeZone(new Date(), DEMO_SHOP.timeZone);
} catch (error) {
	console.error(`[hatchlot] SEED_TODAY: ${error instanceof Error ? error.message : String(error)}`);
	process.exit(1);
}

// npm start passes --if-empty: a database someone has been using is left alone.
const onlyIfEmpty = process.argv.includes('--if-empty');

const db = createDb(url, 2);
try {
	if (onlyIfEmpty) {
		const { n } = await db
			.selectFrom('species')
			.select((eb) => eb.fn.countAll<number>().as('n'))
			.executeTakeFirstOrThrow();
		if (n > 0) {
			console.log('[hatchlot] the database already holds a shop: not seeding');
			process.exit(0);
		}
	}
	const counts = await seedDemo(db, { today });
	const total = Object.values(counts).reduce((sum, n) => sum + n, 0);
	if (total === 0) {
		console.log('[hatchlot] demo already seeded: nothing to add');
	} else {
		console.log(`[hatchlot] demo seeded around ${today} (${total} rows):`);
		const width = Math.max(...Object.keys(counts).map((t) => t.length));
		for (const [table, n] of Object.entries(counts)) console.log(`  ${table.padEnd(width)}  ${n}`);
	}
} catch (error) {
	console.error(
		`[hatchlot] seed failed, nothing written: ${error instanceof Error ? error.message : String(error)}`
	);
	process.exitCode = 1;
} finally {
	await db.destroy();
}
