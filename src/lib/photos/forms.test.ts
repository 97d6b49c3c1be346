import { describe, expect, it } from 'vitest';
import { photoAltSchema, photoUploadSchema } from './forms';

describe('photo form fields', () => {
	it('takes a species, colony or clutch by id and trims the description', () => {
		expect(
			photoUploadSchema.parse({ target_kind: 'clutch', target_id: 4, alt_text: '  Juveniles  ' })
		).toEqual({ target_kind: 'clutch', target_id: 4, return_to: '', alt_text: 'Juveniles' });
	});

	it('refuses other targets, bad ids and a description over 300 characters', () => {
		expect(photoUploadSchema.safeParse({ target_kind: 'claim', target_id: 1 }).success).toBe(false);
		expect(photoUploadSchema.safeParse({ target_kind: 'colony', target_id: 0 }).success).toBe(
			false
		);
		const long = photoAltSchema.safeParse({ photo_id: 1, alt_text: 'x'.repeat(301) });
		expect(long.success).toBe(false);
		expect(long.error?.issues[0]?.message).toBe('Keep the description to 300 characters.');
	});

	it('drops a NUL from the description, which PostgreSQL would refuse in text', () => {
		expect(photoAltSchema.parse({ photo_id: 1, alt_text: '\0Juveniles\0' }).alt_text).toBe(
			'Juveniles'
		);
	});
});
