// The shop settings on a scratch copy of the demo: what a save writes and records (only
// what changed, nothing for an unchanged save), what it refuses, putting the shipping
// defaults back, the row lock under two saves at once, and the admin-only form actions.
import { isHttpError, isRedirect } from '@sveltejs/kit';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { DEMO_ACCOUNTS } from '../../seed/accounts';
import { seedDemo } from '../../seed/demo';
import type { SessionUser } from '../../src/lib/server/auth/guard';
import {
	readShopSetting,
	restoreShippingDefaults,
	updateShopSetting
} from '../../src/lib/server/backoffice/settings';
import type { Db } from '../../src/lib/server/db/connect';
import { addDays, todayInZone } from '../../src/lib/format/dates';
import { DEFAULT_SHIP_WEEKDAYS, DEFAULT_THRESHOLDS } from '../../src/lib/shipping/defaults';
import {
	settingsFormFromRow,
	type SettingsForm,
	type ShopSettingValues
} from '../../src/lib/shipping/settings-schema';
import { createSession } from '../../src/lib/server/auth/sessions';
import { actions } from '../../src/routes/admin/+page.server';
import { startApp, type RunningApp } from './support/app';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

// The route opens the app's database through getDb(); here that is the scratch copy.
const current = vi.hoisted(() => ({ db: undefined as unknown }));
vi.mock('$lib/server/db', () => ({ getDb: () => current.db }));

const COLUMNS = [
	'shop_name',
	'origin_zip',
	'time_zone',
	'ship_weekdays_overnight',
	'ship_weekdays_two_day',
	'heat_pack_below_f',
	'hold_below_f',
	'cold_pack_above_f',
	'hold_above_f',
	'extra_closed_dates',
	'forecast_horizon_days',
	'fee_overnight_cents',
	'fee_two_day_cents',
	'reservation_minutes',
	'claim_window_hours',
	'slip_paper'
] as const satisfies readonly (keyof ShopSettingValues)[];

