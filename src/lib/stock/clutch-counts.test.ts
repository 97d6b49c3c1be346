import { describe, expect, it } from 'vitest';
import {
	applyLoss,
	applyMerge,
	applyRecount,
	applySplit,
	backToGrowingProblem,
	countsProblem,
	markReadyProblem,
	maySell,
	mergeProblem,
	pauseProblem,
	recountProblem,
	splitProblem,
	unpauseTarget,
	type ClutchCounts,
	type ClutchForMove
} from './clutch-counts';

// Every expected count below is worked by hand from the rule that a clutch's animals are
// either alive, lost or moved out, so alive + lost never exceeds found.
const clutch = (found: number, alive: number, lost: number): ClutchCounts => ({
	found,
	alive,
	lost
});

function expectOk<T extends { ok: boolean }>(outcome: T): Extract<T, { ok: true }> {
	if (!outcome.ok) throw new Error(`refused: ${JSON.stringify(outcome)}`);
	return outcome as Extract<T, { ok: true }>;
}

function expectRefused(outcome: { ok: boolean; problem?: string }): string {
	expect(outcome.ok).toBe(false);
	return outcome.problem ?? '';
}

describe('countsProblem', () => {
	it('accepts counts with some moved out (alive + lost below found)', () => {
		expect(countsProblem(clutch(20, 12, 3))).toBeNull();
	});
	it('refuses negatives, fractions and more alive + lost than found', () => {
		expect(countsProblem(clutch(20, -1, 3))).toMatch(/below zero/);
		expect(countsProblem(clutch(20, 1.5, 3))).toMatch(/whole/);
		expect(countsProblem(clutch(20, 18, 3))).toMatch(/cannot exceed found \(20\)/);
	});
});

describe('applyLoss', () => {
	it('moves the lost from alive to lost and leaves found alone', () => {
		// 20 found, 15 alive, 2 lost; lose 3 → 12 alive, 5 lost.
		const outcome = expectOk(applyLoss(clutch(20, 15, 2), 3));
		expect(outcome.counts).toEqual(clutch(20, 12, 5));
		expect(outcome.aliveDelta).toBe(-3);
	});
	it('takes the last animal, reaching exactly zero', () => {
		expect(expectOk(applyLoss(clutch(5, 1, 4), 1)).counts).toEqual(clutch(5, 0, 5));
	});
	it('refuses a loss larger than the alive count, saying how many are alive', () => {
		expect(expectRefused(applyLoss(clutch(10, 2, 8), 3))).toMatch(/Only 2 animals alive/);
		expect(expectRefused(applyLoss(clutch(10, 0, 10), 1))).toMatch(/No animals are alive/);
	});
	it('refuses zero, negative and fractional losses', () => {
		expect(expectRefused(applyLoss(clutch(10, 5, 0), 0))).toMatch(/at least 1/);
		expect(expectRefused(applyLoss(clutch(10, 5, 0), -2))).toMatch(/at least 1/);
		expect(expectRefused(applyLoss(clutch(10, 5, 0), 1.5))).toMatch(/whole/);
	});
});

describe('applyRecount', () => {
	it('counts the missing ones as lost when the census is lower', () => {
		// 20 found, 15 alive, 2 lost; counted 11 → 4 more lost: 11 alive, 6 lost.
		const outcome = expectOk(applyRecount(clutch(20, 15, 2), 11));
		expect(outcome.counts).toEqual(clutch(20, 11, 6));
		expect(outcome.aliveDelta).toBe(-4);
	});
	it('adds young missed at the first count to found when the census is higher', () => {
		// 20 found, 15 alive, 2 lost; counted 18 → 3 more found: 23 found, 18 alive.
		const outcome = expectOk(applyRecount(clutch(20, 15, 2), 18));
		expect(outcome.counts).toEqual(clutch(23, 18, 2));
		expect(outcome.aliveDelta).toBe(3);
	});
	it('accepts a census of zero', () => {
		expect(expectOk(applyRecount(clutch(8, 3, 5), 0)).counts).toEqual(clutch(8, 0, 8));
	});
	it('refuses a negative count, a fraction and the count already on record', () => {
		expect(expectRefused(applyRecount(clutch(8, 3, 5), -1))).toMatch(/below zero/);
		expect(expectRefused(applyRecount(clutch(8, 3, 5), 2.5))).toMatch(/whole/);
		expect(expectRefused(applyRecount(clutch(8, 3, 5), 3))).toMatch(/already on record \(3\)/);
	});
	it('keeps a clutch with animals moved out within its found count', () => {
		// 30 found, 10 alive, 5 lost, 15 split off; counted 4 → 6 more lost: 4 + 11 ≤ 30.
		const outcome = expectOk(applyRecount(clutch(30, 10, 5), 4));
		expect(outcome.counts).toEqual(clutch(30, 4, 11));
		expect(countsProblem(outcome.counts)).toBeNull();
	});
});

describe('applyMerge', () => {
	it('gives the survivor every live animal of the source and empties the source', () => {
		// Survivor 20/15/2, source 12/9/3: 9 move → survivor 29/24/2, source 12/0/3.
		const outcome = expectOk(applyMerge(clutch(20, 15, 2), clutch(12, 9, 3)));
		expect(outcome.moved).toBe(9);
		expect(outcome.survivor).toEqual(clutch(29, 24, 2));
		expect(outcome.source).toEqual(clutch(12, 0, 3));
		// Whole: alive before (15 + 9) equals alive after (24 + 0).
		expect(outcome.survivor.alive + outcome.source.alive).toBe(15 + 9);
	});
	it('refuses a source with nothing alive', () => {
		expect(expectRefused(applyMerge(clutch(5, 5, 0), clutch(4, 0, 4)))).toMatch(/no animals/);
	});
});

