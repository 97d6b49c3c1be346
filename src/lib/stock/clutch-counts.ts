// The counting rules of a clutch: what a loss, a recount, a merge or a split does to
// its counts, and which state moves a keeper may make by hand. Pure: no clock, no I/O.
// Every refusal is a sentence meant to sit beside the form field that caused it.
import { clutchStateLabels } from '$lib/format/labels';
import type { ClutchState } from '$lib/server/db/schema';

/** A clutch's three counts. Animals moved out by a merge or split are the rest of found. */
export interface ClutchCounts {
	found: number;
	alive: number;
	lost: number;
}

export type Refusal = { ok: false; problem: string };
export type CountChange = { ok: true; counts: ClutchCounts; aliveDelta: number };

/** Why a set of counts cannot be stored, or null. Mirrors the clutch table's CHECKs. */
export function countsProblem(counts: ClutchCounts): string | null {
	for (const [name, value] of Object.entries(counts)) {
		if (!Number.isInteger(value)) return `The ${name} count must be a whole number.`;
		if (value < 0) return `The ${name} count cannot go below zero.`;
	}
	if (counts.alive + counts.lost > counts.found)
		return `Alive (${counts.alive}) and lost (${counts.lost}) together cannot exceed found (${counts.found}).`;
	return null;
}

function animals(n: number): string {
	return `${n} ${n === 1 ? 'animal' : 'animals'}`;
}

function wholeAtLeastOne(n: number, what: string): string | null {
	if (!Number.isInteger(n)) return `${what} must be a whole number.`;
	if (n < 1) return `${what} must be at least 1.`;
	return null;
}

/** n animals died (or escaped): alive goes down, lost goes up, found stays. */
export function applyLoss(counts: ClutchCounts, n: number): CountChange | Refusal {
	const shape = wholeAtLeastOne(n, 'The number lost');
	if (shape) return { ok: false, problem: shape };
	if (n > counts.alive)
		return {
			ok: false,
			problem:
				counts.alive === 0
					? 'No animals are alive in this clutch, so none can be lost.'
					: `Only ${animals(counts.alive)} alive; a loss of ${n} would take the count below zero.`
		};
	const next = { found: counts.found, alive: counts.alive - n, lost: counts.lost + n };
	const problem = countsProblem(next);
	return problem ? { ok: false, problem } : { ok: true, counts: next, aliveDelta: -n };
}

/**
 * A census: the keeper counted `newAlive` animals. A lower count means the missing ones
 * are gone, so they join the lost; a higher one means young were missed at the first
 * count, so they join found. Either way alive + lost ≤ found still holds.
 */
export function applyRecount(counts: ClutchCounts, newAlive: number): CountChange | Refusal {
	if (!Number.isInteger(newAlive)) return { ok: false, problem: 'Count whole animals.' };
	if (newAlive < 0) return { ok: false, problem: 'A count cannot be below zero.' };
	const delta = newAlive - counts.alive;
	if (delta === 0)
		return { ok: false, problem: `That is the count already on record (${counts.alive}).` };
	const next =
		delta > 0
			? { found: counts.found + delta, alive: newAlive, lost: counts.lost }
			: { found: counts.found, alive: newAlive, lost: counts.lost - delta };
	const problem = countsProblem(next);
	return problem ? { ok: false, problem } : { ok: true, counts: next, aliveDelta: delta };
}

/**
 * Merging pours every live animal of `source` into `survivor`: the survivor's found and
 * alive grow by that many (they are new to it); the source keeps its history (found and
 * lost stay) and its alive count goes to zero.
 */
export function applyMerge(
	survivor: ClutchCounts,
	source: ClutchCounts
): { ok: true; survivor: ClutchCounts; source: ClutchCounts; moved: number } | Refusal {
	const moved = source.alive;
	if (moved < 1) return { ok: false, problem: 'That clutch has no animals alive to move.' };
	const nextSurvivor = {
		found: survivor.found + moved,
		alive: survivor.alive + moved,
		lost: survivor.lost
	};
	const nextSource = { found: source.found, alive: 0, lost: source.lost };
	const problem = countsProblem(nextSurvivor) ?? countsProblem(nextSource);
	if (problem) return { ok: false, problem };
	return { ok: true, survivor: nextSurvivor, source: nextSource, moved };
}

/** Why one part of a split is refused, with its position (0-based) for the field. */
export type SplitRefusal = Refusal & { part: number | null };

/**
 * Splitting moves `parts[i]` animals into each new clutch; the parent keeps the rest,
 * which must be at least one (moving every animal out is a merge, or just a new cup).
 */
export function applySplit(
	parent: ClutchCounts,
	parts: readonly number[]
): { ok: true; parent: ClutchCounts; children: ClutchCounts[]; moved: number } | SplitRefusal {
	if (parts.length === 0)
		return { ok: false, part: null, problem: 'Give the count of at least one new clutch.' };
	for (const [index, count] of parts.entries()) {
		const shape = wholeAtLeastOne(count, 'Each new clutch');
		if (shape) return { ok: false, part: index, problem: shape };
	}
	const moved = parts.reduce((sum, count) => sum + count, 0);
	if (moved >= parent.alive)
		return {
			ok: false,
			part: parts.length - 1,
			problem:
				parent.alive <= 1
					? `Only ${animals(parent.alive)} alive: there is nothing to split.`
					: `Only ${animals(parent.alive)} alive and these parts take ${moved}; leave at least one in this clutch.`
		};
	const nextParent = { found: parent.found, alive: parent.alive - moved, lost: parent.lost };
	const children = parts.map((count) => ({ found: count, alive: count, lost: 0 }));
	const problem = countsProblem(nextParent);
	if (problem) return { ok: false, part: null, problem };
	return { ok: true, parent: nextParent, children, moved };
}

