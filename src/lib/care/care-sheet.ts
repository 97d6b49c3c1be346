// The care sheet of a species: plain sections of plain lines, so the back office, the
// catalogue and the packing-slip PDF all show the same words. Pure: a species row in,
// data out. The standard lines are the trade's common practice and the cautions the
// product always shows (PRODUCT.md); the species' own notes come first in each section.
import { formatInches } from '$lib/format/length';
import { animalGroupLabel, moistureLevelLabels } from '$lib/format/labels';
import { formatTemperature } from '$lib/format/temperature';
import type { AnimalGroup, MoistureLevel, Species } from '$lib/server/db/schema';
import { MOISTURE_CHECK_DAYS } from './schedule';
import { HEAT_TREATMENT } from './substrate';
import { MM_PER_INCH, aboutMonths } from './species-schema';

export type CareSectionId =
	'temperature' | 'moisture' | 'substrate' | 'diet' | 'size' | 'handling' | 'routine' | 'cautions';

export interface CareLine {
	text: string;
	/** A short lead-in shown before the text ("Ideal", "Too wet"). */
	label?: string;
	/** caution lines are shown with the caution shape and word. */
	tone?: 'plain' | 'caution';
	/** species: typed by the keeper for this species; standard: the shop's own wording. */
	source: 'species' | 'standard';
}

export interface CareSection {
	id: CareSectionId;
	title: string;
	lines: CareLine[];
}

export interface CareSheet {
	/** The common name, as buyers know it. */
	title: string;
	scientificName: string;
	group: AnimalGroup;
	groupLabel: string;
	summary: string;
	sections: CareSection[];
}

export type CareSheetSpecies = Pick<
	Species,
	| 'scientific_name'
	| 'common_name'
	| 'animal_group'
	| 'summary'
	| 'temp_low_f'
	| 'temp_ideal_low_f'
	| 'temp_ideal_high_f'
	| 'temp_high_f'
	| 'moisture_level'
	| 'substrate_notes'
	| 'diet'
	| 'adult_length_mm'
	| 'handling_notes'
	| 'cautions'
	| 'grow_out_weeks'
	| 'refresh_interval_days'
	| 'tub_hold_days'
	| 'molt_quiet_days'
>;

// ---- The standard wording (common practice and cautions, PRODUCT.md).

export const ROOM_TEMPERATURE_LINE = 'Comfortable room temperature suits most of these animals.';

export const SQUEEZE_TEST = {
	intro: 'Squeeze a handful of substrate in your fist:',
	wet: 'drops of water come out.',
	right: 'you feel a little moisture on your hand, and no drops.',
	dry: 'it feels dry.',
	gradient: 'A moisture gradient is fine, but keep at least half of the enclosure at “right”.'
} as const;

const MOISTURE_LEVEL_LINES: Record<MoistureLevel, string> = {
	drier:
		'Let the surface dry out between waterings, and keep the lower layers and one end at “right”, so the animals can choose.',
	moist: 'Keep the substrate at “right”, with one end allowed to dry a little.',
	humid:
		'Keep the substrate at “right” throughout, with a damp (not wet) corner; never let it dry out.'
};

export const STANDARD_CAUTIONS = {
	defensiveFluid:
		'Many millipedes release a defensive fluid that can stain and irritate skin and eyes: keep your hands away from your face until you have washed them.',
	washHands: 'Wash your hands after every handling.',
	handleLow: 'Handle low, over a soft surface, so a fall does no harm.',
	noHeatMat:
		'No heat mat under the enclosure: these animals burrow, and heat from below can cook them.',
	localRules:
		'Moving some invertebrates between states or across borders needs a permit (in the US, under USDA APHIS rules for plant pests). Check your state’s rules before you buy, keep or pass on these animals; the breeder is responsible for its own permits.'
} as const;

export const MOLT_CAUTION =
	'Molting animals burrow, and disturbing them can kill them: never dig up an animal that has gone under to molt.';

export const HEAT_TREATMENT_LINE = `If you heat-treat substrate or leaves in the oven (about ${formatTemperature(HEAT_TREATMENT.fahrenheit)} for about ${HEAT_TREATMENT.minutes} minutes), mind the fire and burn risk, and let it cool completely before use.`;

export const WEEK_WITHOUT_CARE_LINE = 'A well-set enclosure can go about a week without care.';

/** Large millipede species reach 6 inches or more as adults (PRODUCT.md). */
export const LARGE_MILLIPEDE_MM = Math.round(6 * MM_PER_INCH);

// ---- Building the sheet.

function species(text: string, options: { tone?: 'caution' } = {}): CareLine | null {
	const trimmed = text.trim();
	return trimmed ? { text: trimmed, ...options, source: 'species' } : null;
}

function standard(text: string, options: { label?: string; tone?: 'caution' } = {}): CareLine {
	return { text, ...options, source: 'standard' };
}

/** "70 °F (21 °C) to 77 °F (25 °C)", or one value when both ends agree. */
export function formatBand(lowF: number, highF: number): string {
	return lowF === highF
		? formatTemperature(lowF)
		: `${formatTemperature(lowF)} to ${formatTemperature(highF)}`;
}

