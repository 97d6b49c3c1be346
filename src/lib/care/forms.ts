// The zod schemas of the colony, care-log and resting-tub forms. Shared by the server
// (which validates) and the pages (which show the limits as hints).
import { z } from 'zod';
import { calendarDate } from '$lib/forms/calendar-date';
import { MAX_INTEGER_COLUMN, NO_SUCH_ROW } from '$lib/forms/row-id';
import { holdUntilProblem } from './schedule';
import { ENCLOSURE_LIMITS } from './substrate';

const isoDate = calendarDate('Pick a date.');

const note = z.string().trim().max(2000, 'Keep the note under 2,000 characters.').default('');

/** Inches with one decimal, inside the limits the colony table enforces. */
function inches(label: string, max: number) {
	return z
		.number({ error: `Give the ${label} in inches.` })
		.gt(0, `The ${label} must be more than 0 in.`)
		.max(max, `${max} in is the most Hatchlot records for the ${label}; check the figure.`)
		.refine((value) => Math.round(value * 10) === value * 10, 'Use at most one decimal place.');
}

export const colonySchema = z.object({
	speciesId: z
		.number({ error: 'Choose the species.' })
		.int()
		.positive('Choose the species.')
		.max(MAX_INTEGER_COLUMN, 'Choose the species.'),
	name: z.string().trim().min(2, 'Give the colony a name of two letters or more.').max(80),
	lengthIn: inches('inside length', ENCLOSURE_LIMITS.length.max),
	widthIn: inches('inside width', ENCLOSURE_LIMITS.width.max),
	depthIn: inches('substrate depth', ENCLOSURE_LIMITS.depth.max),
	foundersCount: z
		.number({ error: 'Give a whole number.' })
		.int('Give a whole number.')
		.min(0, 'A count cannot be negative.')
		.max(100_000, 'That is more founders than a colony holds; check the figure.')
		.default(0),
	foundersNote: z.string().trim().max(500).default(''),
	generation: z
		.number({ error: 'Give the generation.' })
		.int('Give a whole number.')
		.min(0, '0 is wild-caught; a generation cannot be lower.')
		.max(50, 'Check the generation: 50 or fewer.')
		.default(1),
	startedOn: isoDate,
	notes: z.string().trim().max(4000).default('')
});
export type ColonyForm = z.infer<typeof colonySchema>;

export const retireSchema = z.object({
	retiredOn: isoDate,
	reason: z.string().trim().max(500).default('')
});

export const careEntryKinds = [
	'substrate_refresh_half',
	'substrate_refresh_full',
	'leaf_top_up',
	'moisture_check',
	'protein',
	'calcium',
	'molt_seen',
	'census',
	'pest_note'
] as const;

export const careEntrySchema = z
	.object({
		kind: z.enum(careEntryKinds, { error: 'Choose what you did.' }),
		loggedOn: isoDate,
		moistureReading: z.enum(['dry', 'right', 'wet']).optional(),
		censusCount: z
			.number()
			.int('Count whole animals.')
			.min(0, 'A count cannot be negative.')
			.max(1_000_000, 'Check the count: a million or fewer.')
			.optional(),
		note,
		/** Only for a substrate refresh: set the removed substrate aside as a resting tub. */
		saveTub: z.boolean().default(true),
		holdUntil: z.union([isoDate, z.literal('')]).default('')
	})
	.superRefine((entry, ctx) => {
		if (entry.kind === 'moisture_check' && !entry.moistureReading)
			ctx.addIssue({
				code: 'custom',
				path: ['moistureReading'],
				message: 'Say how the squeeze test felt.'
			});
		if (entry.kind === 'census' && entry.censusCount === undefined)
			ctx.addIssue({ code: 'custom', path: ['censusCount'], message: 'Give the count.' });
		if (entry.kind === 'pest_note' && entry.note.length === 0)
			ctx.addIssue({ code: 'custom', path: ['note'], message: 'Say what you saw.' });
		if (isRefresh(entry.kind) && entry.saveTub && entry.holdUntil) {
			const problem = holdUntilProblem(entry.loggedOn, entry.holdUntil);
			if (problem) ctx.addIssue({ code: 'custom', path: ['holdUntil'], message: problem });
		}
	});
export type CareEntryForm = z.infer<typeof careEntrySchema>;

export function isRefresh(kind: string): boolean {
	return kind === 'substrate_refresh_half' || kind === 'substrate_refresh_full';
}

export const deleteEntrySchema = z.object({
	entryId: z.number().int().positive().max(MAX_INTEGER_COLUMN, NO_SUCH_ROW)
});

export const stageValues = ['hatchling', 'juvenile', 'sub_adult', 'adult'] as const;
export const sizeClassValues = ['tiny', 'small', 'medium', 'large'] as const;

/** A tub check; when young are found they go into one or more new clutches at once. */
export const tubCheckSchema = z
	.object({
		checkedOn: isoDate,
		youngFound: z
			.number({ error: 'Give the number of young found (0 if none).' })
			.int('Count whole animals.')
			.min(0, 'A count cannot be negative.')
			.max(100_000, 'Check the count: 100,000 or fewer.')
			.default(0),
		eggsSeen: z.boolean().default(false),
		note,
		/** Parallel arrays, one slot per new clutch (so the form works without JavaScript). */
		partCount: z.array(z.number().int().min(0, 'A count cannot be negative.')).default([]),
		partStage: z.array(z.enum(stageValues)).default([]),
		partSize: z.array(z.enum(sizeClassValues)).default([]),
		keepResting: z.boolean().default(false)
	})
	.superRefine((check, ctx) => {
		const used = check.partCount.filter((count) => count > 0);
		if (check.youngFound > 0 && used.length > 0) {
			const sum = used.reduce((a, b) => a + b, 0);
			if (sum !== check.youngFound)
				ctx.addIssue({
					code: 'custom',
					path: ['partCount'],
					message: `The clutches hold ${sum} between them; ${check.youngFound} were found. Make them add up.`
				});
		}
		if (check.youngFound === 0 && used.length > 0)
			ctx.addIssue({
				code: 'custom',
				path: ['youngFound'],
				message: 'Clutches need young: give the number found.'
			});
	});
export type TubCheckForm = z.infer<typeof tubCheckSchema>;

export const holdSchema = z.object({ holdUntil: isoDate });
export const closeTubSchema = z.object({ closedOn: isoDate, note });
