// Pure helpers of `npm run bench`: percentiles, and reading a page's HTML and Link header
// for the files it loads and its next page. No I/O here, so each is unit-tested.

/** The nearest-rank percentile (p in (0, 100]) of a list of numbers. */
export function percentile(values: readonly number[], p: number): number {
	if (values.length === 0) throw new RangeError('percentile of an empty list');
	if (!(p > 0 && p <= 100)) throw new RangeError(`percentile ${p} is outside (0, 100]`);
	const sorted = [...values].sort((a, b) => a - b);
	const rank = Math.ceil((p / 100) * sorted.length);
	return sorted[rank - 1] as number;
}

const ENTITIES: Record<string, string> = {
	'&amp;': '&',
	'&quot;': '"',
	'&#39;': "'",
	'&#x27;': "'",
	'&lt;': '<',
	'&gt;': '>'
};

/** An attribute value as the browser reads it (the entities SvelteKit and Svelte escape). */
export function decodeAttribute(value: string): string {
	return value.replace(/&(?:amp|quot|#39|#x27|lt|gt);/g, (entity) => ENTITIES[entity] ?? entity);
}

function attribute(tag: string, name: string): string | null {
	const match = new RegExp(`\\s${name}\\s*=\\s*(?:"([^"]*)"|'([^']*)'|([^\\s>]+))`, 'i').exec(tag);
	if (!match) return null;
	return decodeAttribute(match[1] ?? match[2] ?? match[3] ?? '');
}

function relTokens(tag: string): string[] {
	return (attribute(tag, 'rel') ?? '').toLowerCase().split(/\s+/).filter(Boolean);
}

/** The address of the page's rel="next" link (an `<a>` or a `<link>`), or null on the last page. */
export function nextPageUrl(html: string, pageUrl: string): string | null {
	for (const match of html.matchAll(/<(?:a|link)\b[^>]*>/gi)) {
		const tag = match[0];
		if (!relTokens(tag).includes('next')) continue;
		const href = attribute(tag, 'href');
		if (href) return new URL(href, pageUrl).href;
	}
	return null;
}

/** Targets of an HTTP Link header with the given rel, e.g. SvelteKit's modulepreload list. */
export function linkHeaderTargets(header: string | null, rel: string): string[] {
	if (!header) return [];
	const targets: string[] = [];
	for (const match of header.matchAll(/<([^>]*)>([^,<]*)/g)) {
		const params = match[2] ?? '';
		const relMatch = /;\s*rel\s*=\s*"?([^";]+)"?/i.exec(params);
		const rels = (relMatch?.[1] ?? '').toLowerCase().split(/\s+/);
		if (rels.includes(rel)) targets.push(match[1] ?? '');
	}
	return targets;
}

function underApp(href: string, pageUrl: string): string | null {
	const url = new URL(href, pageUrl);
	return url.pathname.startsWith('/_app/') ? url.href : null;
}

/**
 * The JavaScript modules a page starts loading: `<script src>`, `<link rel="modulepreload">`
 * (in the HTML or, as SvelteKit sends them, in the Link header) and the inline bootstrap's
 * `import("…")`, only those under /_app/, as absolute URLs without repeats.
 */
export function pageScriptUrls(html: string, linkHeader: string | null, pageUrl: string): string[] {
	const found = new Set<string>();
	const add = (href: string | null) => {
		const url = href ? underApp(href, pageUrl) : null;
		if (url) found.add(url);
	};
	for (const match of html.matchAll(/<script\b[^>]*>/gi)) add(attribute(match[0], 'src'));
	for (const match of html.matchAll(/<link\b[^>]*>/gi)) {
		if (relTokens(match[0]).includes('modulepreload')) add(attribute(match[0], 'href'));
	}
	for (const target of linkHeaderTargets(linkHeader, 'modulepreload')) add(target);
	for (const match of html.matchAll(/\bimport\(\s*(["'])([^"']+)\1\s*\)/g)) add(match[2] ?? null);
	return [...found];
}

/** Files under /_app/immutable/ that the page names (scripts, styles, fonts), for a static-file target. */
export function immutableAssetUrls(
	html: string,
	linkHeader: string | null,
	pageUrl: string
): string[] {
	const found = new Set<string>();
	const consider = (href: string) => {
		const url = new URL(href, pageUrl);
		if (url.pathname.startsWith('/_app/immutable/')) found.add(url.href);
	};
	for (const match of html.matchAll(/\s(?:src|href)\s*=\s*"([^"]+)"/gi))
		consider(decodeAttribute(match[1] ?? ''));
	for (const target of linkHeader?.matchAll(/<([^>]*)>/g) ?? []) consider(target[1] ?? '');
	return [...found];
}

/**
 * The modules a built (minified) ES module imports statically: `import … from "./x.js"`,
 * `import "./x.js"` and `export … from "./x.js"`. Dynamic `import("…")` is left out: the
 * browser fetches those only when another page needs them.
 */
export function staticImportUrls(source: string, moduleUrl: string): string[] {
	const found = new Set<string>();
	const pattern = /(?:\bfrom\s*|\bimport\s*)(["'])(\.{1,2}\/[^"'\n]+?\.m?js)\1/g;
	for (const match of source.matchAll(pattern)) {
		// `import("./x.js")` has a parenthesis between import and the quote, so it never matches.
		found.add(new URL(match[2] ?? '', moduleUrl).href);
	}
	return [...found];
}

/**
 * A plain text table. Each column is aligned as `align` says; by default the first column
 * is left-aligned and the rest, numbers mostly, right-aligned.
 */
export function textTable(
	header: readonly string[],
	rows: readonly (readonly string[])[],
	align: readonly ('left' | 'right')[] = []
): string {
	const all = [header, ...rows];
	const widths = header.map((_, col) => Math.max(...all.map((row) => (row[col] ?? '').length)));
	const left = (col: number) => (align[col] ?? (col === 0 ? 'left' : 'right')) === 'left';
	const line = (row: readonly string[]) =>
		row
			.map((cell, col) =>
				left(col) ? cell.padEnd(widths[col] ?? 0) : cell.padStart(widths[col] ?? 0)
			)
			.join('  ')
			.trimEnd();
	return [line(header), widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(line)].join('\n');
}
