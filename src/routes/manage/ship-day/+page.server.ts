import { error, fail } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { shipDayFromQuery, substituteSchema } from '$lib/fulfilment/ship-day-forms';
import { recheckSchema } from '$lib/shipping/dispatch-forms';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { loadShipDay } from '$lib/server/fulfilment/ship-day';
import { substituteChoices, substituteClutch } from '$lib/server/fulfilment/substitute';
import { checkOrder } from '$lib/server/shipping/order-checks';
import { forecastSource } from '$lib/server/weather';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'keeper');
	const db = getDb();
	const { timeZone, today } = await shopClock(db, env.SHOP_TIME_ZONE);
	const { date, note } = shipDayFromQuery(event.url.searchParams.get('date'), today);
	const day = await loadShipDay(db, date, { source: forecastSource(db), today, timeZone });
	const unshipped = [...day.toPack, ...day.packed];
	// A re-check form for each box whose check changed; a substitute form for each short line.
	const recheck = Object.fromEntries(
		await Promise.all(
			unshipped
				.filter((order) => order.change || order.checkUnavailable)
				.map(
					async (order) =>
						[
							order.id,
							await superValidate({ orderId: order.id }, zod4(recheckSchema), {
								id: `recheck-${order.id}`,
								errors: false
							})
						] as const
				)
		)
	);
	const shortClutches = new Set(day.shortfalls.map((s) => s.clutchId));
	const shortLines = unshipped.flatMap((order) =>
		order.lines.filter((line) => line.clutchId !== null && shortClutches.has(line.clutchId))
	);
	const substitute = Object.fromEntries(
		await Promise.all(
			shortLines.map(
				async (line) =>
					[
						line.id,
						{
							choices: await substituteChoices(db, line.id),
							form: await superValidate({ orderLineId: line.id }, zod4(substituteSchema), {
								id: `substitute-${line.id}`,
								errors: false
							})
						}
					] as const
			)
		)
	);
	return {
		day,
		today,
		timeZone,
		dateNote: note,
		recheck,
		substitute,
		isAdmin: me.role === 'admin'
	};
};

export const actions: Actions = {
	recheck: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(recheckSchema));
		if (!form.valid) return fail(400, { form });
		const db = getDb();
		try {
			const outcome = await checkOrder(db, forecastSource(db), form.data.orderId, {
				kind: 'user',
				userId: me.id,
				ip: clientAddress(event)
			});
			return message(form, outcome.message);
		} catch (cause) {
			console.error('[ship-day] re-check failed', cause);
			error(503, 'The ship check could not run just now; nothing was changed.');
		}
	},
	substitute: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(substituteSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await substituteClutch(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			form.data
		);
		if (!outcome.ok) return setError(form, 'clutchId', outcome.problem);
		return message(form, 'Line moved; the order’s history says from which clutch to which.');
	}
};
