import { describe, expect, it } from 'vitest';
import {
	generationLabel,
	generationsLabel,
	photoAlt,
	tierLines,
	unitCount,
	unitLabel,
	upperFirst
} from './words';

describe('units', () => {
	it('names one unit of a listing', () => {
		expect(unitLabel(1, 'unsexed')).toBe('each');
		expect(unitLabel(2, 'pair')).toBe('pair');
		expect(unitLabel(2, 'unsexed')).toBe('group of 2');
		expect(unitLabel(5, 'unsexed')).toBe('group of 5');
	});

	it('counts units in plain words', () => {
		expect(unitCount(1, 1, 'female')).toBe('1 animal');
		expect(unitCount(3, 2, 'pair')).toBe('3 pairs');
		expect(unitCount(1, 10, 'unsexed')).toBe('1 group of 10');
		expect(unitCount(2, 10, 'unsexed')).toBe('2 groups of 10');
	});
});

describe('generations', () => {
	// F1 is the first generation born in captivity, F2 its young (common practice).
	it('writes a generation as breeders do', () => {
		expect(generationLabel(2)).toBe('captive-bred F2');
		expect(generationLabel(0)).toBe('wild-caught (F0)');
		expect(() => generationLabel(-1)).toThrow(RangeError);
		expect(upperFirst(generationLabel(3))).toBe('Captive-bred F3');
	});

	it('lists the generations on offer once each, in order', () => {
		expect(generationsLabel([3, 2, 3])).toBe('captive-bred F2 and F3');
		expect(generationsLabel([4, 2, 3])).toBe('captive-bred F2, F3 and F4');
		expect(generationsLabel([0, 1])).toBe('captive-bred F1 and wild-caught (F0)');
		expect(generationsLabel([])).toBe('');
	});
});

describe('photoAlt', () => {
	const subject = {
		title: 'Narceus juveniles',
		commonName: 'American giant millipede',
		scientificName: 'Narceus americanus',
		stage: 'juvenile' as const
	};

	it('keeps the keeper’s own description', () => {
		expect(photoAlt('  Three juveniles on oak leaves ', subject)).toBe(
			'Three juveniles on oak leaves'
		);
	});

	it('builds one from the species and stage when there is none', () => {
		expect(photoAlt('', subject)).toBe('American giant millipede (Narceus americanus), juvenile');
		expect(photoAlt(null, { ...subject, stage: null })).toBe(
			'American giant millipede (Narceus americanus)'
		);
		expect(
			photoAlt(' ', {
				title: 'House substrate mix',
				commonName: null,
				scientificName: null,
				stage: null
			})
		).toBe('House substrate mix');
	});
});

describe('tierLines', () => {
	it('reads a tier as a total, a rate and the saving against one', () => {
		// $14 each, or 5 for $60: $12 each, and 1 − 12/14 = 14.3 % saved (worked by hand).
		expect(
			tierLines(
				[
					{ minQuantity: 5, priceCents: 6000 },
					{ minQuantity: 1, priceCents: 1400 }
				],
				1,
				'unsexed'
			).map((line) => line.text)
		).toEqual(['1 for $14.00 — $14.00 each', '5 for $60.00 — $12.00 each, save 14%']);
	});

	it('gives group and pair units a rate per unit and per animal', () => {
		// A group of 5 for $32 is $6.40 an animal; 3 groups for $84 is $28 a group, $5.60 an
		// animal, and 1 − 5.60/6.40 = 12.5 %, which rounds half up to 13 % (worked by hand).
		const lines = tierLines(
			[
				{ minQuantity: 1, priceCents: 3200 },
				{ minQuantity: 3, priceCents: 8400 }
			],
			5,
			'unsexed'
		);
		expect(lines.map((line) => line.text)).toEqual([
			'1 group of 5 for $32.00 — $32.00 a group, $6.40 an animal',
			'3 groups of 5 for $84.00 — $28.00 a group, $5.60 an animal, save 13%'
		]);
		expect(lines[1]).toMatchObject({
			perUnitCents: 2800,
			perAnimalCents: 560,
			totalCents: 8400,
			quantityText: '3 groups of 5',
			rateText: '$28.00 a group, $5.60 an animal',
			savingPercent: 13
		});
		expect(
			tierLines([{ minQuantity: 1, priceCents: 900 }], 2, 'pair').map((line) => line.text)
		).toEqual(['1 pair for $9.00 — $9.00 a pair, $4.50 an animal']);
	});
});
