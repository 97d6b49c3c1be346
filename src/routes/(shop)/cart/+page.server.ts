// The cart page. Its load prices the cart on the server for the chosen service and, when a
// ZIP was given, asks for the ship estimate, so the page is whole without JavaScript. The
// actions are the same changes the JSON routes make, for browsers without JavaScript.
import { fail, redirect, type RequestEvent } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { getDb, getPool } from '$lib/server/db';
import { writeAudit } from '$lib/server/audit';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import {
	changeLine,
	findCartId,
	holdCart,
	readCart,
	releaseCartHolds,
	removeLine
} from '$lib/server/cart/cart';
import { cartOwner, chosenService, rememberGuestCart } from '$lib/server/cart/request';
import {
	createEstimateLimiter,
	shipEstimate,
	type EstimateLimiter
} from '$lib/server/shipping/estimate';
import { forecastSource } from '$lib/server/weather';
import { cartLineSchema, cartRemoveSchema, fieldProblems } from '$lib/cart/schemas';
import type { ShipEstimate } from '$lib/shipping/estimate';
import type { Actions, PageServerLoad } from './$types';

let limiter: EstimateLimiter | undefined;

export const load: PageServerLoad = async (event) => {
	const db = getDb();
	const owner = await cartOwner(event);
	const service = chosenService(event.url.searchParams.get('service'));
	const zip = (event.url.searchParams.get('zip') ?? '').trim();
	const [cart, clock] = await Promise.all([
		readCart(db, await findCartId(db, owner), service),
		shopClock(db, env.SHOP_TIME_ZONE)
	]);
	let estimate: { zip: string; result: ShipEstimate | null; problem: string | null } | null = null;
	if (zip) {
		limiter ??= createEstimateLimiter(getPool());
		const address = clientAddress(event);
		const verdict = await limiter.consume(address ?? 'unknown');
		if (!verdict.allowed) {
			if (verdict.firstRefusal)
				await writeAudit(db, {
					actorUserId: event.locals.user?.id ?? null,
					actorIp: address,
					action: 'ship_estimate.limit_reached',
					entity: 'ship_estimate',
					entityId: null
				});
			estimate = {
				zip,
				result: null,
				problem: 'Too many estimates from this address. Please wait a minute and try again.'
			};
		} else {
			const answer = await shipEstimate(db, forecastSource(db), {
				zip,
				service,
				today: clock.today
			});
			estimate =
				answer.status === 200
					? { zip, result: answer.body, problem: null }
					: { zip, result: null, problem: answer.body.message };
		}
	}
	return {
		cart,
		estimate,
		timeZone: clock.timeZone,
		added: event.url.searchParams.get('added') === '1'
	};
};

async function formOf(request: Request): Promise<Record<string, FormDataEntryValue>> {
	return Object.fromEntries(await request.formData());
}

/** Add to a line or set it, from a form post: the refusal keeps the listing and the reason. */
async function lineChange(event: RequestEvent, mode: 'add' | 'set') {
	const db = getDb();
	const owner = await cartOwner(event);
	const form = await formOf(event.request);
	const parsed = cartLineSchema.safeParse(form);
	if (!parsed.success)
		return {
			refusal: fail(400, {
				listingId: Number(form.listingId) || null,
				fields: fieldProblems(parsed.error),
				message: 'That change could not be made.'
			})
		};
	const outcome = await changeLine(db, owner, { ...parsed.data, mode });
	rememberGuestCart(event, owner, outcome.cartId);
	if (!outcome.ok)
		return {
			refusal: fail(outcome.status, {
				listingId: parsed.data.listingId,
				fields: { [outcome.field]: outcome.problem },
				message: outcome.problem
			})
		};
	return { listingId: parsed.data.listingId };
}

export const actions: Actions = {
	add: async (event) => {
		const changed = await lineChange(event, 'add');
		if ('refusal' in changed) return changed.refusal;
		redirect(303, '/cart?added=1');
	},
	update: async (event) => {
		const changed = await lineChange(event, 'set');
		return 'refusal' in changed ? changed.refusal : { changed: changed.listingId };
	},
	remove: async (event) => {
		const db = getDb();
		const owner = await cartOwner(event);
		const parsed = cartRemoveSchema.safeParse(await formOf(event.request));
		if (!parsed.success)
			return fail(400, { listingId: null, fields: {}, message: 'Choose a line to remove.' });
		await removeLine(db, owner, parsed.data.listingId);
		return { changed: parsed.data.listingId };
	},
	hold: async (event) => {
		const db = getDb();
		const owner = await cartOwner(event);
		const outcome = await holdCart(db, owner, clientAddress(event));
		if (!outcome.ok)
			return fail(409, {
				listingId: null,
				fields: {},
				message: outcome.problem,
				holdProblems: outcome.lines
			});
		return { held: true };
	},
	release: async (event) => {
		await releaseCartHolds(getDb(), await cartOwner(event));
		return { released: true };
	}
};
