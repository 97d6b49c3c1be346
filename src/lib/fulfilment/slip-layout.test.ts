import bwipjs from 'bwip-js/node';
import PDFDocument from 'pdfkit';
import { describe, expect, it } from 'vitest';
import {
	LABEL_SIZE,
	PAPER_SIZES,
	flowColumns,
	fontRuns,
	linearBars,
	matrixRuns,
	planSlipBody,
	slipFrame,
	unicodeRangeTest
} from './slip-layout';

/** The page size pdfkit (a general-purpose PDF library) gives a named paper. */
function pdfkitPage(size: 'LETTER' | 'A4'): { width: number; height: number } {
	const doc = new PDFDocument({ size, autoFirstPage: true });
	const { width, height } = doc.page;
	doc.end();
	return { width, height };
}

describe('paper and label', () => {
	it('matches the paper sizes pdfkit knows: US Letter 8.5 × 11 in, ISO 216 A4 210 × 297 mm', () => {
		for (const [paper, name] of [
			['letter', 'LETTER'],
			['a4', 'A4']
		] as const) {
			const reference = pdfkitPage(name);
			expect(PAPER_SIZES[paper].width).toBeCloseTo(reference.width, 1);
			expect(PAPER_SIZES[paper].height).toBeCloseTo(reference.height, 1);
		}
	});

	it('makes the label 4 × 6 in at 72 points to the inch (ISO 32000-1, 8.3.2.3)', () => {
		expect(LABEL_SIZE).toEqual({ width: 288, height: 432 });
	});

	it('keeps label, side column and body inside the page and apart on both papers', () => {
		for (const paper of ['letter', 'a4'] as const) {
			const frame = slipFrame(paper);
			const right = (box: { x: number; width: number }) => box.x + box.width;
			const bottom = (box: { y: number; height: number }) => box.y + box.height;
			expect(frame.label).toMatchObject(LABEL_SIZE);
			expect(frame.side.x).toBeGreaterThan(right(frame.label));
			expect(right(frame.side)).toBeLessThanOrEqual(frame.page.width - 18);
			expect(frame.side.width).toBeGreaterThan(200);
			expect(frame.body.y).toBeGreaterThan(bottom(frame.label));
			expect(bottom(frame.body)).toBeLessThanOrEqual(frame.page.height - 18);
			expect(frame.body.height).toBeGreaterThan(180);
		}
	});
});

describe('the slip body over pages', () => {
	it('keeps everything on the first page when it fits', () => {
		expect(planSlipBody([20, 20, 20], 16, 100, 200, 600)).toEqual([
			{ lines: [0, 1, 2], guarantee: true }
		]);
	});

	it('moves the guarantee to a page of its own when the rows fill the first', () => {
		expect(planSlipBody([40, 40, 40], 16, 100, 200, 600)).toEqual([
			{ lines: [0, 1, 2], guarantee: false },
			{ lines: [], guarantee: true }
		]);
	});

	it('carries rows on to continuation pages, each under its own table head', () => {
		const pages = planSlipBody(Array<number>(30).fill(20), 16, 100, 200, 316);
		// 184 / 20 → 9 rows first; then 300 / 20 → 15; then 6 rows and the guarantee.
		expect(pages.map((page) => page.lines.length)).toEqual([9, 15, 6]);
		expect(pages.map((page) => page.guarantee)).toEqual([false, false, true]);
		expect(pages.flatMap((page) => page.lines)).toEqual([...Array(30).keys()]);
	});

	it('still places a row taller than a page', () => {
		expect(planSlipBody([500], 16, 100, 200, 300)).toEqual([
			{ lines: [0], guarantee: false },
			{ lines: [], guarantee: true }
		]);
	});
});

describe('care-card columns', () => {
	it('fills two columns in reading order, about evenly', () => {
		const placed = flowColumns([100, 100, 100, 100], 1000, 1000, 2, 10);
		expect(placed).toEqual([
			{ page: 0, column: 0, y: 0 },
			{ page: 0, column: 0, y: 110 },
			{ page: 0, column: 1, y: 0 },
			{ page: 0, column: 1, y: 110 }
		]);
	});

	it('goes on to a next page when both columns are full', () => {
		const placed = flowColumns([150, 150, 150, 150, 150], 320, 700, 2, 10);
		expect(placed.map((p) => [p.page, p.column])).toEqual([
			[0, 0],
			[0, 0],
			[0, 1],
			[0, 1],
			[1, 0]
		]);
	});

	it('gives a block taller than a column a column of its own', () => {
		const placed = flowColumns([50, 900, 50], 400, 400, 2, 10);
		expect(placed.map((p) => [p.page, p.column, p.y])).toEqual([
			[0, 0, 0],
			[0, 1, 0],
			[1, 0, 0]
		]);
	});
});