describe('shop settings', () => {
	let scratch: ScratchDatabase;
	const people: Partial<Record<'admin' | 'keeper' | 'customer', SessionUser>> = {};
	let actor: { userId: string; ip: string };

	const stored = async (): Promise<ShopSettingValues & { updated_at: Date }> => {
		const row = await readShopSetting(scratch.db);
		if (!row) throw new Error('the demo has a settings row');
		const { id: _id, ...values } = row;
		return values;
	};
	const valuesOf = (row: ShopSettingValues): ShopSettingValues =>
		Object.fromEntries(COLUMNS.map((column) => [column, row[column]])) as ShopSettingValues;
	const audits = () =>
		scratch.db
			.selectFrom('audit_log')
			.selectAll()
			.where('action', 'like', 'settings.%')
			.orderBy('id')
			.execute();

	beforeAll(async () => {
		scratch = await scratchDatabase();
		current.db = scratch.db as Db;
		await seedDemo(scratch.db, { today: '2026-12-01' });
		for (const role of ['admin', 'keeper', 'customer'] as const) {
			const account = DEMO_ACCOUNTS.find((a) => a.role === role)!;
			const user = await scratch.db
				.selectFrom('User')
				.select(['id', 'name', 'email'])
				.where('email', '=', account.email)
				.executeTakeFirstOrThrow();
			people[role] = { id: user.id, name: user.name, email: user.email, role };
		}
		actor = { userId: people.admin!.id, ip: '198.51.100.7' };
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	it('records only the columns a save changed, with from and to', async () => {
		const before = await stored();
		const auditsBefore = (await audits()).length;
		const outcome = await updateShopSetting(scratch.db, actor, {
			...valuesOf(before),
			fee_two_day_cents: 3150,
			extra_closed_dates: ['2027-07-05', '2027-01-04'],
			// The same days in another order are no change.
			ship_weekdays_overnight: [...before.ship_weekdays_overnight].reverse()
		});
		expect(outcome.ok).toBe(true);
		if (!outcome.ok) return;
		expect(Object.keys(outcome.changes).sort()).toEqual([
			'extra_closed_dates',
			'fee_two_day_cents'
		]);

		const after = await stored();
		expect(after.fee_two_day_cents).toBe(3150);
		expect(after.extra_closed_dates).toEqual(['2027-01-04', '2027-07-05']);
		expect(after.shop_name).toBe(before.shop_name);
		expect(after.updated_at.getTime()).toBeGreaterThan(before.updated_at.getTime());

		const written = await audits();
		expect(written).toHaveLength(auditsBefore + 1);
		const entry = written.at(-1)!;
		expect(entry).toMatchObject({
			action: 'settings.update',
			entity: 'shop_setting',
			actor_user_id: actor.userId,
			actor_ip: actor.ip
		});
		expect(entry.detail).toEqual({
			changes: {
				fee_two_day_cents: { from: before.fee_two_day_cents, to: 3150 },
				extra_closed_dates: { from: [], to: ['2027-01-04', '2027-07-05'] }
			}
		});
	});

	it('writes nothing, not even the stamp, when nothing changed', async () => {
		const before = await stored();
		const auditsBefore = (await audits()).length;
		const outcome = await updateShopSetting(scratch.db, actor, valuesOf(before));
		expect(outcome).toMatchObject({ ok: true, changes: {}, created: false });
		expect((await stored()).updated_at).toEqual(before.updated_at);
		expect(await audits()).toHaveLength(auditsBefore);
	});

	it('refuses limits out of order, an unknown ZIP and a zone Intl does not know, writing nothing', async () => {
		const before = await stored();
		const auditsBefore = (await audits()).length;
		const outcome = await updateShopSetting(scratch.db, actor, {
			...valuesOf(before),
			hold_above_f: 80,
			origin_zip: '00000',
			time_zone: 'Mars/Olympus_Mons'
		});
		expect(outcome.ok).toBe(false);
		if (outcome.ok) return;
		// 80 °F = 26.7 → 27 °C; 85 °F = 29.4 → 29 °C (°C = (°F − 32)/1.8, NIST SP 811 B.9).
		expect(outcome.fieldErrors.holdAboveF).toBe(
			'80 °F (27 °C) must be above the cold-pack limit, 85 °F (29 °C).'
		);
		// 00000 is no US ZIP: ZIP codes start at 00501 (USPS; from memory).
		expect(outcome.fieldErrors.originZip).toMatch(/00000 is not a US ZIP code/);
		expect(outcome.fieldErrors.timeZone).toBeTruthy();
		expect(await stored()).toEqual(before);
		expect(await audits()).toHaveLength(auditsBefore);
	});

	it('waits for the row lock, so a save records what the save before it wrote', async () => {
		const before = await stored();
		let second: ReturnType<typeof updateShopSetting> | undefined;
		await scratch.db.transaction().execute(async (first) => {
			// Another save holds the row...
			await first
				.selectFrom('shop_setting')
				.select('id')
				.where('id', '=', true)
				.forUpdate()
				.execute();
			second = updateShopSetting(scratch.db, actor, {
				...valuesOf(before),
				fee_overnight_cents: 4700
			});
			// ...until the second save is seen waiting on it (a lock wait, in pg_stat_activity).
			await untilSomeoneWaitsOnALock();
			await first
				.updateTable('shop_setting')
				.set({ fee_overnight_cents: 4600 })
				.where('id', '=', true)
				.execute();
		});
		const outcome = await second!;
		expect(outcome.ok).toBe(true);
		if (!outcome.ok) return;
		// Read without the lock, it would have recorded the value from before the first save.
		expect(outcome.changes.fee_overnight_cents).toEqual({ from: 4600, to: 4700 });
		expect((await stored()).fee_overnight_cents).toBe(4700);
	});

	async function untilSomeoneWaitsOnALock(): Promise<void> {
		for (let attempt = 0; attempt < 1000; attempt++) {
			const { rows } = await sql<{ waiting: number }>`
				select count(*)::int as waiting from pg_stat_activity
				where datname = current_database() and wait_event_type = 'Lock'`.execute(scratch.db);
			if (rows[0]!.waiting > 0) return;
			await new Promise((resolve) => setTimeout(resolve, 10));
		}
		throw new Error('the second save never waited for the row lock');
	}

	it('puts back the default limits and ship days only, once, and records it', async () => {
		const before = await stored();
		const moved = await updateShopSetting(scratch.db, actor, {
			...valuesOf(before),
			hold_below_f: 20,
			heat_pack_below_f: 45,
			cold_pack_above_f: 88,
			hold_above_f: 98,
			ship_weekdays_overnight: [1, 2, 3, 4],
			ship_weekdays_two_day: [1],
			forecast_horizon_days: 12
		});
		expect(moved.ok).toBe(true);
		const auditsBefore = (await audits()).length;

		const restored = await restoreShippingDefaults(scratch.db, actor);
		expect(Object.keys(restored!.changes).sort()).toEqual([
			'cold_pack_above_f',
			'heat_pack_below_f',
			'hold_above_f',
			'hold_below_f',
			'ship_weekdays_overnight',
			'ship_weekdays_two_day'
		]);
		const after = await stored();
		// PRODUCT.md's general-practice defaults, through the constants of defaults.ts.
		expect(after).toMatchObject({
			hold_below_f: DEFAULT_THRESHOLDS.holdBelowF,
			heat_pack_below_f: DEFAULT_THRESHOLDS.heatPackBelowF,
			cold_pack_above_f: DEFAULT_THRESHOLDS.coldPackAboveF,
			hold_above_f: DEFAULT_THRESHOLDS.holdAboveF,
			ship_weekdays_overnight: [...DEFAULT_SHIP_WEEKDAYS.overnight],
			ship_weekdays_two_day: [...DEFAULT_SHIP_WEEKDAYS.two_day],
			forecast_horizon_days: 12
		});
		const written = await audits();
		expect(written).toHaveLength(auditsBefore + 1);
		expect(written.at(-1)).toMatchObject({ action: 'settings.restore_defaults' });
		expect(
			(written.at(-1)!.detail as { changes: Record<string, unknown> }).changes.hold_below_f
		).toEqual({ from: 20, to: DEFAULT_THRESHOLDS.holdBelowF });

		const again = await restoreShippingDefaults(scratch.db, actor);
		expect(again!.changes).toEqual({});
		expect(await audits()).toHaveLength(auditsBefore + 1);
	});

	// ---- the form actions

	type ActionEvent = Parameters<NonNullable<typeof actions.save>>[0];
	function actionEvent(user: SessionUser | null, name: string, body: FormData): ActionEvent {
		const url = new URL(`http://127.0.0.1/admin?/${name}`);
		return {
			url,
			request: new Request(url, { method: 'POST', body }),
			locals: { user, sessionToken: null },
			getClientAddress: () => '203.0.113.9'
		} as unknown as ActionEvent;
	}
	/** The form as a browser posts it: one entry per ticked weekday. */
	function posted(form: SettingsForm): FormData {
		const body = new FormData();
		for (const [name, value] of Object.entries(form)) {
			if (Array.isArray(value)) for (const day of value) body.append(name, String(day));
			else body.append(name, value === null ? '' : String(value));
		}
		return body;
	}
	const today = () => todayInZone('America/New_York');

	async function refusal(pending: unknown): Promise<number | string> {
		try {
			await pending;
		} catch (failure) {
			if (isHttpError(failure)) return failure.status;
			if (isRedirect(failure)) return failure.location;
			throw failure;
		}
		return 'let through';
	}

	it('refuses a keeper and a customer with 403 and sends a visitor to sign in', async () => {
		const before = await stored();
		const form = posted({ ...settingsFormFromRow(before, today()), feeTwoDay: '1.00' });
		for (const name of ['save', 'restoreDefaults'] as const) {
			const action = actions[name]!;
			expect(await refusal(action(actionEvent(people.keeper!, name, form)))).toBe(403);
			expect(await refusal(action(actionEvent(people.customer!, name, form)))).toBe(403);
			expect(await refusal(action(actionEvent(null, name, form)))).toMatch(/^\/signin\?next=/);
		}
		expect(await stored()).toEqual(before);
	});

	it('saves the posted form for the owner: dollars to cents, dates sorted, the address recorded', async () => {
		const before = await stored();
		const closed = [addDays(today(), 20), addDays(today(), 3)];
		const form = {
			...settingsFormFromRow(before, today()),
			feeOvernight: '$39.9',
			extraClosedDates: `${closed[0]}\n\n${closed[1]}\n${closed[0]}`
		};
		const result = (await actions.save!(actionEvent(people.admin!, 'save', posted(form)))) as {
			form: { valid: boolean; message?: string; data: SettingsForm };
		};
		expect(result.form.valid).toBe(true);
		expect(result.form.message).toMatch(/^Saved: 2 settings changed/);
		expect(result.form.data.feeOvernight).toBe('39.90');
		expect(result.form.data.extraClosedDates).toBe(`${closed[1]}\n${closed[0]}`);
		const after = await stored();
		expect(after.fee_overnight_cents).toBe(3990);
		expect(after.extra_closed_dates).toEqual([closed[1], closed[0]]);
		expect((await audits()).at(-1)).toMatchObject({
			action: 'settings.update',
			actor_user_id: people.admin!.id,
			actor_ip: '203.0.113.9'
		});
	});

	it('answers a bad form with 400 and the reason beside the field, keeping what was typed', async () => {
		const before = await stored();
		const form = {
			...settingsFormFromRow(before, today()),
			coldPackAboveF: 40,
			shipWeekdaysTwoDay: [],
			feeTwoDay: '12.345'
		};
		const result = (await actions.save!(actionEvent(people.admin!, 'save', posted(form)))) as {
			status: number;
			data: { form: { errors: Record<string, unknown>; data: SettingsForm } };
		};
		expect(result.status).toBe(400);
		const { errors, data } = result.data.form;
		// The stored limits tell which of the clashing two was changed: only it is blamed.
		expect(errors.coldPackAboveF).toEqual([
			'40 °F (4 °C) must be above the heat-pack limit, 50 °F (10 °C).'
		]);
		expect(errors.heatPackBelowF).toBeUndefined();
		expect(errors.shipWeekdaysTwoDay).toEqual({
			_errors: ['Tick at least one day the shop hands two-day boxes to the carrier.']
		});
		expect(errors.feeTwoDay).toBeTruthy();
		expect(data.feeTwoDay).toBe('12.345');
		expect(data.coldPackAboveF).toBe(40);
		expect(await stored()).toEqual(before);
	});

	it('refuses a ZIP the dataset does not know beside the ZIP field', async () => {
		const before = await stored();
		const form = { ...settingsFormFromRow(before, today()), originZip: '00000' };
		const result = (await actions.save!(actionEvent(people.admin!, 'save', posted(form)))) as {
			status: number;
			data: { form: { errors: Record<string, unknown> } };
		};
		expect(result.status).toBe(400);
		expect(result.data.form.errors.originZip).toEqual([
			'ZIP 00000 is not a US ZIP code the ship check can place on the map.'
		]);
	});

	it('creates the row on the first save of a shop without one; defaults need a row first', async () => {
		const before = await stored();
		await scratch.db.deleteFrom('shop_setting').execute();
		expect(await restoreShippingDefaults(scratch.db, actor)).toBeNull();
		const outcome = await updateShopSetting(scratch.db, actor, valuesOf(before));
		expect(outcome).toMatchObject({ ok: true, created: true });
		expect(valuesOf(await stored())).toEqual(valuesOf(before));
		const entry = (await audits()).at(-1)!;
		expect(entry.action).toBe('settings.update');
		expect(entry.detail).toMatchObject({
			created: true,
			changes: { origin_zip: { from: null, to: before.origin_zip } }
		});
	});
});

describe('shop settings over HTTP, without JavaScript', () => {
	let scratch: ScratchDatabase;
	let app: RunningApp;
	const cookies: Partial<Record<'admin' | 'keeper', string>> = {};

	beforeAll(async () => {
		scratch = await scratchDatabase();
		await seedDemo(scratch.db, { today: '2026-12-01' });
		for (const role of ['admin', 'keeper'] as const) {
			const account = DEMO_ACCOUNTS.find((a) => a.role === role)!;
			const user = await scratch.db
				.selectFrom('User')
				.select('id')
				.where('email', '=', account.email)
				.executeTakeFirstOrThrow();
			cookies[role] = `hatchlot.session=${await createSession(scratch.db, user.id)}`;
		}
		app = await startApp({ DATABASE_URL: scratch.url });
	});
	afterAll(async () => {
		await app?.stop();
		await scratch?.drop();
	});

	const feeOf = async () =>
		(
			await scratch.db
				.selectFrom('shop_setting')
				.select('fee_two_day_cents')
				.executeTakeFirstOrThrow()
		).fee_two_day_cents;

	function post(role: 'admin' | 'keeper', action: string, body: URLSearchParams) {
		return fetch(`${app.origin}/admin?/${action}`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				origin: app.origin,
				accept: 'text/html',
				cookie: cookies[role]!,
				'content-type': 'application/x-www-form-urlencoded'
			},
			body
		});
	}
	async function browserForm(): Promise<URLSearchParams> {
		const row = await readShopSetting(scratch.db);
		const form = settingsFormFromRow(row!, todayInZone(row!.time_zone));
		const body = new URLSearchParams();
		for (const [name, value] of Object.entries(form)) {
			if (Array.isArray(value)) for (const day of value) body.append(name, String(day));
			else body.append(name, String(value ?? ''));
		}
		return body;
	}

	it('shows the owner the form with every fieldset and the cautions', async () => {
		const response = await fetch(`${app.origin}/admin`, {
			headers: { cookie: cookies.admin!, accept: 'text/html' }
		});
		expect(response.status).toBe(200);
		const html = await response.text();
		for (const words of [
			'Shipping days',
			'Weather limits',
			'Forecast horizon',
			'Shipping fees',
			'Reservations and claims',
			'Put back the defaults',
			'Heat packs can overheat a sealed box',
			'Knoxville, TN'
		]) {
			expect(html, words).toContain(words);
		}
		expect(html).toContain('name="shipWeekdaysOvernight"');
	});

	it('saves a posted form and answers with the page and its saved message', async () => {
		const body = await browserForm();
		body.set('feeTwoDay', '29.95');
		const response = await post('admin', 'save', body);
		expect(response.status).toBe(200);
		expect(await response.text()).toContain('Saved: one setting changed.');
		expect(await feeOf()).toBe(2995);
	});

	it('refuses the keeper’s post with 403 and changes nothing', async () => {
		const body = await browserForm();
		body.set('feeTwoDay', '1.00');
		expect((await post('keeper', 'save', body)).status).toBe(403);
		expect((await post('keeper', 'restoreDefaults', new URLSearchParams())).status).toBe(403);
		expect(await feeOf()).toBe(2995);
	});
});
