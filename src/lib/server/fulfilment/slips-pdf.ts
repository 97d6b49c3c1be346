// Packing slips and care cards as one PDF (pdfkit), in the order given: per order a
// slip page (more when its lines run long), then a care card per species in the box.
// Source Sans 3 is embedded from the installed @fontsource files; codes are drawn as
// vector rectangles from bwip-js's encoder, so they stay sharp at any printer's dpi.
// Geometry comes from $lib/fulfilment/slip-layout; words from the care sheet and the
// slip rules; this module only draws.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import bwipjs from 'bwip-js/node';
import PDFDocument from 'pdfkit';
import type { CareLine, CareSection, CareSheet } from '$lib/care/care-sheet';
import { icons, type IconName, type IconShape } from '$lib/components/icons';
import { formatShopDate } from '$lib/format/dates';
import { formatCount, serviceLabels, sexLabels, stageLabels } from '$lib/format/labels';
import { formatHours } from '$lib/orders/timeline';
import {
	PAGE_MARGIN,
	PAPER_SIZES,
	fitScale,
	flowColumns,
	fontRuns,
	linearBars,
	matrixRuns,
	planSlipBody,
	slipFrame,
	unicodeRangeTest,
	type Box,
	type SlipFrame
} from '$lib/fulfilment/slip-layout';
import { PACK_WORDS, packInstruction, unitCountText } from '$lib/fulfilment/slip-rules';
import type { Service, SlipPaper } from '../db/schema';
import type { SlipLine, SlipOrder } from './slip-data';
import { woffToSfnt } from './woff';

export interface RenderSlipsOptions {
	paper: SlipPaper;
	/** Called after each order's pages, with how many orders are done; awaited. */
	onProgress?: (doneCount: number) => void | Promise<void>;
}

// ---- colours: the design tokens of tailwind.config.ts, for paper.

const COLOUR = {
	ink: '#24221d',
	inkSoft: '#524d42',
	inkMuted: '#6b6558',
	rule: '#e6ddcb',
	paper: '#faf7f0',
	moss: '#2f5227',
	mossLight: '#eff4eb',
	mossLine: '#8fb27c',
	loam: '#6c533b',
	loamLight: '#f4efe6',
	loamLine: '#d4c4a8',
	amber: '#82520c',
	amberLight: '#fdf6e4',
	amberLine: '#bd7e14',
	brick: '#7f3121',
	white: '#ffffff'
} as const;

// ---- fonts

type Weight = 'regular' | 'semibold' | 'bold' | 'italic';

const WEIGHT_FILES: Record<Weight, string> = {
	regular: '400-normal',
	semibold: '600-normal',
	bold: '700-normal',
	italic: '400-italic'
};

/** The script subsets @fontsource ships, latin first: a character takes the first that has it. */
const SUBSETS = [
	'latin',
	'latin-ext',
	'vietnamese',
	'greek',
	'greek-ext',
	'cyrillic',
	'cyrillic-ext'
] as const;

interface Face {
	name: string;
	data: Buffer;
	covers: (codePoint: number) => boolean;
}

let faceCache: Record<Weight, Face[]> | undefined;

/** Every weight's faces, read once per process from node_modules. */
function faces(): Record<Weight, Face[]> {
	if (faceCache) return faceCache;
	const require = createRequire(import.meta.url);
	const ranges = JSON.parse(
		readFileSync(require.resolve('@fontsource/source-sans-3/unicode.json'), 'utf8')
	) as Record<string, string>;
	const loaded = {} as Record<Weight, Face[]>;
	for (const weight of Object.keys(WEIGHT_FILES) as Weight[]) {
		loaded[weight] = SUBSETS.map((subset) => ({
			name: `source-sans-3-${subset}-${WEIGHT_FILES[weight]}`,
			data: woffToSfnt(
				readFileSync(
					require.resolve(
						`@fontsource/source-sans-3/files/source-sans-3-${subset}-${WEIGHT_FILES[weight]}.woff`
					)
				)
			),
			covers: unicodeRangeTest(ranges[subset] ?? '')
		}));
	}
	faceCache = loaded;
	return loaded;
}

// ---- drawing

interface TextStyle {
	size: number;
	weight?: Weight;
	color?: string;
	/** Extra space between lines; generous by default, as the look asks. */
	lineGap?: number;
	align?: 'left' | 'center' | 'right';
	characterSpacing?: number;
}

interface Segment {
	text: string;
	weight?: Weight;
	color?: string;
}

/** A new pdfkit document with every face registered (parsed only when first used). */
function newDocument(options: PDFKit.PDFDocumentOptions): PDFKit.PDFDocument {
	// No built-in Helvetica: every glyph comes from the embedded Source Sans 3.
	const doc = new PDFDocument({ ...options, autoFirstPage: false, font: '' });
	const all = faces();
	for (const weight of Object.keys(all) as Weight[])
		for (const face of all[weight]) doc.registerFont(face.name, face.data);
	return doc;
}

/** Scratch pages between flushes of the measuring document, so it never grows large. */
const MEASURES_PER_PAGE = 300;

/** pdfkit with the shop's faces, colours and icons. */
class Sheet {
	readonly doc: PDFKit.PDFDocument;
	private readonly faces = faces();
	/**
	 * A second document, never saved, where texts are set to learn their height: the
	 * same wrapping code as the real page, so mixed faces measure exactly.
	 */
	private readonly scratch: PDFKit.PDFDocument;
	private measures = 0;

	constructor(
		readonly paper: SlipPaper,
		info: { title: string; author: string }
	) {
		this.doc = newDocument({
			info: { Title: info.title, Author: info.author, Creator: 'Hatchlot' },
			displayTitle: true,
			lang: 'en-US'
		});
		this.scratch = newDocument({});
		this.scratch.on('data', () => undefined);
	}

