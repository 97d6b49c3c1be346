// Reading PDFs back in tests with tools from outside the project: pdfjs-dist (Mozilla's
// PDF reader) for text and page sizes, poppler's pdftoppm for the page as pixels, and
// jsQR for the QR codes on it.
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import jsQR from 'jsqr';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';

const run = promisify(execFile);

export interface PdfPage {
	/** The page's text runs joined by single spaces, in drawing order. */
	text: string;
	width: number;
	height: number;
}

export async function readPdf(bytes: Uint8Array): Promise<PdfPage[]> {
	// pdfjs takes ownership of the buffer it is given, so it gets a copy.
	const document = await getDocument({ data: new Uint8Array(bytes), isEvalSupported: false })
		.promise;
	try {
		const pages: PdfPage[] = [];
		for (let number = 1; number <= document.numPages; number++) {
			const page = await document.getPage(number);
			const content = await page.getTextContent();
			const text = content.items
				.map((item) => ('str' in item ? item.str : ''))
				.join(' ')
				.replace(/\s+/g, ' ')
				.trim();
			const [x0, y0, x1, y1] = page.view as [number, number, number, number];
			pages.push({ text, width: x1 - x0, height: y1 - y0 });
		}
		return pages;
	} finally {
		await document.destroy();
	}
}

export interface Raster {
	data: Uint8ClampedArray;
	width: number;
	height: number;
}

/** One page as RGBA pixels, rendered by pdftoppm (poppler-utils) at `dpi`. */
export async function rasterizePage(bytes: Uint8Array, page: number, dpi = 150): Promise<Raster> {
	const dir = await mkdtemp(path.join(tmpdir(), 'hatchlot-pdf-'));
	try {
		const file = path.join(dir, 'in.pdf');
		await writeFile(file, bytes);
		const out = path.join(dir, 'page');
		await run('pdftoppm', [
			'-r',
			String(dpi),
			'-f',
			String(page),
			'-l',
			String(page),
			'-singlefile',
			file,
			out
		]);
		return fromPpm(await readFile(`${out}.ppm`));
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}

/** A binary PPM (P6, 8-bit) as RGBA: the format pdftoppm writes by default. */
function fromPpm(ppm: Buffer): Raster {
	const header = /^P6\s+(\d+)\s+(\d+)\s+(\d+)\s/.exec(ppm.toString('latin1', 0, 64));
	if (!header || header[3] !== '255') throw new Error('pdftoppm did not write an 8-bit P6 file');
	const width = Number(header[1]);
	const height = Number(header[2]);
	const pixels = ppm.subarray(header[0].length);
	const data = new Uint8ClampedArray(width * height * 4);
	for (let i = 0, j = 0; i < width * height; i++, j += 3) {
		data[i * 4] = pixels[j]!;
		data[i * 4 + 1] = pixels[j + 1]!;
		data[i * 4 + 2] = pixels[j + 2]!;
		data[i * 4 + 3] = 255;
	}
	return { data, width, height };
}

/** The text of the QR code jsQR finds on the image, or null. */
export function decodeQr(image: Raster): string | null {
	return jsQR(image.data, image.width, image.height)?.data ?? null;
}
