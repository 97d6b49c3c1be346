// Words shown for the stored codes. Each map must name every code of its type,
// so a new state in the schema fails type-checking here until it has a word.
import type {
	AnimalGroup,
	CareEntryKind,
	ClaimState,
	ClutchStage,
	ClutchState,
	ListingState,
	MoistureLevel,
	MoistureReading,
	OrderState,
	Service,
	Sex,
	SizeClass,
	TubState
} from '$lib/server/db/schema';

export const tubStateLabels = {
	resting: 'Resting',
	yielded: 'Yielded',
	cleared: 'Cleared'
} as const satisfies Record<TubState, string>;

export const clutchStateLabels = {
	growing: 'Growing',
	ready: 'Ready',
	listed: 'Listed',
	sold_out: 'Sold out',
	paused: 'Paused'
} as const satisfies Record<ClutchState, string>;

export const orderStateLabels = {
	awaiting_payment: 'Awaiting payment',
	paid: 'Paid',
	scheduled: 'Scheduled',
	weather_hold: 'Weather hold',
	packed: 'Packed',
	shipped: 'Shipped',
	delivered: 'Delivered',
	cancelled: 'Cancelled',
	refunded: 'Refunded',
	part_refunded: 'Part refunded'
} as const satisfies Record<OrderState, string>;

export const listingStateLabels = {
	draft: 'Draft',
	live: 'Live',
	withdrawn: 'Withdrawn',
	sold_out: 'Sold out'
} as const satisfies Record<ListingState, string>;

export const claimStateLabels = {
	open: 'Open',
	refunded: 'Refunded',
	reshipped: 'Reshipped',
	declined: 'Declined'
} as const satisfies Record<ClaimState, string>;

/** Every kind of thing that has a state, with the words for its states. */
export const stateLabels = {
	tub: tubStateLabels,
	clutch: clutchStateLabels,
	order: orderStateLabels,
	listing: listingStateLabels,
	claim: claimStateLabels
} as const;

export type StateKind = keyof typeof stateLabels;
export type StateOf<K extends StateKind> = keyof (typeof stateLabels)[K];

/** The word for one state, e.g. stateLabel('order', 'weather_hold') → "Weather hold". */
export function stateLabel<K extends StateKind>(kind: K, state: StateOf<K>): string {
	return (stateLabels[kind] as Record<StateOf<K>, string>)[state];
}

/** The states of one kind in their life-cycle order (the order of the maps above). */
export function statesOf<K extends StateKind>(kind: K): StateOf<K>[] {
	return Object.keys(stateLabels[kind]) as StateOf<K>[];
}

export const stageLabels = {
	hatchling: 'Hatchling',
	juvenile: 'Juvenile',
	sub_adult: 'Sub-adult',
	adult: 'Adult'
} as const satisfies Record<ClutchStage, string>;

export const sizeClassLabels = {
	tiny: 'Tiny',
	small: 'Small',
	medium: 'Medium',
	large: 'Large'
} as const satisfies Record<SizeClass, string>;

export const animalGroupLabels = {
	millipede: 'Millipede',
	isopod: 'Isopod',
	springtail: 'Springtail',
	beetle: 'Beetle',
	roach: 'Roach'
} as const satisfies Record<AnimalGroup, string>;

export const animalGroupPluralLabels = {
	millipede: 'millipedes',
	isopod: 'isopods',
	springtail: 'springtails',
	beetle: 'beetles',
	roach: 'roaches'
} as const satisfies Record<AnimalGroup, string>;

/** "millipedes, isopods and springtails": groups in the order of the maps above. */
export function formatGroupList(groups: readonly AnimalGroup[]): string {
	const present = new Set(groups);
	const words = (Object.keys(animalGroupPluralLabels) as AnimalGroup[])
		.filter((group) => present.has(group))
		.map((group) => animalGroupPluralLabels[group]);
	if (words.length <= 1) return words.join('');
	return `${words.slice(0, -1).join(', ')} and ${words.at(-1)}`;
}

export const sexLabels = {
	unsexed: 'Unsexed',
	male: 'Male',
	female: 'Female',
	pair: 'Pair'
} as const satisfies Record<Sex, string>;

export const serviceLabels = {
	overnight: 'Overnight',
	two_day: 'Two-day'
} as const satisfies Record<Service, string>;

export const moistureLevelLabels = {
	drier: 'Drier',
	moist: 'Moist',
	humid: 'Humid'
} as const satisfies Record<MoistureLevel, string>;

export const moistureReadingLabels = {
	dry: 'Too dry',
	right: 'Right',
	wet: 'Too wet'
} as const satisfies Record<MoistureReading, string>;

export function stageLabel(stage: ClutchStage): string {
	return stageLabels[stage];
}

export function sizeClassLabel(sizeClass: SizeClass): string {
	return sizeClassLabels[sizeClass];
}

export function animalGroupLabel(group: AnimalGroup): string {
	return animalGroupLabels[group];
}

// ISO 8601 weekday numbers, as the shop's ship-weekday settings store them: 1 = Monday … 7 = Sunday.
const isoWeekdayNames = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'] as const;

/** [1, 2, 3] → "Mon, Tue, Wed"; sorted, each day once. */
export function formatIsoWeekdays(days: readonly number[]): string {
	const unique = [...new Set(days)].sort((a, b) => a - b);
	for (const day of unique) {
		if (!Number.isInteger(day) || day < 1 || day > 7) {
			throw new RangeError(`ISO weekday must be 1 (Mon) to 7 (Sun), got ${day}`);
		}
	}
	return unique.map((day) => isoWeekdayNames[day - 1]).join(', ');
}

/** "1 animal", "12 animals": a count with its noun. */
export function formatCount(count: number, singular: string, plural = `${singular}s`): string {
	return `${count.toLocaleString('en-US')} ${count === 1 ? singular : plural}`;
}

export const careEntryKindLabels = {
	substrate_refresh_half: 'Half substrate refresh',
	substrate_refresh_full: 'Full substrate refresh',
	leaf_top_up: 'Leaf top-up',
	moisture_check: 'Moisture check',
	protein: 'Protein offered',
	calcium: 'Calcium offered',
	molt_seen: 'Molt seen',
	census: 'Census count',
	pest_note: 'Pest note'
} as const satisfies Record<CareEntryKind, string>;

export function careEntryKindLabel(kind: CareEntryKind): string {
	return careEntryKindLabels[kind];
}
