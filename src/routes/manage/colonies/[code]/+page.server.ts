import { error, fail, redirect } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	careEntryKinds,
	careEntrySchema,
	deleteEntrySchema,
	type CareEntryForm
} from '$lib/care/forms';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { formatShopDate } from '$lib/format/dates';
import {
	colonyTimeline,
	deleteCareEntry,
	findCareEntry,
	logCareEntry,
	updateCareEntry
} from '$lib/server/care/care-log';
import { findColony, findColonyPage } from '$lib/server/colonies/colonies';
import { defaultRecipe } from '$lib/server/care/recipes';
import { listPhotos } from '$lib/server/uploads/photos';
import { getDb } from '$lib/server/db';
import type { CareEntryKind } from '$lib/server/db/schema';
import type { Actions, PageServerLoad } from './$types';

const schema = zod4(careEntrySchema);

function kindFrom(value: string | null): CareEntryKind {
	return (careEntryKinds as readonly string[]).includes(value ?? '')
		? (value as CareEntryKind)
		: 'moisture_check';
}

async function colonyOr404(code: string, today: string) {
	const colony = await findColonyPage(getDb(), code, today);
	if (!colony) error(404, `No colony has the code ${code}.`);
	return colony;
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const db = getDb();
	const { today, timeZone } = await shopClock(db, env.SHOP_TIME_ZONE);
	const colony = await colonyOr404(event.params.code, today);
	const kind = kindFrom(event.url.searchParams.get('log'));
	const editId = Number(event.url.searchParams.get('edit'));
	const found = Number.isInteger(editId) && editId > 0 ? await findCareEntry(db, editId) : null;
	// Only an entry of this colony can be edited from its page.
	const editing = found && found.colony_id === colony.id ? found : null;
	const [timeline, recipe, photos] = await Promise.all([
		colonyTimeline(db, colony.id, 15),
		defaultRecipe(db),
		listPhotos(db, { kind: 'colony', id: colony.id })
	]);
	return {
		colony,
		recipe,
		photos,
		today,
		timeZone,
		timeline,
		kind,
		logForm: await superValidate(
			{ kind, loggedOn: today, saveTub: true, holdUntil: '', note: '' },
			schema,
			{ id: 'log', errors: false }
		),
		editForm: editing
			? await superValidate(
					{
						kind: editing.kind,
						loggedOn: editing.logged_on,
						moistureReading: editing.moisture_reading ?? undefined,
						censusCount: editing.census_count ?? undefined,
						note: editing.note,
						saveTub: false,
						holdUntil: ''
					},
					schema,
					{ id: 'edit', errors: false }
				)
			: null,
		deleteForm: editing
			? await superValidate({ entryId: editing.id }, zod4(deleteEntrySchema), {
					id: 'delete',
					errors: false
				})
			: null,
		editingId: editing?.id ?? null
	};
};

/**
 * A refused form goes back to the page with what was posted, and the page names the kind
 * in its labels: a kind that is not one of ours is shown as the default one.
 */
function withKnownKind<T extends { data: { kind: string } }>(form: T): T {
	form.data.kind = kindFrom(form.data.kind);
	return form;
}

async function actionContext(event: Parameters<Actions[string]>[0]) {
	const me = requireRole(event, 'keeper');
	const db = getDb();
	const [{ today }, colony] = await Promise.all([
		shopClock(db, env.SHOP_TIME_ZONE),
		findColony(db, event.params.code ?? '')
	]);
	if (!colony) error(404, `No colony has the code ${event.params.code}.`);
	return { actor: { userId: me.id, ip: clientAddress(event) }, today, colony };
}

export const actions: Actions = {
	log: async (event) => {
		const { actor, today, colony } = await actionContext(event);
		const form = await superValidate(event.request, schema, { id: 'log' });
		if (!form.valid) return fail(400, { logForm: withKnownKind(form) });
		const outcome = await logCareEntry(getDb(), actor, colony.id, form.data, today);
		if (!outcome.ok) return setError(form, outcome.field as keyof CareEntryForm, outcome.problem);
		const tub = outcome.value.tub;
		// The next entry starts from a clean form of the same kind, dated today again.
		const fresh = await superValidate(
			{ kind: form.data.kind, loggedOn: today, saveTub: true, holdUntil: '', note: '' },
			schema,
			{ id: 'log', errors: false }
		);
		// Not message(): the blank form fails its own rules (no reading yet), and message()
		// would answer the saved entry as a refused form, with 400.
		fresh.message = tub
			? `Logged. The removed substrate is resting tub ${tub.code}, held until ${formatShopDate(tub.holdUntil, 'UTC')}.`
			: 'Logged.';
		return { form: fresh };
	},
	edit: async (event) => {
		const { actor, today } = await actionContext(event);
		const entryId = Number(event.url.searchParams.get('edit'));
		const form = await superValidate(event.request, schema, { id: 'edit' });
		if (!form.valid) return fail(400, { editForm: withKnownKind(form) });
		if (!Number.isInteger(entryId) || entryId <= 0)
			return setError(form, 'kind', 'Which entry? Open it from the timeline again.');
		const outcome = await updateCareEntry(getDb(), actor, entryId, form.data, today);
		if (!outcome.ok) return setError(form, outcome.field as keyof CareEntryForm, outcome.problem);
		return message(form, 'Entry saved.');
	},
	delete: async (event) => {
		const { actor, colony } = await actionContext(event);
		const form = await superValidate(event.request, zod4(deleteEntrySchema), { id: 'delete' });
		if (!form.valid) return fail(400, { deleteForm: form });
		const entry = await findCareEntry(getDb(), form.data.entryId);
		if (!entry || entry.colony_id !== colony.id)
			return setError(form, 'entryId', 'This entry is not in this colony’s log.');
		const outcome = await deleteCareEntry(getDb(), actor, form.data.entryId);
		if (!outcome.ok) return setError(form, 'entryId', outcome.problem);
		redirect(303, `/manage/colonies/${encodeURIComponent(colony.code)}?deleted=1#timeline`);
	}
};
