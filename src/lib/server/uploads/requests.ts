// Reading a photo form's multipart body, shared by the form actions and the JSON route.
import type { PhotoRefusalCode } from '$lib/photos/limits';
import type { UploadedPhotoFile } from './photos';

export type PhotoFormBody = { ok: true; form: FormData } | { ok: false; code: PhotoRefusalCode };

/**
 * The body as FormData; or why not: larger than the server's BODY_SIZE_LIMIT (the
 * adapter's reader fails with status 413), or not a form at all.
 */
export async function readPhotoForm(request: Request): Promise<PhotoFormBody> {
	try {
		return { ok: true, form: await request.formData() };
	} catch (failure) {
		const status = (failure as { status?: unknown } | null)?.status;
		return { ok: false, code: status === 413 ? 'batch_too_large' : 'bad_form' };
	}
}

/** The chosen files; the empty part a browser sends when none was chosen is left out. */
export async function uploadedFiles(form: FormData, field = 'files'): Promise<UploadedPhotoFile[]> {
	const files: UploadedPhotoFile[] = [];
	for (const value of form.getAll(field)) {
		if (typeof value === 'string') continue;
		if (value.name === '' && value.size === 0) continue;
		files.push({ name: value.name, bytes: new Uint8Array(await value.arrayBuffer()) });
	}
	return files;
}
