import { describe, expect, it } from 'vitest';
import {
	immutableAssetUrls,
	linkHeaderTargets,
	nextPageUrl,
	pageScriptUrls,
	percentile,
	staticImportUrls,
	textTable
} from './measure';

describe('percentile (nearest rank)', () => {
	it('matches the worked examples of the nearest-rank method', () => {
		// Wikipedia, "Percentile", nearest-rank method examples (values from memory).
		const five = [15, 20, 35, 40, 50];
		expect(percentile(five, 5)).toBe(15);
		expect(percentile(five, 30)).toBe(20);
		expect(percentile(five, 40)).toBe(20);
		expect(percentile(five, 50)).toBe(35);
		expect(percentile(five, 100)).toBe(50);
		const ten = [3, 6, 7, 8, 8, 10, 13, 15, 16, 20];
		expect(percentile(ten, 25)).toBe(7);
		expect(percentile(ten, 50)).toBe(8);
		expect(percentile(ten, 75)).toBe(15);
		expect(percentile(ten, 100)).toBe(20);
	});

	it('does not care about input order and refuses an empty list', () => {
		const values = Array.from({ length: 200 }, (_, i) => (i * 37) % 200);
		// 95th of 0..199: rank ceil(0.95 × 200) = 190, the value 189.
		expect(percentile(values, 95)).toBe(189);
		expect(() => percentile([], 95)).toThrow(RangeError);
		expect(() => percentile([1], 0)).toThrow(RangeError);
	});
});

describe('linkHeaderTargets', () => {
	it('reads the examples of RFC 8288 section 3.5', () => {
		const header =
			'</TheBook/chapter2>; rel="previous"; title*=UTF-8\'de\'letztes%20Kapitel, ' +
			'</TheBook/chapter4>; rel="next"; title*=UTF-8\'de\'n%c3%a4chstes%20Kapitel';
		expect(linkHeaderTargets(header, 'next')).toEqual(['/TheBook/chapter4']);
		expect(linkHeaderTargets(header, 'previous')).toEqual(['/TheBook/chapter2']);
		// Several relation types in one rel parameter.
		const multi = '<http://example.org/>; rel="start http://example.net/relation/other"';
		expect(linkHeaderTargets(multi, 'start')).toEqual(['http://example.org/']);
		expect(linkHeaderTargets(null, 'next')).toEqual([]);
	});
});

// The shape of a page the production build serves: styles in the HTML, modulepreloads in
// the Link header, and an inline bootstrap importing the entry points by relative URL.
const PAGE = 'http://127.0.0.1:3299/catalogue?after=abc';
const HTML = `<!doctype html><html><head>
<link href="./_app/immutable/assets/0.C9j4Fegz.css" rel="stylesheet">
<link rel="modulepreload" href="./_app/immutable/chunks/inline.js">
<script src="https://cdn.example.com/x.js"></script>
</head><body><nav>
<a href="/catalogue?after=one&amp;sort=new" rel="prev">Newer</a>
<a class="button" rel="next" href="/catalogue?after=two&amp;sort=new">Older</a>
</nav><script>
	Promise.all([
		import("./_app/immutable/entry/start.CpRC4Dnb.js"),
		import("./_app/immutable/entry/app.Diad51h1.js")
	]).then(([kit, app]) => { kit.start(app, element, {}); });
</script></body></html>`;
const LINK =
	'<./_app/immutable/assets/0.C9j4Fegz.css>; rel="preload"; as="style"; nopush, ' +
	'<./_app/immutable/entry/start.CpRC4Dnb.js>; rel="modulepreload"; nopush, ' +
	'<./_app/immutable/nodes/0.B51oVZ_O.js>; rel="modulepreload"; nopush';

describe('reading a page', () => {
	it('finds the rel="next" link and resolves it against the page', () => {
		expect(nextPageUrl(HTML, PAGE)).toBe('http://127.0.0.1:3299/catalogue?after=two&sort=new');
		expect(nextPageUrl('<a href="/x" rel="prev">back</a>', PAGE)).toBeNull();
		expect(nextPageUrl('<link rel="next" href="?after=z">', PAGE)).toBe(
			'http://127.0.0.1:3299/catalogue?after=z'
		);
	});

	it('lists the scripts under /_app/ once each, from the HTML, the Link header and the bootstrap', () => {
		expect(pageScriptUrls(HTML, LINK, PAGE).sort()).toEqual(
			[
				'http://127.0.0.1:3299/_app/immutable/chunks/inline.js',
				'http://127.0.0.1:3299/_app/immutable/entry/app.Diad51h1.js',
				'http://127.0.0.1:3299/_app/immutable/entry/start.CpRC4Dnb.js',
				'http://127.0.0.1:3299/_app/immutable/nodes/0.B51oVZ_O.js'
			].sort()
		);
	});

	it('lists immutable assets for the static-file target', () => {
		const assets = immutableAssetUrls(HTML, LINK, PAGE);
		expect(assets).toContain('http://127.0.0.1:3299/_app/immutable/assets/0.C9j4Fegz.css');
		expect(assets).toContain('http://127.0.0.1:3299/_app/immutable/nodes/0.B51oVZ_O.js');
		expect(assets.every((url) => new URL(url).pathname.startsWith('/_app/immutable/'))).toBe(true);
	});
});

describe('staticImportUrls', () => {
	it('follows static imports and re-exports of a minified module, not dynamic ones', () => {
		const source =
			'import{a as t,b as e}from"../chunks/DKRMSL_i.js";import"../chunks/side.js";' +
			'const n=()=>import("../nodes/3.js");export{s as default}from"./y.js";' +
			"import{x}from'../chunks/single.js';";
		const base = 'http://127.0.0.1:3299/_app/immutable/entry/app.js';
		expect(staticImportUrls(source, base).sort()).toEqual(
			[
				'http://127.0.0.1:3299/_app/immutable/chunks/DKRMSL_i.js',
				'http://127.0.0.1:3299/_app/immutable/chunks/side.js',
				'http://127.0.0.1:3299/_app/immutable/chunks/single.js',
				'http://127.0.0.1:3299/_app/immutable/entry/y.js'
			].sort()
		);
	});
});

describe('textTable', () => {
	it('pads the first column left and the others right', () => {
		expect(
			textTable(
				['what', 'n'],
				[
					['a', '10'],
					['bbb', '2']
				]
			)
		).toBe(['what   n', '----  --', 'a     10', 'bbb    2'].join('\n'));
	});

	it('aligns columns as asked', () => {
		expect(
			textTable(
				['what', 'n', 'note'],
				[
					['a', '10', 'x'],
					['bbb', '2', 'longer']
				],
				['left', 'right', 'left']
			)
		).toBe(['what   n  note', '----  --  ------', 'a     10  x', 'bbb    2  longer'].join('\n'));
	});
});
