// Checkout: the address, the service and the buyer's word on the live-arrival terms;
// the action holds the stock, makes the order and sends the buyer to Stripe's pay page.
// Public: a guest checks out with the cart in their signed cookie.
import { fail, redirect } from '@sveltejs/kit';
import type Stripe from 'stripe';
import { setError, superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { env } from '$env/dynamic/private';
import { checkoutSchema } from '$lib/checkout/schema';
import { loadProfile } from '$lib/server/accounts/profile';
import { origin } from '$lib/server/auth';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { findCartId, readCart } from '$lib/server/cart/cart';
import { cartOwner, chosenService } from '$lib/server/cart/request';
import { getDb } from '$lib/server/db';
import { addressProblem, startCheckout } from '$lib/server/payments/checkout';
import { stripeClient } from '$lib/server/payments/stripe';
import { shipEstimate } from '$lib/server/shipping/estimate';
import { forecastSource } from '$lib/server/weather';
import type { ShipEstimate } from '$lib/shipping/estimate';
import type { Actions, PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

export const load: PageServerLoad = async (event) => {
	const db = getDb();
	const owner = await cartOwner(event);
	const user = event.locals.user;
	const profile = user ? await loadProfile(db, user.id) : null;
	const service = chosenService(event.url.searchParams.get('service'));
	const cart = await readCart(db, await findCartId(db, owner), service);
	const form = await superValidate(
		{
			email: user?.email ?? '',
			ship_name: profile?.ship_name || profile?.name || '',
			ship_line1: profile?.ship_line1 ?? '',
			ship_line2: profile?.ship_line2 ?? '',
			ship_city: profile?.ship_city ?? '',
			ship_state: profile?.ship_state ?? '',
			ship_zip: profile?.ship_zip ?? '',
			service
		},
		zod4(checkoutSchema),
		{ errors: false }
	);
	// The ship estimate for the address we know, so a weather hold is seen before paying.
	let estimate: ShipEstimate | null = null;
	const zip = form.data.ship_zip;
	if (/^\d{5}$/.test(zip) && cart.hasLive) {
		const clock = await shopClock(db, env.SHOP_TIME_ZONE);
		const answer = await shipEstimate(db, forecastSource(db), { zip, service, today: clock.today });
		if (answer.status === 200) estimate = answer.body;
	}
	const species = [
		...new Set(cart.lines.filter((l) => l.isLive && l.commonName).map((l) => l.commonName!))
	];
	return { form, cart, species, estimate, signedIn: user !== null };
};

export const actions: Actions = {
	default: async (event) => {
		const form = await superValidate(event.request, zod4(checkoutSchema));
		if (!form.valid) {
			// Say what is wrong with the address too, so one round trip shows every problem.
			const { ship_zip: zip, ship_state: state } = form.data;
			const place = /^\d{5}$/.test(zip) && state ? addressProblem(zip, state) : null;
			if (place && !form.errors[place.field]) form.errors[place.field] = [place.problem];
			return fail(400, { form });
		}
		let stripe: Stripe;
		try {
			stripe = stripeClient();
		} catch (cause) {
			logger.error({ err: cause }, '[checkout] Stripe is not configured');
			return message(
				form,
				'Card payments are not available just now, so nothing was held or charged. Please try again later.',
				{ status: 503 }
			);
		}
		const db = getDb();
		const owner = await cartOwner(event);
		const outcome = await startCheckout(db, stripe, owner, form.data, {
			origin: origin(),
			clientIp: clientAddress(event)
		});
		if (!outcome.ok) {
			if (outcome.field) return setError(form, outcome.field, outcome.problem);
			const lines = outcome.lines.map((line) => line.problem);
			return message(form, [outcome.problem, ...lines].join(' '), { status: 409 });
		}
		redirect(303, outcome.url);
	}
};
