// The customer's dead-on-arrival claim form: how many of each live line arrived dead,
// photos of the animals as they arrived, and a note. Pure, so the page and the server
// read it alike; the server decodes every photo and checks counts against the order.
import { z } from 'zod';
import { precheckFiles } from '$lib/photos/limits';

export const CLAIM_NOTE_MAX = 2000;

/** The file a browser sends for a file field left empty: no name, no bytes. */
export const isChosenFile = (file: File): boolean => !(file.name === '' && file.size === 0);

export const claimFormSchema = z
	.object({
		/** The order's live line ids, in the order the count boxes are shown. */
		lineId: z.array(z.number().int()).default([]),
		/** How many of each line arrived dead (blank for none). */
		deadCount: z.array(z.string().max(6)).default([]),
		photos: z.array(z.instanceof(File)).default([]),
		note: z
			.string()
			// Never typed, refused by PostgreSQL in text: dropped here, as the form may be too
			// large for hooks to read twice (small forms with one are refused whole).
			.overwrite((text) => text.replaceAll('\0', ''))
			.trim()
			.max(CLAIM_NOTE_MAX, `Keep the note under ${CLAIM_NOTE_MAX} characters.`)
			.default('')
	})
	.superRefine((form, ctx) => {
		let dead = 0;
		form.deadCount.forEach((text, index) => {
			const typed = text.trim();
			if (typed === '') return;
			if (!/^\d+$/.test(typed)) {
				ctx.addIssue({
					code: 'custom',
					path: ['deadCount', index],
					message: 'A whole number of animals, or blank.'
				});
				return;
			}
			dead += Number(typed);
		});
		if (dead === 0 && form.deadCount.every((text) => /^\d*$/.test(text.trim())))
			ctx.addIssue({
				code: 'custom',
				path: ['deadCount'],
				message: 'Say how many arrived dead on at least one line.'
			});
		const chosen = form.photos.filter(isChosenFile);
		if (chosen.length === 0) {
			ctx.addIssue({
				code: 'custom',
				path: ['photos'],
				message: 'Add at least one photo of the animals as they arrived.'
			});
			return;
		}
		const refused = precheckFiles(chosen);
		if (refused.length)
			ctx.addIssue({
				code: 'custom',
				path: ['photos'],
				message: refused.map((r) => (r.file ? `${r.file}: ${r.reason}` : r.reason)).join(' ')
			});
	});

export type ClaimForm = z.infer<typeof claimFormSchema>;

/** A valid form's dead counts per order line, leaving out blanks and zeros. */
export function claimLinesOf(form: ClaimForm): { orderLineId: number; deadCount: number }[] {
	return form.lineId.flatMap((orderLineId, index) => {
		const deadCount = Number((form.deadCount[index] ?? '').trim() || '0');
		return deadCount > 0 ? [{ orderLineId, deadCount }] : [];
	});
}