	addPage(): void {
		const { width, height } = PAPER_SIZES[this.paper];
		// Margins of 0: every block is placed by hand, so pdfkit never breaks a page itself.
		this.doc.addPage({ size: [width, height], margin: 0 });
	}

	private lineGap(style: TextStyle): number {
		return style.lineGap ?? style.size * 0.28;
	}

	/** The height a text takes in `width`, set exactly as `write` would set it. */
	measure(segments: Segment[] | string, width: number, style: TextStyle): number {
		if (this.measures % MEASURES_PER_PAGE === 0)
			this.scratch.addPage({ size: [2000, 100_000], margin: 0 });
		this.measures += 1;
		return this.paint(this.scratch, segments, 0, 0, width, style);
	}

	/** Draws a paragraph of one or more styled segments; returns the height it took. */
	write(
		segments: Segment[] | string,
		x: number,
		y: number,
		width: number,
		style: TextStyle
	): number {
		return this.paint(this.doc, segments, x, y, width, style);
	}

	private paint(
		doc: PDFKit.PDFDocument,
		segments: Segment[] | string,
		x: number,
		y: number,
		width: number,
		style: TextStyle
	): number {
		const parts: Segment[] = typeof segments === 'string' ? [{ text: segments }] : segments;
		const runs = parts.flatMap((part) => {
			const weight = part.weight ?? style.weight ?? 'regular';
			const weightFaces = this.faces[weight];
			return fontRuns(
				part.text,
				weightFaces.map((face) => face.covers)
			).map((run) => ({
				text: run.text,
				font: weightFaces[run.face]!.name,
				color: part.color ?? style.color ?? COLOUR.ink
			}));
		});
		if (runs.length === 0) return 0;
		const options = {
			width,
			lineGap: this.lineGap(style),
			align: style.align ?? 'left',
			characterSpacing: style.characterSpacing
		};
		runs.forEach((run, index) => {
			doc.font(run.font).fontSize(style.size).fillColor(run.color);
			const continued = index < runs.length - 1;
			if (index === 0) doc.text(run.text, x, y, { ...options, continued });
			else doc.text(run.text, { ...options, continued });
		});
		return doc.y - y;
	}

	/** One line that must not wrap, shrunk to fit `width` if it is too long. */
	line(text: string, x: number, y: number, width: number, style: TextStyle): number {
		this.doc.font(this.faces[style.weight ?? 'regular'][0]!.name).fontSize(style.size);
		const natural = this.doc.widthOfString(text, { characterSpacing: style.characterSpacing });
		const size = style.size * fitScale(natural, width, 1);
		this.write(text, x, y, width + 1, { ...style, size, lineGap: 0 });
		return size * 1.25;
	}

	/** One of the shop's 24 × 24 line icons, drawn at `size` points. */
	icon(name: IconName, x: number, y: number, size: number, color: string): void {
		const doc = this.doc;
		doc.save();
		doc.translate(x, y).scale(size / 24);
		doc.lineWidth(1.8).lineCap('round').lineJoin('round');
		const shapes: readonly IconShape[] = icons[name];
		for (const shape of shapes) {
			if ('d' in shape) doc.path(shape.d);
			else if ('cx' in shape) doc.circle(shape.cx, shape.cy, shape.r);
			else doc.roundedRect(shape.x, shape.y, shape.width, shape.height, shape.rx ?? 0);
			if (shape.fill) doc.fillColor(color).fill();
			else doc.strokeColor(color).stroke();
		}
		doc.restore();
	}

	panel(box: Box, fill: string, stroke: string, options: { radius?: number; width?: number } = {}) {
		this.doc
			.roundedRect(box.x, box.y, box.width, box.height, options.radius ?? 6)
			.lineWidth(options.width ?? 0.8)
			.fillAndStroke(fill, stroke);
	}

	rule(x: number, y: number, width: number, color: string = COLOUR.rule, lineWidth = 0.6): void {
		this.doc
			.moveTo(x, y)
			.lineTo(x + width, y)
			.lineWidth(lineWidth)
			.strokeColor(color)
			.stroke();
	}

	tickBox(x: number, y: number, size = 9): void {
		this.doc.rect(x, y, size, size).lineWidth(0.9).strokeColor(COLOUR.inkSoft).stroke();
	}

	/** A QR code (ISO/IEC 18004, level M) of `text`, `size` points square with its 4-module quiet zone. */
	qrCode(text: string, x: number, y: number, size: number): void {
		const [symbol] = bwipjs.raw('qrcode', text, 'eclevel=M') as {
			pixs: number[];
			pixx: number;
			pixy: number;
		}[];
		if (!symbol) throw new Error('the QR encoder returned nothing');
		const quiet = 4;
		const module = size / (symbol.pixx + 2 * quiet);
		this.doc.rect(x, y, size, size).fill(COLOUR.white);
		for (const run of matrixRuns(symbol.pixs, symbol.pixx))
			this.doc.rect(
				x + (quiet + run.x) * module,
				y + (quiet + run.y) * module,
				run.width * module,
				module
			);
		this.doc.fill(COLOUR.ink);
	}