describe('codes as rectangles', () => {
	it('draws every dark module of a QR code from bwip-js once, starting with the 7-module finder row (ISO/IEC 18004)', () => {
		const [symbol] = bwipjs.raw(
			'qrcode',
			'https://shop.example.com/account/orders/HL-10011/claim',
			'eclevel=M'
		) as { pixs: number[]; pixx: number; pixy: number }[];
		const runs = matrixRuns(symbol!.pixs, symbol!.pixx);
		expect(runs[0]).toEqual({ x: 0, y: 0, width: 7 });
		const redrawn = Array<number>(symbol!.pixs.length).fill(0);
		for (const run of runs)
			for (let x = run.x; x < run.x + run.width; x++) redrawn[run.y * symbol!.pixx + x] = 1;
		expect(redrawn).toEqual(symbol!.pixs);
		expect(runs.length).toBeLessThan(symbol!.pixs.filter((m) => m === 1).length);
	});

	it('lays out Code 128 as ISO/IEC 15417 builds it: 11-module symbols of 3 bars, a 13-module stop of 4', () => {
		const [symbol] = bwipjs.raw('code128', 'HL-10011', {}) as { sbs: number[] }[];
		const { bars, modules } = linearBars(symbol!.sbs);
		const symbols = (symbol!.sbs.length - 7) / 6;
		expect(Number.isInteger(symbols)).toBe(true);
		expect(modules).toBe(11 * symbols + 13);
		expect(bars).toHaveLength(3 * symbols + 4);
		// Start code B (ISO/IEC 15417 table 1, value 104): bars and spaces 2 1 1 2 1 4.
		expect(symbol!.sbs.slice(0, 6)).toEqual([2, 1, 1, 2, 1, 4]);
		expect(bars[0]).toEqual({ x: 0, width: 2 });
	});

	it('refuses a module list that is not whole rows', () => {
		expect(() => matrixRuns([1, 0, 1], 2)).toThrow(RangeError);
	});
});

describe('font runs', () => {
	// Stand-ins for the shipped files' coverage: Latin-1, and Latin Extended-A/B.
	const latin = (cp: number) => cp <= 0xff;
	const latinExt = (cp: number) => cp >= 0x100 && cp <= 0x24f;

	it('keeps a plain text in one run of the first face', () => {
		expect(fontRuns('Zoë Calloway, 72 °F', [latin, latinExt])).toEqual([
			{ text: 'Zoë Calloway, 72 °F', face: 0 }
		]);
	});

	it('switches face for the letters only the second face has, spaces staying put', () => {
		expect(fontRuns('Antonín Dvořák Łódź', [latin, latinExt])).toEqual([
			{ text: 'Antonín Dvo', face: 0 },
			{ text: 'ř', face: 1 },
			{ text: 'ák ', face: 0 },
			{ text: 'Ł', face: 1 },
			{ text: 'ód', face: 0 },
			{ text: 'ź', face: 1 }
		]);
	});

	it('falls back to the first face for a character no face has', () => {
		expect(fontRuns('a漢', [latin, latinExt])).toEqual([{ text: 'a漢', face: 0 }]);
	});
});

describe('unicode ranges', () => {
	it('reads the ranges, single points and wildcards of CSS Fonts Level 4', () => {
		const covers = unicodeRangeTest('U+0000-00FF, U+0131,U+4??');
		expect(covers(0x41)).toBe(true);
		expect(covers(0xff)).toBe(true);
		expect(covers(0x100)).toBe(false);
		expect(covers(0x131)).toBe(true);
		expect(covers(0x400)).toBe(true);
		expect(covers(0x4ff)).toBe(true);
		expect(covers(0x500)).toBe(false);
		expect(() => unicodeRangeTest('0000-00FF')).toThrow(SyntaxError);
	});
});
