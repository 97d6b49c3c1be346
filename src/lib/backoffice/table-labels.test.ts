import { describe, expect, it } from 'vitest';
import { formatGeneration, formatLedgerDate } from './table-labels';

describe('table labels', () => {
	it('writes generations as breeders do, F0 for wild-caught founders', () => {
		expect(formatGeneration(0)).toBe('F0');
		expect(formatGeneration(2)).toBe('F2');
		expect(() => formatGeneration(-1)).toThrow(RangeError);
		expect(() => formatGeneration(1.5)).toThrow(RangeError);
	});

	it('shows a calendar date as that day, whatever zone the machine is in', () => {
		// 2024-02-29 exists (2024 is a leap year); 2026-02-29 does not.
		expect(formatLedgerDate('2024-02-29')).toBe('Feb 29, 2024');
		expect(formatLedgerDate('2026-12-31')).toBe('Dec 31, 2026');
		expect(() => formatLedgerDate('2026-02-29')).toThrow(RangeError);
	});
});
