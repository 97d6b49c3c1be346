import { error, fail } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import {
	message,
	setError,
	superValidate,
	type FormPathLeavesWithErrors
} from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { lookUpZip } from '$lib/server/accounts/zip';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import {
	DEFAULT_SHOP_TIME_ZONE,
	readShopSetting,
	resolveShopTimeZone,
	restoreShippingDefaults,
	updateShopSetting
} from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import type { ShopSetting } from '$lib/server/db/schema';
import { todayInZone, type IsoDate } from '$lib/format/dates';
import { federalHolidays } from '$lib/shipping/calendar';
import {
	centsToDollarText,
	newSettingsForm,
	restoreDefaultsSchema,
	rowThresholds,
	settingValuesFromForm,
	settingsFormFromRow,
	settingsFormSchema,
	timeZoneOptions,
	type SettingChanges,
	type SettingsForm,
	type SettingsFormField
} from '$lib/shipping/settings-schema';
import type { Actions, PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

const SETTINGS_FORM = { id: 'settings' } as const;
const DEFAULTS_FORM = { id: 'defaults' } as const;

/** The row (or none yet) and the shop's calendar day, or a 503 while PostgreSQL is away. */
async function current(): Promise<{ setting: ShopSetting | null; today: IsoDate; zone: string }> {
	try {
		const db = getDb();
		const setting = (await readShopSetting(db)) ?? null;
		const zone = await resolveShopTimeZone(db, env.SHOP_TIME_ZONE);
		return { setting, today: todayInZone(zone), zone };
	} catch (cause) {
		logger.error({ err: cause }, '[admin] shop settings unavailable');
		error(503, 'The shop settings cannot be read just now. Check that PostgreSQL is running.');
	}
}

function schemaFor(setting: ShopSetting | null, today: IsoDate) {
	return zod4(settingsFormSchema(today, setting ? rowThresholds(setting) : undefined));
}

function settingsFormOf(setting: ShopSetting | null, today: IsoDate, zone: string) {
	return superValidate(
		setting ? settingsFormFromRow(setting, today) : newSettingsForm(zone),
		schemaFor(setting, today),
		{ ...SETTINGS_FORM, errors: false }
	);
}

/** The next few federal holidays, observed dates: closed whatever the form says. */
function upcomingHolidays(today: IsoDate): { name: string; observedDate: IsoDate }[] {
	const year = Number(today.slice(0, 4));
	return [...federalHolidays(year), ...federalHolidays(year + 1)]
		.filter((holiday) => holiday.observedDate >= today)
		.slice(0, 4)
		.map(({ name, observedDate }) => ({ name, observedDate }));
}

function savedMessage(changes: SettingChanges, created: boolean): string {
	const count = Object.keys(changes).length;
	if (created) return 'Shop settings saved for the first time.';
	if (count === 0) return 'Nothing had changed, so nothing was saved.';
	return `Saved: ${count === 1 ? 'one setting' : `${count} settings`} changed. The ship check uses them from now on.`;
}

/** Where superforms keeps a field's errors: a list field's own errors sit under `_errors`. */
function errorPath(field: SettingsFormField): FormPathLeavesWithErrors<SettingsForm> {
	return (
		field === 'shipWeekdaysOvernight' || field === 'shipWeekdaysTwoDay' ? `${field}._errors` : field
	) as FormPathLeavesWithErrors<SettingsForm>;
}

function actorOf(event: Parameters<typeof clientAddress>[0], userId: string) {
	return { userId, ip: clientAddress(event) };
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'admin');
	const { setting, today, zone } = await current();
	const place = setting ? lookUpZip(setting.origin_zip) : null;
	return {
		setting,
		today,
		originPlace: place ? `${place.city}, ${place.state}` : null,
		timeZones: timeZoneOptions(
			Intl.supportedValuesOf('timeZone'),
			setting?.time_zone ?? DEFAULT_SHOP_TIME_ZONE
		),
		holidays: upcomingHolidays(today),
		form: await settingsFormOf(setting, today, zone),
		defaultsForm: await superValidate(zod4(restoreDefaultsSchema), DEFAULTS_FORM)
	};
};

export const actions: Actions = {
	save: async (event) => {
		const me = requireRole(event, 'admin');
		const { setting, today } = await current();
		const form = await superValidate(event.request, schemaFor(setting, today), SETTINGS_FORM);
		if (!form.valid) return fail(400, { form });
		const values = settingValuesFromForm(form.data);
		const outcome = await updateShopSetting(getDb(), actorOf(event, me.id), values);
		if (!outcome.ok) {
			for (const [field, problem] of Object.entries(outcome.fieldErrors)) {
				setError(form, errorPath(field as SettingsFormField), problem);
			}
			return fail(400, { form });
		}
		// Show the amounts as stored ("12.5" comes back as "12.50").
		form.data.feeOvernight = centsToDollarText(outcome.setting.fee_overnight_cents);
		form.data.feeTwoDay = centsToDollarText(outcome.setting.fee_two_day_cents);
		return message(form, savedMessage(outcome.changes, outcome.created));
	},
	restoreDefaults: async (event) => {
		const me = requireRole(event, 'admin');
		const defaultsForm = await superValidate(
			event.request,
			zod4(restoreDefaultsSchema),
			DEFAULTS_FORM
		);
		const outcome = await restoreShippingDefaults(getDb(), actorOf(event, me.id));
		if (!outcome) {
			return setError(
				defaultsForm,
				'Save the shop settings once first; then the defaults can be put back.'
			);
		}
		const { today, zone } = await current();
		const count = Object.keys(outcome.changes).length;
		defaultsForm.message =
			count === 0
				? 'The weather limits and ship days were at their defaults already; nothing changed.'
				: `Defaults put back: ${count === 1 ? 'one setting' : `${count} settings`} changed.`;
		// The settings form on the page takes the restored values too (its id matches).
		return { defaultsForm, form: await settingsFormOf(outcome.setting, today, zone) };
	}
};
