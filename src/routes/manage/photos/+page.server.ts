// The photo forms' actions. PhotoPanel posts here when JavaScript is off (uploads)
// and for removing and describing photos; each action answers with a redirect back
// to the page the form was on, the outcome in its query (see $lib/photos/outcome).
import { redirect, type RequestEvent } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { photoAltSchema, photoDeleteSchema, photoUploadSchema } from '$lib/photos/forms';
import { refusal, type PhotoRefusalCode } from '$lib/photos/limits';
import {
	outcomeUrl,
	parseTargetKey,
	PHOTOS_FALLBACK_PATH,
	safeReturnPath,
	type PhotoOutcome
} from '$lib/photos/outcome';
import type { PhotoTarget } from '$lib/photos/urls';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import { deletePhoto, savePhotos, updateAlt } from '$lib/server/uploads/photos';
import { readPhotoForm, uploadedFiles } from '$lib/server/uploads/requests';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'keeper');
	return {};
};

function back(returnTo: string | undefined, outcome: PhotoOutcome): never {
	redirect(303, outcomeUrl(safeReturnPath(returnTo) ?? PHOTOS_FALLBACK_PATH, outcome));
}

function formProblem(altTooLong: boolean): PhotoRefusalCode {
	return altTooLong ? 'alt_too_long' : 'bad_form';
}

async function formOf(event: RequestEvent): Promise<FormData> {
	const read = await readPhotoForm(event.request);
	if (read.ok) return read.form;
	// The body could not be read (too large, or not a form), so neither could return_to:
	// go back to the page the post came from, and name the target the form's URL carries.
	const referer = event.request.headers.get('referer');
	const from = referer ? new URL(referer, event.url) : null;
	back(from && from.origin === event.url.origin ? from.pathname + from.search : undefined, {
		status: 'refused',
		target: parseTargetKey(event.url.searchParams.get('for')),
		refusals: [refusal('', read.code)]
	});
}

export const actions: Actions = {
	upload: async (event) => {
		const me = requireRole(event, 'keeper');
		const body = await formOf(event);
		const form = await superValidate(body, zod4(photoUploadSchema));
		const target: PhotoTarget | null =
			form.errors.target_kind || form.errors.target_id
				? null
				: { kind: form.data.target_kind, id: form.data.target_id };
		const typedAlt = String(body.get('alt_text') ?? '');
		if (!form.valid || !target) {
			back(form.data.return_to, {
				status: 'refused',
				target,
				refusals: [refusal('', formProblem(Boolean(form.errors.alt_text)))],
				altText: typedAlt
			});
		}
		const outcome = await savePhotos(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			target,
			await uploadedFiles(body),
			{ altText: form.data.alt_text }
		);
		if (outcome.ok)
			back(form.data.return_to, { status: 'saved', target, count: outcome.photos.length });
		back(form.data.return_to, {
			status: 'refused',
			target,
			refusals: outcome.refusals,
			altText: typedAlt
		});
	},

	delete: async (event) => {
		const me = requireRole(event, 'keeper');
		const form = await superValidate(await formOf(event), zod4(photoDeleteSchema));
		if (!form.valid)
			back(form.data.return_to, {
				status: 'refused',
				target: null,
				refusals: [refusal('', 'bad_form')]
			});
		const outcome = await deletePhoto(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			form.data.photo_id
		);
		if (outcome.ok)
			back(form.data.return_to, {
				status: 'deleted',
				target: outcome.target,
				photoId: form.data.photo_id
			});
		back(form.data.return_to, {
			status: 'refused',
			target: null,
			photoId: form.data.photo_id,
			refusals: outcome.refusals
		});
	},

	alt: async (event) => {
		const me = requireRole(event, 'keeper');
		const body = await formOf(event);
		const form = await superValidate(body, zod4(photoAltSchema));
		if (!form.valid)
			back(form.data.return_to, {
				status: 'refused',
				target: null,
				photoId: form.errors.photo_id ? undefined : form.data.photo_id,
				refusals: [refusal('', formProblem(Boolean(form.errors.alt_text)))],
				altText: String(body.get('alt_text') ?? '')
			});
		const outcome = await updateAlt(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			form.data.photo_id,
			form.data.alt_text
		);
		if (outcome.ok)
			back(form.data.return_to, {
				status: 'described',
				target: outcome.target,
				photoId: form.data.photo_id,
				altText: outcome.photo.altText
			});
		back(form.data.return_to, {
			status: 'refused',
			target: null,
			photoId: form.data.photo_id,
			refusals: outcome.refusals
		});
	}
};
