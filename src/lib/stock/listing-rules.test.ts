import { describe, expect, it } from 'vitest';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	LISTING_LIMITS,
	describeListingAudit,
	draftFromClutchProblem,
	listingChanges,
	listingFormSchema,
	listingSlug,
	nothingOnOfferProblem,
	pairProblem,
	parseListingFilters,
	publishProblem,
	readTierRows,
	shelfCountProblem,
	slugCandidate,
	slugWords,
	soldOutDue,
	STATE_RULES_LINE,
	suggestedDescription,
	suggestedTitle,
	tierRowsOf,
	unitChangeProblem,
	unitSizeProblem,
	withTierRowAdded,
	withTierRowRemoved,
	withdrawProblem,
	type PublishCheck
} from './listing-rules';

const fields = (result: ReturnType<typeof readTierRows>) =>
	result.problems.map((p) => `${p.field}: ${p.message}`);

describe('readTierRows', () => {
	it('reads "1 for $14, 5 for $60, 10 for $110" into exact cents, smallest first', () => {
		const read = readTierRows(['10', '1', '5'], ['110', '14.00', '$60']);
		expect(read.problems).toEqual([]);
		// $14 = 1400 cents, $60 = 6000, $110 = 11000: 100 cents to the dollar (ISO 4217, USD).
		expect(read.tiers).toEqual([
			{ minQuantity: 1, priceCents: 1400 },
			{ minQuantity: 5, priceCents: 6000 },
			{ minQuantity: 10, priceCents: 11000 }
		]);
	});

	it('converts cents without a float slip', () => {
		// IEEE 754 binary64: 0.29 × 100 is 28.999999999999996, so a float route would lose a cent.
		expect(0.29 * 100).not.toBe(29);
		expect(readTierRows(['1'], ['0.29']).tiers).toEqual([{ minQuantity: 1, priceCents: 29 }]);
		expect(readTierRows(['1'], ['1,250.5']).tiers).toEqual([
			{ minQuantity: 1, priceCents: 125050 }
		]);
	});

	it('skips blank rows and keeps the row number on each problem', () => {
		expect(readTierRows(['1', '', ''], ['9', '', '']).tiers).toEqual([
			{ minQuantity: 1, priceCents: 900 }
		]);
		const read = readTierRows(['1', '', 'x', '3'], ['9', '20', '5', '']);
		expect(read.tiers).toEqual([]);
		expect(fields(read)).toEqual([
			'tierQuantity[1]: Say how many units this price is for.',
			'tierQuantity[2]: A whole number of units, 1 or more.',
			'tierPrice[3]: Give the price for these units.'
		]);
	});

	it('refuses negative, zero, three-decimal and absurd prices beside the price', () => {
		expect(fields(readTierRows(['1'], ['-5']))).toEqual([
			'tierPrice[0]: A price cannot be negative.'
		]);
		expect(fields(readTierRows(['1'], ['0']))[0]).toMatch(/^tierPrice\[0\]: A price of \$0\.00/);
		expect(fields(readTierRows(['1'], ['1.005']))[0]).toMatch(/at most two digits/);
		expect(fields(readTierRows(['1'], ['10000']))[0]).toMatch(/slipped digit/);
		expect(fields(readTierRows(['1'], ['9999.99']))).toEqual([]);
	});

	it('refuses a quantity of 0, a fraction or past the largest line', () => {
		expect(fields(readTierRows(['0'], ['5']))[0]).toMatch(/^tierQuantity\[0\]: A whole number/);
		expect(fields(readTierRows(['1.5'], ['5']))[0]).toMatch(/^tierQuantity\[0\]: A whole number/);
		expect(fields(readTierRows(['1', '1001'], ['5', '4000']))[0]).toMatch(/at most 1000 units/);
	});

	it('names the first row when two rows are for the same quantity', () => {
		expect(fields(readTierRows(['1', '5', '5'], ['10', '45', '40']))).toEqual([
			'tierQuantity[2]: Row 2 is already for 5; keep one of them.'
		]);
	});

	it('asks for a price of one unit, and for any price at all, on the list as a whole', () => {
		expect(fields(readTierRows(['5'], ['60']))).toEqual([
			'tierQuantity: Add a row for 1 unit, so any quantity has a price.'
		]);
		expect(fields(readTierRows(['', ''], ['', '']))).toEqual([
			'tierQuantity: Give at least one price: the price of a single unit.'
		]);
	});

	it('refuses a larger tier that costs more per unit', () => {
		// 5 for $75 is $15 each, more than $14 for one: worked by hand.
		expect(fields(readTierRows(['1', '5'], ['14', '75']))[0]).toMatch(
			/^tierPrice\[1\]: 5 units at this price cost more each than 1 at \$14\.00/
		);
	});

	it('refuses a tier that makes a line cheaper than one unit fewer', () => {
		// 1 for $14, 5 for $50: four units cost 4 × $14 = $56 > $50 for five: worked by hand.
		expect(fields(readTierRows(['1', '5'], ['14', '50']))).toEqual([
			'tierPrice[1]: At this price 5 units cost less than 4 ($56.00); make it at least that.'
		]);
		expect(fields(readTierRows(['1', '5'], ['14', '56']))).toEqual([]);
	});
});

