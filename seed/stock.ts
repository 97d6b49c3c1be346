// The demo's living stock: colonies with a year of care log, the resting tubs their
// old substrate went into, and the clutches those tubs yielded. Pure: every date is
// laid out from `today`, and the only variety comes from the seeded PRNG.
import type {
	CareEntryKind,
	ClutchEventKind,
	ClutchOrigin,
	ClutchStage,
	ClutchState,
	MoistureReading,
	SizeClass,
	TubState
} from '../src/lib/server/db/schema';
import { addDays, daysBetween, instantOn } from './dates';
import { demoRandom } from './random';
import { DEMO_SPECIES, type DemoSpecies } from './species';

export const WREN = 'wren@mossback.example.com';
export const TEO = 'teo@mossback.example.com';

export interface DemoColony {
	code: string;
	speciesSlug: string;
	name: string;
	lengthIn: string;
	widthIn: string;
	depthIn: string;
	foundersCount: number;
	foundersNote: string;
	generation: number;
	startedOn: string;
	retiredOn: string | null;
	notes: string;
	createdAt: string;
}

export interface DemoCareEntry {
	colonyCode: string;
	kind: CareEntryKind;
	loggedOn: string;
	moistureReading: MoistureReading | null;
	censusCount: number | null;
	note: string;
	byEmail: string;
	at: string;
}

export interface DemoTubCheck {
	checkedOn: string;
	youngFound: number;
	eggsSeen: boolean;
	note: string;
	byEmail: string;
	at: string;
}

export interface DemoTub {
	code: string;
	colonyCode: string;
	/** The refresh entry it came from: the colony's substrate refresh on this day. */
	sourceRefreshOn: string;
	startedOn: string;
	holdUntil: string;
	state: TubState;
	closedOn: string | null;
	note: string;
	checks: DemoTubCheck[];
	createdAt: string;
}

export interface DemoClutchEvent {
	kind: ClutchEventKind;
	fromValue: string | null;
	toValue: string | null;
	countDelta: number;
	reason: string;
	happenedOn: string;
	byEmail: string;
	at: string;
}

export interface DemoClutch {
	code: string;
	speciesSlug: string;
	tubCode: string | null;
	origin: ClutchOrigin;
	generation: number;
	foundOn: string;
	stage: ClutchStage;
	sizeClass: SizeClass;
	countFound: number;
	countAlive: number;
	countLost: number;
	state: ClutchState;
	pausedReason: 'molting' | 'unwell' | null;
	saleReadyOn: string;
	/** When its listing went live (listed and sold-out clutches). */
	listedOn: string | null;
	note: string;
	events: DemoClutchEvent[];
	/** Stage changes in order, starting with the stage it was found at. */
	stages: Array<{ on: string; stage: ClutchStage }>;
	createdAt: string;
}

export interface DemoStock {
	colonies: DemoColony[];
	careLog: DemoCareEntry[];
	tubs: DemoTub[];
	clutches: DemoClutch[];
}

// ---------------------------------------------------------------- colony plans

interface ColonyPlan {
	code: string;
	speciesSlug: string;
	name: string;
	size: [length: string, width: string, depth: string];
	foundersCount: number;
	foundersNote: string;
	generation: number;
	startedDaysAgo: number;
	retiredDaysAgo?: number;
	notes: string;
	refreshes: Array<{ daysAgo: number; full?: boolean; note: string }>;
	/** Days before the colony's last day (today, or its retirement) of the latest moisture check. */
	lastMoistureDaysAgo: number;
	molts: Array<{ daysAgo: number; note: string }>;
	pests: Array<{ daysAgo: number; note: string }>;
	census: { first: number; perCheck: number } | null;
}

