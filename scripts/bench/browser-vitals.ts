// Lab Core Web Vitals in headless Chromium (the system's browser, never a downloaded one):
// each load in a fresh browser context, so nothing is cached, the pages taken in turn.
import { chromium } from '@playwright/test';
// The flags the end-to-end tests launch Chromium with.
import { CHROMIUM_ARGS } from '../../tests/e2e/playwright.config';
import { BenchError } from './load';
import {
	readVitalsSample,
	summariseVitals,
	VITALS_COLLECTOR,
	VITALS_READER,
	type PageVitals,
	type VitalsSample
} from './vitals';

export interface VitalsPage {
	label: string;
	url: string;
}

export interface Viewport {
	label: string;
	width: number;
	height: number;
}

export interface VitalsOptions {
	executablePath: string;
	pages: readonly VitalsPage[];
	viewports: readonly Viewport[];
	/** Loads of each page at each viewport; the pages are taken in turn within a round. */
	rounds: number;
	/** How long to leave a page after the network is quiet, for late shifts and paints. */
	settleMs: number;
	timeoutMs: number;
}

export interface PageVitalsAt extends PageVitals {
	page: string;
	url: string;
	viewport: string;
	width: number;
	height: number;
}

/** Every page at every viewport, `rounds` cold loads each, taken in turn (A B A B …). */
export async function measureVitals(options: VitalsOptions): Promise<PageVitalsAt[]> {
	const browser = await chromium.launch({
		executablePath: options.executablePath,
		args: CHROMIUM_ARGS,
		timeout: options.timeoutMs
	});
	const samples = new Map<string, VitalsSample[]>();
	const key = (page: VitalsPage, viewport: Viewport) => `${page.label}\u0000${viewport.label}`;
	try {
		for (let round = 0; round < options.rounds; round++)
			for (const viewport of options.viewports)
				for (const page of options.pages) {
					const sample = await coldLoad(browser, page, viewport, options);
					const list = samples.get(key(page, viewport)) ?? [];
					list.push(sample);
					samples.set(key(page, viewport), list);
				}
	} finally {
		await browser.close();
	}
	const result: PageVitalsAt[] = [];
	for (const viewport of options.viewports)
		for (const page of options.pages) {
			let summary: PageVitals;
			try {
				summary = summariseVitals(samples.get(key(page, viewport)) ?? []);
			} catch (error) {
				throw new BenchError(
					`${page.url} at ${viewport.width}×${viewport.height}: ${error instanceof Error ? error.message : String(error)}`
				);
			}
			result.push({
				page: page.label,
				url: page.url,
				viewport: viewport.label,
				width: viewport.width,
				height: viewport.height,
				...summary
			});
		}
	return result;
}

type Browser = Awaited<ReturnType<typeof chromium.launch>>;

async function coldLoad(
	browser: Browser,
	target: VitalsPage,
	viewport: Viewport,
	options: VitalsOptions
): Promise<VitalsSample> {
	const context = await browser.newContext({
		viewport: { width: viewport.width, height: viewport.height }
	});
	try {
		await context.addInitScript({ content: VITALS_COLLECTOR });
		const page = await context.newPage();
		const response = await page.goto(target.url, {
			waitUntil: 'load',
			timeout: options.timeoutMs
		});
		if (!response || response.status() !== 200)
			throw new BenchError(`${target.url} answered ${response?.status() ?? 'nothing'} in Chromium`);
		await page.waitForLoadState('networkidle', { timeout: options.timeoutMs });
		await page.waitForTimeout(options.settleMs);
		try {
			return readVitalsSample(await page.evaluate(VITALS_READER));
		} catch (error) {
			throw new BenchError(
				`${target.url}: ${error instanceof Error ? error.message : String(error)}`
			);
		}
	} finally {
		await context.close();
	}
}