// ---- state moves a keeper makes by hand. Listed and sold out belong to the listings.

export type PauseReason = 'molting' | 'unwell';

/** Growing → ready: the keeper judges them sale size, before or after the projected date. */
export function markReadyProblem(state: ClutchState, alive: number): string | null {
	if (state === 'ready') return 'This clutch is already marked ready.';
	if (state === 'paused')
		return 'This clutch is paused; unpause it first, once the animals are settled.';
	if (state !== 'growing')
		return 'Only a growing clutch can be marked ready; listing and selling are set by its listings.';
	if (alive < 1) return 'No animals are alive in this clutch.';
	return null;
}

/** Ready → growing: on a second look they are not sale size yet. */
export function backToGrowingProblem(state: ClutchState): string | null {
	if (state === 'growing') return 'This clutch is already growing.';
	if (state !== 'ready')
		return 'Only a clutch marked ready can go back to growing; a listed clutch is changed through its listing.';
	return null;
}

/** A pause can start from any state with animals for sale or on the way to it. */
export function pauseProblem(state: ClutchState, alive: number): string | null {
	if (state === 'paused') return 'This clutch is already paused.';
	if (state === 'sold_out') return 'A sold-out clutch has nothing left to pause.';
	if (alive < 1) return 'No animals are alive in this clutch.';
	return null;
}

/**
 * Unpausing returns the clutch to the state it had when it was paused (the pause event's
 * from-value). Only growing, ready and listed can have been paused; anything else falls
 * back to growing, the state that promises nothing to a buyer.
 */
export function unpauseTarget(
	state: ClutchState,
	stateBeforePause: string | null
): { ok: true; to: Exclude<ClutchState, 'paused' | 'sold_out'> } | Refusal {
	if (state !== 'paused') return { ok: false, problem: 'This clutch is not paused.' };
	if (stateBeforePause === 'ready' || stateBeforePause === 'listed')
		return { ok: true, to: stateBeforePause };
	return { ok: true, to: 'growing' };
}

/** A paused clutch is never sold, whatever its listings say. */
export function maySell(state: ClutchState): boolean {
	return state === 'listed';
}

/** Counting means digging through the substrate; molting animals must be left alone. */
export function recountProblem(
	state: ClutchState,
	pausedReason: PauseReason | null
): string | null {
	if (state === 'sold_out') return 'This clutch is closed; there is nothing left in it to count.';
	if (state === 'paused' && pausedReason === 'molting')
		return 'They are molting: counting means digging, and disturbing molting animals can kill them. Record any loss you see on the surface, and recount once you unpause.';
	return null;
}

/** What the merge and split rules need to know about a clutch. */
export interface ClutchForMove {
	code: string;
	speciesId: number;
	generation: number;
	state: ClutchState;
	counts: ClutchCounts;
}

const stateWord = (state: ClutchState) => clutchStateLabels[state].toLowerCase();

function moveStateProblem(clutch: ClutchForMove, verb: 'merged' | 'split'): string | null {
	switch (clutch.state) {
		case 'paused':
			return `${clutch.code} is paused: moving animals that are molting or unwell can kill them. Unpause it first.`;
		case 'listed':
			return `${clutch.code} is listed: its animals are on offer in the shop. Withdraw its listing before it is ${verb}.`;
		case 'sold_out':
			return `${clutch.code} is closed (sold out); nothing in it can be ${verb}.`;
		default:
			return null;
	}
}

/** Why `source` cannot be poured into `survivor`, or null. */
export function mergeProblem(survivor: ClutchForMove, source: ClutchForMove): string | null {
	if (survivor.code === source.code) return 'A clutch cannot be merged into itself.';
	if (survivor.speciesId !== source.speciesId)
		return `${source.code} is another species; only clutches of one species can be merged.`;
	const stateProblem = moveStateProblem(survivor, 'merged') ?? moveStateProblem(source, 'merged');
	if (stateProblem) return stateProblem;
	// The survivor's generation is the one buyers are told; mixing would mislabel some.
	if (survivor.generation !== source.generation)
		return `${source.code} is generation ${source.generation} and ${survivor.code} generation ${survivor.generation}; merging would mislabel some of them.`;
	// A ready clutch can be listed; growing animals poured in would be offered too early.
	if (survivor.state !== source.state)
		return `${survivor.code} is ${stateWord(survivor.state)} and ${source.code} ${stateWord(source.state)}: mark them the same first, so no growing animal is offered as sale size.`;
	if (source.counts.alive < 1) return `${source.code} has no animals alive to move.`;
	return null;
}

/** Why a clutch cannot be split, or null. */
export function splitProblem(parent: ClutchForMove): string | null {
	return moveStateProblem(parent, 'split');
}
