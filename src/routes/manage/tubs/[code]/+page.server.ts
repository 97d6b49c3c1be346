import { error, fail } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { closeTubSchema, holdSchema, tubCheckSchema, type TubCheckForm } from '$lib/care/forms';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { formatShopDate } from '$lib/format/dates';
import { getDb } from '$lib/server/db';
import {
	changeHoldUntil,
	closeTub,
	findTubId,
	findTubPage,
	recordTubCheck
} from '$lib/server/tubs/tubs';
import type { Actions, PageServerLoad } from './$types';

/** Empty clutch rows to start from; the page adds more on request. */
const PART_ROWS = 2;

function blankCheck(today: string): Partial<TubCheckForm> {
	return {
		checkedOn: today,
		youngFound: 0,
		eggsSeen: false,
		note: '',
		partCount: Array(PART_ROWS).fill(0),
		partStage: Array(PART_ROWS).fill('hatchling'),
		partSize: Array(PART_ROWS).fill('tiny'),
		keepResting: false
	};
}

async function tubOr404(code: string) {
	const { today, timeZone } = await shopClock(getDb(), env.SHOP_TIME_ZONE);
	const tub = await findTubPage(getDb(), code, today);
	if (!tub) error(404, `No resting tub has the code ${code}.`);
	return { tub, today, timeZone };
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	const { tub, today, timeZone } = await tubOr404(event.params.code);
	return {
		tub,
		today,
		timeZone,
		checkForm: await superValidate(blankCheck(today), zod4(tubCheckSchema), {
			id: 'check',
			errors: false
		}),
		holdForm: await superValidate({ holdUntil: tub.holdUntil }, zod4(holdSchema), {
			id: 'hold',
			errors: false
		}),
		closeForm: await superValidate({ closedOn: today, note: '' }, zod4(closeTubSchema), {
			id: 'close',
			errors: false
		})
	};
};

/** What an action needs: the signed-in keeper, the tub's id and the shop's today. */
async function actionContext(event: Parameters<Actions[string]>[0]) {
	const me = requireRole(event, 'keeper');
	const db = getDb();
	const [{ today }, tubId] = await Promise.all([
		shopClock(db, env.SHOP_TIME_ZONE),
		findTubId(db, event.params.code ?? '')
	]);
	if (tubId === null) error(404, `No resting tub has the code ${event.params.code}.`);
	return { actor: { userId: me.id, ip: clientAddress(event) }, tubId, today };
}

export const actions: Actions = {
	check: async (event) => {
		const { actor, tubId, today } = await actionContext(event);
		const form = await superValidate(event.request, zod4(tubCheckSchema), { id: 'check' });
		if (!form.valid) return fail(400, { checkForm: form });
		const outcome = await recordTubCheck(getDb(), actor, tubId, form.data, today);
		if (!outcome.ok) return setError(form, outcome.field as 'checkedOn', outcome.problem);
		const made = outcome.value.clutches;
		const fresh = await superValidate(blankCheck(today), zod4(tubCheckSchema), {
			id: 'check',
			errors: false
		});
		return message(
			fresh,
			made.length === 0
				? 'Check recorded.'
				: `Check recorded. ${made.map((c) => `${c.code} (${c.count})`).join(', ')} ${made.length === 1 ? 'is a new clutch' : 'are new clutches'}, projected sale-ready ${made[0] ? formatShopDate(made[0].saleReadyOn, 'UTC') : ''}.`
		);
	},
	hold: async (event) => {
		const { actor, tubId } = await actionContext(event);
		const form = await superValidate(event.request, zod4(holdSchema), { id: 'hold' });
		if (!form.valid) return fail(400, { holdForm: form });
		const outcome = await changeHoldUntil(getDb(), actor, tubId, form.data.holdUntil);
		if (!outcome.ok) return setError(form, 'holdUntil', outcome.problem);
		return message(form, 'Hold date saved.');
	},
	close: async (event) => {
		const { actor, tubId, today } = await actionContext(event);
		const form = await superValidate(event.request, zod4(closeTubSchema), { id: 'close' });
		if (!form.valid) return fail(400, { closeForm: form });
		const outcome = await closeTub(
			getDb(),
			actor,
			tubId,
			form.data.closedOn,
			form.data.note,
			today
		);
		if (!outcome.ok) return setError(form, 'closedOn', outcome.problem);
		return message(
			form,
			outcome.value.state === 'cleared'
				? 'Cleared: the substrate can go to the compost.'
				: 'Closed as yielded.'
		);
	}
};
