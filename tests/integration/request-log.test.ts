// The built app's own log output while it serves requests that carry secrets: every line a
// request writes names that request's id (also sent back in x-request-id), and no
// cookie, bearer token, signing secret, key, one-time link token or card number that the
// requests or the process held is ever written.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seed/demo';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { createSession } from '../../src/lib/server/auth/sessions';
import { startApp, TEST_AUTH_SECRET, type RunningApp } from './support/app';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const STRIPE_KEY = 'sk_test_request_log_0123456789abcdef';
const WEBHOOK_SECRET = 'whsec_request_log_0123456789abcdef';
const TRACKING_SECRET = 'tracking-request-log-0123456789abcdef';
const BEARER = 'eyJhbGciOiJIUzI1NiJ9.request-log-bearer.c2lnbmF0dXJl';
const RESET_TOKEN = 'rQ7mZ2xK9pL4vN8sT1wY6bC3dF5gH0jA';
// Stripe's published Visa test number (its "Testing" documentation; quoted from memory).
const CARD = '4242424242424242';
const CARD_SPACED = '4242 4242 4242 4242';
// RFC 9562's layout of a version-4 UUID, what the app makes when it takes no caller's id.
const UUID_V4 = /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/;

type LogLine = Record<string, unknown> & { msg?: string; requestId?: string };

describe('request logs of the built app', () => {
	let scratch: ScratchDatabase;
	let app: RunningApp;
	let sessionToken: string;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		const keeper = DEMO_ACCOUNTS.find((account) => account.role === 'keeper')!;
		const user = await scratch.db
			.selectFrom('User')
			.select('id')
			.where('email', '=', keeper.email)
			.executeTakeFirstOrThrow();
		sessionToken = await createSession(scratch.db, user.id);
		app = await startApp({
			DATABASE_URL: scratch.url,
			LOG_LEVEL: 'info',
			STRIPE_SECRET_KEY: STRIPE_KEY,
			STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET,
			TRACKING_WEBHOOK_SECRET: TRACKING_SECRET
		});
	});
	afterAll(async () => {
		await app?.stop();
		await scratch?.drop();
	});

	/** Every JSON line written so far. */
	function jsonLines(): LogLine[] {
		return app
			.output()
			.split('\n')
			.filter((line) => line.startsWith('{'))
			.map((line) => JSON.parse(line) as LogLine);
	}

	/** The request's lines once its closing "request" line is out (the pipe may lag the answer). */
	async function linesOf(requestId: string): Promise<LogLine[]> {
		for (let tries = 0; tries < 100; tries++) {
			const lines = jsonLines().filter((line) => line.requestId === requestId);
			if (lines.some((line) => line.msg === 'request')) return lines;
			await new Promise((resolve) => setTimeout(resolve, 50));
		}
		throw new Error(`no request line for ${requestId} in:\n${app.output()}`);
	}

	it("sends a load balancer's id back and writes the request's line under it", async () => {
		const response = await fetch(`${app.origin}/api/health`, {
			headers: { 'x-request-id': 'lb-health-000001' }
		});
		expect(response.status).toBe(200);
		expect(response.headers.get('x-request-id')).toBe('lb-health-000001');
		const lines = await linesOf('lb-health-000001');
		expect(lines.find((line) => line.msg === 'request')).toMatchObject({
			level: 'info',
			method: 'GET',
			path: '/api/health',
			route: '/api/health',
			status: 200
		});
	});

	it('makes its own id for one that is not a short plain token', async () => {
		const offered = 'two words "and" a quote';
		const response = await fetch(`${app.origin}/api/health`, {
			headers: { 'x-request-id': offered }
		});
		const id = response.headers.get('x-request-id');
		expect(id).toMatch(UUID_V4);
		await linesOf(id!);
		expect(app.output()).not.toContain(offered);
	});

	it("puts the id on the lines the request's own code writes, and leaves its secrets out", async () => {
		// A delivery whose signature does not verify: the webhook code logs why it refused it.
		const body = JSON.stringify({
			id: 'evt_request_log',
			type: 'checkout.session.completed',
			data: { object: { card: { number: CARD_SPACED }, note: `card ${CARD}` } }
		});
		const response = await fetch(`${app.origin}/api/stripe/webhook`, {
			method: 'POST',
			headers: {
				'content-type': 'application/json',
				'stripe-signature': `t=1,v1=${WEBHOOK_SECRET}`,
				authorization: `Bearer ${BEARER}`,
				cookie: `hatchlot.session=${sessionToken}`
			},
			body
		});
		expect(response.status).toBe(400);
		const id = response.headers.get('x-request-id')!;
		const lines = await linesOf(id);
		expect(lines.map((line) => line.msg)).toEqual(
			expect.arrayContaining([expect.stringMatching(/^stripe webhook refused/), 'request'])
		);
		expect(lines.find((line) => line.msg === 'request')).toMatchObject({
			method: 'POST',
			path: '/api/stripe/webhook',
			status: 400
		});
	});

	it("keeps a signed-in keeper's session and a bearer token out of the lines", async () => {
		const response = await fetch(`${app.origin}/manage`, {
			headers: { cookie: `hatchlot.session=${sessionToken}`, authorization: `Bearer ${BEARER}` },
			redirect: 'manual'
		});
		expect(response.status).toBe(200);
		const lines = await linesOf(response.headers.get('x-request-id')!);
		expect(lines.find((line) => line.msg === 'request')).toMatchObject({ route: '/manage' });
	});

	it("logs a one-time link's route, never its token", async () => {
		const response = await fetch(`${app.origin}/reset/${RESET_TOKEN}?from=mail`, {
			redirect: 'manual'
		});
		const lines = await linesOf(response.headers.get('x-request-id')!);
		expect(lines.find((line) => line.msg === 'request')).toMatchObject({
			path: '/reset/[token]',
			route: '/(shop)/reset/[token]'
		});
	});

	it('scrubs a card number even where a caller hands it in as the request id', async () => {
		const response = await fetch(`${app.origin}/api/health`, {
			headers: { 'x-request-id': CARD }
		});
		expect(response.status).toBe(200);
		await linesOf('[card number]');
	});

	it('has written no secret, cookie, token or card number, and only JSON lines', async () => {
		const output = app.output();
		expect(jsonLines().length).toBeGreaterThan(5);
		const password = decodeURIComponent(new URL(scratch.url).password);
		for (const secret of [
			TEST_AUTH_SECRET,
			STRIPE_KEY,
			WEBHOOK_SECRET,
			TRACKING_SECRET,
			BEARER,
			sessionToken,
			RESET_TOKEN,
			CARD,
			CARD_SPACED,
			password
		])
			expect(output, secret).not.toContain(secret);
		// adapter-node announces its address in plain text; everything else is ours.
		const plain = output
			.split('\n')
			.filter((line) => line.trim() && !line.startsWith('{') && !line.startsWith('Listening on'));
		expect(plain).toEqual([]);
	});
});
