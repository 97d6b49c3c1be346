// Which built files a page asks the browser to fetch early. SvelteKit preloads the page's
// JavaScript and CSS by default; we add the Latin faces of Source Sans 3 that the shop's
// header and body text use, so they are usually in before the first paint and the header
// does not jump when they swap in for the fallback font (a layout shift at phone width,
// where the fallback's wider letters wrapped the tagline onto a second line).
import type { Handle } from '@sveltejs/kit';

/** The faces drawn above the fold on every page: body (400), labels (600), headings (700). */
const EARLY_FACES = /\/source-sans-3-latin-(400|600|700)-normal\.[\w-]+\.woff2$/;

/** SvelteKit's `preload` option: scripts and styles as before, plus those three fonts. */
export function shouldPreload({ type, path }: { type: string; path: string }): boolean {
	if (type === 'js' || type === 'css') return true;
	// Every other subset (Cyrillic, Greek, Vietnamese, Latin Extended) and the .woff copies
	// stay lazy: a browser fetches them only for text that needs them.
	return type === 'font' && EARLY_FACES.test(path);
}

export const fontPreload: Handle = ({ event, resolve }) =>
	resolve(event, { preload: shouldPreload });
