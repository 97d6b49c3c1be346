// A small seeded PRNG so the demo has variety yet is the same on every run.

/** mulberry32: a 32-bit generator, plenty for spreading demo care-log entries. */
export function mulberry32(seed: number): () => number {
	let state = seed >>> 0;
	return () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
	};
}

/** FNV-1a hash of a text, so each colony gets its own stream (editing one leaves the rest alone). */
export function seedFromText(text: string): number {
	let hash = 0x811c9dc5;
	for (let i = 0; i < text.length; i++) {
		hash ^= text.charCodeAt(i);
		hash = Math.imul(hash, 0x01000193);
	}
	return hash >>> 0;
}

export interface DemoRandom {
	/** A float in [0, 1). */
	next(): number;
	/** A whole number in [min, max], both ends included. */
	int(min: number, max: number): number;
	/** One element of a non-empty list. */
	pick<T>(items: readonly T[]): T;
}

export function demoRandom(streamName: string): DemoRandom {
	const next = mulberry32(seedFromText(`hatchlot-demo:${streamName}`));
	return {
		next,
		int(min, max) {
			return min + Math.floor(next() * (max - min + 1));
		},
		pick(items) {
			if (items.length === 0) throw new RangeError('pick from an empty list');
			return items[Math.floor(next() * items.length)] as (typeof items)[number];
		}
	};
}