const COLONY_PLANS: ReadonlyArray<ColonyPlan> = [
	{
		code: 'NAR-01',
		speciesSlug: 'narceus-americanus',
		name: 'Narceus breeding bin A',
		size: ['24.0', '16.0', '8.0'],
		foundersCount: 12,
		foundersNote: 'Twelve captive-bred adults from another keeper, sexes mixed.',
		generation: 1,
		startedDaysAgo: 490,
		notes: 'The first colony of the shop. Rotten oak chunks under the substrate, cork on top.',
		refreshes: [
			{ daysAgo: 251, note: 'Half the substrate out to a resting tub; fresh house mix in.' },
			{
				daysAgo: 130,
				full: true,
				note: 'Full change: the bottom layer had gone sour. All of it to a resting tub.'
			},
			{ daysAgo: 12, note: 'Half out to a resting tub; topped up with house mix and leaves.' }
		],
		lastMoistureDaysAgo: 2,
		molts: [{ daysAgo: 160, note: 'Molt chamber against the side wall; left undisturbed.' }],
		pests: [],
		census: { first: 12, perCheck: 1 }
	},
	{
		code: 'NAR-02',
		speciesSlug: 'narceus-americanus',
		name: 'Narceus breeding bin B',
		size: ['18.0', '12.0', '7.0'],
		foundersCount: 8,
		foundersNote: 'Eight sub-adults raised from an early NAR-01 tub.',
		generation: 2,
		startedDaysAgo: 245,
		notes: 'Kept on the lower shelf, where the room runs a few degrees cooler.',
		refreshes: [
			{ daysAgo: 125, note: 'Half the substrate out to a resting tub; fresh house mix in.' },
			{ daysAgo: 5, note: 'Half out to a resting tub; fresh house mix in.' }
		],
		lastMoistureDaysAgo: 11,
		molts: [{ daysAgo: 70, note: 'One adult curled in a chamber at the bottom; not dug.' }],
		pests: [
			{
				daysAgo: 40,
				note: 'Fungus gnats at the lid. Let the top inch dry and set a yellow sticky trap.'
			}
		],
		census: { first: 8, perCheck: 0 }
	},
	{
		code: 'ANA-01',
		speciesSlug: 'anadenobolus-monilicornis',
		name: 'Bumblebee tub',
		size: ['16.0', '11.0', '5.0'],
		foundersCount: 20,
		foundersNote: 'Twenty captive-bred F2 adults.',
		generation: 2,
		startedDaysAgo: 430,
		notes: 'Warmest shelf in the room. Extra crushed leaves on top.',
		refreshes: [
			{ daysAgo: 350, note: 'Half the substrate out to a resting tub; fresh house mix in.' },
			{ daysAgo: 232, note: 'Half out to a resting tub; fresh house mix in.' },
			{
				daysAgo: 113,
				full: true,
				note: 'Full change after a mould bloom; springtails added to the new mix.'
			}
		],
		lastMoistureDaysAgo: 1,
		molts: [
			{ daysAgo: 95, note: 'Several young in molt chambers along the bottom; left alone.' },
			{
				daysAgo: 6,
				note: 'Two adults coiled in molt chambers at the bottom. Quiet period: no digging until they resurface.'
			}
		],
		pests: [],
		census: { first: 24, perCheck: 6 }
	},
	{
		code: 'ORT-01',
		speciesSlug: 'orthoporus-ornatus',
		name: 'Desert millipede tank',
		size: ['22.0', '14.0', '8.0'],
		foundersCount: 6,
		foundersNote: 'Six captive-bred F1 adults from another keeper.',
		generation: 1,
		startedDaysAgo: 470,
		notes: 'Top kept dry, one corner and the bottom layer kept at "right".',
		refreshes: [
			{ daysAgo: 320, note: 'Half the substrate out to a resting tub; fresh mix with sand in.' },
			{ daysAgo: 170, note: 'Half out to a resting tub; fresh mix with sand in.' }
		],
		lastMoistureDaysAgo: 3,
		molts: [{ daysAgo: 200, note: 'Adult gone down into a molt chamber; corner left alone.' }],
		pests: [],
		census: { first: 6, perCheck: 1 }
	},
	{
		code: 'PLA-01',
		speciesSlug: 'porcellio-laevis',
		name: 'Smooth slater bin 1',
		size: ['16.0', '11.0', '3.0'],
		foundersCount: 40,
		foundersNote: 'Forty adults split from an F2 group.',
		generation: 3,
		startedDaysAgo: 540,
		notes: 'Busy colony; cork bark stack at the dry end.',
		refreshes: [
			{ daysAgo: 355, note: 'Half the substrate out to a resting tub; fresh house mix in.' },
			{
				daysAgo: 265,
				full: true,
				note: 'Full change after grain mites; all of the old substrate to a resting tub.'
			},
			{ daysAgo: 178, note: 'Half out to a resting tub; fresh house mix in.' },
			{ daysAgo: 88, note: 'Half out to a resting tub; fresh house mix in.' }
		],
		lastMoistureDaysAgo: 4,
		molts: [
			{ daysAgo: 45, note: 'Many half-molted (pale back halves); food kept away from them.' }
		],
		pests: [
			{
				daysAgo: 270,
				note: 'Grain mites on leftover fish flakes. Removed the food and let the top layer dry.'
			}
		],
		census: { first: 150, perCheck: 25 }
	},
	{
		code: 'PLA-02',
		speciesSlug: 'porcellio-laevis',
		name: 'Smooth slater bin 2',
		size: ['16.0', '11.0', '3.0'],
		foundersCount: 30,
		foundersNote: 'Thirty sub-adults held back from an earlier PLA-01 brood.',
		generation: 4,
		startedDaysAgo: 200,
		notes: '',
		refreshes: [
			{ daysAgo: 110, note: 'Half the substrate out to a resting tub; fresh house mix in.' },
			{ daysAgo: 28, note: 'Half out to a resting tub; fresh house mix in.' }
		],
		lastMoistureDaysAgo: 2,
		molts: [],
		pests: [],
		census: { first: 30, perCheck: 20 }
	},
	{
		code: 'ARM-01',
		speciesSlug: 'armadillidium-vulgare',
		name: 'Pill bug bin',
		size: ['14.0', '9.0', '3.0'],
		foundersCount: 30,
		foundersNote: 'Thirty captive-bred F2 adults.',
		generation: 2,
		startedDaysAgo: 330,
		notes: 'Took in the cleanest twenty adults of ARM-02 after they were held apart for a month.',
		refreshes: [
			{ daysAgo: 260, note: 'Half the substrate out to a resting tub; fresh house mix in.' },
			{
				daysAgo: 155,
				full: true,
				note: 'Full change to start clean before the ARM-02 adults came in.'
			},
			{ daysAgo: 50, note: 'Half out to a resting tub; fresh house mix in.' }
		],
		lastMoistureDaysAgo: 5,
		molts: [],
		pests: [],
		census: { first: 40, perCheck: 15 }
	},
	{
		code: 'ARM-02',
		speciesSlug: 'armadillidium-vulgare',
		name: 'Pill bug bin (old)',
		size: ['14.0', '9.0', '3.0'],
		foundersCount: 25,
		foundersNote: 'Twenty-five F1 adults.',
		generation: 1,
		startedDaysAgo: 520,
		retiredDaysAgo: 75,
		notes:
			'Retired: mites kept coming back. The cleanest twenty adults were held apart for a month, then moved into ARM-01.',
		refreshes: [
			{ daysAgo: 300, note: 'Half the substrate out to a resting tub; fresh house mix in.' },
			{
				daysAgo: 190,
				full: true,
				note: 'Full change: mites throughout. Old substrate to a resting tub, kept apart.'
			}
		],
		lastMoistureDaysAgo: 2,
		molts: [],
		pests: [
			{ daysAgo: 200, note: 'Mites on the bark and the cuttlebone; bark baked, food cut back.' },
			{ daysAgo: 95, note: 'Mites back on the food dish within two weeks of the full change.' }
		],
		census: { first: 60, perCheck: -8 }
	},
	{
		code: 'CUB-01',
		speciesSlug: 'cubaris-murina',
		name: 'Cubaris tub',
		size: ['12.0', '8.0', '3.0'],
		foundersCount: 16,
		foundersNote: 'Sixteen captive-bred F1 adults.',
		generation: 1,
		startedDaysAgo: 300,
		notes: 'Damp moss in one corner; lid vented on two sides.',
		refreshes: [
			{ daysAgo: 185, note: 'Half the substrate out to a resting tub; fresh house mix in.' },
			{ daysAgo: 45, note: 'Half out to a resting tub; fresh house mix and moss in.' }
		],
		lastMoistureDaysAgo: 1,
		molts: [{ daysAgo: 70, note: 'A few half-molted under the moss; left alone.' }],
		pests: [],
		census: { first: 16, perCheck: 6 }
	},
	{
		code: 'FOL-01',
		speciesSlug: 'folsomia-candida',
		name: 'Springtail cultures',
		size: ['12.0', '8.0', '2.0'],
		foundersCount: 0,
		foundersNote: 'Started from a bought culture; split into new boxes every few months.',
		generation: 1,
		startedDaysAgo: 260,
		notes: 'The source of the starter cultures on sale and of the clean-up crew in every tub.',
		refreshes: [
			{ daysAgo: 190, note: 'Old culture medium used to seed two new boxes; fresh mix in.' },
			{ daysAgo: 100, note: 'Old culture medium used to seed three new boxes; fresh mix in.' },
			{ daysAgo: 10, note: 'Old culture medium used to seed two new boxes; fresh mix in.' }
		],
		lastMoistureDaysAgo: 3,
		molts: [],
		pests: [],
		census: null
	}
];