	/** A Code 128 (ISO/IEC 15417) of `text`, centred in `width`, with 10-module quiet zones. */
	code128(text: string, x: number, y: number, width: number, height: number): void {
		let widths: number[];
		try {
			const [symbol] = bwipjs.raw('code128', text, {}) as { sbs: number[] }[];
			widths = symbol?.sbs ?? [];
		} catch {
			// A number the symbology cannot carry: the text beneath still says it.
			return;
		}
		const { bars, modules } = linearBars(widths);
		const quiet = 10;
		const module = fitScale(modules + 2 * quiet, width, 1.6);
		const left = x + (width - modules * module) / 2;
		this.doc
			.rect(left - quiet * module, y, (modules + 2 * quiet) * module, height)
			.fill(COLOUR.white);
		for (const bar of bars) this.doc.rect(left + bar.x * module, y, bar.width * module, height);
		this.doc.fill(COLOUR.ink);
	}

	end(): Promise<Uint8Array> {
		const chunks: Buffer[] = [];
		const done = new Promise<Uint8Array>((resolve, reject) => {
			this.doc.on('data', (chunk: Buffer) => chunks.push(chunk));
			this.doc.on('end', () => resolve(new Uint8Array(Buffer.concat(chunks))));
			this.doc.on('error', reject);
		});
		this.doc.end();
		return done;
	}
}

// ---- words

const TRANSIT_WORDS: Record<Service, string> = {
	overnight: '1 day in transit',
	two_day: '2 days in transit'
};

/** Calendar dates carry no zone; 'UTC' only tells the formatter not to shift the day. */
function day(date: string | null): string {
	return date ? formatShopDate(date, 'UTC') : 'not set';
}

function kicker(sheet: Sheet, text: string, x: number, y: number, color: string = COLOUR.loam) {
	return sheet.write(text.toUpperCase(), x, y, 400, {
		size: 7.5,
		weight: 'semibold',
		color,
		characterSpacing: 0.35,
		lineGap: 1
	});
}

// ---- the slip page

function drawHeader(
	sheet: Sheet,
	frame: SlipFrame,
	order: SlipOrder,
	kickerText: string,
	rightTitle: string
): void {
	const { header } = frame;
	sheet.line(order.shop.name, header.x, header.y, header.width * 0.58, {
		size: 18,
		weight: 'bold',
		color: COLOUR.moss
	});
	sheet.write(
		`Captive-bred invertebrates · ships from ${order.shop.origin}`,
		header.x,
		header.y + 24,
		header.width * 0.6,
		{ size: 9, color: COLOUR.inkMuted }
	);
	const rightWidth = header.width * 0.4;
	const rightX = header.x + header.width - rightWidth;
	sheet.write(kickerText.toUpperCase(), rightX, header.y + 1, rightWidth, {
		size: 7.5,
		weight: 'semibold',
		color: COLOUR.loam,
		characterSpacing: 0.35,
		align: 'right',
		lineGap: 1
	});
	sheet.write(rightTitle, rightX, header.y + 11, rightWidth, {
		size: 20,
		weight: 'bold',
		align: 'right',
		lineGap: 0
	});
	sheet.rule(header.x, header.y + header.height, header.width, COLOUR.moss, 1.4);
}

/** The 4 × 6 in label: from, ship to, service, the handling panel, and the order's code. */
function drawLabel(sheet: Sheet, frame: SlipFrame, order: SlipOrder): void {
	const { label } = frame;
	const doc = sheet.doc;
	doc.save();
	doc
		.rect(label.x, label.y, label.width, label.height)
		.lineWidth(0.8)
		.dash(5, { space: 3 })
		.strokeColor(COLOUR.loamLine)
		.stroke();
	doc.restore();
	sheet.write(
		'Box label, 4 × 6 in: cut along the dashed line and fix it to the lid.',
		label.x,
		label.y + label.height + 4,
		label.width,
		{ size: 7.5, color: COLOUR.inkMuted, lineGap: 0 }
	);

	const pad = 14;
	const x = label.x + pad;
	const width = label.width - 2 * pad;
	let y = label.y + pad;

	y += kicker(sheet, 'From', x, y);
	y += sheet.line(order.shop.name, x, y, width, { size: 10, weight: 'semibold' });
	y += sheet.line(order.shop.origin, x, y, width, { size: 9, color: COLOUR.inkSoft });
	y += 6;
	sheet.rule(x, y, width);
	y += 7;

	// A long name or address gets smaller type, and then the handling panel drops its
	// small print, so the label never runs into its own code.
	const codeHeight = 40;
	const foot = label.y + label.height - pad;
	const room = foot - 15 - codeHeight - 8 - y - STRIP_HEIGHT - 8;
	const rules = order.hasLive ? LIVE_HANDLING : SUPPLY_HANDLING;
	const fit = [1, 0.9, 0.8]
		.flatMap((scale) => [false, true].map((compact) => ({ scale, compact })))
		.find(
			({ scale, compact }) =>
				drawAddress(sheet, order, x, y, width, scale, true) +
					handlingHeight(rules.length, compact) <=
				room
		) ?? { scale: 0.7, compact: true };
	y += drawAddress(sheet, order, x, y, width, fit.scale, false);

	// The service strip: what the carrier must honour.
	const strip = { x, y, width, height: STRIP_HEIGHT };
	sheet.panel(strip, COLOUR.moss, COLOUR.moss, { radius: 4 });
	sheet.icon('van', x + 7, y + 4, 18, COLOUR.white);
	sheet.line(serviceLabels[order.service].toUpperCase(), x + 30, y + 6, 110, {
		size: 13,
		weight: 'bold',
		color: COLOUR.white,
		characterSpacing: 0.5
	});
	sheet.write(`Leaves ${day(order.shipDate)}`, x + 130, y + 8, width - 138, {
		size: 8.5,
		color: COLOUR.white,
		align: 'right',
		lineGap: 0
	});
	y += strip.height + 8;

	drawHandlingPanel(sheet, { x, y, width, height: 0 }, rules, order.hasLive, fit.compact);

	// The order number as text and as Code 128, at the foot of the label.
	sheet.write(order.orderNumber, x, foot - 13, width, {
		size: 10,
		weight: 'semibold',
		align: 'center',
		lineGap: 0
	});
	sheet.code128(order.orderNumber, x, foot - 15 - codeHeight, width, codeHeight);
}

