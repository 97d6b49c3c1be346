// The geometry of a packing slip and a care card, in PDF points (1/72 in), without a
// PDF in sight: paper sizes, where the 4 × 6 in box label sits, how the lines and the
// guarantee share the pages, how care-card sections flow into two columns, how a code's
// modules become rectangles, and which font face can draw each run of a text.
import type { SlipPaper } from '$lib/server/db/schema';

/** PDF user space: 72 units to the inch (ISO 32000-1, 8.3.2.3). */
export const POINTS_PER_INCH = 72;
const POINTS_PER_MM = POINTS_PER_INCH / 25.4;

export interface Box {
	x: number;
	y: number;
	width: number;
	height: number;
}

/** Page width and height in points, portrait. */
export const PAPER_SIZES: Record<SlipPaper, { width: number; height: number; name: string }> = {
	letter: { width: 8.5 * POINTS_PER_INCH, height: 11 * POINTS_PER_INCH, name: 'US Letter' },
	a4: { width: 210 * POINTS_PER_MM, height: 297 * POINTS_PER_MM, name: 'A4' }
};

/** The box label: 4 in wide, 6 in tall, the common size of a thermal shipping label. */
export const LABEL_SIZE = { width: 4 * POINTS_PER_INCH, height: 6 * POINTS_PER_INCH };

/** A third of an inch: inside what office printers can reach on either paper. */
export const PAGE_MARGIN = 24;
const HEADER_HEIGHT = 40;
const GUTTER = 14;
/** Room under the label for the "cut along the dashed line" note. */
const LABEL_NOTE_HEIGHT = 12;

export interface SlipFrame {
	page: { width: number; height: number };
	/** The shop and order number across the top. */
	header: Box;
	/** The 4 × 6 in label, top left under the header. */
	label: Box;
	/** Beside the label: service, dates, packs, care cards. */
	side: Box;
	/** Under the label, full width: the lines, then the guarantee. */
	body: Box;
	/** A continuation page's body: everything under the header. */
	nextBody: Box;
}

/** Where each part of a slip goes on the given paper. */
export function slipFrame(paper: SlipPaper): SlipFrame {
	const page = PAPER_SIZES[paper];
	const inner = page.width - 2 * PAGE_MARGIN;
	const header = { x: PAGE_MARGIN, y: PAGE_MARGIN, width: inner, height: HEADER_HEIGHT };
	const top = header.y + header.height + 6;
	const label = { x: PAGE_MARGIN, y: top, ...LABEL_SIZE };
	const sideX = label.x + label.width + GUTTER;
	const side = { x: sideX, y: top, width: page.width - PAGE_MARGIN - sideX, height: label.height };
	const bodyY = label.y + label.height + LABEL_NOTE_HEIGHT + 4;
	const bottom = page.height - PAGE_MARGIN;
	return {
		page: { width: page.width, height: page.height },
		header,
		label,
		side,
		body: { x: PAGE_MARGIN, y: bodyY, width: inner, height: bottom - bodyY },
		nextBody: { x: PAGE_MARGIN, y: top, width: inner, height: bottom - top }
	};
}

export interface SlipBodyPage {
	/** Indexes of the line rows on this page, in order. */
	lines: number[];
	/** The guarantee panel closes this page. */
	guarantee: boolean;
}

/**
 * Shares the line rows and the guarantee panel out over the slip's pages: as many rows
 * as fit under the label, then on continuation pages; the guarantee follows the last
 * row, on a page of its own if it does not fit after it. Every page's rows sit under
 * one table head (`headHeight`). A row taller than a whole page still gets a page.
 */
export function planSlipBody(
	rowHeights: readonly number[],
	headHeight: number,
	guaranteeHeight: number,
	firstSpace: number,
	nextSpace: number
): SlipBodyPage[] {
	const pages: SlipBodyPage[] = [];
	let current: SlipBodyPage = { lines: [], guarantee: false };
	let room = firstSpace - headHeight;
	rowHeights.forEach((height, index) => {
		if (height > room && current.lines.length > 0) {
			pages.push(current);
			current = { lines: [], guarantee: false };
			room = nextSpace - headHeight;
		}
		current.lines.push(index);
		room -= height;
	});
	if (guaranteeHeight <= room) pages.push({ ...current, guarantee: true });
	else pages.push(current, { lines: [], guarantee: true });
	return pages;
}

export interface ColumnPlacement {
	page: number;
	column: number;
	/** Offset from the top of the column. */
	y: number;
}

/**
 * Places blocks (care-card sections) in reading order down `columns` columns of a
 * page, balancing them: a column ends once it holds its share of the whole, or when the
 * next block would not fit. Blocks that do not fit on the page go on to the next one,
 * whose columns are `nextHeight` tall.
 */
