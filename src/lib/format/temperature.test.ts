import { describe, expect, it } from 'vitest';
import {
	describeCelsiusRounding,
	fahrenheitToCelsius,
	formatTemperature,
	roundedCelsius
} from './temperature';

describe('fahrenheitToCelsius', () => {
	it('follows NIST SP 811: t/°C = (t/°F − 32)/1.8', () => {
		// NIST SP 811 (2008), Appendix B.8, temperature conversion (formula from memory).
		for (const f of [-40, 0, 25, 50, 72, 85, 95, 200]) {
			expect(fahrenheitToCelsius(f)).toBeCloseTo((f - 32) / 1.8, 12);
		}
	});

	it('meets the fixed points of water and the −40 crossing', () => {
		// Ice point 32 °F = 0 °C and steam point 212 °F = 100 °C (from memory);
		// −40 is where both scales meet, which the NIST formula gives exactly.
		expect(fahrenheitToCelsius(32)).toBe(0);
		expect(fahrenheitToCelsius(212)).toBe(100);
		expect(fahrenheitToCelsius(-40)).toBe(-40);
		// Normal body temperature 98.6 °F = 37 °C (from memory).
		expect(fahrenheitToCelsius(98.6)).toBeCloseTo(37, 10);
	});

	it('refuses what is not a number', () => {
		expect(() => fahrenheitToCelsius(Number.NaN)).toThrow(RangeError);
	});
});

describe('formatTemperature', () => {
	it('shows °F with whole °C beside', () => {
		// (72 − 32)/1.8 = 22.2… → 22, by the NIST SP 811 formula.
		expect(formatTemperature(72)).toBe('72 °F (22 °C)');
		// The shop's default thresholds: 50 → 10, 25 → −3.9 → −4, 85 → 29.4 → 29, 95 → 35.
		expect(formatTemperature(50)).toBe('50 °F (10 °C)');
		expect(formatTemperature(25)).toBe('25 °F (\u22124 °C)');
		expect(formatTemperature(85)).toBe('85 °F (29 °C)');
		expect(formatTemperature(95)).toBe('95 °F (35 °C)');
		// Substrate heat treatment at about 200 °F: (200 − 32)/1.8 = 93.3… → 93.
		expect(formatTemperature(200)).toBe('200 °F (93 °C)');
	});

	it('rounds half away from zero and never prints -0', () => {
		// 31 °F = −0.56 °C → −1; 32.5 °F = 0.28 °C → 0; 31.5 °F = −0.28 °C → 0, not "-0".
		expect(roundedCelsius(31)).toBe(-1);
		expect(formatTemperature(32.5)).toBe('32.5 °F (0 °C)');
		expect(formatTemperature(31.5)).toBe('31.5 °F (0 °C)');
		// 36.5 °F is 2.5 °C and 27.5 °F is −2.5 °C, both exact in binary: half away from zero.
		expect(roundedCelsius(36.5)).toBe(3);
		expect(roundedCelsius(27.5)).toBe(-3);
	});

	it('explains the rounding in words', () => {
		expect(describeCelsiusRounding(72)).toBe('72 °F is 22.2 °C, shown rounded to 22 °C');
		expect(describeCelsiusRounding(50)).toBe('50 °F is exactly 10 °C');
		expect(describeCelsiusRounding(25)).toBe('25 °F is \u22123.9 °C, shown rounded to \u22124 °C');
	});

	it('prints below-zero values with a true minus sign (U+2212), as NIST SP 811 typesets them', () => {
		// −40 °F = −40 °C by the NIST SP 811 formula; 0 °F = −17.8 °C → −18.
		expect(formatTemperature(-40)).toBe('\u221240 °F (\u221240 °C)');
		expect(formatTemperature(0)).toBe('0 °F (\u221218 °C)');
	});
});