const STRIP_HEIGHT = 26;

/** The "ship to" block at `scale` of its type; draws it unless `measureOnly`. Returns its height. */
function drawAddress(
	sheet: Sheet,
	order: SlipOrder,
	x: number,
	y: number,
	width: number,
	scale: number,
	measureOnly: boolean
): number {
	const to = order.shipTo;
	const blocks: [string, TextStyle][] = [
		[to.name, { size: 15 * scale, weight: 'bold', lineGap: 1 }],
		[to.line1, { size: 13 * scale, lineGap: 1 }],
		...(to.line2.trim()
			? [[to.line2, { size: 13 * scale, lineGap: 1 }] as [string, TextStyle]]
			: []),
		[`${to.city}, ${to.state} ${to.zip}`, { size: 14 * scale, weight: 'bold', lineGap: 1 }]
	];
	let height = measureOnly
		? sheet.measure('SHIP TO', width, { size: 7.5, weight: 'semibold', lineGap: 1 })
		: kicker(sheet, 'Ship to', x, y);
	for (const [text, style] of blocks)
		height += measureOnly
			? sheet.measure(text, width, style)
			: sheet.write(text, x, y + height, width, style);
	return height + 8;
}

interface HandlingRule {
	icon: IconName | 'up';
	title: string;
	detail: string;
}

/** The box's handling rules: our own panel, a band and four rules each with its shape. */
const LIVE_HANDLING: HandlingRule[] = [
	{
		icon: 'thermometer',
		title: 'Keep at room temperature',
		detail: 'Indoors, away from heaters, vents and cold floors.'
	},
	{
		icon: 'slash-circle',
		title: 'Never leave in sun, heat or frost',
		detail: 'Not on a doorstep, in a mailbox or in a parked vehicle.'
	},
	{
		icon: 'parcel',
		title: 'Open as soon as it arrives',
		detail: 'Check every animal the moment it comes.'
	},
	{ icon: 'up', title: 'This side up', detail: 'Carry it level and set it down gently.' }
];

/** A box of supplies only: nothing in it can die, so the panel says so. */
const SUPPLY_HANDLING: HandlingRule[] = [
	{
		icon: 'leaf',
		title: 'Keep dry',
		detail: 'Substrate, leaves and wood keep best sealed, cool and dry.'
	},
	{ icon: 'up', title: 'This side up', detail: 'Carry it level and set it down gently.' }
];

const HANDLING_BAND = 38;

function handlingHeight(rules: number, compact: boolean): number {
	return HANDLING_BAND + rules * (compact ? 16 : 25) + 8;
}

function drawHandlingPanel(
	sheet: Sheet,
	area: Box,
	rules: readonly HandlingRule[],
	live: boolean,
	compact: boolean
): number {
	const band = HANDLING_BAND;
	const row = compact ? 16 : 25;
	const height = handlingHeight(rules.length, compact);
	const doc = sheet.doc;
	sheet.panel({ ...area, height }, COLOUR.white, COLOUR.moss, { radius: 6, width: 2 });
	// The band: the panel's top, filled, with its words.
	doc.save();
	doc.roundedRect(area.x, area.y, area.width, height, 6).clip();
	doc.rect(area.x, area.y, area.width, band).fill(COLOUR.moss);
	doc.restore();
	sheet.write(live ? 'LIVE ANIMALS' : 'KEEPING SUPPLIES', area.x, area.y + 5, area.width, {
		size: 19,
		weight: 'bold',
		color: COLOUR.white,
		align: 'center',
		characterSpacing: 1,
		lineGap: 0
	});
	const subtitle = live ? 'Captive-bred invertebrates inside' : 'No live animals inside';
	sheet.write(subtitle, area.x, area.y + 26, area.width, {
		size: 8,
		color: COLOUR.mossLight,
		align: 'center',
		lineGap: 0
	});
	let y = area.y + band + 6;
	for (const rule of rules) {
		const iconX = area.x + 10;
		const iconSize = compact ? 13 : 17;
		if (rule.icon === 'up') drawThisSideUp(sheet, iconX, y + 1, iconSize);
		else sheet.icon(rule.icon, iconX, y + 1, iconSize, COLOUR.moss);
		sheet.write(rule.title, area.x + 34, y, area.width - 42, {
			size: 10,
			weight: 'bold',
			lineGap: 0
		});
		if (!compact)
			sheet.write(rule.detail, area.x + 34, y + 12, area.width - 42, {
				size: 7.5,
				color: COLOUR.inkSoft,
				lineGap: 0
			});
		y += row;
	}
	return height;
}

/** Two upright arrows over a base line: the "this way up" mark of ISO 780. */
function drawThisSideUp(sheet: Sheet, x: number, y: number, size: number): void {
	const doc = sheet.doc;
	doc.save();
	doc.translate(x, y).scale(size / 24);
	doc.lineWidth(1.8).lineCap('round').lineJoin('round').strokeColor(COLOUR.moss);
	doc.path('M8 19V5M4.5 8.5 8 5l3.5 3.5M16 19V5M12.5 8.5 16 5l3.5 3.5M3.5 21.5h17').stroke();
	doc.restore();
}