/** "100 mm (3.9 in)": stored mm with inches beside. */
export function formatAdultSize(mm: number): string {
	return `${mm} mm (${formatInches(mm / MM_PER_INCH)})`;
}

function weeks(count: number): string {
	return `${count} ${count === 1 ? 'week' : 'weeks'}`;
}

function days(count: number): string {
	return `${count} ${count === 1 ? 'day' : 'days'}`;
}

/** "6 weeks", or "45 days" when the hold is not whole weeks. */
function holdText(holdDays: number): string {
	return holdDays % 7 === 0 ? weeks(holdDays / 7) : days(holdDays);
}

export function careSheet(row: CareSheetSpecies): CareSheet {
	const present = (lines: Array<CareLine | null>) =>
		lines.filter((line): line is CareLine => line !== null);

	const sections: CareSection[] = [
		{
			id: 'temperature',
			title: 'Temperature',
			lines: [
				standard(formatBand(row.temp_ideal_low_f, row.temp_ideal_high_f), { label: 'Ideal' }),
				standard(formatBand(row.temp_low_f, row.temp_high_f), { label: 'Tolerated' }),
				standard(ROOM_TEMPERATURE_LINE)
			]
		},
		{
			id: 'moisture',
			title: 'Moisture',
			lines: [
				standard(MOISTURE_LEVEL_LINES[row.moisture_level], {
					label: moistureLevelLabels[row.moisture_level]
				}),
				standard(SQUEEZE_TEST.intro, { label: 'Squeeze test' }),
				standard(SQUEEZE_TEST.wet, { label: 'Too wet' }),
				standard(SQUEEZE_TEST.right, { label: 'Right' }),
				standard(SQUEEZE_TEST.dry, { label: 'Too dry' }),
				standard(SQUEEZE_TEST.gradient)
			]
		},
		{
			id: 'substrate',
			title: 'Substrate',
			lines: present([
				species(row.substrate_notes),
				standard(HEAT_TREATMENT_LINE, { tone: 'caution' })
			])
		},
		{ id: 'diet', title: 'Diet', lines: present([species(row.diet)]) },
		{
			id: 'size',
			title: 'Size and growth',
			lines: present([
				standard(`Adults reach about ${formatAdultSize(row.adult_length_mm)}.`, {
					label: 'Adult size'
				}),
				row.animal_group === 'millipede' && row.adult_length_mm >= LARGE_MILLIPEDE_MM
					? standard(
							'One of the large millipedes, which reach 6 in or more as adults: plan the enclosure for the adult.'
						)
					: null,
				standard(`Young reach sale size in about ${weeks(row.grow_out_weeks)}.`, {
					label: 'Growth'
				})
			])
		},
		{
			id: 'handling',
			title: 'Handling',
			lines: present([species(row.handling_notes), standard(MOLT_CAUTION, { tone: 'caution' })])
		},
		{
			id: 'routine',
			title: 'Routine care',
			lines: [
				standard(
					`Check the moisture by the squeeze test once a week (every ${days(MOISTURE_CHECK_DAYS)}).`,
					{ label: 'Weekly' }
				),
				standard(
					`Refresh half of the substrate every ${days(row.refresh_interval_days)} (${aboutMonths(row.refresh_interval_days)}).`,
					{ label: 'Substrate' }
				),
				standard(
					`Do not throw the old substrate away at once: keep it in a separate tub for ${holdText(row.tub_hold_days)} and check it for eggs and young first.`,
					{ label: 'Old substrate' }
				),
				standard(
					`Leave the enclosure undisturbed, and do not dig, for ${days(row.molt_quiet_days)} after you see a molt.`,
					{ label: 'After a molt' }
				),
				standard(WEEK_WITHOUT_CARE_LINE)
			]
		},
		{
			id: 'cautions',
			title: 'Cautions',
			lines: present([
				species(row.cautions, { tone: 'caution' }),
				row.animal_group === 'millipede'
					? standard(STANDARD_CAUTIONS.defensiveFluid, { tone: 'caution' })
					: null,
				standard(STANDARD_CAUTIONS.washHands, { tone: 'caution' }),
				standard(STANDARD_CAUTIONS.handleLow, { tone: 'caution' }),
				standard(STANDARD_CAUTIONS.noHeatMat, { tone: 'caution' }),
				standard(STANDARD_CAUTIONS.localRules, { tone: 'caution', label: 'Local rules' })
			])
		}
	];

	return {
		title: row.common_name,
		scientificName: row.scientific_name,
		group: row.animal_group,
		groupLabel: animalGroupLabel(row.animal_group),
		summary: row.summary.trim(),
		sections: sections.filter((section) => section.lines.length > 0)
	};
}

/** The profile fields a keeper left empty that buyers would look for on the sheet. */
export function careSheetGaps(row: CareSheetSpecies): string[] {
	const gaps: Array<[string, string]> = [
		[row.summary, 'summary'],
		[row.substrate_notes, 'substrate notes'],
		[row.diet, 'diet'],
		[row.handling_notes, 'handling notes']
	];
	return gaps.filter(([text]) => text.trim() === '').map(([, word]) => word);
}
