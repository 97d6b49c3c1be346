import { describe, expect, it } from 'vitest';
import { parseInt8 } from './connect';

describe('parseInt8', () => {
	it('keeps bigint values exact as integers', () => {
		expect(parseInt8('0')).toBe(0);
		expect(parseInt8('-42')).toBe(-42);
		// 2^53 − 1 is Number.MAX_SAFE_INTEGER (ECMA-262, Number.MAX_SAFE_INTEGER).
		expect(parseInt8('9007199254740991')).toBe(Number.MAX_SAFE_INTEGER);
	});
	it('refuses a value that a float would round', () => {
		expect(() => parseInt8('9007199254740993')).toThrow(RangeError);
	});
});