/** Beside the label: shipping facts, packs, facility pickup, care cards, the packer's checks. */
function drawSide(sheet: Sheet, frame: SlipFrame, order: SlipOrder): void {
	const { side } = frame;
	const pad = 10;
	const inner = side.width - 2 * pad;
	let y = side.y;

	// Shipping facts.
	const facts: [string, string][] = [
		['Service', `${serviceLabels[order.service]} (${TRANSIT_WORDS[order.service]})`],
		['Leaves', day(order.shipDate)],
		['Arrives', order.expectedDelivery ? `${day(order.expectedDelivery)}, expected` : 'not set'],
		['Ordered by', `${order.customer.name}\n${order.customer.email}`]
	];
	const labelWidth = 62;
	const factHeights = facts.map(([, value]) =>
		Math.max(13, sheet.measure(value, inner - labelWidth, { size: 9.5 }))
	);
	const factsHeight = 14 + factHeights.reduce((a, b) => a + b + 3, 0) + 2 * pad - 3;
	sheet.panel(
		{ x: side.x, y, width: side.width, height: factsHeight },
		COLOUR.loamLight,
		COLOUR.loamLine
	);
	let fy = y + pad;
	fy += kicker(sheet, 'Shipping', side.x + pad, fy);
	facts.forEach(([name, value], index) => {
		sheet.write(name, side.x + pad, fy, labelWidth, {
			size: 8.5,
			weight: 'semibold',
			color: COLOUR.inkSoft
		});
		sheet.write(value, side.x + pad + labelWidth, fy - 0.5, inner - labelWidth, { size: 9.5 });
		fy += factHeights[index]! + 3;
	});
	y += factsHeight + 8;

	// Packs: amber when one goes in (it needs care), moss when none.
	const instruction = packInstruction(order.packs);
	const packNote = instruction
		? order.packs
				.map((pack) =>
					pack === 'heat'
						? 'Heat packs can overheat a sealed box: fix it to the lid, away from the animals’ cups, and keep the air holes open.'
						: 'Wrap the cold pack and fix it to the lid, away from the animals’ cups: cold from touching can kill.'
				)
				.join(' ')
		: order.hasLive
			? 'The forecast on the route stays inside the shop’s limits.'
			: 'Nothing live in this box.';
	y += drawNotePanel(
		sheet,
		{ x: side.x, y, width: side.width, height: 0 },
		{
			tone: instruction ? 'care' : 'calm',
			icon: instruction ? 'thermometer' : 'check-circle',
			title: instruction ?? 'No packs',
			kickerText: 'Packs',
			body: packNote
		}
	);
	y += 8;

	if (order.facilityPickup) {
		y += drawNotePanel(
			sheet,
			{ x: side.x, y, width: side.width, height: 0 },
			{
				tone: 'care',
				icon: 'caution',
				title: 'Hold at a carrier facility',
				kickerText: 'Delivery',
				body: 'The weather at the buyer is near the shop’s limits: send it to a staffed carrier facility to be held for pickup, and the buyer collects it the day it arrives.'
			}
		);
		y += 8;
	}

	// The packer's last look before the lid goes on.
	const cards = order.careSheets.map((card) => card.title);
	const checks: (Segment[] | null)[] = [
		[{ text: 'Every line below counted into the box' }],
		order.packs.length
			? [{ text: `${order.packs.map((p) => PACK_WORDS[p]).join(' and ')} added` }]
			: null,
		cards.length
			? [
					{ text: cards.length === 1 ? 'Care card: ' : 'Care cards: ' },
					{ text: cards.join(', '), weight: 'semibold' as const },
					{ text: ' (the pages after this one)' }
				]
			: null,
		[{ text: 'This slip inside, air holes open, label on the lid' }]
	];
	y += 2;
	y += kicker(sheet, 'Before the lid goes on', side.x, y);
	for (const check of checks) {
		if (!check) continue;
		sheet.tickBox(side.x + 1, y + 1.5);
		y += sheet.write(check, side.x + 16, y, side.width - 16, { size: 9, lineGap: 2 }) + 2;
	}
}

type Tone = 'care' | 'calm' | 'plain';

const TONES: Record<Tone, { fill: string; line: string; icon: string }> = {
	care: { fill: COLOUR.amberLight, line: COLOUR.amberLine, icon: COLOUR.amber },
	calm: { fill: COLOUR.mossLight, line: COLOUR.mossLine, icon: COLOUR.moss },
	plain: { fill: COLOUR.paper, line: COLOUR.loamLine, icon: COLOUR.loam }
};

/** A small panel: kicker, shape and title, then a sentence. Returns its height. */
function drawNotePanel(
	sheet: Sheet,
	area: Box,
	note: { tone: Tone; icon: IconName; title: string; kickerText: string; body: string }
): number {
	const pad = 8;
	const textX = area.x + pad + 24;
	const textWidth = area.width - pad * 2 - 24;
	const bodyHeight = sheet.measure(note.body, textWidth, { size: 8.5 });
	const titleHeight = sheet.measure(note.title, textWidth, {
		size: 11.5,
		weight: 'bold',
		lineGap: 1
	});
	const height = pad + 11 + titleHeight + 2 + bodyHeight + pad - 2;
	const tone = TONES[note.tone];
	sheet.panel({ ...area, height }, tone.fill, tone.line);
	let y = area.y + pad;
	kicker(sheet, note.kickerText, textX, y);
	sheet.icon(note.icon, area.x + pad, y + 4, 18, tone.icon);
	y += 11;
	y += sheet.write(note.title, textX, y, textWidth, { size: 11.5, weight: 'bold', lineGap: 1 });
	y += 2;
	sheet.write(note.body, textX, y, textWidth, { size: 8.5, color: COLOUR.inkSoft });
	return height;
}

// ---- the lines table

