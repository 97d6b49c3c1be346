// One order's packing slip and care cards as a PDF, for keepers: refused with the reason
// (409) when the order may not have a slip, such as an unpaid or cancelled one.
import { env } from '$env/dynamic/private';
import { siteOrigin } from '$lib/catalogue/crawl';
import { requireRole } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import {
	loadSlipOrders,
	orderIdByNumber,
	slipPaperOf,
	SlipRefused
} from '$lib/server/fulfilment/slip-data';
import { pdfResponse, refusalResponse } from '$lib/server/fulfilment/slip-responses';
import { renderSlipsPdf } from '$lib/server/fulfilment/slips-pdf';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	requireRole(event, 'keeper');
	const number = event.params.number;
	const back = {
		href: `/manage/orders/${encodeURIComponent(number)}`,
		label: `Back to order ${number}`
	};
	const db = getDb();
	const orderId = await orderIdByNumber(db, number);
	if (orderId === null)
		return refusalResponse(event.request, 404, `There is no order ${number}.`, {
			href: '/manage/orders',
			label: 'Back to the orders'
		});
	try {
		const [orders, paper] = await Promise.all([
			loadSlipOrders(db, [orderId], { origin: siteOrigin(env.ORIGIN, event.url) }),
			slipPaperOf(db)
		]);
		return pdfResponse(await renderSlipsPdf(orders, { paper }), `slip-${number}.pdf`);
	} catch (failure) {
		if (failure instanceof SlipRefused)
			return refusalResponse(event.request, 409, failure.message, back);
		throw failure;
	}
};
