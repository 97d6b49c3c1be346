// Accounts over HTTP against the production build: session ids, cookie flags,
// disabled accounts, the abuse limit; and the limiter itself on PostgreSQL.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import { changeRole, setDisabled } from '../../src/lib/server/accounts/users';
import { signUp, verifyEmail } from '../../src/lib/server/auth/accounts';
import { createAccountLimits } from '../../src/lib/server/auth/limits';
import { cookiesMustBeSecure, createSession } from '../../src/lib/server/auth/sessions';
import { createPool } from '../../src/lib/server/db/connect';
import { startApp, type RunningApp } from './support/app';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const customer = DEMO_ACCOUNTS.find((a) => a.role === 'customer')!;
const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!;
const EMAIL_LIMIT = 4;

describe('accounts over HTTP', () => {
	let scratch: ScratchDatabase;
	let app: RunningApp;

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		app = await startApp({ DATABASE_URL: scratch.url, AUTH_LIMIT_PER_EMAIL: String(EMAIL_LIMIT) });
	});
	afterAll(async () => {
		await app?.stop();
		await scratch?.drop();
	});

	const userId = async (email: string) =>
		(
			await scratch.db
				.selectFrom('User')
				.select('id')
				.where('email', '=', email)
				.executeTakeFirstOrThrow()
		).id;

	function signIn(email: string, password: string, cookie = '') {
		return fetch(`${app.origin}/signin?/password`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				origin: app.origin,
				accept: 'text/html',
				'content-type': 'application/x-www-form-urlencoded',
				...(cookie ? { cookie } : {})
			},
			body: new URLSearchParams({ email, password, next: '/account' })
		});
	}
	const sessionFrom = (response: Response) =>
		response.headers
			.getSetCookie()
			.find((c) => c.startsWith('hatchlot.session='))
			?.split(';')[0]
			?.split('=')[1];

	it('signs in with the demo password and gives a new session id, ending the old one', async () => {
		const before = await createSession(scratch.db, await userId(customer.email));
		const response = await signIn(customer.email, DEMO_PASSWORD, `hatchlot.session=${before}`);
		expect(response.status).toBe(303);
		expect(response.headers.get('location')).toBe('/account');
		const after = sessionFrom(response);
		expect(after).toBeTruthy();
		expect(after).not.toBe(before);
		const old = await scratch.db
			.selectFrom('Session')
			.select('id')
			.where('sessionToken', '=', before)
			.executeTakeFirst();
		expect(old).toBeUndefined();
	});

	it('sets the session cookie HttpOnly, SameSite=Lax, path /, and not Secure on loopback', async () => {
		const response = await signIn(customer.email, DEMO_PASSWORD);
		const cookie = response.headers.getSetCookie().find((c) => c.startsWith('hatchlot.session='))!;
		expect(cookie).toMatch(/;\s*HttpOnly/i);
		expect(cookie).toMatch(/;\s*SameSite=Lax/i);
		expect(cookie).toMatch(/;\s*Path=\//i);
		expect(cookie).not.toMatch(/;\s*Secure/i);
		// Outside loopback the cookie must be Secure (and is then named with the __Secure- prefix, RFC 6265bis).
		expect(cookiesMustBeSecure('https://shop.example.com')).toBe(true);
		expect(cookiesMustBeSecure('http://shop.example.com')).toBe(true);
		expect(cookiesMustBeSecure('http://127.0.0.1:3000')).toBe(false);
	});

	it('answers a wrong password and an unknown e-mail with the same words', async () => {
		const wrong = await (await signIn(admin.email, 'not the password at all')).text();
		const unknown = await (await signIn('nobody@example.test', 'not the password at all')).text();
		const sentence = 'That e-mail and password do not match an account that can sign in.';
		expect(wrong).toContain(sentence);
		expect(unknown).toContain(sentence);
	});

	it("refuses a disabled account's old cookie and ends its sessions", async () => {
		const teo = DEMO_ACCOUNTS.find((a) => a.role === 'keeper')!;
		const token = await createSession(scratch.db, await userId(teo.email));
		const cookie = `hatchlot.session=${token}`;
		const before = await fetch(`${app.origin}/manage`, { headers: { cookie }, redirect: 'manual' });
		expect(before.status).toBe(200);
		const outcome = await setDisabled(
			scratch.db,
			{ userId: await userId(admin.email), ip: '127.0.0.1' },
			await userId(teo.email),
			true
		);
		expect(outcome.ok).toBe(true);
		const after = await fetch(`${app.origin}/manage`, { headers: { cookie }, redirect: 'manual' });
		expect(after.status).toBe(303);
		expect(after.headers.get('location')).toMatch(/^\/signin/);
		const audit = await scratch.db
			.selectFrom('audit_log')
			.select('action')
			.where('action', '=', 'user.disabled')
			.execute();
		expect(audit).toHaveLength(1);
		const signInAgain = await (await signIn(teo.email, DEMO_PASSWORD)).text();
		expect(signInAgain).toContain('do not match an account that can sign in');
	});

	it("changes a role with an audit entry, but never takes away the acting admin's own", async () => {
		const adminId = await userId(admin.email);
		const actor = { userId: adminId, ip: '127.0.0.1' };
		expect(await changeRole(scratch.db, actor, adminId, 'keeper')).toMatchObject({ ok: false });
		const someone = DEMO_ACCOUNTS.filter((a) => a.role === 'customer')[2]!;
		expect(await changeRole(scratch.db, actor, await userId(someone.email), 'keeper')).toEqual({
			ok: true
		});
		const role = await scratch.db
			.selectFrom('user_role')
			.select('role')
			.where('user_id', '=', await userId(someone.email))
			.executeTakeFirstOrThrow();
		expect(role.role).toBe('keeper');
		const audit = await scratch.db
			.selectFrom('audit_log')
			.select(['actor_user_id', 'actor_ip', 'detail'])
			.where('action', '=', 'user.role_changed')
			.execute();
		expect(audit).toEqual([
			{ actor_user_id: adminId, actor_ip: '127.0.0.1', detail: { from: 'customer', to: 'keeper' } }
		]);
	});

	it("shows a customer their own order and answers 404 for another customer's", async () => {
		const [first, second] = DEMO_ACCOUNTS.filter((a) => a.role === 'customer');
		const orderOf = async (email: string) =>
			(
				await scratch.db
					.selectFrom('customer_order')
					.select('order_number')
					.where('user_id', '=', await userId(email))
					.orderBy('order_number')
					.executeTakeFirstOrThrow()
			).order_number;
		const mine = await orderOf(first!.email);
		const theirs = await orderOf(second!.email);
		const cookie = `hatchlot.session=${await createSession(scratch.db, await userId(first!.email))}`;
		const own = await fetch(`${app.origin}/account/orders/${mine}`, { headers: { cookie } });
		expect(own.status).toBe(200);
		expect(await own.text()).toContain(mine);
		const other = await fetch(`${app.origin}/account/orders/${theirs}`, { headers: { cookie } });
		expect(other.status).toBe(404);
		expect(await other.text()).not.toContain(theirs);
		const list = await (
			await fetch(`${app.origin}/account/orders`, { headers: { cookie } })
		).text();
		expect(list).toContain(mine);
		expect(list).not.toContain(theirs);
	});

	it('ends the session on the server at sign-out', async () => {
		const token = await createSession(scratch.db, await userId(customer.email));
		const response = await fetch(`${app.origin}/signout`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				origin: app.origin,
				accept: 'text/html',
				'content-type': 'application/x-www-form-urlencoded',
				cookie: `hatchlot.session=${token}`
			},
			body: ''
		});
		expect(response.status).toBe(303);
		const left = await scratch.db
			.selectFrom('Session')
			.select('id')
			.where('sessionToken', '=', token)
			.executeTakeFirst();
		expect(left).toBeUndefined();
		const later = await fetch(`${app.origin}/account`, {
			headers: { cookie: `hatchlot.session=${token}` },
			redirect: 'manual'
		});
		expect(later.headers.get('location')).toMatch(/^\/signin/);
	});

	it('gives a guest order to the account that signs up and confirms the same e-mail', async () => {
		const email = 'moss.guest@example.test';
		await scratch.db
			.insertInto('customer_order')
			.values({
				order_number: 'HL-90001',
				email: 'Moss.Guest@example.test',
				ship_name: 'Moss Guest',
				ship_line1: '4 Fern Row',
				ship_city: 'Astoria',
				ship_state: 'OR',
				ship_zip: '97103',
				service: 'two_day',
				subtotal_cents: 1400,
				shipping_cents: 2800,
				total_cents: 4200
			})
			.execute();
		await signUp(
			scratch.db,
			{ name: 'Moss Guest', email, password: 'mossy logs and rain barrels' },
			app.origin,
			{ ip: null }
		);
		const mail = await scratch.db
			.selectFrom('outgoing_mail')
			.select('text_body')
			.where('to_address', '=', email)
			.where('kind', '=', 'verify_email')
			.executeTakeFirstOrThrow();
		const token = /\/verify\/([\w-]+)/.exec(mail.text_body)![1]!;
		const outcome = await verifyEmail(scratch.db, token, { ip: null });
		expect(outcome.ok).toBe(true);
		const order = await scratch.db
			.selectFrom('customer_order')
			.select('user_id')
			.where('order_number', '=', 'HL-90001')
			.executeTakeFirstOrThrow();
		expect(order.user_id).toBe(await userId(email));
		// The link works once.
		expect(await verifyEmail(scratch.db, token, { ip: null })).toEqual({
			ok: false,
			reason: 'used'
		});
	});

	it('stops sign-in tries past the per-e-mail limit, audits the burst once, and tells the person to wait', async () => {
		const target = DEMO_ACCOUNTS.filter((a) => a.role === 'customer')[1]!;
		const statuses: number[] = [];
		for (let i = 0; i < EMAIL_LIMIT + 2; i++)
			statuses.push((await signIn(target.email, 'wrong wrong wrong')).status);
		expect(statuses.slice(0, EMAIL_LIMIT).every((s) => s === 400)).toBe(true);
		expect(statuses.slice(EMAIL_LIMIT)).toEqual([429, 429]);
		const burst = await scratch.db
			.selectFrom('audit_log')
			.select(['action', 'actor_ip', 'detail'])
			.where('action', '=', 'account.limit_reached')
			.execute();
		expect(burst).toHaveLength(1);
		expect(burst[0]!.actor_ip).toBe('127.0.0.1');
		const blocked = await (await signIn(target.email, DEMO_PASSWORD)).text();
		expect(blocked).toMatch(/Too many tries/);
	});
});

