import { describe, expect, it } from 'vitest';
import { shouldPreload } from './font-preload';

const ASSETS = '/_app/immutable/assets';

describe('shouldPreload', () => {
	it('keeps SvelteKit’s default of scripts and styles', () => {
		expect(shouldPreload({ type: 'js', path: '/_app/immutable/entry/start.Bx1.js' })).toBe(true);
		expect(shouldPreload({ type: 'css', path: `${ASSETS}/0.D2x.css` })).toBe(true);
		expect(shouldPreload({ type: 'asset', path: `${ASSETS}/logo.C1.svg` })).toBe(false);
	});

	it('adds the Latin woff2 of the three weights drawn on every page', () => {
		for (const weight of [400, 600, 700])
			expect(
				shouldPreload({
					type: 'font',
					path: `${ASSETS}/source-sans-3-latin-${weight}-normal.DQi5PRDE.woff2`
				}),
				String(weight)
			).toBe(true);
	});

	it('leaves other subsets, the italic and the .woff copies to load when text needs them', () => {
		for (const file of [
			'source-sans-3-latin-ext-400-normal.Ab1.woff2',
			'source-sans-3-cyrillic-400-normal.Ab1.woff2',
			'source-sans-3-latin-400-italic.bFKvakRX.woff2',
			'source-sans-3-latin-400-normal.RR2C27NP.woff',
			'source-sans-3-latin-200-normal.Ab1.woff2'
		])
			expect(shouldPreload({ type: 'font', path: `${ASSETS}/${file}` }), file).toBe(false);
	});
});
