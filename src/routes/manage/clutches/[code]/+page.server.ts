// The clutch page: counts, lineage and history, and a quick-entry form for each thing a
// keeper does to a clutch. Every action checks the role and hands the change to
// $lib/server/clutches, which locks the row and re-checks everything against it.
import { error, fail, type RequestEvent } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import {
	message,
	setError,
	superValidate,
	type FormPathLeavesWithErrors,
	type SuperValidated
} from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { listPhotos } from '$lib/server/uploads/photos';
import {
	backToGrowing,
	changeSizeClass,
	changeStage,
	editNote,
	editSaleReadyOn,
	getClutchPage,
	markReady,
	merge,
	pause,
	recordLoss,
	recount,
	split,
	unpause,
	type ClutchRefusal
} from '$lib/server/clutches/clutches';
import { getDb } from '$lib/server/db';
import {
	backToGrowingSchema,
	lossSchema,
	mergeSchema,
	noteSchema,
	pauseSchema,
	recountSchema,
	saleReadySchema,
	sizeClassSchema,
	splitRows,
	splitSchema,
	stageSchema,
	stateNoteSchema
} from '$lib/stock/clutch-forms';
import type { Actions, PageServerLoad } from './$types';

const shopDay = () => shopClock(getDb(), env.SHOP_TIME_ZONE);

function keeper(event: RequestEvent) {
	const user = requireRole(event, 'keeper');
	return { userId: user.id, ip: clientAddress(event) };
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const { timeZone, today } = await shopDay();
	const page = await getClutchPage(getDb(), event.params.code, timeZone);
	if (!page) error(404, `No clutch has the code ${event.params.code}.`);
	const { clutch } = page;
	const quiet = { errors: false } as const;
	return {
		...page,
		photos: await listPhotos(getDb(), { kind: 'clutch', id: clutch.id }),
		timeZone,
		today,
		lossForm: await superValidate({ count: 1, reason: '', happenedOn: today }, zod4(lossSchema), {
			id: 'loss',
			...quiet
		}),
		recountForm: await superValidate(
			{ countAlive: clutch.counts.alive, reason: '', happenedOn: today, version: clutch.version },
			zod4(recountSchema),
			{ id: 'recount', ...quiet }
		),
		stageForm: await superValidate(
			{ stage: clutch.stage, version: clutch.version },
			zod4(stageSchema),
			{ id: 'stage', ...quiet }
		),
		sizeClassForm: await superValidate(
			{ sizeClass: clutch.sizeClass, version: clutch.version },
			zod4(sizeClassSchema),
			{ id: 'sizeClass', ...quiet }
		),
		pauseForm: await superValidate({ pausedReason: 'molting', note: '' }, zod4(pauseSchema), {
			id: 'pause',
			...quiet
		}),
		unpauseForm: await superValidate({ note: '' }, zod4(stateNoteSchema), {
			id: 'unpause',
			...quiet
		}),
		readyForm: await superValidate({ note: '' }, zod4(stateNoteSchema), { id: 'ready', ...quiet }),
		growingForm: await superValidate({ note: '' }, zod4(backToGrowingSchema), {
			id: 'growing',
			...quiet
		}),
		saleReadyForm: await superValidate(
			{ saleReadyOn: clutch.saleReadyOn, reason: '', version: clutch.version },
			zod4(saleReadySchema),
			{ id: 'saleReady', ...quiet }
		),
		noteForm: await superValidate(
			{ note: clutch.note, version: clutch.version },
			zod4(noteSchema),
			{ id: 'note', ...quiet }
		),
		mergeForm: await superValidate({ direction: 'take_in', otherCode: '' }, zod4(mergeSchema), {
			id: 'merge',
			...quiet
		}),
		splitForm: await superValidate({}, zod4(splitSchema), { id: 'split', ...quiet })
	};
};

/**
 * A refusal beside the field it belongs to; a clutch gone meanwhile is a 404. A refusal
 * because someone else saved first also hands back the clutch as it is now, so the page
 * shows those counts (and checks the next save against that version) while the form
 * keeps what was typed.
 */
function refused<T extends Record<string, unknown>>(
	form: SuperValidated<T>,
	refusal: ClutchRefusal,
	fieldFor: (field: string) => string = (field) => field
) {
	if (refusal.notFound && refusal.field === null) error(404, refusal.problem);
	const field = refusal.field === null ? '' : fieldFor(refusal.field);
	// The domain names its fields after these forms' fields.
	const failure = field
		? setError(form, field as FormPathLeavesWithErrors<T>, refusal.problem)
		: setError(form, refusal.problem);
	return refusal.current ? fail(400, { form, current: refusal.current }) : failure;
}

const count = (n: number) => `${n} ${n === 1 ? 'animal' : 'animals'}`;

