// Care profiles of the demo's real species. Values follow common keeping practice:
// low-to-high 70s °F ideal, the 60s and high 80s tolerated.
import type { AnimalGroup, MoistureLevel } from '../src/lib/server/db/schema';

export interface DemoSpecies {
	slug: string;
	scientificName: string;
	commonName: string;
	group: AnimalGroup;
	summary: string;
	tempLowF: number;
	tempIdealLowF: number;
	tempIdealHighF: number;
	tempHighF: number;
	moisture: MoistureLevel;
	substrateNotes: string;
	diet: string;
	adultLengthMm: number;
	handlingNotes: string;
	cautions: string;
	growOutWeeks: number;
	refreshIntervalDays: number;
	tubHoldDays: number;
	/** Code prefix of this species' colonies and clutches, e.g. NAR-01, NAR-C1. */
	codePrefix: string;
}

const MILLIPEDE_CAUTIONS =
	'Releases a defensive fluid that can stain skin and irritate eyes and cuts: keep hands away ' +
	'from your face and wash them after every handling. Molting animals burrow and curl up in a ' +
	'chamber in the substrate; do not dig them up or disturb them, it can kill them.';

const ISOPOD_CAUTIONS =
	'Wash hands after handling and after working in the tub. A molting isopod (one half pale, the ' +
	'other dark) is soft and burrows or hides: leave it alone, disturbing it can kill it.';

const MILLIPEDE_HANDLING =
	'Let it walk onto a flat, open hand; never pull it off the substrate. Handle low, over the tub ' +
	'or a soft surface, as a fall can crack its rings. Wash hands afterwards.';

const NO_HEAT_MAT = 'No heat mat underneath: burrowers dig down to escape heat and cook instead.';

