// How the shop pages word a listing: its unit, its captive-bred generation, a price
// tier, and a photo's description when the keeper gave none. Pure, so the catalogue,
// the species page and the listing page say the same thing the same way.
import { formatCents } from '$lib/format/money';
import { formatCount, stageLabels } from '$lib/format/labels';
import { tierTable, type PriceTier } from '$lib/money/pricing';
import type { ClutchStage, Sex } from '$lib/server/db/schema';

/** "each", "pair", "group of 5": what one unit of a listing is. */
export function unitLabel(unitSize: number, sex: Sex): string {
	if (unitSize === 1) return 'each';
	if (unitSize === 2 && sex === 'pair') return 'pair';
	return `group of ${unitSize}`;
}

/** "1 animal", "2 pairs", "3 groups of 5": a count of units. */
export function unitCount(quantity: number, unitSize: number, sex: Sex): string {
	const unit = unitLabel(unitSize, sex);
	if (unit === 'each') return formatCount(quantity, 'animal');
	if (unit === 'pair') return formatCount(quantity, 'pair');
	return formatCount(quantity, `group of ${unitSize}`, `groups of ${unitSize}`);
}

/**
 * "captive-bred F2": the generation as breeders write it (F1 is the first born in
 * captivity, common practice); F0 animals are the wild-caught founders themselves.
 */
export function generationLabel(generation: number): string {
	if (!Number.isInteger(generation) || generation < 0)
		throw new RangeError(`a generation is a whole number from 0, got ${generation}`);
	return generation === 0 ? 'wild-caught (F0)' : `captive-bred F${generation}`;
}

/** "captive-bred F2", "captive-bred F2 and F3", "captive-bred F2, F3 and F4" (F0 apart). */
export function generationsLabel(generations: readonly number[]): string {
	const sorted = [...new Set(generations)].sort((a, b) => a - b);
	const bred = sorted.filter((g) => g > 0).map((g) => `F${g}`);
	const parts: string[] = [];
	if (bred.length > 0) {
		const list =
			bred.length === 1 ? bred[0]! : `${bred.slice(0, -1).join(', ')} and ${bred.at(-1)}`;
		parts.push(`captive-bred ${list}`);
	}
	if (sorted.includes(0)) parts.push(generationLabel(0));
	return parts.join(' and ');
}

export interface PhotoSubject {
	title: string;
	commonName: string | null;
	scientificName: string | null;
	stage: ClutchStage | null;
}

/**
 * The photo's own description, or one built from what it shows: "American giant
 * millipede (Narceus americanus), juvenile". Never empty: every shop photo carries content.
 */
export function photoAlt(altText: string | null | undefined, subject: PhotoSubject): string {
	const own = altText?.trim();
	if (own) return own;
	if (!subject.commonName) return subject.title;
	const named = subject.scientificName
		? `${subject.commonName} (${subject.scientificName})`
		: subject.commonName;
	if (!subject.stage) return named;
	return `${named}, ${stageLabels[subject.stage].toLowerCase()}`;
}

export interface TierLine {
	minQuantity: number;
	totalCents: number;
	perUnitCents: number;
	perAnimalCents: number;
	savingPercent: number;
	/** "5", "2 pairs", "3 groups of 5" */
	quantityText: string;
	/** "$12.00 each", "$28.00 a group, $5.60 an animal" */
	rateText: string;
	/** "5 for $60.00 — $12.00 each, save 14%" */
	text: string;
}

/** The tier table as sentences a buyer reads down: price per unit and per animal, and the saving. */
export function tierLines(tiers: readonly PriceTier[], unitSize: number, sex: Sex): TierLine[] {
	const unit = unitLabel(unitSize, sex);
	return tierTable(tiers, unitSize).map((row) => {
		const quantityText =
			unit === 'each'
				? String(row.tier.minQuantity)
				: unitCount(row.tier.minQuantity, unitSize, sex);
		const rateText =
			unit === 'each'
				? `${formatCents(row.perUnitCents)} each`
				: `${formatCents(row.perUnitCents)} a ${unit === 'pair' ? 'pair' : 'group'}, ${formatCents(row.perAnimalCents)} an animal`;
		const saving = row.savingPercent > 0 ? `, save ${row.savingPercent}%` : '';
		return {
			minQuantity: row.tier.minQuantity,
			totalCents: row.tier.priceCents,
			perUnitCents: row.perUnitCents,
			perAnimalCents: row.perAnimalCents,
			savingPercent: row.savingPercent,
			quantityText,
			rateText,
			text: `${quantityText} for ${formatCents(row.tier.priceCents)} — ${rateText}${saving}`
		};
	});
}

/** "Captive-bred F2": the same words at the start of a line. */
export function upperFirst(text: string): string {
	return text.charAt(0).toUpperCase() + text.slice(1);
}
