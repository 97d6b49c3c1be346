// The photo forms' text fields (the files themselves are checked by decoding them
// on the server). Used by the /manage/photos actions and the JSON upload route.
import { z } from 'zod';
import { MAX_ALT_LENGTH, refusalReason } from './limits';
import { PHOTO_TARGET_KINDS } from './urls';

// A NUL never comes from a keyboard and PostgreSQL takes none in text. Other forms are
// refused whole for one (hooks); an upload too large to read twice drops it here.
const altText = z
	.string()
	.overwrite((text) => text.replaceAll('\0', ''))
	.trim()
	.max(MAX_ALT_LENGTH, refusalReason('alt_too_long'))
	.default('');
const returnTo = z.string().max(500).default('');
const id = z.number().int().positive().max(2_147_483_647);

export const photoUploadSchema = z.object({
	target_kind: z.enum(PHOTO_TARGET_KINDS),
	target_id: id,
	return_to: returnTo,
	alt_text: altText
});

export const photoDeleteSchema = z.object({
	photo_id: id,
	return_to: returnTo
});

export const photoAltSchema = z.object({
	photo_id: id,
	alt_text: altText,
	return_to: returnTo
});
