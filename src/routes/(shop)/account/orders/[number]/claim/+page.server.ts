import { error, redirect } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { fail, message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { claimFormSchema, claimLinesOf, isChosenFile } from '$lib/claims/claim-form';
import { refusalReason } from '$lib/photos/limits';
import { origin } from '$lib/server/auth';
import { requireUser } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { fileClaim } from '$lib/server/claims/claims';
import { getDb } from '$lib/server/db';
import { ownOrderWithClaimWindow } from '$lib/server/orders/customer';
import { readPhotoForm } from '$lib/server/uploads/requests';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

async function orderAndWindow(event: Pick<RequestEvent, 'locals' | 'params' | 'url'>) {
	const user = requireUser(event);
	const found = await ownOrderWithClaimWindow(
		getDb(),
		user.id,
		event.params.number.slice(0, 20),
		env.SHOP_TIME_ZONE
	);
	// Another customer's order is "not found", never "forbidden": its number tells nothing.
	if (!found) error(404, 'No order of yours has that number.');
	return { user, ...found };
}

export const load: PageServerLoad = async (event) => {
	const { order, timeZone, windowHours, availability } = await orderAndWindow(event);
	const liveLines = order.lines.filter((line) => line.is_live);
	const form = await superValidate(
		{
			lineId: liveLines.map((line) => line.id),
			deadCount: liveLines.map(() => ''),
			photos: [],
			note: ''
		},
		zod4(claimFormSchema),
		{ errors: false }
	);
	return {
		order: {
			order_number: order.order_number,
			delivered_at: order.delivered_at,
			lines: liveLines.map((line) => ({
				id: line.id,
				description: line.description,
				animalsSent: line.quantity * line.unit_size
			}))
		},
		availability,
		claimWindowHours: windowHours,
		timeZone,
		form
	};
};

export const actions: Actions = {
	default: async (event) => {
		const { user, order } = await orderAndWindow(event);
		const body = await readPhotoForm(event.request);
		if (!body.ok) {
			const form = await superValidate(zod4(claimFormSchema), { errors: false });
			return setError(form, 'photos._errors', refusalReason(body.code), {
				status: body.code === 'batch_too_large' ? 413 : 400
			});
		}
		const form = await superValidate(body.form, zod4(claimFormSchema));
		if (!form.valid) return fail(400, { form });
		const photos = await Promise.all(
			form.data.photos.filter(isChosenFile).map(async (file) => ({
				name: file.name,
				bytes: new Uint8Array(await file.arrayBuffer())
			}))
		);
		const outcome = await fileClaim(
			getDb(),
			{ userId: user.id, ip: clientAddress(event) },
			{
				orderNumber: order.order_number,
				lines: claimLinesOf(form.data),
				note: form.data.note,
				photos
			},
			new Date(),
			{ origin: origin() }
		);
		if (!outcome.ok) {
			if (outcome.field === 'lines') return setError(form, 'deadCount._errors', outcome.problem);
			if (outcome.field === 'photos') return setError(form, 'photos._errors', outcome.problem);
			if (outcome.field === 'note') return setError(form, 'note', outcome.problem);
			return message(form, outcome.problem, { status: outcome.status });
		}
		redirect(303, `/account/orders/${encodeURIComponent(order.order_number)}?claim=filed`);
	}
};
