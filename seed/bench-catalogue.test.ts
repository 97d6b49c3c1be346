import { describe, expect, it } from 'vitest';
import { basePriceCents, tiersProblem } from '../src/lib/money/pricing';
import { planBenchCatalogue, type BenchSpecies } from './bench-catalogue';

const SPECIES: BenchSpecies[] = [
	{
		id: 1,
		slug: 'narceus-americanus',
		scientificName: 'Narceus americanus',
		commonName: 'American giant millipede',
		group: 'millipede',
		growOutWeeks: 30,
		codePrefix: 'NAR',
		highestClutchNumber: 2,
		tubIds: [11, 12]
	},
	{
		id: 4,
		slug: 'porcellio-laevis',
		scientificName: 'Porcellio laevis',
		commonName: 'Smooth slater',
		group: 'isopod',
		growOutWeeks: 10,
		codePrefix: 'PLA',
		highestClutchNumber: 3,
		tubIds: []
	},
	{
		id: 7,
		slug: 'folsomia-candida',
		scientificName: 'Folsomia candida',
		commonName: 'White springtail',
		group: 'springtail',
		growOutWeeks: 4,
		codePrefix: 'FOL',
		highestClutchNumber: 0,
		tubIds: []
	}
];

const TODAY = '2026-12-01';
const plan = planBenchCatalogue(SPECIES, { today: TODAY, animalListings: 3000, supplies: 120 });
const listings = [...plan.clutches.flatMap((c) => c.listings), ...plan.supplies];

describe('planBenchCatalogue', () => {
	it('is the same plan on every run', () => {
		const again = planBenchCatalogue(SPECIES, {
			today: TODAY,
			animalListings: 3000,
			supplies: 120
		});
		expect(again).toEqual(plan);
	});

	it('makes at least the listings asked for, one or two per clutch, and the supplies', () => {
		expect(plan.animalListings).toBeGreaterThanOrEqual(3000);
		expect(plan.animalListings).toBeLessThan(3002);
		expect(plan.supplies).toHaveLength(120);
		for (const clutch of plan.clutches) {
			expect(clutch.listings.length).toBeGreaterThanOrEqual(1);
			expect(clutch.listings.length).toBeLessThanOrEqual(2);
		}
	});

	it('never counts springtails out as animals, and numbers clutches after the highest code', () => {
		expect(plan.clutches.some((c) => c.speciesId === 7)).toBe(false);
		const narCodes = plan.clutches.filter((c) => c.speciesId === 1).map((c) => c.code);
		expect(narCodes[0]).toBe('NAR-C3');
		expect(new Set(plan.clutches.map((c) => c.code)).size).toBe(plan.clutches.length);
		// Only species with resting tubs have clutches found in one.
		expect(plan.clutches.every((c) => c.tubId === null || c.speciesId === 1)).toBe(true);
	});

	it('keeps to the listing table rules: unique slugs of the checked shape', () => {
		// The same pattern as listing.slug's CHECK in the data model migration.
		const shape = /^[a-z0-9]+(-[a-z0-9]+)*$/;
		for (const listing of listings) expect(listing.slug).toMatch(shape);
		expect(new Set(listings.map((l) => l.slug)).size).toBe(listings.length);
	});

	it('prices every listing with valid tiers and stores the cheapest rate per animal', () => {
		for (const listing of listings) {
			expect(tiersProblem(listing.tiers)).toBeNull();
			expect(listing.tiers.length).toBeGreaterThanOrEqual(1);
			expect(listing.tiers.length).toBeLessThanOrEqual(3);
			expect(listing.basePriceCents).toBe(basePriceCents(listing.tiers, listing.unitSize));
			// A bigger tier never costs more per unit than the single-unit price.
			const first = listing.tiers[0]!.priceCents;
			for (const tier of listing.tiers)
				expect(tier.priceCents / tier.minQuantity).toBeLessThanOrEqual(first);
		}
	});

	it('keeps to the clutch table rules and has animals on offer for every listing', () => {
		for (const clutch of plan.clutches) {
			expect(clutch.countAlive + clutch.countLost).toBeLessThanOrEqual(clutch.countFound);
			expect(clutch.saleReadyOn >= clutch.foundOn).toBe(true);
			expect(clutch.saleReadyOn < TODAY).toBe(true);
			for (const listing of clutch.listings)
				expect(clutch.countAlive).toBeGreaterThanOrEqual(listing.unitSize);
		}
	});

	it('spreads publication over past months, never in the future', () => {
		const end = new Date(`${TODAY}T23:59:59Z`).getTime();
		const times = listings.map((l) => l.publishedAt.getTime());
		expect(Math.max(...times)).toBeLessThanOrEqual(end);
		const spanDays = (Math.max(...times) - Math.min(...times)) / 86_400_000;
		expect(spanDays).toBeGreaterThan(200);
	});
});
