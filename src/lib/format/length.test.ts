import { describe, expect, it } from 'vitest';
import { formatInches } from './length';

describe('formatInches', () => {
	it('reads the numeric text PostgreSQL returns', () => {
		expect(formatInches('12.0')).toBe('12 in');
		expect(formatInches('4.5')).toBe('4.5 in');
		expect(formatInches(16)).toBe('16 in');
	});

	it('keeps one decimal, the precision the schema stores', () => {
		expect(formatInches(5.25)).toBe('5.3 in');
		expect(formatInches(0.04)).toBe('0 in');
	});

	it('refuses text that is not a number', () => {
		expect(() => formatInches('')).toThrow(RangeError);
		expect(() => formatInches('twelve')).toThrow(RangeError);
	});
});
