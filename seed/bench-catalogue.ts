// The benchmark's catalogue fixture: thousands of listed clutches with one or two live
// listings each, plus a few hundred supplies, laid out around `today` from a seeded
// generator so every run measures the same shop. Pure: the caller inserts the rows.
import { basePriceCents, type PriceTier } from '../src/lib/money/pricing';
import type { AnimalGroup, ClutchStage, Sex, SizeClass } from '../src/lib/server/db/schema';
import { addDays, assertIsoDate } from './dates';
import { demoRandom, type DemoRandom } from './random';

/** A species as the database holds it after the demo seed. */
export interface BenchSpecies {
	id: number;
	slug: string;
	scientificName: string;
	commonName: string;
	group: AnimalGroup;
	growOutWeeks: number;
	/** Clutch code prefix (NAR for NAR-C7). */
	codePrefix: string;
	/** The highest clutch number this prefix has used so far. */
	highestClutchNumber: number;
	/** Resting tubs of this species' colonies, for clutches found in one. */
	tubIds: readonly number[];
}

export interface BenchListing {
	slug: string;
	kind: 'animal' | 'supply';
	speciesId: number | null;
	title: string;
	description: string;
	unitSize: number;
	sex: Sex;
	isLive: boolean;
	supplyStock: number | null;
	publishedAt: Date;
	basePriceCents: number;
	tiers: PriceTier[];
}

export interface BenchClutch {
	code: string;
	speciesId: number;
	tubId: number | null;
	generation: number;
	foundOn: string;
	stage: ClutchStage;
	sizeClass: SizeClass;
	countFound: number;
	countAlive: number;
	countLost: number;
	saleReadyOn: string;
	listedAt: Date;
	listings: BenchListing[];
}

export interface BenchCatalogue {
	clutches: BenchClutch[];
	supplies: BenchListing[];
	animalListings: number;
}

const CHECK_STATE_RULES =
	"Check your state's rules on keeping and moving invertebrates before you order.";
const MILLIPEDE_CAUTION =
	'Millipedes release a defensive fluid that can stain and irritate: handle low over a soft ' +
	'surface and wash hands afterwards.';
const ISOPOD_CAUTION = 'Wash hands after handling and after working in the tub.';

/** Springtails are sold as cultures (supplies), never counted out as animals. */
const SOLD_AS_ANIMALS: ReadonlySet<AnimalGroup> = new Set([
	'millipede',
	'isopod',
	'beetle',
	'roach'
]);

interface UnitPlan {
	unitSize: number;
	sex: Sex;
	/** Title words: "each", "group of 10", "pair". */
	words: string;
	slugWords: string;
	/** Quantities the tiers are for, smallest first. */
	ladder: readonly number[];
	/** Who is in one unit: "A group of 5 captive-bred F3 juveniles". */
	who: (animals: string, animal: string) => string;
}

const EACH: UnitPlan = {
	unitSize: 1,
	sex: 'unsexed',
	words: 'each',
	slugWords: 'each',
	ladder: [1, 5, 10],
	who: (_animals, animal) => `A captive-bred ${animal}`
};
const PAIR: UnitPlan = {
	unitSize: 2,
	sex: 'pair',
	words: 'pair',
	slugWords: 'pair',
	ladder: [1, 2, 3],
	who: (animals) => `A sexed pair of captive-bred ${animals}`
};
function groupOf(n: number): UnitPlan {
	return {
		unitSize: n,
		sex: 'unsexed',
		words: `group of ${n}`,
		slugWords: `group-of-${n}`,
		ladder: [1, 3, 5],
		who: (animals) => `A group of ${n} captive-bred ${animals}`
	};
}

/** How a group's clutches are sold, by stage: the units a keeper would offer. */
function unitChoices(group: AnimalGroup, stage: ClutchStage): UnitPlan[] {
	if (group === 'isopod') return [groupOf(10), groupOf(25)];
	if (stage === 'adult') return [EACH, PAIR];
	return [EACH, groupOf(5)];
}

const STAGE_WORDS: Record<ClutchStage, { title: string; slug: string; plural: string }> = {
	hatchling: { title: 'hatchling', slug: 'hatchlings', plural: 'hatchlings' },
	juvenile: { title: 'juvenile', slug: 'juveniles', plural: 'juveniles' },
	sub_adult: { title: 'sub-adult', slug: 'sub-adults', plural: 'sub-adults' },
	adult: { title: 'adult', slug: 'adults', plural: 'adults' }
};
const SIZE_BY_STAGE: Record<ClutchStage, SizeClass> = {
	hatchling: 'tiny',
	juvenile: 'small',
	sub_adult: 'medium',
	adult: 'large'
};