describe('the account limiter on PostgreSQL', () => {
	let scratch: ScratchDatabase;
	beforeAll(async () => {
		scratch = await scratchDatabase();
	});
	afterAll(async () => {
		await scratch.drop();
	});

	it('refuses at the configured count and lets tries through again once the window passes', async () => {
		const pool = createPool(scratch.url, 2);
		try {
			const limits = createAccountLimits(pool, {
				perAddress: { points: 100, seconds: 60 },
				perEmail: { points: 3, seconds: 1 }
			});
			const verdicts = [];
			for (let i = 0; i < 5; i++)
				verdicts.push(await limits.consume('reset', '203.0.113.5', 'fern@example.test'));
			expect(verdicts.map((v) => v.allowed)).toEqual([true, true, true, false, false]);
			expect(verdicts[3]).toMatchObject({ allowed: false, firstRefusal: true });
			expect(verdicts[4]).toMatchObject({ allowed: false, firstRefusal: false });
			// Another e-mail from the same address is counted apart.
			expect((await limits.consume('reset', '203.0.113.5', 'moss@example.test')).allowed).toBe(
				true
			);
			await new Promise((resolve) => setTimeout(resolve, 1_200));
			expect((await limits.consume('reset', '203.0.113.5', 'fern@example.test')).allowed).toBe(
				true
			);
		} finally {
			await pool.end();
		}
	});
});