describe('applySplit', () => {
	it('moves each part into a new clutch and leaves the rest in the parent', () => {
		// Parent 40/30/4, parts 10 and 8 → parent 40/12/4, children 10/10/0 and 8/8/0.
		const outcome = expectOk(applySplit(clutch(40, 30, 4), [10, 8]));
		expect(outcome.moved).toBe(18);
		expect(outcome.parent).toEqual(clutch(40, 12, 4));
		expect(outcome.children).toEqual([clutch(10, 10, 0), clutch(8, 8, 0)]);
		const aliveAfter = outcome.parent.alive + outcome.children.reduce((s, c) => s + c.alive, 0);
		expect(aliveAfter).toBe(30);
	});
	it('refuses taking every animal, and names the last part', () => {
		const refused = applySplit(clutch(10, 10, 0), [5, 5]);
		expect(refused.ok).toBe(false);
		if (!refused.ok) {
			expect(refused.part).toBe(1);
			expect(refused.problem).toMatch(/leave at least one/);
		}
	});
	it('refuses an empty part, naming it', () => {
		const refused = applySplit(clutch(10, 10, 0), [3, 0]);
		expect(refused.ok).toBe(false);
		if (!refused.ok) expect(refused.part).toBe(1);
	});
	it('refuses no parts at all', () => {
		expect(expectRefused(applySplit(clutch(10, 10, 0), []))).toMatch(/at least one/);
	});
});

describe('state moves by hand', () => {
	it('marks a growing clutch ready, and nothing else', () => {
		expect(markReadyProblem('growing', 10)).toBeNull();
		expect(markReadyProblem('ready', 10)).toMatch(/already/);
		expect(markReadyProblem('paused', 10)).toMatch(/unpause/);
		expect(markReadyProblem('listed', 10)).toMatch(/listings/);
		expect(markReadyProblem('growing', 0)).toMatch(/No animals/);
	});
	it('sends a ready clutch back to growing, never a listed one', () => {
		expect(backToGrowingProblem('ready')).toBeNull();
		expect(backToGrowingProblem('listed')).toMatch(/listing/);
		expect(backToGrowingProblem('growing')).toMatch(/already/);
	});
	it('pauses growing, ready and listed clutches, not sold-out or paused ones', () => {
		expect(pauseProblem('growing', 4)).toBeNull();
		expect(pauseProblem('ready', 4)).toBeNull();
		expect(pauseProblem('listed', 4)).toBeNull();
		expect(pauseProblem('paused', 4)).toMatch(/already/);
		expect(pauseProblem('sold_out', 0)).toMatch(/sold-out/);
	});
	it('unpauses to the state before the pause', () => {
		expect(unpauseTarget('paused', 'ready')).toEqual({ ok: true, to: 'ready' });
		expect(unpauseTarget('paused', 'listed')).toEqual({ ok: true, to: 'listed' });
		expect(unpauseTarget('paused', 'growing')).toEqual({ ok: true, to: 'growing' });
		expect(unpauseTarget('paused', null)).toEqual({ ok: true, to: 'growing' });
		expect(unpauseTarget('growing', 'ready').ok).toBe(false);
	});
	it('never sells a paused clutch (PRODUCT.md: paused while molting or unwell, not sold)', () => {
		expect(maySell('paused')).toBe(false);
		expect(maySell('listed')).toBe(true);
		expect(maySell('growing')).toBe(false);
	});
	it('refuses a recount while molting (PRODUCT.md, common practice: disturbing molting animals can kill them)', () => {
		expect(recountProblem('paused', 'molting')).toMatch(/molting/);
		expect(recountProblem('paused', 'unwell')).toBeNull();
		expect(recountProblem('growing', null)).toBeNull();
		expect(recountProblem('sold_out', null)).toMatch(/closed/);
	});
});

describe('mergeProblem and splitProblem', () => {
	const base: ClutchForMove = {
		code: 'NAR-C1',
		speciesId: 1,
		generation: 2,
		state: 'growing',
		counts: clutch(20, 15, 2)
	};
	const other: ClutchForMove = { ...base, code: 'NAR-C2', counts: clutch(12, 9, 3) };

	it('allows two growing clutches of one species and generation', () => {
		expect(mergeProblem(base, other)).toBeNull();
	});
	it('refuses merging a clutch into itself', () => {
		expect(mergeProblem(base, base)).toMatch(/itself/);
	});
	it('refuses another species', () => {
		expect(mergeProblem(base, { ...other, speciesId: 2 })).toMatch(/another species/);
	});
	it('refuses a paused or listed clutch on either side, saying why', () => {
		expect(mergeProblem(base, { ...other, state: 'paused' })).toMatch(/NAR-C2 is paused.*kill/);
		expect(mergeProblem({ ...base, state: 'listed' }, other)).toMatch(/NAR-C1 is listed.*shop/);
	});
	it('refuses mixing generations and mixing ready with growing', () => {
		expect(mergeProblem(base, { ...other, generation: 1 })).toMatch(/mislabel/);
		expect(mergeProblem({ ...base, state: 'ready' }, other)).toMatch(/ready and NAR-C2 growing/);
	});
	it('refuses a source with nothing alive', () => {
		expect(mergeProblem(base, { ...other, counts: clutch(12, 0, 12) })).toMatch(/no animals/);
	});
	it('refuses splitting a paused, listed or sold-out clutch', () => {
		expect(splitProblem(base)).toBeNull();
		expect(splitProblem({ ...base, state: 'ready' })).toBeNull();
		expect(splitProblem({ ...base, state: 'paused' })).toMatch(/paused/);
		expect(splitProblem({ ...base, state: 'listed' })).toMatch(/listed/);
		expect(splitProblem({ ...base, state: 'sold_out' })).toMatch(/closed/);
	});
});