describe('tier rows in the editor', () => {
	it('shows stored tiers as dollars with one blank row', () => {
		expect(
			tierRowsOf([
				{ minQuantity: 5, priceCents: 6000 },
				{ minQuantity: 1, priceCents: 1405 }
			])
		).toEqual({ tierQuantity: ['1', '5', ''], tierPrice: ['14.05', '60.00', ''] });
	});

	it('adds a row up to the limit and removes any row, blanking the last one', () => {
		const form = { tierQuantity: ['1', '5'], tierPrice: ['14'] };
		expect(withTierRowAdded(form)).toEqual({
			tierQuantity: ['1', '5', ''],
			tierPrice: ['14', '', '']
		});
		const full = { tierQuantity: Array(8).fill('1'), tierPrice: Array(8).fill('1') };
		expect(withTierRowAdded(full)).toBeNull();
		expect(withTierRowRemoved(form, 0)).toEqual({ tierQuantity: ['5'], tierPrice: [''] });
		expect(withTierRowRemoved({ tierQuantity: ['1'], tierPrice: ['14'] }, 0)).toEqual({
			tierQuantity: [''],
			tierPrice: ['']
		});
		expect(withTierRowRemoved(form, 2)).toBeNull();
	});
});

describe('the listing form', () => {
	const valid = {
		title: 'Smooth slaters, pair',
		unitSize: 2,
		sex: 'pair',
		tierQuantity: ['1', ''],
		tierPrice: ['9', '']
	};

	it('accepts a pair of two with a price', () => {
		const parsed = listingFormSchema.safeParse(valid);
		expect(parsed.success).toBe(true);
	});

	it('puts each problem beside its field', () => {
		const parsed = listingFormSchema.safeParse({
			...valid,
			title: ' ',
			unitSize: 3,
			tierPrice: ['abc', '']
		});
		expect(parsed.success).toBe(false);
		const messages = parsed.error?.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
		expect(messages).toContain('title: Give the listing a title buyers will read.');
		expect(messages).toContain(
			'unitSize: A pair is two animals, one male and one female: set the unit to 2.'
		);
		expect(messages).toContain('tierPrice.0: Write the amount as dollars and cents, e.g. 12.50.');
	});

	it('knows the two kinds, animals by default', () => {
		expect(listingFormSchema.safeParse({ ...valid, kind: 'clutch' }).success).toBe(false);
		expect(listingFormSchema.safeParse({ ...valid, kind: 'supply' }).data?.kind).toBe('supply');
		expect(listingFormSchema.parse(valid)).toMatchObject({
			kind: 'animal',
			clutchCode: '',
			stamp: ''
		});
	});

	it('refuses a pair of any size but two', () => {
		expect(pairProblem('pair', 2)).toBeNull();
		expect(pairProblem('pair', 1)).toMatch(/two animals/);
		expect(pairProblem('female', 1)).toBeNull();
	});
});

describe('titles and slugs', () => {
	it('suggests a title in the shop’s words', () => {
		expect(
			suggestedTitle({
				commonName: 'American giant millipede',
				scientificName: 'Narceus americanus',
				stage: 'juvenile',
				unitSize: 1,
				sex: 'unsexed'
			})
		).toBe('American giant millipede (Narceus americanus), juvenile, each');
		expect(
			suggestedTitle({
				commonName: 'Smooth slater',
				scientificName: 'Porcellio laevis',
				stage: 'sub_adult',
				unitSize: 10,
				sex: 'female'
			})
		).toBe('Smooth slater (Porcellio laevis), sub-adult, female, group of 10');
	});

	it('makes slugs the table accepts: title words and the clutch code', () => {
		const pattern = /^[a-z0-9]+(-[a-z0-9]+)*$/; // listing.slug's CHECK
		const slug = listingSlug('Bumblebee millipedes (Anadenobolus), group of 5', 'ANA-C2');
		expect(slug).toBe('bumblebee-millipedes-anadenobolus-group-of-5-ana-c2');
		expect(slug).toMatch(pattern);
		expect(listingSlug('Crème brûlée leaf litter — 1 gallon', null)).toBe(
			'creme-brulee-leaf-litter-1-gallon'
		);
		expect(listingSlug('!!!', null)).toBe('listing');
		const long = listingSlug('word '.repeat(40), 'NAR-C1');
		expect(long.length).toBeLessThanOrEqual(LISTING_LIMITS.slugBody + 7);
		expect(long).toMatch(pattern);
		expect(long.endsWith('-nar-c1')).toBe(true);
		expect(slugWords('a'.repeat(80), 60)).toHaveLength(60);
		expect(slugCandidate('pill-bugs', 1)).toBe('pill-bugs');
		expect(slugCandidate('pill-bugs', 3)).toBe('pill-bugs-3');
	});
});