/** Price of one unit at the single-unit tier, rounded to 50 cents the way a shop prices. */
function unitPriceCents(
	rng: DemoRandom,
	group: AnimalGroup,
	unit: UnitPlan,
	speciesFactor: number
) {
	const perAnimal = group === 'isopod' ? rng.int(180, 450) : rng.int(900, 2400);
	const raw = perAnimal * unit.unitSize * speciesFactor;
	return Math.max(100, Math.round(raw / 50) * 50);
}

/** One to three tiers, each a little cheaper per unit than the one before. */
function tiersFor(rng: DemoRandom, unit: UnitPlan, firstPrice: number): PriceTier[] {
	const count = rng.int(1, 3);
	const discounts = [1, 0.9, 0.8];
	return unit.ladder.slice(0, count).map((minQuantity, index) => ({
		minQuantity,
		priceCents:
			index === 0
				? firstPrice
				: Math.round((firstPrice * minQuantity * (discounts[index] ?? 1)) / 50) * 50
	}));
}

/** A published instant on `day`, during the shop's working hours (UTC 13:00–22:59). */
function instantOnDay(rng: DemoRandom, day: string): Date {
	const minutes = rng.int(13 * 60, 22 * 60 + 59);
	return new Date(
		`${day}T${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}:00Z`
	);
}

function olderOf(day: string, today: string): string {
	return day < today ? day : today;
}

/**
 * Clutches in state `listed` across the species that are sold as animals, round robin,
 * each with one or two live listings, until `animalListings` listings exist; then
 * `supplies` supply listings. Listings were published over the last `spanDays` days.
 */
export function planBenchCatalogue(
	species: readonly BenchSpecies[],
	opts: { today: string; animalListings: number; supplies: number; spanDays?: number }
): BenchCatalogue {
	const today = assertIsoDate(opts.today);
	const spanDays = opts.spanDays ?? 300;
	const rng = demoRandom('bench-catalogue');
	const animalSpecies = species.filter((s) => SOLD_AS_ANIMALS.has(s.group));
	if (animalSpecies.length === 0) throw new Error('bench: no species that are sold as animals');
	const nextNumber = new Map(animalSpecies.map((s) => [s.id, s.highestClutchNumber + 1]));
	const speciesFactor = new Map(animalSpecies.map((s) => [s.id, 0.8 + rng.next() * 0.8]));

	const clutches: BenchClutch[] = [];
	let animalListings = 0;
	for (let i = 0; animalListings < opts.animalListings; i++) {
		const sp = animalSpecies[i % animalSpecies.length] as BenchSpecies;
		const number = nextNumber.get(sp.id) ?? 1;
		nextNumber.set(sp.id, number + 1);
		const code = `${sp.codePrefix}-C${number}`;
		const stage = rng.pick<ClutchStage>(['juvenile', 'juvenile', 'sub_adult', 'adult']);
		const saleReadyOn = addDays(today, -rng.int(1, spanDays));
		const foundOn = addDays(saleReadyOn, -sp.growOutWeeks * 7 - rng.int(0, 21));
		const countFound = sp.group === 'isopod' ? rng.int(80, 400) : rng.int(20, 90);
		const countLost = rng.int(0, Math.floor(countFound / 10));
		const listedOn = olderOf(addDays(saleReadyOn, rng.int(0, 6)), today);
		const listedAt = instantOnDay(rng, listedOn);
		const fromTub = sp.tubIds.length > 0 && rng.next() < 0.85;
		const choices = unitChoices(sp.group, stage);
		const units = rng.next() < 0.5 ? choices : [rng.pick(choices)];
		const words = STAGE_WORDS[stage];
		const factor = speciesFactor.get(sp.id) ?? 1;
		const caution = sp.group === 'millipede' ? MILLIPEDE_CAUTION : ISOPOD_CAUTION;
		const generation = rng.int(1, 6);
		const listings = units.map((unit): BenchListing => {
			const tiers = tiersFor(rng, unit, unitPriceCents(rng, sp.group, unit, factor));
			const base = basePriceCents(tiers, unit.unitSize);
			if (base === null) throw new Error('bench: a listing without tiers');
			const who = unit.who(`F${generation} ${words.plural}`, `F${generation} ${words.title}`);
			return {
				slug: `${sp.slug}-${words.slug}-${unit.slugWords}-${code.toLowerCase()}`,
				kind: 'animal',
				speciesId: sp.id,
				title: `${sp.commonName} (${sp.scientificName}), ${words.title}, ${unit.words}`,
				description:
					`${who} from clutch ${code}. Sent with a care sheet. ` +
					`${caution} ${CHECK_STATE_RULES}`,
				unitSize: unit.unitSize,
				sex: unit.sex,
				isLive: true,
				supplyStock: null,
				publishedAt: listedAt,
				basePriceCents: base,
				tiers
			};
		});
		animalListings += listings.length;
		clutches.push({
			code,
			speciesId: sp.id,
			tubId: fromTub ? rng.pick(sp.tubIds) : null,
			generation,
			foundOn,
			stage,
			sizeClass: SIZE_BY_STAGE[stage],
			countFound,
			countAlive: countFound - countLost,
			countLost,
			saleReadyOn,
			listedAt,
			listings
		});
	}

	const springtail = species.find((s) => s.group === 'springtail') ?? null;
	const supplies: BenchListing[] = [];
	for (let lot = 1; supplies.length < opts.supplies; lot++) {
		for (const product of SUPPLY_PRODUCTS) {
			if (supplies.length >= opts.supplies) break;
			const publishedOn = addDays(today, -rng.int(1, spanDays));
			const tiers: PriceTier[] = [{ minQuantity: 1, priceCents: product.priceCents }];
			if (rng.next() < 0.6)
				tiers.push({
					minQuantity: 3,
					priceCents: Math.round((product.priceCents * 3 * 0.85) / 50) * 50
				});
			const live = product.culture === true;
			supplies.push({
				slug: `${product.slug}-lot-${lot}`,
				kind: 'supply',
				speciesId: live && springtail ? springtail.id : null,
				title: `${product.title}, lot ${lot}`,
				description: product.description,
				unitSize: 1,
				sex: 'unsexed',
				isLive: live,
				supplyStock: rng.int(3, 60),
				publishedAt: instantOnDay(rng, publishedOn),
				basePriceCents: basePriceCents(tiers, 1) ?? product.priceCents,
				tiers
			});
		}
	}
	return { clutches, supplies, animalListings };
}