export const actions: Actions = {
	loss: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(lossSchema), { id: 'loss' });
		if (!form.valid) return fail(400, { form });
		const { today } = await shopDay();
		const outcome = await recordLoss(getDb(), actor, event.params.code, form.data, today);
		if (!outcome.ok) return refused(form, outcome);
		// A recorded loss clears the form, so a second click cannot record it twice.
		form.data = { count: 1, reason: '', happenedOn: today };
		return message(form, `Loss recorded: ${count(outcome.clutch.counts.alive)} alive now.`);
	},
	recount: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(recountSchema), { id: 'recount' });
		if (!form.valid) return fail(400, { form });
		const { today } = await shopDay();
		const outcome = await recount(getDb(), actor, event.params.code, form.data, today);
		if (!outcome.ok) return refused(form, outcome);
		form.data = { ...form.data, reason: '', version: outcome.clutch.version };
		return message(form, `Census saved: ${count(outcome.clutch.counts.alive)} alive.`);
	},
	stage: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(stageSchema), { id: 'stage' });
		if (!form.valid) return fail(400, { form });
		const { today } = await shopDay();
		const outcome = await changeStage(getDb(), actor, event.params.code, form.data, today);
		if (!outcome.ok) return refused(form, outcome);
		form.data.version = outcome.clutch.version;
		return message(form, 'Stage saved.');
	},
	sizeClass: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(sizeClassSchema), { id: 'sizeClass' });
		if (!form.valid) return fail(400, { form });
		const { today } = await shopDay();
		const outcome = await changeSizeClass(getDb(), actor, event.params.code, form.data, today);
		if (!outcome.ok) return refused(form, outcome);
		form.data.version = outcome.clutch.version;
		return message(form, 'Size class saved.');
	},
	pause: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(pauseSchema), { id: 'pause' });
		if (!form.valid) return fail(400, { form });
		const { today } = await shopDay();
		const outcome = await pause(getDb(), actor, event.params.code, form.data, today);
		if (!outcome.ok) return refused(form, outcome, () => 'pausedReason');
		return message(form, 'Paused. It will not be sold until you unpause it.');
	},
	unpause: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(stateNoteSchema), { id: 'unpause' });
		if (!form.valid) return fail(400, { form });
		const { today } = await shopDay();
		const outcome = await unpause(getDb(), actor, event.params.code, form.data, today);
		if (!outcome.ok) return refused(form, outcome, () => 'note');
		form.data.note = '';
		return message(form, 'Unpaused.');
	},
	ready: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(stateNoteSchema), { id: 'ready' });
		if (!form.valid) return fail(400, { form });
		const { today } = await shopDay();
		const outcome = await markReady(getDb(), actor, event.params.code, form.data, today);
		if (!outcome.ok) return refused(form, outcome, () => 'note');
		form.data.note = '';
		return message(form, 'Marked ready. A listing can offer them now.');
	},
	growing: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(backToGrowingSchema), { id: 'growing' });
		if (!form.valid) return fail(400, { form });
		const { today } = await shopDay();
		const outcome = await backToGrowing(getDb(), actor, event.params.code, form.data, today);
		if (!outcome.ok) return refused(form, outcome, () => 'note');
		form.data.note = '';
		return message(form, 'Back to growing.');
	},
	saleReady: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(saleReadySchema), { id: 'saleReady' });
		if (!form.valid) return fail(400, { form });
		const outcome = await editSaleReadyOn(getDb(), actor, event.params.code, form.data);
		if (!outcome.ok) return refused(form, outcome);
		form.data = { ...form.data, reason: '', version: outcome.clutch.version };
		return message(form, 'Sale-ready date saved.');
	},
	note: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(noteSchema), { id: 'note' });
		if (!form.valid) return fail(400, { form });
		const outcome = await editNote(getDb(), actor, event.params.code, form.data);
		if (!outcome.ok) return refused(form, outcome);
		form.data.version = outcome.clutch.version;
		return message(form, 'Note saved.');
	},
	merge: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(mergeSchema), { id: 'merge' });
		if (!form.valid) return fail(400, { form });
		const { today } = await shopDay();
		const here = event.params.code;
		const { otherCode, direction } = form.data;
		const pair =
			direction === 'take_in'
				? { intoCode: here, fromCode: otherCode }
				: { intoCode: otherCode, fromCode: here };
		const outcome = await merge(getDb(), actor, pair, today);
		if (!outcome.ok) {
			// Only this page's own clutch vanishing is a 404; a missing other one belongs to its field.
			if (outcome.notFound) return setError(form, 'otherCode', outcome.problem);
			return refused(form, outcome, () => 'otherCode');
		}
		form.data.otherCode = '';
		return message(
			form,
			`${count(outcome.moved)} moved from ${pair.fromCode} into ${pair.intoCode}.`
		);
	},
	split: async (event) => {
		const actor = keeper(event);
		const form = await superValidate(event.request, zod4(splitSchema), { id: 'split' });
		if (!form.valid) return fail(400, { form });
		const rows = splitRows(form.data);
		if (rows.length === 0)
			return setError(form, 'part1Count', 'Give the count of at least one new clutch.');
		const { today } = await shopDay();
		const outcome = await split(
			getDb(),
			actor,
			event.params.code,
			{ parts: rows.map(({ count, sizeClass }) => ({ count, sizeClass })), note: form.data.note },
			today
		);
		if (!outcome.ok) {
			const row = outcome.part === undefined ? undefined : rows[outcome.part]?.row;
			return refused(form, outcome, () => (row ? `part${row}Count` : ''));
		}
		form.data = {
			...form.data,
			part1Count: undefined,
			part2Count: undefined,
			part3Count: undefined,
			part4Count: undefined,
			part1Size: '',
			part2Size: '',
			part3Size: '',
			part4Size: '',
			note: ''
		};
		return message(
			form,
			`Split: ${outcome.children.map((c) => `${c.code} (${c.count})`).join(', ')}; ${count(outcome.clutch.counts.alive)} stay here.`
		);
	}
};