describe('refusals', () => {
	const animal: PublishCheck = {
		kind: 'animal',
		state: 'draft',
		tierCount: 2,
		unitSize: 5,
		clutch: { code: 'ANA-C2', state: 'ready', pausedReason: null, countAlive: 30 },
		supplyStock: null
	};

	it('lets a draft of a ready or listed clutch go live', () => {
		expect(publishProblem(animal)).toBeNull();
		expect(
			publishProblem({ ...animal, clutch: { ...animal.clutch!, state: 'listed' } })
		).toBeNull();
		expect(publishProblem({ ...animal, state: 'withdrawn' })).toBeNull();
	});

	it('refuses a paused, growing or closed clutch, with the reason', () => {
		const clutch = animal.clutch!;
		expect(
			publishProblem({ ...animal, clutch: { ...clutch, state: 'paused', pausedReason: 'molting' } })
		).toMatch(/ANA-C2 is paused \(molting\): a paused clutch is never sold/);
		expect(publishProblem({ ...animal, clutch: { ...clutch, state: 'growing' } })).toMatch(
			/still growing/
		);
		expect(publishProblem({ ...animal, clutch: { ...clutch, state: 'sold_out' } })).toMatch(
			/closed \(sold out\)/
		);
	});

	it('refuses no prices, a unit larger than the clutch, a live listing and an empty shelf', () => {
		expect(publishProblem({ ...animal, tierCount: 0 })).toBe('Give it at least one price first.');
		expect(publishProblem({ ...animal, clutch: { ...animal.clutch!, countAlive: 4 } })).toBe(
			'A unit of 5 is more than the 4 alive in ANA-C2.'
		);
		expect(publishProblem({ ...animal, state: 'live' })).toMatch(/already live/);
		const supply: PublishCheck = { ...animal, kind: 'supply', clutch: null, supplyStock: 0 };
		expect(publishProblem(supply)).toMatch(/shelf count is 0/);
		expect(publishProblem({ ...supply, supplyStock: 3 })).toBeNull();
	});

	it('says why nothing would be on offer', () => {
		expect(
			nothingOnOfferProblem({ kind: 'animal', unitSize: 5, freeAnimals: 3, heldUnits: 0 })
		).toBe('Nothing to offer: only 3 animals are free, fewer than one unit (a group of 5).');
		expect(
			nothingOnOfferProblem({ kind: 'animal', unitSize: 1, freeAnimals: -2, heldUnits: 0 })
		).toMatch(/every animal in the clutch is sold or held/);
		expect(
			nothingOnOfferProblem({ kind: 'supply', unitSize: 1, freeAnimals: null, heldUnits: 4 })
		).toMatch(/4 held/);
	});

	it('withdraws only a live listing', () => {
		expect(withdrawProblem('live')).toBeNull();
		expect(withdrawProblem('draft')).toMatch(/not in the shop/);
		expect(withdrawProblem('withdrawn')).toMatch(/already withdrawn/);
		expect(withdrawProblem('sold_out')).toMatch(/sold out/);
	});

	it('guards the unit, the shelf count and the clutch a draft comes from', () => {
		expect(unitSizeProblem(5, 5, 'ARM-C1')).toBeNull();
		expect(unitSizeProblem(1, 0, 'ARM-C1')).toBe('No animals are alive in ARM-C1.');
		expect(unitChangeProblem('live', 0)).toMatch(/Withdraw the listing/);
		expect(unitChangeProblem('withdrawn', 2)).toMatch(/2 units are still held/);
		expect(unitChangeProblem('draft', 0)).toBeNull();
		expect(shelfCountProblem(3, 4)).toMatch(/4 units are held/);
		expect(shelfCountProblem(4, 4)).toBeNull();
		expect(draftFromClutchProblem('ready', 'NAR-C1')).toBeNull();
		expect(draftFromClutchProblem('listed', 'NAR-C1')).toBeNull();
		expect(draftFromClutchProblem('growing', 'NAR-C1')).toMatch(/still growing/);
		expect(draftFromClutchProblem('paused', 'NAR-C1')).toMatch(/paused/);
	});
});

