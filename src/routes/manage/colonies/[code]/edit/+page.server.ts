import { error, fail, redirect } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { colonySchema, retireSchema } from '$lib/care/forms';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import {
	findColony,
	setRetired,
	speciesChoices,
	updateColony
} from '$lib/server/colonies/colonies';
import { getDb } from '$lib/server/db';
import type { Actions, PageServerLoad } from './$types';

async function colonyOr404(code: string) {
	const db = getDb();
	const [{ today }, colony] = await Promise.all([
		shopClock(db, env.SHOP_TIME_ZONE),
		findColony(db, code)
	]);
	if (!colony) error(404, `No colony has the code ${code}.`);
	return { colony, today };
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const { colony, today } = await colonyOr404(event.params.code);
	return {
		colony: { code: colony.code, name: colony.name, retiredOn: colony.retired_on },
		species: await speciesChoices(getDb()),
		form: await superValidate(
			{
				speciesId: colony.species_id,
				name: colony.name,
				lengthIn: Number(colony.enclosure_length_in),
				widthIn: Number(colony.enclosure_width_in),
				depthIn: Number(colony.substrate_depth_in),
				foundersCount: colony.founders_count,
				foundersNote: colony.founders_note,
				generation: colony.generation,
				startedOn: colony.started_on,
				notes: colony.notes
			},
			zod4(colonySchema),
			{ id: 'colony', errors: false }
		),
		retireForm: await superValidate({ retiredOn: today, reason: '' }, zod4(retireSchema), {
			id: 'retire',
			errors: false
		})
	};
};

export const actions: Actions = {
	save: async (event) => {
		const me = requireRole(event, 'keeper');
		const { colony, today } = await colonyOr404(event.params.code);
		const form = await superValidate(event.request, zod4(colonySchema), { id: 'colony' });
		if (!form.valid) return fail(400, { form });
		const outcome = await updateColony(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			colony.id,
			form.data,
			today
		);
		if (!outcome.ok) return setError(form, outcome.field as 'name', outcome.problem);
		redirect(303, `/manage/colonies/${encodeURIComponent(colony.code)}`);
	},
	retire: async (event) => {
		const me = requireRole(event, 'keeper');
		const { colony, today } = await colonyOr404(event.params.code);
		const form = await superValidate(event.request, zod4(retireSchema), { id: 'retire' });
		if (!form.valid) return fail(400, { retireForm: form });
		const outcome = await setRetired(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			colony.id,
			colony.retired_on ? null : form.data.retiredOn,
			form.data.reason,
			today
		);
		if (!outcome.ok) return setError(form, 'retiredOn', outcome.problem);
		return message(
			form,
			colony.retired_on
				? 'Back in the care schedule.'
				: 'Retired: it leaves the care schedule and the due list.'
		);
	}
};
