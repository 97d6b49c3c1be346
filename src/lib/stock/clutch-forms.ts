// The fields of every form a keeper fills in about a clutch. The server checks each one
// again against the clutch as it is now (src/lib/server/clutches/clutches.ts).
import { z } from 'zod';
import { calendarDate } from '$lib/forms/calendar-date';
import { MAX_INTEGER_COLUMN, NO_SUCH_ROW } from '$lib/forms/row-id';

const isoDate = calendarDate('Pick a date.');

// An empty box stays empty (not 0) in the form; superforms' documented pattern.
const emptyNumber = '' as unknown as number;

function wholeCount(what: string, minimum: number) {
	return z
		.number({ error: `Give ${what} as a whole number.` })
		.int(`Give ${what} as a whole number.`)
		.min(minimum, minimum === 0 ? 'A count cannot be below zero.' : `At least ${minimum}.`)
		.max(100_000, 'That is more animals than one clutch holds.');
}

/** The clutch version the page showed; an edit made against an older one is refused. */
const version = z.number().int().min(0).max(MAX_INTEGER_COLUMN, NO_SUCH_ROW);

const shortText = (max: number) => z.string().trim().max(max, `Keep it under ${max} characters.`);

export const stageValues = ['hatchling', 'juvenile', 'sub_adult', 'adult'] as const;
export const sizeClassValues = ['tiny', 'small', 'medium', 'large'] as const;
export const pauseReasonValues = ['molting', 'unwell'] as const;

export const lossSchema = z.object({
	count: wholeCount('the number lost', 1).default(1),
	reason: shortText(200).min(1, 'Say what happened, even "cause unknown".'),
	happenedOn: isoDate
});

export const recountSchema = z.object({
	countAlive: wholeCount('the count', 0).default(emptyNumber),
	reason: shortText(200).default(''),
	happenedOn: isoDate,
	version
});

export const stageSchema = z.object({ stage: z.enum(stageValues), version });
export const sizeClassSchema = z.object({ sizeClass: z.enum(sizeClassValues), version });

export const pauseSchema = z.object({
	pausedReason: z.enum(pauseReasonValues, { error: 'Pick molting or unwell.' }),
	note: shortText(300).default('')
});

/** Unpause, mark ready and back-to-growing carry only a note. */
export const stateNoteSchema = z.object({ note: shortText(300).default('') });

export const backToGrowingSchema = z.object({
	note: shortText(300).min(1, 'Say why they are not sale size yet.')
});

export const saleReadySchema = z.object({
	saleReadyOn: isoDate,
	reason: shortText(300).min(1, 'Say why the date moves.'),
	version
});

export const noteSchema = z.object({ note: shortText(2000).default(''), version });

export const mergeSchema = z.object({
	/** take_in: the other clutch pours into this one; move_into: this one pours into the other. */
	direction: z.enum(['take_in', 'move_into']).default('take_in'),
	otherCode: z.string().trim().min(1, 'Pick the other clutch.').max(40)
});

/** How many new clutches one split form offers; blank rows are left out. */
export const SPLIT_ROWS = 4;

const splitCount = wholeCount('the count', 1).optional();
const splitSize = z.enum(sizeClassValues).or(z.literal('')).default('');

export const splitSchema = z.object({
	part1Count: splitCount,
	part1Size: splitSize,
	part2Count: splitCount,
	part2Size: splitSize,
	part3Count: splitCount,
	part3Size: splitSize,
	part4Count: splitCount,
	part4Size: splitSize,
	note: shortText(300).default('')
});

export type SplitForm = z.infer<typeof splitSchema>;
export type SplitRow = { count: number; sizeClass: (typeof sizeClassValues)[number] | null };

/** The filled rows of a split form, in order, each with its row number (1-based). */
export function splitRows(form: SplitForm): (SplitRow & { row: number })[] {
	const rows: (SplitRow & { row: number })[] = [];
	for (let row = 1; row <= SPLIT_ROWS; row++) {
		const count = form[`part${row}Count` as keyof SplitForm] as number | undefined;
		const size = form[`part${row}Size` as keyof SplitForm] as SplitRow['sizeClass'] | '';
		if (count === undefined || Number.isNaN(count)) continue;
		rows.push({ row, count, sizeClass: size || null });
	}
	return rows;
}

export const boughtInSchema = z.object({
	speciesId: z
		.number({ error: 'Pick the species.' })
		.int()
		.min(1, 'Pick the species.')
		.max(MAX_INTEGER_COLUMN, 'Pick the species.'),
	foundOn: isoDate,
	stage: z.enum(stageValues),
	sizeClass: z.enum(sizeClassValues),
	count: wholeCount('the count', 1).default(emptyNumber),
	generation: z
		.number({ error: 'Give the generation as a whole number.' })
		.int('Give the generation as a whole number.')
		.min(0, '0 means wild-caught; it cannot be lower.')
		.max(99, 'That generation is past what any breeder keeps.')
		.default(1),
	note: shortText(2000).default('')
});