interface Column {
	title: string;
	width: number;
	align?: 'left' | 'right';
}

function lineColumns(width: number): Column[] {
	const fixed: Column[] = [
		{ title: '', width: 18 },
		{ title: 'In the box', width: 0 },
		{ title: 'Stage', width: 62 },
		{ title: 'Sex', width: 56 },
		{ title: 'Units', width: 90 },
		{ title: 'Animals', width: 48, align: 'right' },
		{ title: 'Clutch', width: 54, align: 'right' }
	];
	const used = fixed.reduce((sum, column) => sum + column.width, 0);
	fixed[1]!.width = width - used;
	return fixed;
}

const HEAD_HEIGHT = 18;
const ROW_PAD = 4;

function lineTitle(line: SlipLine): Segment[] {
	if (line.kind === 'animal' && line.commonName)
		return [
			{ text: line.commonName, weight: 'semibold' },
			{ text: `  ${line.scientificName ?? ''}`, weight: 'italic', color: COLOUR.inkSoft }
		];
	return [{ text: line.description, weight: 'semibold' }];
}

function refundNote(line: SlipLine): string | null {
	if (line.refundedUnits === 0) return null;
	return line.units === 0
		? 'Refunded: leave it out.'
		: `${line.refundedUnits} refunded: pack ${line.units}.`;
}

function rowHeight(sheet: Sheet, line: SlipLine, columns: Column[]): number {
	const width = columns[1]!.width - 6;
	let height = sheet.measure(lineTitle(line), width, { size: 9.5, lineGap: 1 });
	const note = refundNote(line);
	if (note) height += sheet.measure(note, width, { size: 8 }) + 1;
	return Math.max(height, 13) + 2 * ROW_PAD;
}

function drawTableHead(sheet: Sheet, x: number, y: number, columns: Column[]): void {
	const width = columns.reduce((sum, c) => sum + c.width, 0);
	sheet.doc.rect(x, y, width, HEAD_HEIGHT).fill(COLOUR.loamLight);
	let cx = x;
	for (const column of columns) {
		if (column.title)
			sheet.write(column.title.toUpperCase(), cx + 3, y + 5.5, column.width - 6, {
				size: 7.5,
				weight: 'semibold',
				color: COLOUR.loam,
				characterSpacing: 0.3,
				align: column.align ?? 'left',
				lineGap: 0
			});
		cx += column.width;
	}
}

function drawRow(
	sheet: Sheet,
	line: SlipLine,
	x: number,
	y: number,
	columns: Column[],
	height: number
) {
	const cells: (string | null)[] = [
		null,
		null,
		line.stage ? stageLabels[line.stage] : '',
		line.kind === 'animal' ? sexLabels[line.sex] : '',
		line.kind === 'animal'
			? unitCountText(line.units, line.unitSize, line.sex)
			: formatCount(line.units, 'item'),
		line.animals === null ? '' : String(line.animals),
		line.clutchCode ?? ''
	];
	const leftOut = line.units === 0;
	let cx = x;
	columns.forEach((column, index) => {
		const top = y + ROW_PAD;
		if (index === 0) sheet.tickBox(cx + 3, top + 1.5);
		else if (index === 1) {
			const width = column.width - 6;
			const used = sheet.write(lineTitle(line), cx + 3, top, width, { size: 9.5, lineGap: 1 });
			const note = refundNote(line);
			if (note) {
				// Brick and a cross: a refund is a loss, said in words and shape.
				sheet.icon('x-circle', cx + 3, top + used + 1.5, 9, COLOUR.brick);
				sheet.write(note, cx + 15, top + used + 1, width - 12, {
					size: 8,
					weight: 'semibold',
					color: COLOUR.brick
				});
			}
		} else {
			sheet.write(cells[index] ?? '', cx + 3, top + 0.5, column.width - 6, {
				size: index === 5 ? 10 : 9,
				weight: index === 5 ? 'bold' : 'regular',
				align: column.align ?? 'left',
				color: leftOut ? COLOUR.inkMuted : COLOUR.ink,
				lineGap: 1
			});
		}
		cx += column.width;
	});
	sheet.rule(
		x,
		y + height,
		columns.reduce((sum, c) => sum + c.width, 0)
	);
}

// ---- the guarantee

interface GuaranteeParts {
	title: string;
	terms: string[];
	steps: Segment[][];
	code: string;
	codeCaption: string;
}

function guaranteeParts(order: SlipOrder): GuaranteeParts {
	if (!order.hasLive)
		return {
			title: 'Nothing live in this box',
			terms: [
				'The live-arrival guarantee covers live animals; these are keeping supplies.',
				'Something missing or damaged? Tell us from your order page.'
			],
			steps: [[{ text: 'Your order: ', weight: 'semibold' }, { text: order.orderUrl }]],
			code: order.orderUrl,
			codeCaption: 'Scan for your order'
		};
	const window = formatHours(order.claimWindowHours);
	return {
		title: 'Live-arrival guarantee',
		code: order.claimUrl,
		codeCaption: 'Scan to report a loss',
		terms: [
			`Report a loss within ${window} of the carrier marking the box delivered.`,
			'Photograph the animals as they arrived, before moving them out of the packing.',
			'Accept the box on the first delivery attempt, not redirected; collect a held box the day it arrives.',
			'Shipping is not refunded.'
		],
		steps: [
			[
				{ text: 'When it arrives: ', weight: 'semibold' },
				{
					text: 'open the box at once, at room temperature, and check every animal. If one has died, take the photo before you move anything, then scan the code or open '
				},
				{ text: order.claimUrl, weight: 'semibold' },
				{ text: '.' }
			]
		]
	};
}

const QR_SIZE = 76;