// ---------------------------------------------------------------- tub plans

interface TubPlan {
	code: string;
	colonyCode: string;
	/** Days ago of the colony refresh the substrate came from. */
	refreshDaysAgo: number;
	state: TubState;
	note: string;
	/** [days ago, young found, eggs seen, note]; a closed tub closes on its last check. */
	checks: Array<[number, number, boolean, string]>;
}

const TUB_PLANS: ReadonlyArray<TubPlan> = [
	{
		code: 'NAR-01-T1',
		colonyCode: 'NAR-01',
		refreshDaysAgo: 251,
		state: 'yielded',
		note: 'Kept damp and dark on the bottom shelf.',
		checks: [
			[238, 0, true, 'Egg capsules in the lower layer; left covered.'],
			[225, 38, false, ''],
			[202, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'NAR-01-T2',
		colonyCode: 'NAR-01',
		refreshDaysAgo: 130,
		state: 'yielded',
		note: 'All of the old substrate from the full change.',
		checks: [
			[115, 0, false, 'Nothing yet.'],
			[101, 22, false, ''],
			[81, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'NAR-01-T3',
		colonyCode: 'NAR-01',
		refreshDaysAgo: 12,
		state: 'resting',
		note: '',
		checks: [[5, 0, true, 'A few egg capsules seen; covered again.']]
	},
	{
		code: 'NAR-02-T1',
		colonyCode: 'NAR-02',
		refreshDaysAgo: 125,
		state: 'cleared',
		note: 'Nothing came of it; substrate went on the garden.',
		checks: [
			[104, 0, false, 'Nothing yet.'],
			[90, 0, false, 'Nothing yet.'],
			[76, 0, false, 'Hold over; nothing found.']
		]
	},
	{
		code: 'NAR-02-T2',
		colonyCode: 'NAR-02',
		refreshDaysAgo: 5,
		state: 'resting',
		note: '',
		checks: []
	},
	{
		code: 'ANA-01-T1',
		colonyCode: 'ANA-01',
		refreshDaysAgo: 350,
		state: 'yielded',
		note: '',
		checks: [
			[336, 0, true, 'Eggs in the lower layer.'],
			[322, 60, false, ''],
			[308, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'ANA-01-T2',
		colonyCode: 'ANA-01',
		refreshDaysAgo: 232,
		state: 'yielded',
		note: '',
		checks: [
			[218, 0, false, 'Nothing yet.'],
			[205, 45, false, ''],
			[190, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'ANA-01-T3',
		colonyCode: 'ANA-01',
		refreshDaysAgo: 113,
		state: 'yielded',
		note: 'From the full change after the mould bloom; springtails added.',
		checks: [
			[99, 0, false, 'Nothing yet; mould gone.'],
			[86, 30, false, ''],
			[71, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'ORT-01-T1',
		colonyCode: 'ORT-01',
		refreshDaysAgo: 320,
		state: 'cleared',
		note: '',
		checks: [
			[300, 0, false, 'Nothing yet.'],
			[285, 0, false, 'Nothing yet.'],
			[264, 0, false, 'Hold over; nothing found.']
		]
	},
	{
		code: 'ORT-01-T2',
		colonyCode: 'ORT-01',
		refreshDaysAgo: 170,
		state: 'yielded',
		note: 'Bottom layer kept at "right", top left drier.',
		checks: [
			[150, 0, true, 'Eggs in the moist bottom layer.'],
			[134, 18, false, ''],
			[114, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'PLA-01-T1',
		colonyCode: 'PLA-01',
		refreshDaysAgo: 355,
		state: 'yielded',
		note: '',
		checks: [
			[341, 120, false, ''],
			[327, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'PLA-01-T2',
		colonyCode: 'PLA-01',
		refreshDaysAgo: 265,
		state: 'cleared',
		note: 'Mite-season substrate: kept apart from every other tub.',
		checks: [
			[251, 0, false, 'Nothing yet; a few mites.'],
			[237, 0, false, 'Hold over; nothing found.']
		]
	},
	{
		code: 'PLA-01-T3',
		colonyCode: 'PLA-01',
		refreshDaysAgo: 178,
		state: 'yielded',
		note: '',
		checks: [
			[164, 85, false, ''],
			[150, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'PLA-01-T4',
		colonyCode: 'PLA-01',
		refreshDaysAgo: 88,
		state: 'cleared',
		note: 'The colony had just been thinned; no mancae this round.',
		checks: [
			[74, 0, false, 'Nothing yet.'],
			[60, 0, false, 'Hold over; nothing found.']
		]
	},
	{
		code: 'PLA-02-T1',
		colonyCode: 'PLA-02',
		refreshDaysAgo: 110,
		state: 'yielded',
		note: '',
		checks: [
			[97, 75, false, ''],
			[82, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'PLA-02-T2',
		colonyCode: 'PLA-02',
		refreshDaysAgo: 28,
		state: 'resting',
		note: 'Hold ends today: give it a last look.',
		checks: [
			[19, 0, false, 'Nothing yet.'],
			[9, 0, false, 'Nothing yet; gravid females seen in the colony.']
		]
	},
	{
		code: 'ARM-01-T1',
		colonyCode: 'ARM-01',
		refreshDaysAgo: 260,
		state: 'yielded',
		note: '',
		checks: [
			[246, 0, false, 'Nothing yet.'],
			[240, 70, false, ''],
			[225, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'ARM-01-T2',
		colonyCode: 'ARM-01',
		refreshDaysAgo: 155,
		state: 'cleared',
		note: '',
		checks: [
			[141, 0, false, 'Nothing yet.'],
			[127, 0, false, 'Nothing yet.'],
			[120, 0, false, 'Hold over; nothing found.']
		]
	},
	{
		code: 'ARM-01-T3',
		colonyCode: 'ARM-01',
		refreshDaysAgo: 50,
		state: 'yielded',
		note: '',
		checks: [
			[36, 0, false, 'Nothing yet.'],
			[22, 40, false, ''],
			[15, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'ARM-02-T1',
		colonyCode: 'ARM-02',
		refreshDaysAgo: 300,
		state: 'cleared',
		note: '',
		checks: [
			[280, 0, false, 'Nothing yet.'],
			[265, 0, false, 'Hold over; nothing found.']
		]
	},
	{
		code: 'ARM-02-T2',
		colonyCode: 'ARM-02',
		refreshDaysAgo: 190,
		state: 'cleared',
		note: 'Mite-ridden substrate, kept apart and bagged after the hold.',
		checks: [
			[175, 0, false, 'Nothing; mites.'],
			[155, 0, false, 'Hold over; nothing found. Bagged and thrown out.']
		]
	},
	{
		code: 'CUB-01-T1',
		colonyCode: 'CUB-01',
		refreshDaysAgo: 185,
		state: 'yielded',
		note: '',
		checks: [
			[171, 0, false, 'Nothing yet.'],
			[160, 24, false, ''],
			[143, 0, false, 'Hold over; nothing more found.']
		]
	},
	{
		code: 'CUB-01-T2',
		colonyCode: 'CUB-01',
		refreshDaysAgo: 45,
		state: 'resting',
		note: '',
		checks: [
			[31, 0, false, 'Nothing yet.'],
			[17, 0, false, 'Nothing yet.'],
			[9, 0, false, 'Nothing yet; moss kept damp.']
		]
	}
];

// ---------------------------------------------------------------- clutch plans

interface ClutchPlan {
	code: string;
	/** Tub-born clutches take species, generation, found date and count from the tub. */
	tubCode?: string;
	boughtIn?: {
		speciesSlug: string;
		generation: number;
		foundDaysAgo: number;
		count: number;
		stage: ClutchStage;
	};
	stage: ClutchStage;
	state: ClutchState;
	pause?: { reason: 'molting' | 'unwell'; daysAgo: number; note: string };
	listedDaysAgo?: number;
	soldOutDaysAgo?: number;
	losses: Array<[daysAgo: number, count: number, reason: string]>;
	note: string;
}

const CLUTCH_PLANS: ReadonlyArray<ClutchPlan> = [
	{
		code: 'NAR-C1',
		tubCode: 'NAR-01-T1',
		stage: 'juvenile',
		state: 'listed',
		listedDaysAgo: 14,
		losses: [
			[200, 2, 'Found dead at a count; cause unknown.'],
			[120, 2, 'Failed molts.']
		],
		note: 'Grow-out tub on the middle shelf.'
	},
	{
		code: 'NAR-C2',
		tubCode: 'NAR-01-T2',
		stage: 'juvenile',
		state: 'growing',
		losses: [[60, 1, 'Failed molt.']],
		note: ''
	},
	{
		code: 'ANA-C1',
		tubCode: 'ANA-01-T1',
		stage: 'sub_adult',
		state: 'sold_out',
		listedDaysAgo: 167,
		soldOutDaysAgo: 90,
		losses: [
			[300, 6, 'Lost while tiny; the grow-out tub had dried out at one end.'],
			[240, 4, 'Failed molts.']
		],
		note: ''
	},
	{
		code: 'ANA-C2',
		tubCode: 'ANA-01-T2',
		stage: 'sub_adult',
		state: 'listed',
		listedDaysAgo: 50,
		losses: [
			[170, 3, 'Lost while tiny; cause unknown.'],
			[110, 1, 'Failed molt.']
		],
		note: ''
	},
	{
		code: 'ANA-C3',
		tubCode: 'ANA-01-T3',
		stage: 'juvenile',
		state: 'paused',
		pause: {
			reason: 'molting',
			daysAgo: 8,
			note: 'Most of them down in molt chambers: not to be dug or sold until they resurface.'
		},
		losses: [[60, 2, 'Failed molts.']],
		note: ''
	},
	{
		code: 'ORT-C1',
		tubCode: 'ORT-01-T2',
		stage: 'juvenile',
		state: 'growing',
		losses: [[100, 1, 'Found dead on the dry surface.']],
		note: 'Slow growers; first of this species to be raised here.'
	},
	{
		code: 'PLA-C1',
		tubCode: 'PLA-01-T1',
		stage: 'adult',
		state: 'sold_out',
		listedDaysAgo: 270,
		soldOutDaysAgo: 120,
		losses: [
			[320, 12, 'Lost as mancae; normal for a big brood.'],
			[280, 8, 'Lost in the grain-mite weeks.']
		],
		note: ''
	},
	{
		code: 'PLA-C2',
		tubCode: 'PLA-01-T3',
		stage: 'sub_adult',
		state: 'listed',
		listedDaysAgo: 93,
		losses: [[140, 5, 'Lost as mancae.']],
		note: 'Big enough to sex; pairs picked out on request.'
	},
	{
		code: 'PLA-C3',
		tubCode: 'PLA-02-T1',
		stage: 'juvenile',
		state: 'ready',
		losses: [[80, 3, 'Lost as mancae.']],
		note: 'Sale size; listing drafted, photos still to take.'
	},
	{
		code: 'ARM-C1',
		tubCode: 'ARM-01-T1',
		stage: 'adult',
		state: 'listed',
		listedDaysAgo: 155,
		losses: [[215, 4, 'Lost while tiny; cause unknown.']],
		note: ''
	},
	{
		code: 'ARM-C2',
		tubCode: 'ARM-01-T3',
		stage: 'hatchling',
		state: 'growing',
		losses: [],
		note: 'Still white; kept on damp moss.'
	},
	{
		code: 'CUB-C1',
		tubCode: 'CUB-01-T1',
		stage: 'sub_adult',
		state: 'listed',
		listedDaysAgo: 47,
		losses: [[130, 2, 'Lost while tiny; cause unknown.']],
		note: ''
	},
	{
		code: 'CUB-C2',
		boughtIn: {
			speciesSlug: 'cubaris-murina',
			generation: 2,
			foundDaysAgo: 30,
			count: 15,
			stage: 'juvenile'
		},
		stage: 'juvenile',
		state: 'growing',
		losses: [[29, 1, 'Dead on arrival from the seller.']],
		note: 'Bought in from a fellow breeder; kept apart from CUB-01.'
	}
];

// ---------------------------------------------------------------- builders

const STAGE_ORDER: readonly ClutchStage[] = ['hatchling', 'juvenile', 'sub_adult', 'adult'];
const STAGE_SIZE: Readonly<Record<ClutchStage, SizeClass>> = {
	hatchling: 'tiny',
	juvenile: 'small',
	sub_adult: 'medium',
	adult: 'large'
};
/** When each stage begins, as a share of the species' grow-out to sale size. */
const STAGE_AT_GROW_OUT_SHARE: Readonly<Record<ClutchStage, number>> = {
	hatchling: 0,
	juvenile: 0.2,
	sub_adult: 0.7,
	adult: 1.3
};

export function speciesBySlug(slug: string): DemoSpecies {
	const species = DEMO_SPECIES.find((s) => s.slug === slug);
	if (!species) throw new Error(`demo plan names unknown species ${slug}`);
	return species;
}

function careTime(kind: CareEntryKind): string {
	// Morning rounds for checks, afternoon for feeding and the bigger jobs (UTC; shop is New York).
	switch (kind) {
		case 'moisture_check':
		case 'census':
		case 'molt_seen':
		case 'pest_note':
			return '14:10';
		case 'protein':
		case 'calcium':
		case 'leaf_top_up':
			return '19:40';
		default:
			return '17:20';
	}
}

function buildColonyLog(plan: ColonyPlan, species: DemoSpecies, today: string): DemoCareEntry[] {
	const rng = demoRandom(`care:${plan.code}`);
	const startedOn = addDays(today, -plan.startedDaysAgo);
	const lastDay = plan.retiredDaysAgo === undefined ? today : addDays(today, -plan.retiredDaysAgo);
	const yearAgo = addDays(today, -365);
	const firstDay = daysBetween(startedOn, yearAgo) > 0 ? yearAgo : startedOn;
	const entries: DemoCareEntry[] = [];
	const inWindow = (day: string) =>
		daysBetween(firstDay, day) >= 0 && daysBetween(day, lastDay) >= 0;
	const add = (
		kind: CareEntryKind,
		day: string,
		note: string,
		extra: { moisture?: MoistureReading; census?: number; by?: string } = {}
	) => {
		if (!inWindow(day))
			throw new Error(`${plan.code}: ${kind} on ${day} is outside its log window`);
		entries.push({
			colonyCode: plan.code,
			kind,
			loggedOn: day,
			moistureReading: extra.moisture ?? null,
			censusCount: extra.census ?? null,
			note,
			byEmail: extra.by ?? (rng.next() < 0.65 ? TEO : WREN),
			// Today's rounds are stamped early, so nothing looks logged later than the seed ran.
			at: instantOn(day, day === today ? '12:30' : careTime(kind))
		});
	};

	for (const refresh of plan.refreshes) {
		const day = addDays(today, -refresh.daysAgo);
		add(refresh.full ? 'substrate_refresh_full' : 'substrate_refresh_half', day, refresh.note, {
			by: WREN
		});
	}

	// Moisture checks roughly weekly, walking back from the latest one.
	const dryNotes = [
		'Dry feel at the squeeze test; misted the moist end.',
		'Top dry; watered one corner.'
	];
	const wetNotes = [
		'Drops of water at the squeeze test; lid vents opened for a day.',
		'Too wet along the bottom; added dry leaves.'
	];
	for (
		let day = addDays(lastDay, -plan.lastMoistureDaysAgo), first = true;
		inWindow(day);
		day = addDays(day, -rng.int(6, 8)), first = false
	) {
		const roll = rng.next();
		// The latest check reads "right" so the demo's warnings come only from the planned gaps.
		const reading: MoistureReading = first || roll < 0.8 ? 'right' : roll < 0.91 ? 'dry' : 'wet';
		const note =
			reading === 'dry' ? rng.pick(dryNotes) : reading === 'wet' ? rng.pick(wetNotes) : '';
		add('moisture_check', day, note, { moisture: reading });
	}

	const springtails = species.group === 'springtail';
	const proteinNote =
		species.group === 'millipede'
			? 'Protein pellet; leftovers removed after two days.'
			: species.group === 'isopod'
				? 'A pinch of fish flakes.'
				: 'A few grains of active dry yeast.';
	const every = (
		kind: CareEntryKind,
		firstGap: [number, number],
		gap: [number, number],
		note: string
	) => {
		for (
			let day = addDays(firstDay, rng.int(...firstGap));
			daysBetween(day, lastDay) >= 0;
			day = addDays(day, rng.int(...gap))
		) {
			add(kind, day, note);
		}
	};
	every('protein', [2, 9], [12, 16], proteinNote);
	if (!springtails) {
		every('calcium', [6, 13], [12, 16], 'Fresh cuttlebone pieces.');
		every('leaf_top_up', [10, 20], [25, 35], 'Crushed oak and maple leaves on top.');
	}

	if (plan.census) {
		const { first, perCheck } = plan.census;
		let index = 0;
		for (
			let day = addDays(firstDay, rng.int(15, 30));
			daysBetween(day, lastDay) >= 0;
			day = addDays(day, rng.int(80, 100)), index++
		) {
			const count = Math.max(1, first + perCheck * index + rng.int(-1, 1) * Math.ceil(first / 20));
			const note =
				species.group === 'millipede'
					? 'Adults counted at the surface at night; young not counted.'
					: 'Estimate from a count under the bark.';
			add('census', day, note, { census: count });
		}
	}

	for (const molt of plan.molts) add('molt_seen', addDays(today, -molt.daysAgo), molt.note);
	for (const pest of plan.pests) add('pest_note', addDays(today, -pest.daysAgo), pest.note);

	return entries.sort((a, b) => a.at.localeCompare(b.at) || a.kind.localeCompare(b.kind));
}

function buildClutch(
	plan: ClutchPlan,
	today: string,
	tubs: ReadonlyMap<string, DemoTub>,
	colonies: ReadonlyMap<string, DemoColony>
): DemoClutch {
	let speciesSlug: string;
	let generation: number;
	let foundOn: string;
	let countFound: number;
	let firstStage: ClutchStage;
	let foundReason: string;
	let origin: ClutchOrigin;
	if (plan.tubCode) {
		const tub = tubs.get(plan.tubCode);
		if (!tub || tub.state !== 'yielded')
			throw new Error(`${plan.code}: ${plan.tubCode} is no yielded tub`);
		const colony = colonies.get(tub.colonyCode);
		const found = tub.checks.filter((c) => c.youngFound > 0);
		if (!colony || found.length !== 1 || !found[0]) {
			throw new Error(`${plan.code}: ${plan.tubCode} must have exactly one check that found young`);
		}
		speciesSlug = colony.speciesSlug;
		generation = colony.generation + 1;
		foundOn = found[0].checkedOn;
		countFound = found[0].youngFound;
		firstStage = 'hatchling';
		foundReason = `Found in resting tub ${tub.code}.`;
		origin = 'tub';
	} else if (plan.boughtIn) {
		speciesSlug = plan.boughtIn.speciesSlug;
		generation = plan.boughtIn.generation;
		foundOn = addDays(today, -plan.boughtIn.foundDaysAgo);
		countFound = plan.boughtIn.count;
		firstStage = plan.boughtIn.stage;
		foundReason = 'Arrived from another captive breeder.';
		origin = 'bought_in';
	} else {
		throw new Error(`${plan.code}: a clutch comes from a tub or is bought in`);
	}

	const species = speciesBySlug(speciesSlug);
	const growOutDays = species.growOutWeeks * 7;
	const saleReadyOn = addDays(foundOn, growOutDays);
	const events: DemoClutchEvent[] = [];
	const event = (e: Omit<DemoClutchEvent, 'at' | 'byEmail'> & { byEmail?: string }, time: string) =>
		events.push({ byEmail: TEO, ...e, at: instantOn(e.happenedOn, time) });

	event(
		{
			kind: 'found',
			fromValue: null,
			toValue: firstStage,
			countDelta: countFound,
			reason: foundReason,
			happenedOn: foundOn
		},
		'15:00'
	);

	const stages: Array<{ on: string; stage: ClutchStage }> = [{ on: foundOn, stage: firstStage }];
	const from = STAGE_ORDER.indexOf(firstStage);
	const to = STAGE_ORDER.indexOf(plan.stage);
	if (to < from) throw new Error(`${plan.code}: stage ${plan.stage} comes before ${firstStage}`);
	for (let i = from + 1; i <= to; i++) {
		const previous = STAGE_ORDER[i - 1] as ClutchStage;
		const stage = STAGE_ORDER[i] as ClutchStage;
		const on = addDays(foundOn, Math.round(growOutDays * STAGE_AT_GROW_OUT_SHARE[stage]));
		if (daysBetween(on, today) < 0) throw new Error(`${plan.code}: reaches ${stage} after today`);
		stages.push({ on, stage });
		const stageChange = { countDelta: 0, reason: '', happenedOn: on };
		event({ kind: 'stage', fromValue: previous, toValue: stage, ...stageChange }, '15:30');
		event(
			{
				kind: 'size_class',
				fromValue: STAGE_SIZE[previous],
				toValue: STAGE_SIZE[stage],
				...stageChange
			},
			'15:31'
		);
	}

	let countLost = 0;
	for (const [daysAgo, count, reason] of plan.losses) {
		const on = addDays(today, -daysAgo);
		if (daysBetween(foundOn, on) < 0) throw new Error(`${plan.code}: a loss before it was found`);
		countLost += count;
		event(
			{ kind: 'loss', fromValue: null, toValue: null, countDelta: -count, reason, happenedOn: on },
			'16:00'
		);
	}

	const reachedReady =
		plan.state === 'ready' || plan.state === 'listed' || plan.state === 'sold_out';
	if (reachedReady !== daysBetween(saleReadyOn, today) >= 0) {
		throw new Error(
			`${plan.code}: state ${plan.state} does not fit sale-ready date ${saleReadyOn}`
		);
	}
	if (reachedReady) {
		event(
			{
				kind: 'state',
				fromValue: 'growing',
				toValue: 'ready',
				countDelta: 0,
				reason: '',
				happenedOn: saleReadyOn
			},
			'13:00'
		);
	}
	let listedOn: string | null = null;
	if (plan.listedDaysAgo !== undefined) {
		listedOn = addDays(today, -plan.listedDaysAgo);
		if (daysBetween(saleReadyOn, listedOn) < 0)
			throw new Error(`${plan.code}: listed before sale-ready`);
		event(
			{
				kind: 'state',
				fromValue: 'ready',
				toValue: 'listed',
				countDelta: 0,
				reason: '',
				happenedOn: listedOn,
				byEmail: WREN
			},
			'13:30'
		);
	}
	if (plan.soldOutDaysAgo !== undefined) {
		event(
			{
				kind: 'state',
				fromValue: 'listed',
				toValue: 'sold_out',
				countDelta: 0,
				reason: 'Last of them sold.',
				happenedOn: addDays(today, -plan.soldOutDaysAgo)
			},
			'23:00'
		);
	}
	if ((plan.state === 'paused') !== (plan.pause !== undefined)) {
		throw new Error(`${plan.code}: a paused clutch needs a pause, and only a paused one`);
	}
	if (plan.pause) {
		event(
			{
				kind: 'pause',
				fromValue: 'growing',
				toValue: plan.pause.reason,
				countDelta: 0,
				reason: plan.pause.note,
				happenedOn: addDays(today, -plan.pause.daysAgo)
			},
			'14:30'
		);
	}

	const countAlive = countFound - countLost;
	if (countAlive < 0) throw new Error(`${plan.code}: more lost than found`);
	events.sort((a, b) => a.at.localeCompare(b.at));
	return {
		code: plan.code,
		speciesSlug,
		tubCode: plan.tubCode ?? null,
		origin,
		generation,
		foundOn,
		stage: plan.stage,
		sizeClass: STAGE_SIZE[plan.stage],
		countFound,
		countAlive,
		countLost,
		state: plan.state,
		pausedReason: plan.pause?.reason ?? null,
		saleReadyOn,
		listedOn,
		note: plan.note,
		events,
		stages,
		createdAt: instantOn(foundOn, '15:00')
	};
}

/** The clutch's stage on a given day (for order-line snapshots). */
export function stageOn(clutch: DemoClutch, day: string): ClutchStage {
	let stage = clutch.stages[0]?.stage ?? clutch.stage;
	for (const change of clutch.stages) if (daysBetween(change.on, day) >= 0) stage = change.stage;
	return stage;
}

export function buildStock(today: string): DemoStock {
	const colonies: DemoColony[] = COLONY_PLANS.map((plan) => {
		const startedOn = addDays(today, -plan.startedDaysAgo);
		speciesBySlug(plan.speciesSlug);
		return {
			code: plan.code,
			speciesSlug: plan.speciesSlug,
			name: plan.name,
			lengthIn: plan.size[0],
			widthIn: plan.size[1],
			depthIn: plan.size[2],
			foundersCount: plan.foundersCount,
			foundersNote: plan.foundersNote,
			generation: plan.generation,
			startedOn,
			retiredOn: plan.retiredDaysAgo === undefined ? null : addDays(today, -plan.retiredDaysAgo),
			notes: plan.notes,
			createdAt: instantOn(startedOn, '18:00')
		};
	});
	const careLog = COLONY_PLANS.flatMap((plan) =>
		buildColonyLog(plan, speciesBySlug(plan.speciesSlug), today)
	);
	const colonyByCode = new Map(colonies.map((c) => [c.code, c]));

	const tubs: DemoTub[] = TUB_PLANS.map((plan) => {
		const colony = colonyByCode.get(plan.colonyCode);
		if (!colony) throw new Error(`${plan.code}: unknown colony ${plan.colonyCode}`);
		const species = speciesBySlug(colony.speciesSlug);
		const startedOn = addDays(today, -plan.refreshDaysAgo);
		const refreshed = careLog.some(
			(e) =>
				e.colonyCode === plan.colonyCode &&
				e.loggedOn === startedOn &&
				(e.kind === 'substrate_refresh_half' || e.kind === 'substrate_refresh_full')
		);
		if (!refreshed)
			throw new Error(`${plan.code}: no refresh of ${plan.colonyCode} on ${startedOn}`);
		const holdUntil = addDays(startedOn, species.tubHoldDays);
		const checks: DemoTubCheck[] = plan.checks.map(([daysAgo, young, eggs, note]) => {
			const checkedOn = addDays(today, -daysAgo);
			if (daysBetween(startedOn, checkedOn) <= 0)
				throw new Error(`${plan.code}: check before the tub began`);
			return {
				checkedOn,
				youngFound: young,
				eggsSeen: eggs,
				note,
				byEmail: TEO,
				at: instantOn(checkedOn, '15:00')
			};
		});
		const last = checks.at(-1);
		const closedOn = plan.state === 'resting' ? null : (last?.checkedOn ?? null);
		if (plan.state !== 'resting' && (!last || daysBetween(holdUntil, last.checkedOn) < 0)) {
			throw new Error(`${plan.code}: a closed tub closes on a check at or after its hold`);
		}
		if ((plan.state === 'yielded') !== checks.some((c) => c.youngFound > 0)) {
			throw new Error(`${plan.code}: yielded exactly when young were found`);
		}
		return {
			code: plan.code,
			colonyCode: plan.colonyCode,
			sourceRefreshOn: startedOn,
			startedOn,
			holdUntil,
			state: plan.state,
			closedOn,
			note: plan.note,
			checks,
			createdAt: instantOn(startedOn, '17:25')
		};
	});
	const tubByCode = new Map(tubs.map((t) => [t.code, t]));

	const clutches = CLUTCH_PLANS.map((plan) => buildClutch(plan, today, tubByCode, colonyByCode));
	// Say on each yielding check which clutch its young became.
	for (const clutch of clutches) {
		const tub = clutch.tubCode ? tubByCode.get(clutch.tubCode) : undefined;
		const check = tub?.checks.find((c) => c.youngFound > 0);
		if (check && !check.note)
			check.note = `${check.youngFound} young moved out as clutch ${clutch.code}.`;
	}

	return { colonies, careLog, tubs, clutches };
}
