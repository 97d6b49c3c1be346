import { fail, redirect } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { colonySchema } from '$lib/care/forms';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { createColony, speciesChoices } from '$lib/server/colonies/colonies';
import { getDb } from '$lib/server/db';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const { today } = await shopClock(getDb(), env.SHOP_TIME_ZONE);
	const species = await speciesChoices(getDb());
	const wanted = species.find((s) => s.slug === event.url.searchParams.get('species'));
	return {
		species,
		form: await superValidate(
			{ startedOn: today, speciesId: wanted?.id ?? 0, generation: 1 },
			zod4(colonySchema),
			{ errors: false }
		)
	};
};

export const actions: Actions = {
	default: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(colonySchema));
		if (!form.valid) return fail(400, { form });
		const { today } = await shopClock(getDb(), env.SHOP_TIME_ZONE);
		const outcome = await createColony(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			form.data,
			today
		);
		if (!outcome.ok) return setError(form, outcome.field as 'name', outcome.problem);
		redirect(303, `/manage/colonies/${encodeURIComponent(outcome.value.code)}?created=1`);
	}
};