function guaranteeHeight(sheet: Sheet, order: SlipOrder, width: number): number {
	const textWidth = width - QR_SIZE - 3 * 10;
	const { terms, steps } = guaranteeParts(order);
	const termsHeight = terms.reduce(
		(sum, term) => sum + sheet.measure(term, textWidth - 10, { size: 8.5, lineGap: 1.5 }),
		0
	);
	const stepsHeight = steps.reduce(
		(sum, step) => sum + sheet.measure(step, textWidth, { size: 8.5, lineGap: 1.5 }),
		0
	);
	return Math.max(8 + 14 + termsHeight + 3 + stepsHeight + 8, QR_SIZE + 28);
}

function drawGuarantee(sheet: Sheet, order: SlipOrder, box: Box): void {
	sheet.panel(box, COLOUR.paper, COLOUR.loamLine);
	const pad = 8;
	const textX = box.x + pad + 2;
	const textWidth = box.width - QR_SIZE - 3 * 10;
	let y = box.y + pad;
	sheet.icon('check-circle', textX, y - 1, 13, COLOUR.moss);
	const { title, terms, steps, code, codeCaption } = guaranteeParts(order);
	sheet.write(title, textX + 17, y, textWidth - 17, {
		size: 10.5,
		weight: 'bold',
		lineGap: 0
	});
	y += 14;
	for (const term of terms) {
		sheet.doc.circle(textX + 3, y + 5, 1.3).fill(COLOUR.loam);
		y += sheet.write(term, textX + 10, y, textWidth - 10, { size: 8.5, lineGap: 1.5 });
	}
	y += 3;
	for (const step of steps)
		y += sheet.write(step, textX, y, textWidth, { size: 8.5, lineGap: 1.5 });

	const qrX = box.x + box.width - pad - QR_SIZE;
	sheet.qrCode(code, qrX, box.y + pad, QR_SIZE);
	sheet.write(codeCaption, qrX - 6, box.y + pad + QR_SIZE + 2, QR_SIZE + 12, {
		size: 7.5,
		weight: 'semibold',
		align: 'center',
		color: COLOUR.inkSoft,
		lineGap: 0
	});
}

function drawFooter(sheet: Sheet, order: SlipOrder, text: string, pageNote: string): void {
	const { width, height } = PAPER_SIZES[sheet.paper];
	const y = height - PAGE_MARGIN + 7;
	// Local rules ride on every slip page, whatever is in the box.
	sheet.write(text, PAGE_MARGIN, y, width - 2 * PAGE_MARGIN - 120, {
		size: 6.5,
		color: COLOUR.inkMuted,
		lineGap: 0
	});
	sheet.write(`${order.orderNumber} · ${pageNote}`, width - PAGE_MARGIN - 120, y, 120, {
		size: 6.5,
		color: COLOUR.inkMuted,
		align: 'right',
		lineGap: 0
	});
}

/** One line at the foot of every slip page; the care card carries the full sentence. */
const LOCAL_RULES_FOOTER =
	'Some invertebrates need a permit to cross state lines (in the US, USDA APHIS): check your state’s rules. The breeder holds its own permits.';

function drawSlip(sheet: Sheet, order: SlipOrder): void {
	const frame = slipFrame(sheet.paper);
	const columns = lineColumns(frame.body.width);
	const heights = order.lines.map((line) => rowHeight(sheet, line, columns));
	const totalRow = 20;
	const guarantee = guaranteeHeight(sheet, order, frame.body.width);
	// The total row rides with the last line, so the plan counts it in that row's height.
	const planned = heights.map((height, index) =>
		index === heights.length - 1 ? height + totalRow : height
	);
	const pages = planSlipBody(
		planned,
		HEAD_HEIGHT,
		guarantee + 8,
		frame.body.height,
		frame.nextBody.height
	);

	pages.forEach((page, pageIndex) => {
		sheet.addPage();
		const first = pageIndex === 0;
		drawHeader(
			sheet,
			frame,
			order,
			first ? 'Packing slip' : `Packing slip, continued`,
			order.orderNumber
		);
		const body = first ? frame.body : frame.nextBody;
		if (first) {
			drawLabel(sheet, frame, order);
			drawSide(sheet, frame, order);
		}
		let y = body.y;
		if (page.lines.length > 0) {
			drawTableHead(sheet, body.x, y, columns);
			y += HEAD_HEIGHT;
			for (const index of page.lines) {
				drawRow(sheet, order.lines[index]!, body.x, y, columns, heights[index]!);
				y += heights[index]!;
			}
			if (page.lines.includes(order.lines.length - 1)) {
				const animals = order.lines.reduce((sum, line) => sum + (line.animals ?? 0), 0);
				const items = order.lines
					.filter((line) => line.kind === 'supply')
					.reduce((sum, line) => sum + line.units, 0);
				const total = [
					animals > 0 ? formatCount(animals, 'animal') : null,
					items > 0 ? formatCount(items, 'supply item') : null
				]
					.filter(Boolean)
					.join(' and ');
				sheet.write(
					`In the box: ${total || 'nothing left to pack'}`,
					body.x,
					y + 5,
					body.width - 3,
					{
						size: 9.5,
						weight: 'bold',
						align: 'right',
						lineGap: 0
					}
				);
				y += totalRow;
			}
			y += 8;
		}
		if (page.guarantee)
			drawGuarantee(sheet, order, { x: body.x, y, width: body.width, height: guarantee });
		drawFooter(sheet, order, LOCAL_RULES_FOOTER, `slip page ${pageIndex + 1} of ${pages.length}`);
	});
}

// ---- the care card

const SECTION_PAD = 8;
const SECTION_GAP = 10;

