import { describe, expect, it } from 'vitest';
import { unitCount, unitLabel } from './units';

describe('unit labels', () => {
	it('names singles, pairs and groups', () => {
		expect(unitLabel(1, 'unsexed')).toBe('each');
		expect(unitLabel(2, 'pair')).toBe('pair');
		expect(unitLabel(2, 'unsexed')).toBe('group of 2');
		expect(unitLabel(10, 'unsexed')).toBe('group of 10');
	});
	it('counts units in words', () => {
		expect(unitCount(4, 1, 'female')).toBe('4');
		expect(unitCount(1, 2, 'pair')).toBe('1 pair');
		expect(unitCount(2, 2, 'pair')).toBe('2 pairs');
		expect(unitCount(1, 5, 'unsexed')).toBe('1 group of 5');
		expect(unitCount(3, 5, 'unsexed')).toBe('3 groups of 5');
	});
});
