// How each state looks: a tone and a shape. The word comes from $lib/format/labels.
// Amber marks states that need someone's care; brick only loss and refusal.
import type { StateKind, StateOf } from '$lib/format/labels';
import type { IconName } from './icons';

/** moss: moving along well · loam: waiting on something · ink: finished (dashed outline) · amber: needs care · brick: loss or refusal */
export type Tone = 'moss' | 'loam' | 'ink' | 'amber' | 'brick';

export interface StateLook {
	tone: Tone;
	icon: IconName;
}

type Looks = { [K in StateKind]: Record<StateOf<K>, StateLook> };

export const stateLooks: Looks = {
	tub: {
		resting: { tone: 'loam', icon: 'hourglass' },
		yielded: { tone: 'moss', icon: 'tub-young' },
		cleared: { tone: 'ink', icon: 'tub-empty' }
	},
	clutch: {
		growing: { tone: 'moss', icon: 'sprout' },
		ready: { tone: 'moss', icon: 'check-circle' },
		listed: { tone: 'moss', icon: 'tag' },
		sold_out: { tone: 'ink', icon: 'box-empty' },
		paused: { tone: 'amber', icon: 'pause-circle' }
	},
	order: {
		awaiting_payment: { tone: 'loam', icon: 'clock' },
		paid: { tone: 'moss', icon: 'banknote' },
		scheduled: { tone: 'moss', icon: 'calendar' },
		weather_hold: { tone: 'amber', icon: 'thermometer' },
		packed: { tone: 'moss', icon: 'parcel' },
		shipped: { tone: 'moss', icon: 'van' },
		delivered: { tone: 'ink', icon: 'doorstep' },
		cancelled: { tone: 'brick', icon: 'x-circle' },
		refunded: { tone: 'brick', icon: 'return-arrow' },
		part_refunded: { tone: 'brick', icon: 'half-return' }
	},
	listing: {
		draft: { tone: 'loam', icon: 'pencil' },
		live: { tone: 'moss', icon: 'live-dot' },
		withdrawn: { tone: 'ink', icon: 'minus-square' },
		sold_out: { tone: 'ink', icon: 'box-empty' }
	},
	claim: {
		open: { tone: 'amber', icon: 'flag' },
		refunded: { tone: 'brick', icon: 'return-arrow' },
		reshipped: { tone: 'moss', icon: 'loop-arrows' },
		declined: { tone: 'brick', icon: 'slash-circle' }
	}
};

export function stateLook<K extends StateKind>(kind: K, state: StateOf<K>): StateLook {
	return (stateLooks[kind] as Record<StateOf<K>, StateLook>)[state];
}

/** Tailwind classes per tone: tinted fill, darker text and an outline of the same hue. */
export const toneClasses: Record<Tone, string> = {
	moss: 'bg-moss-50 text-moss-800 border-moss-300',
	loam: 'bg-loam-50 text-loam-800 border-loam-300',
	// Finished states get a dashed outline: one more cue besides the shape and the word.
	ink: 'bg-page-100 text-ink-700 border-ink-400 border-dashed',
	amber: 'bg-amber-50 text-amber-800 border-amber-400',
	brick: 'bg-brick-50 text-brick-700 border-brick-300'
};
