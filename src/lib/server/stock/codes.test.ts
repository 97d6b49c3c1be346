import { describe, expect, it } from 'vitest';
import { genusPrefix } from './codes';

describe('genusPrefix', () => {
	it('takes three letters of the genus, upper-cased', () => {
		expect(genusPrefix('Narceus americanus')).toBe('NAR');
		expect(genusPrefix('Folsomia candida')).toBe('FOL');
	});
	it('pads a very short name so every prefix has three letters', () => {
		expect(genusPrefix('Ab')).toBe('ABX');
	});
});