export const DEMO_SPECIES: ReadonlyArray<DemoSpecies> = [
	{
		slug: 'narceus-americanus',
		scientificName: 'Narceus americanus',
		commonName: 'American giant millipede',
		group: 'millipede',
		summary:
			'The big olive-brown millipede of eastern North American woodlands, ringed in rust red. ' +
			'Slow, calm and long-lived; a good first large millipede.',
		tempLowF: 62,
		tempIdealLowF: 70,
		tempIdealHighF: 77,
		tempHighF: 86,
		moisture: 'moist',
		substrateNotes:
			'At least 5 to 6 in of house mix over chunks of rotting hardwood; keep at least half of it ' +
			'at "right" by the squeeze test, with one drier end. ' +
			NO_HEAT_MAT,
		diet:
			'Decaying hardwood leaves and rotten wood as the staple; cucumber, squash or apple now and ' +
			'then; a protein pellet every two weeks; cuttlebone or crushed eggshell for calcium.',
		adultLengthMm: 100,
		handlingNotes: MILLIPEDE_HANDLING,
		cautions: MILLIPEDE_CAUTIONS,
		growOutWeeks: 30,
		refreshIntervalDays: 120,
		tubHoldDays: 49,
		codePrefix: 'NAR'
	},
	{
		slug: 'anadenobolus-monilicornis',
		scientificName: 'Anadenobolus monilicornis',
		commonName: 'Bumblebee millipede',
		group: 'millipede',
		summary:
			'A slim Caribbean millipede, glossy black with yellow rings and red legs. Active, ' +
			'sociable and a steady breeder in a warm, damp tub.',
		tempLowF: 65,
		tempIdealLowF: 72,
		tempIdealHighF: 79,
		tempHighF: 88,
		moisture: 'humid',
		substrateNotes:
			'4 in or more of house mix kept a little damper than for Narceus, with extra crushed ' +
			'leaves on top and pieces of rotten wood to hide under. ' +
			NO_HEAT_MAT,
		diet:
			'Crushed hardwood leaves and rotten wood; soft vegetables and fruit in small amounts; ' +
			'protein every two weeks; calcium always on offer.',
		adultLengthMm: 70,
		handlingNotes:
			'Quick and wriggly: handle low over the tub and let it walk from hand to hand rather ' +
			'than gripping it. Wash hands afterwards.',
		cautions: MILLIPEDE_CAUTIONS,
		growOutWeeks: 22,
		refreshIntervalDays: 120,
		tubHoldDays: 42,
		codePrefix: 'ANA'
	},
	{
		slug: 'orthoporus-ornatus',
		scientificName: 'Orthoporus ornatus',
		commonName: 'Desert millipede',
		group: 'millipede',
		summary:
			'A large banded millipede of the Chihuahuan Desert that surfaces after rain and burrows ' +
			'deep in dry spells. Kept drier than woodland species.',
		tempLowF: 65,
		tempIdealLowF: 73,
		tempIdealHighF: 79,
		tempHighF: 88,
		moisture: 'drier',
		substrateNotes:
			'6 in or more of house mix with a little sand worked in. Let the top dry out; keep the ' +
			'bottom layer and one corner at "right" so it can choose. ' +
			NO_HEAT_MAT,
		diet:
			'Dry and decaying hardwood leaves and rotten wood; a slice of squash or sweet potato now ' +
			'and then; protein every two weeks; calcium always on offer.',
		adultLengthMm: 110,
		handlingNotes: MILLIPEDE_HANDLING,
		cautions: MILLIPEDE_CAUTIONS,
		growOutWeeks: 36,
		refreshIntervalDays: 150,
		tubHoldDays: 56,
		codePrefix: 'ORT'
	},
	{
		slug: 'porcellio-laevis',
		scientificName: 'Porcellio laevis',
		commonName: 'Smooth slater',
		group: 'isopod',
		summary:
			'A large, fast, bold isopod that breeds readily and eats almost anything: a hardy ' +
			'clean-up crew and a good first colony.',
		tempLowF: 62,
		tempIdealLowF: 70,
		tempIdealHighF: 78,
		tempHighF: 88,
		moisture: 'moist',
		substrateNotes:
			'About 3 in of house mix, one half kept at "right" and the other drier; cork bark for ' +
			'cover; plenty of ventilation.',
		diet:
			'Leaf litter as the staple; vegetables; fish flakes or dried shrimp as protein every two ' +
			'weeks; cuttlebone always on offer.',
		adultLengthMm: 18,
		handlingNotes:
			'Move them with a spoon or on a piece of bark rather than with fingers; they are fast ' +
			'climbers. Work low over the tub.',
		cautions: ISOPOD_CAUTIONS,
		growOutWeeks: 10,
		refreshIntervalDays: 90,
		tubHoldDays: 28,
		codePrefix: 'PLA'
	},
	{
		slug: 'armadillidium-vulgare',
		scientificName: 'Armadillidium vulgare',
		commonName: 'Common pill bug',
		group: 'isopod',
		summary:
			'The classic roly-poly that rolls into a ball when disturbed. Tolerates a drier tub than ' +
			'most isopods and breeds steadily.',
		tempLowF: 60,
		tempIdealLowF: 70,
		tempIdealHighF: 77,
		tempHighF: 86,
		moisture: 'moist',
		substrateNotes:
			'About 3 in of house mix with a moist corner under bark and the rest allowed to dry ' +
			'between mistings.',
		diet:
			'Leaf litter, vegetables and a little fish flake as protein; calcium always on offer for ' +
			'their heavy shells.',
		adultLengthMm: 15,
		handlingNotes:
			'Pick up on a spoon or let it walk onto a leaf. A rolled-up pill bug is frightened, not ' +
			'hurt: set it down low and let it unroll.',
		cautions: ISOPOD_CAUTIONS,
		growOutWeeks: 12,
		refreshIntervalDays: 105,
		tubHoldDays: 35,
		codePrefix: 'ARM'
	},
	{
		slug: 'cubaris-murina',
		scientificName: 'Cubaris murina',
		commonName: 'Little sea isopod',
		group: 'isopod',
		summary:
			'A small rolling isopod from warm, humid coasts. Slower to breed than Porcellio, with ' +
			'small broods; likes damp moss and good air flow.',
		tempLowF: 65,
		tempIdealLowF: 72,
		tempIdealHighF: 79,
		tempHighF: 88,
		moisture: 'humid',
		substrateNotes:
			'About 3 in of house mix kept at "right" throughout, damp moss in one corner and cork ' +
			'bark on top; vent the lid so it stays humid without going stale.',
		diet:
			'Leaf litter and rotten wood; a little vegetable; fish flakes as protein every two weeks; ' +
			'calcium always on offer.',
		adultLengthMm: 12,
		handlingNotes:
			'Tiny and easily crushed: move them on a piece of bark or a soft brush, low over the ' +
			'tub, never by pinching.',
		cautions: ISOPOD_CAUTIONS,
		growOutWeeks: 16,
		refreshIntervalDays: 120,
		tubHoldDays: 42,
		codePrefix: 'CUB'
	},
	{
		slug: 'folsomia-candida',
		scientificName: 'Folsomia candida',
		commonName: 'White springtail',
		group: 'springtail',
		summary:
			'Tiny white springtails sold as a live culture. Added to a tub they eat mould and ' +
			'leftovers before either can take hold.',
		tempLowF: 60,
		tempIdealLowF: 70,
		tempIdealHighF: 76,
		tempHighF: 86,
		moisture: 'humid',
		substrateNotes:
			'Cultured on damp house mix or charcoal in a vented box. Never let a culture dry out.',
		diet: 'A few grains of active dry yeast or cooked rice; remove leftovers before they mould.',
		adultLengthMm: 2,
		handlingNotes:
			'Not handled one by one: tip some culture into the tub, or lift a piece of charcoal with ' +
			'springtails on it.',
		cautions:
			'Wash hands after culture care. A dried-out culture can die within a day, so keep the ' +
			'box damp in transit and on arrival.',
		growOutWeeks: 4,
		refreshIntervalDays: 90,
		tubHoldDays: 28,
		codePrefix: 'FOL'
	}
];

export interface DemoRecipePart {
	ingredient: string;
	numerator: number;
	denominator: number;
}

export const HOUSE_MIX = {
	name: 'House mix',
	notes:
		'Heat-treat the compost and the leaves before use: about 200 °F (93 °C) for about 30 ' +
		'minutes in the oven, to kill mites and gnat larvae. Fire and burn risk: use an oven-safe ' +
		'tray, stay in the kitchen while it heats, and let it cool completely before mixing. Soak the ' +
		'hardwood pellets separately until they fall apart, then mix everything to "right" by the ' +
		'squeeze test.',
	parts: [
		{ ingredient: 'Compost or organic soil', numerator: 1, denominator: 1 },
		{ ingredient: 'Hardwood pellets, soaked', numerator: 1, denominator: 1 },
		{ ingredient: 'Crushed fallen hardwood leaves', numerator: 1, denominator: 3 },
		// "A little calcium": 1/20 part is this demo's own choice of amount, not a rule.
		{ ingredient: 'Calcium (crushed cuttlebone or eggshell)', numerator: 1, denominator: 20 }
	] satisfies DemoRecipePart[]
} as const;