interface SupplyProduct {
	slug: string;
	title: string;
	description: string;
	priceCents: number;
	culture?: boolean;
}

const SUPPLY_PRODUCTS: ReadonlyArray<SupplyProduct> = [
	{
		slug: 'house-substrate-mix-4-quarts',
		title: 'House substrate mix, 4 quarts',
		description:
			'Compost, soaked hardwood pellets and crushed leaves, heat-treated. Moisten before use.',
		priceCents: 1500
	},
	{
		slug: 'house-substrate-mix-12-quarts',
		title: 'House substrate mix, 12 quarts',
		description: 'The house mix by the bag, for a large millipede enclosure.',
		priceCents: 3600
	},
	{
		slug: 'crushed-hardwood-leaf-litter-1-gallon',
		title: 'Crushed hardwood leaf litter, 1 gallon',
		description:
			'Fallen oak and maple leaves, crushed and heat-treated: the staple food of millipedes and isopods.',
		priceCents: 800
	},
	{
		slug: 'whole-oak-leaves-100',
		title: 'Whole oak leaves, 100',
		description: 'Dry, heat-treated whole leaves for the top layer of a tub.',
		priceCents: 700
	},
	{
		slug: 'rotten-hardwood-chunks-2-quarts',
		title: 'Rotten hardwood chunks, 2 quarts',
		description: 'Soft white-rotted hardwood, a food and a hide for millipedes.',
		priceCents: 1200
	},
	{
		slug: 'cork-bark-flat-medium',
		title: 'Cork bark flat, medium',
		description: 'A curved hide that keeps the damp under it.',
		priceCents: 900
	},
	{
		slug: 'cuttlebone-pieces-5',
		title: 'Cuttlebone pieces, 5',
		description: 'A calcium source for isopods and millipedes building new rings.',
		priceCents: 500
	},
	{
		slug: 'sphagnum-moss-1-quart',
		title: 'Sphagnum moss, 1 quart',
		description: 'Long-fibre moss for the damp corner of an isopod tub.',
		priceCents: 800
	},
	{
		slug: 'vented-deli-cups-32-oz-10',
		title: 'Vented deli cups, 32 oz, pack of 10',
		description: 'The cups our clutches grow out in, with pin-hole lids.',
		priceCents: 1100
	},
	{
		slug: 'white-springtail-starter-culture',
		title: 'White springtail (Folsomia candida) starter culture',
		description:
			'A vented box of damp culture with hundreds of springtails. Shipped live, so it waits for safe weather.',
		priceCents: 1200,
		culture: true
	}
];