describe('soldOutDue', () => {
	const base = { stateBeforePause: null, countAlive: 10, freeAnimals: 0, heldAnimals: 0 };

	it('closes a listed or ready clutch with nothing free and nothing held', () => {
		expect(soldOutDue({ ...base, state: 'listed' })).toBe(true);
		expect(soldOutDue({ ...base, state: 'ready', freeAnimals: -3 })).toBe(true);
	});

	it('waits while a hold may still come back, or while anything is free', () => {
		expect(soldOutDue({ ...base, state: 'listed', heldAnimals: 2 })).toBe(false);
		expect(soldOutDue({ ...base, state: 'listed', freeAnimals: 1 })).toBe(false);
	});

	it('never closes a growing clutch, and a paused one only when none is alive', () => {
		expect(soldOutDue({ ...base, state: 'growing', countAlive: 0 })).toBe(false);
		expect(soldOutDue({ ...base, state: 'paused', stateBeforePause: 'listed' })).toBe(false);
		expect(
			soldOutDue({ ...base, state: 'paused', stateBeforePause: 'listed', countAlive: 0 })
		).toBe(true);
		expect(
			soldOutDue({ ...base, state: 'paused', stateBeforePause: 'growing', countAlive: 0 })
		).toBe(false);
		expect(soldOutDue({ ...base, state: 'sold_out' })).toBe(false);
	});
});

describe('listingChanges', () => {
	it('keeps only what differs, as from and to', () => {
		expect(
			listingChanges(
				{ title: 'A', unitSize: 1, tiers: [{ minQuantity: 1, priceCents: 900 }] },
				{ title: 'A', unitSize: 2, tiers: [{ minQuantity: 1, priceCents: 900 }] }
			)
		).toEqual({ unitSize: { from: 1, to: 2 } });
	});
});

describe('parseListingFilters', () => {
	it('reads the filter bar, empty fields meaning no filter', () => {
		expect(
			parseListingFilters(new URLSearchParams('state=live&kind=&species=&q=%20NAR%20'))
		).toEqual({
			ok: true,
			filters: { state: 'live', q: 'NAR' }
		});
	});
	it('refuses an unknown state with a sentence', () => {
		expect(parseListingFilters(new URLSearchParams('state=gone'))).toEqual({
			ok: false,
			problem: 'State must be draft, live, withdrawn or sold_out.'
		});
	});
});

describe('suggestedDescription', () => {
	it('carries the handling caution for millipedes and the state-rules line for all', () => {
		const millipedes = suggestedDescription({
			generation: 2,
			stage: 'juvenile',
			clutchCode: 'NAR-C1',
			animalGroup: 'millipede'
		});
		expect(millipedes).toMatch(/^Captive-bred F2 juveniles from clutch NAR-C1\./);
		expect(millipedes).toMatch(/defensive fluid/);
		expect(millipedes.endsWith(STATE_RULES_LINE)).toBe(true);
		const isopods = suggestedDescription({
			generation: 0,
			stage: 'adult',
			clutchCode: 'PLA-C9',
			animalGroup: 'isopod'
		});
		expect(isopods).toMatch(/^Wild-caught adults/);
		expect(isopods).not.toMatch(/defensive fluid/);
	});
});

describe('describeListingAudit', () => {
	it('says each entry in a line', () => {
		expect(describeListingAudit('listing.create', {})).toBe('Drafted.');
		expect(
			describeListingAudit('listing.edit', {
				changes: { title: {}, tiers: {}, supplyStock: {} }
			})
		).toBe('Changed the title, prices and shelf count.');
		expect(describeListingAudit('listing.publish', { onOffer: 12, firstTime: true })).toBe(
			'Put on sale for the first time, 12 on offer.'
		);
		expect(describeListingAudit('listing.withdraw', {})).toBe('Taken off sale.');
	});
});

describe('the listing form through superforms', () => {
	it('reads repeated tier fields as rows and puts each error beside its box', async () => {
		const body = new FormData();
		body.set('title', 'Pill bugs, group of 10');
		body.set('unitSize', '10');
		const rows: [string, string][] = [
			['5', '60'],
			['10', 'abc']
		];
		for (const [quantity, price] of rows) {
			body.append('tierQuantity', quantity);
			body.append('tierPrice', price);
		}
		const form = await superValidate(body, zod4(listingFormSchema));
		expect(form.data.tierQuantity).toEqual(['5', '10']);
		expect(form.valid).toBe(false);
		expect(form.errors.tierPrice?.[1]).toEqual([
			'Write the amount as dollars and cents, e.g. 12.50.'
		]);

		body.set('tierPrice', '60');
		body.append('tierPrice', '110');
		const noSingle = await superValidate(body, zod4(listingFormSchema));
		// A problem with the rows as a set sits on the list, not on one box.
		expect(noSingle.errors.tierQuantity?._errors).toEqual([
			'Add a row for 1 unit, so any quantity has a price.'
		]);
	});
});
