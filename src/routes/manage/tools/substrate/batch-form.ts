// The calculator's fields. It is a GET form: the sizes sit in the address, so a batch
// can be bookmarked or sent to a helper, and it works without JavaScript.
import { z } from 'zod';
import { dimensionProblem, type EnclosureDimension } from '$lib/care/substrate';

function inches(dimension: EnclosureDimension) {
	return z
		.string()
		.trim()
		.max(12, 'Use a plain number of inches, like 18 or 4.5.')
		.superRefine((value, ctx) => {
			const problem = dimensionProblem(dimension, value);
			if (problem) ctx.addIssue({ code: 'custom', message: problem });
		})
		.default('');
}

export const batchSchema = z.object({
	length: inches('length'),
	width: inches('width'),
	depth: inches('depth'),
	/** A recipe id; empty means the default recipe. */
	recipe: z.string().max(12).default(''),
	/** The colony whose enclosure was filled in, if any (its code). */
	colony: z.string().max(40).default('')
});

export type BatchForm = z.infer<typeof batchSchema>;

/** "18.0" → "18", "4.5" → "4.5": how a colony's stored size reads in the form. */
export function inchesText(stored: string): string {
	const value = Number(stored);
	return Number.isFinite(value) ? String(value) : stored;
}

/** The calculator's address query for these values ("length=18&width=12&…"), blanks left out. */
export function batchQuery(values: Partial<Record<keyof BatchForm, string>>): string {
	const query = new URLSearchParams();
	for (const key of ['length', 'width', 'depth', 'recipe', 'colony'] as const) {
		const value = values[key]?.trim();
		if (value) query.set(key, value);
	}
	return query.toString();
}
