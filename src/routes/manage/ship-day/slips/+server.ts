// A ship day's slips in one PDF, in ship order (overnight first, then two-day, then by
// order number). GET draws up to SLIP_SYNC_LIMIT boxes while the keeper waits; POST
// queues a batch job for any day (the way for bigger ones) and answers with where to
// watch it: JSON for the page's script, a redirect to the progress page without one.
import { json, redirect } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { siteOrigin } from '$lib/catalogue/crawl';
import { formatCount } from '$lib/format/labels';
import { formatShopDate, parseIsoDate, type IsoDate } from '$lib/format/dates';
import { SLIP_SYNC_LIMIT } from '$lib/fulfilment/slip-rules';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import { createSlipBatch, slipBatchView } from '$lib/server/fulfilment/slip-batches';
import {
	loadSlipOrders,
	slipOrderIdsForDay,
	slipPaperOf,
	SlipRefused
} from '$lib/server/fulfilment/slip-data';
import { pdfResponse, refusalResponse, wantsHtml } from '$lib/server/fulfilment/slip-responses';
import { renderSlipsPdf } from '$lib/server/fulfilment/slips-pdf';
import type { RequestHandler } from './$types';

/** The ?date= of the request as a calendar day, or null. */
function dayOf(url: URL): IsoDate | null {
	const value = url.searchParams.get('date') ?? '';
	try {
		parseIsoDate(value);
		return value;
	} catch {
		return null;
	}
}

const toShipDays = { href: '/manage/ship-day', label: 'Back to the ship day' };

function shipDayLink(date: IsoDate) {
	return { href: `/manage/ship-day?date=${date}`, label: 'Back to the ship day' };
}

export const GET: RequestHandler = async (event) => {
	requireRole(event, 'keeper');
	const date = dayOf(event.url);
	if (!date)
		return refusalResponse(
			event.request,
			400,
			'Say which ship day to print, as ?date=YYYY-MM-DD.',
			toShipDays
		);
	const db = getDb();
	const orderIds = await slipOrderIdsForDay(db, date);
	const day = formatShopDate(date, 'UTC');
	if (orderIds.length === 0)
		return refusalResponse(
			event.request,
			404,
			`No boxes are scheduled or packed for ${day}.`,
			shipDayLink(date)
		);
	if (orderIds.length > SLIP_SYNC_LIMIT)
		return refusalResponse(
			event.request,
			409,
			`${day} has ${formatCount(orderIds.length, 'box', 'boxes')}: more than ${SLIP_SYNC_LIMIT} are drawn as a batch in the background. Use “Make the day’s slips” on the ship-day page.`,
			shipDayLink(date)
		);
	try {
		const [orders, paper] = await Promise.all([
			loadSlipOrders(db, orderIds, { origin: siteOrigin(env.ORIGIN, event.url) }),
			slipPaperOf(db)
		]);
		return pdfResponse(await renderSlipsPdf(orders, { paper }), `slips-${date}.pdf`);
	} catch (failure) {
		if (failure instanceof SlipRefused)
			return refusalResponse(event.request, 409, failure.message, shipDayLink(date));
		throw failure;
	}
};

export const POST: RequestHandler = async (event) => {
	const me = requireRole(event, 'keeper');
	const date = dayOf(event.url);
	if (!date)
		return refusalResponse(
			event.request,
			400,
			'Say which ship day to print, as ?date=YYYY-MM-DD.',
			toShipDays
		);
	const outcome = await createSlipBatch(
		getDb(),
		{ userId: me.id, ip: clientAddress(event) },
		date,
		{ origin: siteOrigin(env.ORIGIN, event.url) }
	);
	if (!outcome.ok)
		return refusalResponse(event.request, outcome.status, outcome.reason, shipDayLink(date));
	const view = slipBatchView(outcome.batch);
	if (wantsHtml(event.request)) redirect(303, view.progressUrl);
	return json(view, { status: 202 });
};
