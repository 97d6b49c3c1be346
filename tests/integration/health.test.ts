// /api/health on the production build: 503 while PostgreSQL is unreachable,
// then 200 by itself once it comes up, with no restart of the app.
import net from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LATEST_MIGRATION } from '../../src/lib/server/db/migrator';
import { freePort, relayTo, startApp, type RunningApp } from './support/app';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

async function health(
	appPort: number
): Promise<{ status: number; body: Record<string, unknown> } | null> {
	try {
		const response = await fetch(`http://127.0.0.1:${appPort}/api/health`);
		return { status: response.status, body: (await response.json()) as Record<string, unknown> };
	} catch {
		return null; // the app is not listening yet
	}
}

async function waitFor<T>(
	probe: () => Promise<T | null>,
	accept: (value: T) => boolean,
	ms: number
): Promise<T> {
	const deadline = Date.now() + ms;
	let last: T | null = null;
	while (Date.now() < deadline) {
		last = await probe();
		if (last !== null && accept(last)) return last;
		await new Promise((resolve) => setTimeout(resolve, 150));
	}
	throw new Error(`gave up waiting; last answer: ${JSON.stringify(last)}`);
}

describe('GET /api/health', () => {
	let scratch: ScratchDatabase;
	let app: RunningApp;
	let appPort: number;
	let dbPort: number;
	let relay: net.Server | undefined;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		dbPort = await freePort();
		const url = new URL(scratch.url);
		url.port = String(dbPort);
		app = await startApp({ DATABASE_URL: url.toString() });
		appPort = app.port;
	});
	afterAll(async () => {
		await app?.stop();
		await new Promise((resolve) => (relay ? relay.close(resolve) : resolve(undefined)));
		await scratch?.drop();
	});

	it('answers 503 while the database is down and 200 once it is up', async () => {
		const down = await waitFor(
			() => health(appPort),
			() => true,
			15_000
		);
		expect(down.status).toBe(503);
		expect(down.body).toMatchObject({ status: 'unavailable', database: 'unreachable' });
		expect(JSON.stringify(down.body)).not.toMatch(/at .*\.js/); // no stack trace leaks

		relay = relayTo(Number(new URL(scratch.url).port));
		await new Promise<void>((resolve) => relay!.listen(dbPort, '127.0.0.1', resolve));

		const up = await waitFor(
			() => health(appPort),
			(r) => r.status === 200,
			15_000
		);
		expect(up.body).toMatchObject({
			status: 'ok',
			database: 'reachable',
			migration: LATEST_MIGRATION
		});
	});
});
