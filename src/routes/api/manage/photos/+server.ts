// Photo uploads from PhotoPanel's script (XMLHttpRequest, for its progress events).
// Answers {photos} when the whole batch is saved, or {errors: [{file, code, reason}]}
// with 400, 404, 413 or 415 when anything was refused, in which case nothing was saved.
import { json } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { photoUploadSchema } from '$lib/photos/forms';
import { refusal, refusalStatus } from '$lib/photos/limits';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import { savePhotos } from '$lib/server/uploads/photos';
import { readPhotoForm, uploadedFiles } from '$lib/server/uploads/requests';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => {
	const me = requireRole(event, 'keeper');
	const read = await readPhotoForm(event.request);
	if (!read.ok)
		return json({ errors: [refusal('', read.code)] }, { status: refusalStatus([read.code]) });
	const body = read.form;
	const form = await superValidate(body, zod4(photoUploadSchema));
	if (!form.valid) {
		const code = form.errors.alt_text ? 'alt_too_long' : 'bad_form';
		return json({ errors: [refusal('', code)] }, { status: 400 });
	}
	const outcome = await savePhotos(
		getDb(),
		{ userId: me.id, ip: clientAddress(event) },
		{ kind: form.data.target_kind, id: form.data.target_id },
		await uploadedFiles(body),
		{ altText: form.data.alt_text }
	);
	if (!outcome.ok) return json({ errors: outcome.refusals }, { status: outcome.status });
	return json({ photos: outcome.photos }, { status: 201 });
};
