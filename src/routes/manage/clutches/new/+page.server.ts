// Recording young bought in from another breeder: one new clutch, made through
// insertClutches like every other, with its projected sale-ready date.
import { fail, redirect } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { resolve } from '$app/paths';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { recordBoughtIn, speciesChoices } from '$lib/server/clutches/clutches';
import { getDb } from '$lib/server/db';
import { boughtInSchema } from '$lib/stock/clutch-forms';
import type { Actions, PageServerLoad } from './$types';

async function shopToday() {
	return (await shopClock(getDb(), env.SHOP_TIME_ZONE)).today;
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const today = await shopToday();
	return {
		today,
		species: await speciesChoices(getDb()),
		form: await superValidate(
			{ foundOn: today, stage: 'juvenile', sizeClass: 'small', generation: 1 },
			zod4(boughtInSchema),
			{ errors: false }
		)
	};
};

export const actions: Actions = {
	default: async (event) => {
		const user = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(boughtInSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await recordBoughtIn(
			getDb(),
			{ userId: user.id, ip: clientAddress(event) },
			form.data,
			await shopToday()
		);
		if (!outcome.ok) {
			const field = (outcome.field ?? '') as '' | keyof typeof form.data;
			return setError(form, field, outcome.problem);
		}
		redirect(303, resolve('/manage/clutches/[code]', { code: outcome.code }));
	}
};
