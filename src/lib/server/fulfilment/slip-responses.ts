// Answers of the slip routes: the PDF itself, or a refusal that says why. A keeper who
// clicked a slip link gets a small page in the shop's look with the reason and a way
// back; a script gets the same sentence as plain text. (The routes are +server.ts files,
// since a page cannot answer with a PDF, so the refusal cannot use the app's error page.)
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { icons, type IconName, type IconShape } from '$lib/components/icons';

/** The PDF, shown in the browser's viewer (`inline`) or saved (`attachment`). */
export function pdfResponse(
	pdf: Uint8Array,
	filename: string,
	disposition: 'inline' | 'attachment' = 'inline'
): Response {
	return new Response(new Blob([new Uint8Array(pdf)], { type: 'application/pdf' }), {
		headers: {
			'content-type': 'application/pdf',
			'content-length': String(pdf.length),
			'content-disposition': `${disposition}; filename="${filename.replace(/[^\w.-]/g, '_')}"`,
			// Slips carry buyers' addresses: never kept by a shared cache.
			'cache-control': 'private, no-store'
		}
	});
}

/** One of the shop's line icons as inline SVG, as Icon.svelte draws it. */
function iconSvg(name: IconName, size: number): string {
	const drawn: readonly IconShape[] = icons[name];
	const shapes = drawn.map((shape) => {
		const fill = shape.fill ? 'currentColor' : 'none';
		if ('d' in shape) return `<path d="${shape.d}" fill="${fill}"/>`;
		if ('cx' in shape)
			return `<circle cx="${shape.cx}" cy="${shape.cy}" r="${shape.r}" fill="${fill}"/>`;
		return `<rect x="${shape.x}" y="${shape.y}" width="${shape.width}" height="${shape.height}" rx="${shape.rx ?? 0}" fill="${fill}"/>`;
	});
	return `<svg width="${size}" height="${size}" viewBox="0 0 24 24" fill="none" stroke="currentColor" stroke-width="1.8" stroke-linecap="round" stroke-linejoin="round" aria-hidden="true">${shapes.join('')}</svg>`;
}

function escapeHtml(text: string): string {
	return text.replace(/[&<>"']/g, (char) => `&#${char.charCodeAt(0)};`);
}

/** True when the asker reads HTML (a browser tab) rather than text or JSON. */
export function wantsHtml(request: Request): boolean {
	const accept = request.headers.get('accept') ?? '';
	return /\btext\/html\b/.test(accept);
}

let faceRules: string | undefined;

/** Source Sans 3 (regular and bold, Latin) inlined: this page stands outside the app's styles. */
function fontFaces(): string {
	if (faceRules !== undefined) return faceRules;
	const require = createRequire(import.meta.url);
	faceRules = (
		[
			[400, 'source-sans-3-latin-400-normal.woff2'],
			[700, 'source-sans-3-latin-700-normal.woff2']
		] as const
	)
		.map(([weight, file]) => {
			const data = readFileSync(require.resolve(`@fontsource/source-sans-3/files/${file}`));
			return `@font-face{font-family:"Source Sans 3";font-weight:${weight};font-display:swap;src:url(data:font/woff2;base64,${data.toString('base64')}) format("woff2")}`;
		})
		.join('\n');
	return faceRules;
}

/**
 * A refusal: the status, one sentence, and for a browser a link back. Brick and the stop
 * shape sit beside the words "Not printed", so the state never rests on colour alone.
 */
export function refusalResponse(
	request: Request,
	status: 400 | 404 | 409,
	reason: string,
	back: { href: string; label: string }
): Response {
	if (!wantsHtml(request))
		return new Response(`${reason}\n`, {
			status,
			headers: { 'content-type': 'text/plain; charset=utf-8', 'cache-control': 'no-store' }
		});
	const page = `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Not printed · Hatchlot</title>
<style>
${fontFaces()}
body{margin:0;background:#faf7f0;color:#24221d;font:1.0625rem/1.65 "Source Sans 3",ui-sans-serif,system-ui,sans-serif}
main{max-width:38rem;margin:3rem auto;padding:0 1.25rem}
.notice{display:flex;gap:.75rem;align-items:flex-start;border:1px solid #d8826b;border-left-width:4px;background:#fbefeb;border-radius:.5rem;padding:1rem 1.25rem}
h1{margin:0 0 .25rem;font-size:1.25rem;line-height:1.35}
p{margin:0}
a{display:inline-flex;align-items:center;min-height:2.75rem;margin-top:1.25rem;padding:0 1rem;border-radius:.5rem;background:#2f5227;color:#fff;font-weight:600;text-decoration:none}
a:focus-visible{outline:3px solid #4e7a3f;outline-offset:2px}
svg{flex:none;color:#a4402b}
</style>
</head>
<body>
<main>
<div class="notice" role="alert">
${iconSvg('stop', 26)}
<div><h1>Not printed</h1><p>${escapeHtml(reason)}</p></div>
</div>
<a href="${escapeHtml(back.href)}">${escapeHtml(back.label)}</a>
</main>
</body>
</html>
`;
	return new Response(page, {
		status,
		headers: { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-store' }
	});
}