function careLineSegments(line: CareLine, inCautions: boolean): Segment[] {
	const segments: Segment[] = [];
	if (line.label) segments.push({ text: `${line.label}: `, weight: 'semibold' });
	else if (line.tone === 'caution' && !inCautions)
		// Outside the Cautions section the word travels with the shape.
		segments.push({ text: 'Caution: ', weight: 'semibold' });
	segments.push({ text: line.text });
	return segments;
}

function sectionHeight(sheet: Sheet, section: CareSection, width: number): number {
	const inCautions = section.id === 'cautions';
	const textWidth = width - 2 * SECTION_PAD - 14;
	const lines = section.lines.reduce(
		(sum, line) =>
			sum +
			sheet.measure(careLineSegments(line, inCautions), textWidth, { size: 8.5, lineGap: 1.5 }) +
			3,
		0
	);
	return SECTION_PAD + 16 + lines + SECTION_PAD - 3;
}

function drawSection(sheet: Sheet, section: CareSection, box: Box): void {
	const inCautions = section.id === 'cautions';
	sheet.panel(
		box,
		inCautions ? COLOUR.amberLight : COLOUR.paper,
		inCautions ? COLOUR.amberLine : COLOUR.rule,
		{ width: inCautions ? 1.2 : 0.8 }
	);
	let y = box.y + SECTION_PAD;
	const x = box.x + SECTION_PAD;
	if (inCautions) sheet.icon('caution', x, y - 1, 13, COLOUR.amber);
	sheet.write(section.title, x + (inCautions ? 17 : 0), y, box.width - 2 * SECTION_PAD, {
		size: 10.5,
		weight: 'bold',
		lineGap: 0
	});
	y += 16;
	const textWidth = box.width - 2 * SECTION_PAD - 14;
	for (const line of section.lines) {
		if (line.tone === 'caution') sheet.icon('caution', x, y, 10, COLOUR.amber);
		else sheet.doc.circle(x + 4, y + 5, 1.3).fill(COLOUR.loam);
		y +=
			sheet.write(careLineSegments(line, inCautions), x + 14, y, textWidth, {
				size: 8.5,
				lineGap: 1.5
			}) + 3;
	}
}

function drawCareCard(sheet: Sheet, order: SlipOrder, card: CareSheet): void {
	const frame = slipFrame(sheet.paper);
	const { header } = frame;
	const inner = header.width;
	const bottom = frame.page.height - PAGE_MARGIN - 4;

	const start = () => {
		sheet.addPage();
		drawHeader(sheet, frame, order, 'Care card for the box of', order.orderNumber);
		drawFooter(
			sheet,
			order,
			`Care notes from ${order.shop.name}: general practice for keepers, not a rule. Follow your local rules first.`,
			'care card'
		);
	};
	start();

	let y = header.y + header.height + 12;
	const x = header.x;
	// Title block: the group's shape, the names.
	sheet.doc.circle(x + 20, y + 20, 20).fill(COLOUR.loamLight);
	sheet.icon(card.group, x + 6, y + 6, 28, COLOUR.loam);
	kicker(sheet, `Care card · ${card.groupLabel}`, x + 52, y);
	sheet.line(card.title, x + 52, y + 10, inner - 52, { size: 18, weight: 'bold' });
	sheet.line(card.scientificName, x + 52, y + 32, inner - 52, {
		size: 11,
		weight: 'italic',
		color: COLOUR.inkSoft
	});
	y += 52;
	if (card.summary) {
		y += sheet.write(card.summary, x, y, inner, { size: 9.5 }) + 6;
	}

	// Cautions first and full width: the things that can hurt the animal or the keeper.
	const cautions = card.sections.find((section) => section.id === 'cautions');
	if (cautions) {
		const height = sectionHeight(sheet, cautions, inner);
		drawSection(sheet, cautions, { x, y, width: inner, height });
		y += height + SECTION_GAP;
	}

	const rest = card.sections.filter((section) => section.id !== 'cautions');
	const columnWidth = (inner - SECTION_GAP) / 2;
	const heights = rest.map((section) => sectionHeight(sheet, section, columnWidth));
	const nextTop = header.y + header.height + 12;
	const placements = flowColumns(heights, bottom - y, bottom - nextTop, 2, SECTION_GAP);
	let page = 0;
	rest.forEach((section, index) => {
		const placed = placements[index]!;
		while (placed.page > page) {
			start();
			page += 1;
		}
		const top = (placed.page === 0 ? y : nextTop) + placed.y;
		drawSection(sheet, section, {
			x: x + placed.column * (columnWidth + SECTION_GAP),
			y: top,
			width: columnWidth,
			height: heights[index]!
		});
	});
}

/**
 * One PDF of the orders' slips and care cards, in the order given, on the shop's paper.
 * `onProgress` hears after each order, so a batch job can show how far it got.
 */
export async function renderSlipsPdf(
	orders: readonly SlipOrder[],
	options: RenderSlipsOptions
): Promise<Uint8Array> {
	const shopName = orders[0]?.shop.name ?? 'Hatchlot';
	const title =
		orders.length === 1
			? `Packing slip ${orders[0]!.orderNumber}`
			: `Packing slips, ${formatCount(orders.length, 'order')}`;
	const sheet = new Sheet(options.paper, { title, author: shopName });
	if (orders.length === 0) throw new RangeError('renderSlipsPdf needs at least one order');
	let done = 0;
	for (const order of orders) {
		drawSlip(sheet, order);
		for (const card of order.careSheets) drawCareCard(sheet, order, card);
		done += 1;
		await options.onProgress?.(done);
	}
	return sheet.end();
}
