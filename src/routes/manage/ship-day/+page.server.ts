import { fail } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { shopTimeOf } from '$lib/fulfilment/local-time';
import {
	deliveredAtFrom,
	deliverSchema,
	lateNoticeSchema,
	packItemsFrom,
	packSchema,
	reverseSchema,
	shipSchema,
	type ReversibleMark
} from '$lib/fulfilment/mark-forms';
import { shipDayFromQuery, substituteSchema } from '$lib/fulfilment/ship-day-forms';
import { recheckSchema } from '$lib/shipping/dispatch-forms';
import { origin } from '$lib/server/auth';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import {
	lateShipments,
	markDelivered,
	markPacked,
	markShipped,
	reverseMark,
	sendLateNotice
} from '$lib/server/fulfilment/marks';
import { changedChecks, loadShipDay } from '$lib/server/fulfilment/ship-day';
import { substituteChoices, substituteClutch } from '$lib/server/fulfilment/substitute';
import { forecastSource } from '$lib/server/weather';
import { recheckAction } from '$lib/server/shipping/recheck-action';
import type { Actions, PageServerLoad } from './$types';

const quiet = (id: string) => ({ id, errors: false }) as const;

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
							await superValidate(
								{ orderId: order.id },
								zod4(recheckSchema),
								quiet(`recheck-${order.id}`)
							)
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
							form: await superValidate(
								{ orderLineId: line.id },
								zod4(substituteSchema),
								quiet(`substitute-${line.id}`)
							)
						}
					] as const
			)
		)
	);
	const now = shopTimeOf(new Date(), timeZone);
	// One set of marking forms per box, each with its own id so results stay apart.
	const marks = Object.fromEntries(
		await Promise.all(
			[...day.toPack, ...day.packed, ...day.shipped].map(async (order) => {
				const reversible: ReversibleMark | null = order.state === 'scheduled' ? null : order.state;
				return [
					order.id,
					{
						pack:
							order.state === 'scheduled'
								? await superValidate(
										{ orderIds: [order.id], confirmChangedCheck: [] },
										zod4(packSchema),
										quiet(`pack-${order.id}`)
									)
								: null,
						ship:
							order.state === 'packed'
								? await superValidate(
										{
											orderId: order.id,
											carrier: 'UPS' as const,
											trackingNumber: '',
											confirmOffDay: false
										},
										zod4(shipSchema),
										quiet(`ship-${order.id}`)
									)
								: null,
						deliver:
							order.state === 'shipped'
								? await superValidate(
										{ orderId: order.id, deliveredAt: now },
										zod4(deliverSchema),
										quiet(`deliver-${order.id}`)
									)
								: null,
						reverse:
							me.role === 'admin' && reversible
								? await superValidate(
										{ orderId: order.id, from: reversible, reason: '' },
										zod4(reverseSchema),
										quiet(`reverse-${order.id}`)
									)
								: null
					}
				] as const;
			})
		)
	);
	const packAll =
		day.toPack.length > 1
			? await superValidate(
					{ orderIds: day.toPack.map((o) => o.id), confirmChangedCheck: [] },
					zod4(packSchema),
					quiet('pack-all')
				)
			: null;
	// Late boxes show on today's page: the morning after they were due.
	const late = date === today ? await lateShipments(db, today) : [];
	const lateForms = Object.fromEntries(
		await Promise.all(
			late.map(
				async (box) =>
					[
						box.orderId,
						await superValidate(
							{ orderId: box.orderId },
							zod4(lateNoticeSchema),
							quiet(`late-${box.orderId}`)
						)
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
		marks,
		packAll,
		late,
		lateForms,
		isAdmin: me.role === 'admin'
	};
};

const actorOf = (me: { id: string }, event: Parameters<typeof clientAddress>[0]) => ({
	userId: me.id,
	ip: clientAddress(event)
});

export const actions: Actions = {
	recheck: (event) => recheckAction(event, 'ship-day'),
	pack: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(packSchema));
		if (!form.valid) return fail(400, { form });
		const db = getDb();
		const { today } = await shopClock(db, env.SHOP_TIME_ZONE);
		// The server decides what changed, as the page showed it; the keeper only confirms.
		const changes = await changedChecks(db, forecastSource(db), form.data.orderIds, today);
		const items = packItemsFrom(form.data, (id) => Boolean(changes.get(id))).map((item) => {
			const change = changes.get(item.orderId);
			return change?.kind === 'packs' && item.confirmChangedCheck
				? { ...item, packs: change.packs }
				: item;
		});
		const outcome = await markPacked(db, actorOf(me, event), { orders: items });
		const packed = outcome.packed.map((p) => p.orderNumber);
		const text = [
			packed.length ? `Packed ${packed.join(', ')}.` : '',
			...outcome.refused.map((r) => r.problem)
		]
			.filter(Boolean)
			.join(' ');
		if (outcome.refused.length && !packed.length)
			return message(form, { ok: false, text }, { status: 409 });
		return message(form, { ok: outcome.refused.length === 0, text });
	},
	ship: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(shipSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await markShipped(getDb(), actorOf(me, event), form.data, {
			origin: origin()
		});
		if (!outcome.ok) {
			if (
				outcome.field === 'carrier' ||
				outcome.field === 'trackingNumber' ||
				outcome.field === 'confirmOffDay'
			)
				return setError(form, outcome.field, outcome.problem, { status: outcome.status });
			return message(form, { ok: false, text: outcome.problem }, { status: outcome.status });
		}
		return message(form, {
			ok: true,
			text: `${outcome.orderNumber} is on its way; the customer is e-mailed the ship notice.`
		});
	},
	deliver: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(deliverSchema));
		if (!form.valid) return fail(400, { form });
		const db = getDb();
		const { timeZone } = await shopClock(db, env.SHOP_TIME_ZONE);
		const at = deliveredAtFrom(form.data.deliveredAt, timeZone, new Date());
		if (!at.ok) return setError(form, 'deliveredAt', at.problem);
		const outcome = await markDelivered(db, actorOf(me, event), {
			orderId: form.data.orderId,
			at: at.at
		});
		if (!outcome.ok) {
			if (outcome.field === 'deliveredAt')
				return setError(form, 'deliveredAt', outcome.problem, { status: outcome.status });
			return message(form, { ok: false, text: outcome.problem }, { status: outcome.status });
		}
		return message(form, {
			ok: true,
			text: `${outcome.orderNumber} is delivered; the claim window is open.`
		});
	},
	reverse: async (event) => {
		const me = requireRole(event, 'admin');
		const form = await superValidate(event.request, zod4(reverseSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await reverseMark(getDb(), actorOf(me, event), form.data);
		if (!outcome.ok) {
			if (outcome.field === 'reason')
				return setError(form, 'reason', outcome.problem, { status: outcome.status });
			return message(form, { ok: false, text: outcome.problem }, { status: outcome.status });
		}
		return message(form, {
			ok: true,
			text: `${outcome.orderNumber} is back to ${outcome.to.replaceAll('_', ' ')}.`
		});
	},
	late: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(lateNoticeSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await sendLateNotice(getDb(), actorOf(me, event), form.data, {
			origin: origin()
		});
		if (!outcome.ok)
			return message(form, { ok: false, text: outcome.problem }, { status: outcome.status });
		return message(form, {
			ok: true,
			text: `The customer of ${outcome.orderNumber} is e-mailed.`
		});
	},
	substitute: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(event.request, zod4(substituteSchema));
		if (!form.valid) return fail(400, { form });
		const outcome = await substituteClutch(getDb(), actorOf(me, event), form.data);
		if (!outcome.ok) return setError(form, 'clutchId', outcome.problem);
		return message(form, 'Line moved; the order’s history says from which clutch to which.');
	}
};
