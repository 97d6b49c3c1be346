import { error, fail, type RequestEvent } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	claimDeclineSchema,
	claimRefundSchema,
	claimReshipSchema,
	refundCentsOf,
	type DecisionMessage
} from '$lib/claims/decision-form';
import { formatCents } from '$lib/format/money';
import { centsToDollarText } from '$lib/shipping/settings-schema';
import { origin } from '$lib/server/auth';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { declineClaim, reshipClaim } from '$lib/server/claims/claims';
import { refundClaim, suggestedClaimRefundCents } from '$lib/server/claims/refund';
import { claimForReview } from '$lib/server/claims/review';
import { getDb } from '$lib/server/db';
import { refundableCents } from '$lib/server/payments/refunds';
import { listPhotos } from '$lib/server/uploads/photos';
import { forecastSource } from '$lib/server/weather';
import type { Actions, PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

/** One id per form, so each form on the page answers only its own post. */
const FORM_ID = {
	refund: 'claim-refund',
	reship: 'claim-reship',
	decline: 'claim-decline'
} as const;

const DEFAULT_REFUND_NOTE =
	'Refund for the animals that arrived dead. Shipping is not refunded under the live-arrival guarantee.';
const DEFAULT_RESHIP_NOTE =
	'Replacements go out at no charge on the next day the weather on the route is safe for them.';

const notFound = 'No claim has that number.';

/** The claim id in the address; anything that cannot be one is a 404, not a database error. */
function claimIdOf(event: Pick<RequestEvent, 'params'>): number {
	const raw = (event.params as { id?: string }).id ?? '';
	const id = /^[1-9]\d{0,9}$/.test(raw) ? Number(raw) : NaN;
	// Ids are PostgreSQL integers; a larger number names no row.
	if (!Number.isSafeInteger(id) || id > 2_147_483_647) error(404, notFound);
	return id;
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'admin');
	const claimId = claimIdOf(event);
	const db = getDb();
	const timeZone = await resolveShopTimeZone(db, env.SHOP_TIME_ZONE);
	const review = await claimForReview(db, claimId, { timeZone });
	if (!review) error(404, notFound);
	const [photos, suggestedCents, refundable] = await Promise.all([
		listPhotos(db, { kind: 'claim', id: claimId }),
		suggestedClaimRefundCents(db, claimId),
		refundableCents(db, review.order.number)
	]);
	// The box starts at the dead animals' share, never above what is left to refund.
	const startCents = Math.min(suggestedCents, refundable);
	const [refund, reship, decline] = await Promise.all([
		superValidate(
			{ amount: startCents > 0 ? centsToDollarText(startCents) : '', note: DEFAULT_REFUND_NOTE },
			zod4(claimRefundSchema),
			{ id: FORM_ID.refund, errors: false }
		),
		superValidate({ note: DEFAULT_RESHIP_NOTE }, zod4(claimReshipSchema), {
			id: FORM_ID.reship,
			errors: false
		}),
		superValidate({ reason: '' }, zod4(claimDeclineSchema), {
			id: FORM_ID.decline,
			errors: false
		})
	]);
	return {
		review,
		photos,
		money: { suggestedCents, refundableCents: refundable },
		forms: { refund, reship, decline }
	};
};

const said = (ok: boolean, text: string): DecisionMessage => ({ ok, text });

export const actions: Actions = {
	refund: async (event) => {
		const me = requireRole(event, 'admin');
		const claimId = claimIdOf(event);
		const form = await superValidate(event.request, zod4(claimRefundSchema), {
			id: FORM_ID.refund
		});
		if (!form.valid) return fail(400, { form });
		const db = getDb();
		const amountCents = refundCentsOf(form.data);
		const review = await claimForReview(db, claimId);
		if (!review) error(404, notFound);
		try {
			const outcome = await refundClaim(
				db,
				{ userId: me.id, ip: clientAddress(event) },
				{ claimId, amountCents, note: form.data.note }
			);
			if (!outcome.ok) {
				if (outcome.field === 'reason') return setError(form, 'note', outcome.problem);
				if (outcome.field === 'amount') return setError(form, 'amount', outcome.problem);
				return message(form, said(false, outcome.problem), { status: outcome.status });
			}
			return message(
				form,
				said(
					true,
					`Refunded ${formatCents(outcome.amountCents)} through Stripe; the customer is e-mailed.`
				)
			);
		} catch (cause) {
			logger.error({ err: cause }, '[admin/claims] refund failed');
			return message(
				form,
				said(
					false,
					`The refund could not be finished just now. Look at the refunds on ${review.order.number} before trying again.`
				),
				{ status: 503 }
			);
		}
	},

	reship: async (event) => {
		const me = requireRole(event, 'admin');
		const claimId = claimIdOf(event);
		const form = await superValidate(event.request, zod4(claimReshipSchema), {
			id: FORM_ID.reship
		});
		if (!form.valid) return fail(400, { form });
		const db = getDb();
		try {
			const outcome = await reshipClaim(
				db,
				{ userId: me.id, ip: clientAddress(event) },
				{ claimId, note: form.data.note },
				forecastSource(db),
				{ links: { origin: origin() } }
			);
			if (!outcome.ok) {
				if (outcome.field === 'note') return setError(form, 'note', outcome.problem);
				return message(form, said(false, outcome.problem), { status: outcome.status });
			}
			return message(
				form,
				said(true, `Reship ${outcome.orderNumber} made at no charge. ${outcome.check.message}`)
			);
		} catch (cause) {
			logger.error({ err: cause }, '[admin/claims] reship failed');
			return message(
				form,
				said(
					false,
					'The reship could not be finished just now. Reload the claim to see whether it was made before trying again.'
				),
				{ status: 503 }
			);
		}
	},

	decline: async (event) => {
		const me = requireRole(event, 'admin');
		const claimId = claimIdOf(event);
		const form = await superValidate(event.request, zod4(claimDeclineSchema), {
			id: FORM_ID.decline
		});
		if (!form.valid) return fail(400, { form });
		const outcome = await declineClaim(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			{ claimId, reason: form.data.reason },
			new Date(),
			{ origin: origin() }
		);
		if (!outcome.ok) {
			if (outcome.field === 'reason') return setError(form, 'reason', outcome.problem);
			return message(form, said(false, outcome.problem), { status: outcome.status });
		}
		return message(form, said(true, 'Claim declined; the customer is e-mailed your reason.'));
	}
};