export function flowColumns(
	heights: readonly number[],
	firstHeight: number,
	nextHeight: number,
	columns: number,
	gap: number
): ColumnPlacement[] {
	const placements: ColumnPlacement[] = [];
	let index = 0;
	for (let page = 0; index < heights.length; page++) {
		const columnHeight = page === 0 ? firstHeight : nextHeight;
		const left = heights.slice(index).reduce((sum, height) => sum + height + gap, 0);
		const share = Math.min(columnHeight, left / columns);
		for (let column = 0; column < columns && index < heights.length; column++) {
			const last = column === columns - 1;
			let y = 0;
			while (index < heights.length) {
				const height = heights[index]!;
				// An empty column always takes the next block, so a block taller than a
				// column still gets one (and every call ends).
				const full = y + height > columnHeight || (!last && y + height / 2 > share);
				if (y > 0 && full) break;
				placements.push({ page, column, y });
				y += height + gap;
				index += 1;
			}
		}
	}
	return placements;
}

/** One horizontal run of dark modules in a 2-D code, in module units. */
export interface ModuleRun {
	x: number;
	y: number;
	width: number;
}

/**
 * The dark modules of a matrix code (row by row, 1 = dark) as horizontal runs, so a QR
 * code is a few hundred rectangles rather than a thousand squares, with no seams.
 */
export function matrixRuns(modules: readonly number[], columns: number): ModuleRun[] {
	if (columns <= 0 || modules.length % columns !== 0)
		throw new RangeError(`${modules.length} modules do not make rows of ${columns}`);
	const runs: ModuleRun[] = [];
	for (let y = 0; y < modules.length / columns; y++) {
		let start = -1;
		for (let x = 0; x <= columns; x++) {
			const dark = x < columns && modules[y * columns + x] === 1;
			if (dark && start < 0) start = x;
			if (!dark && start >= 0) {
				runs.push({ x: start, y, width: x - start });
				start = -1;
			}
		}
	}
	return runs;
}

/** One bar of a linear code: offset and width in modules. */
export interface Bar {
	x: number;
	width: number;
}

/**
 * The bars of a linear code from its alternating bar/space widths (bar first), as
 * bwip-js's raw encoder gives them; `modules` is the symbol's whole width.
 */
export function linearBars(widths: readonly number[]): { bars: Bar[]; modules: number } {
	const bars: Bar[] = [];
	let x = 0;
	widths.forEach((width, index) => {
		if (index % 2 === 0) bars.push({ x, width });
		x += width;
	});
	return { bars, modules: x };
}

/** A piece of text and the index of the first face that can draw all of it. */
export interface FontRun {
	text: string;
	face: number;
}

/**
 * Splits a text into runs each drawable by one face: the first face in `faces` that
 * has the character, or face 0 when none has it (it then shows its missing-glyph box).
 * The shipped Source Sans 3 files are split by script, so "Dvořák" needs two faces.
 */
export function fontRuns(
	text: string,
	faces: readonly ((codePoint: number) => boolean)[]
): FontRun[] {
	const runs: FontRun[] = [];
	for (const char of text) {
		const codePoint = char.codePointAt(0)!;
		// Spaces and line breaks join whatever run they sit in.
		const face = /\s/.test(char)
			? (runs.at(-1)?.face ?? 0)
			: Math.max(
					0,
					faces.findIndex((covers) => covers(codePoint))
				);
		const last = runs.at(-1);
		if (last && last.face === face) last.text += char;
		else runs.push({ text: char, face });
	}
	return runs;
}

/** Scales a size to fit: the largest of `preferred` that keeps `needed × scale ≤ room`. */
export function fitScale(needed: number, room: number, preferred: number): number {
	if (needed <= 0) return preferred;
	return Math.min(preferred, room / needed);
}

/**
 * A CSS `unicode-range` list ("U+0000-00FF,U+0131,U+4??") as a test for one code point
 * (CSS Fonts Level 4, 4.5): the shipped font files say which characters each covers.
 */
export function unicodeRangeTest(ranges: string): (codePoint: number) => boolean {
	const spans = ranges
		.split(',')
		.map((part) => part.trim())
		.filter((part) => part !== '')
		.map((part): [number, number] => {
			const match = /^U\+([0-9A-F?]{1,6})(?:-([0-9A-F]{1,6}))?$/i.exec(part);
			if (!match) throw new SyntaxError(`not a unicode-range: ${part}`);
			const [, first, last] = match as unknown as [string, string, string | undefined];
			if (first.includes('?'))
				return [parseInt(first.replaceAll('?', '0'), 16), parseInt(first.replaceAll('?', 'F'), 16)];
			return [parseInt(first, 16), parseInt(last ?? first, 16)];
		});
	return (codePoint) => spans.some(([low, high]) => codePoint >= low && codePoint <= high);
}
