// The shop as buyers meet it under load: the production build on a scratch database with
// the demo seeded, the Stripe stand-in started in this process (the app reaches it with
// the real `stripe` package, its events come back to the app's own webhook route), and
// buyers that are plain HTTP clients with their own cookies, posting the same forms and
// JSON a browser does. Shared by the load-* test files.
import Stripe from 'stripe';
import type { CheckoutForm } from '../../../src/lib/checkout/schema';
import type { Db } from '../../../src/lib/server/db/connect';
import { seedDemo } from '../../../seed/demo';
import { startStripeFake, type StripeFake } from '../../fakes/stripe/server';
import { startApp, type RunningApp } from './app';
import { scratchDatabase, type ScratchDatabase } from './databases';

const API_KEY = 'sk_test_local_fake_load';
const WEBHOOK_SECRET = 'whsec_local_fake_load';
/** Stripe's published test card that pays. */
export const PAYING_CARD = '4242 4242 4242 4242';

export interface LoadShop {
	scratch: ScratchDatabase;
	db: Db;
	app: RunningApp;
	fake: StripeFake;
	/** The test's own client of the stand-in, for what a buyer cannot do (expire a session). */
	stripe: Stripe;
	webhookUrl: string;
	stop(): Promise<void>;
}

/**
 * Starts the shop. With `deliverEvents: false` the stand-in keeps its events until the
 * test sends them itself (`fake.setWebhook({ url: shop.webhookUrl })` then `redeliver`).
 */
export async function startLoadShop(options: { deliverEvents: boolean }): Promise<LoadShop> {
	const scratch = await scratchDatabase();
	await seedDemo(scratch.db, { today: '2026-12-01' });
	const fake = await startStripeFake({
		port: 0,
		apiKey: API_KEY,
		webhookSecret: WEBHOOK_SECRET,
		// Short waits: a delivery the app refused is tried again within the test's time.
		retryDelaysMs: [100, 300, 1_000],
		// A busy shop answers late rather than not at all; the app waits as long for a connection.
		deliveryTimeoutMs: 30_000,
		log: () => {}
	});
	const api = new URL(fake.url);
	let app: RunningApp;
	try {
		app = await startApp({
			DATABASE_URL: scratch.url,
			SHOP_TIME_ZONE: 'America/New_York',
			STRIPE_SECRET_KEY: API_KEY,
			STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET,
			STRIPE_API_HOST: api.hostname,
			STRIPE_API_PORT: api.port,
			STRIPE_API_PROTOCOL: 'http',
			// Nothing listens on the discard port: every forecast is missing, so every ship
			// check after a payment holds the order (a missing forecast always means hold).
			WEATHER_API_URL: 'http://127.0.0.1:9',
			WEATHER_TIMEOUT_MS: '2000'
		});
	} catch (failure) {
		await fake.stop();
		await scratch.drop();
		throw failure;
	}
	const webhookUrl = `${app.origin}/api/stripe/webhook`;
	if (options.deliverEvents) fake.setWebhook({ url: webhookUrl });
	const stripe = new Stripe(API_KEY, {
		host: api.hostname,
		port: Number(api.port),
		protocol: 'http',
		maxNetworkRetries: 0
	});
	return {
		scratch,
		db: scratch.db,
		app,
		fake,
		stripe,
		webhookUrl,
		stop: async () => {
			await fake.stop();
			await app.stop();
			await scratch.drop();
		}
	};
}

/** A live supply listing that is not an animal (leaf litter, say): a shelf count and one price. */
export async function insertSupplyListing(
	db: Db,
	spec: { slug: string; title: string; stock: number; priceCents: number }
): Promise<number> {
	const listing = await db
		.insertInto('listing')
		.values({
			slug: spec.slug,
			kind: 'supply',
			title: spec.title,
			is_live: false,
			state: 'live',
			supply_stock: spec.stock,
			published_at: new Date(),
			base_price_cents: spec.priceCents
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	await db
		.insertInto('price_tier')
		.values({ listing_id: listing.id, min_quantity: 1, price_cents: spec.priceCents })
		.execute();
	return listing.id;
}

/** A checkout form for a buyer in Minneapolis (ZIP 55401), overnight, terms ticked. */
export function buyerAddress(email: string): CheckoutForm {
	return {
		email,
		ship_name: 'Test Buyer',
		ship_line1: '100 Example Ave',
		ship_line2: '',
		ship_city: 'Minneapolis',
		ship_state: 'MN',
		ship_zip: '55401',
		service: 'overnight',
		terms: true
	};
}

/** What a browser asks for when it follows a link or posts a form. */
const HTML = 'text/html,application/xhtml+xml';

export type AddOutcome = { ok: true } | { ok: false; status: number; message: string };

export type CheckoutAnswer =
	{ ok: true; payUrl: string; sessionId: string } | { ok: false; status: number; words: string };

export type PayAnswer = { ok: true; doneUrl: string } | { ok: false; status: number };

/**
 * One person at the shop: a browser without JavaScript for the checkout form (the same
 * action `use:enhance` posts to), and the JSON cart route the add-to-cart button calls.
 * Keeps its own cookies (the signed guest cart) and sends the shop's origin as a browser
 * does, so SvelteKit's cross-site form check lets its form posts through.
 */
export class Buyer {
	private readonly jar = new Map<string, string>();
	/** Every HTTP status this buyer was answered with, in order. */
	readonly statuses: number[] = [];

	constructor(
		private readonly origin: string,
		readonly email: string
	) {}

	private async send(url: string, init: RequestInit = {}): Promise<Response> {
		const headers = new Headers(init.headers);
		const sameSite = url.startsWith(this.origin);
		if (sameSite && this.jar.size > 0)
			headers.set('cookie', [...this.jar].map(([name, value]) => `${name}=${value}`).join('; '));
		if (sameSite && init.method && init.method !== 'GET') headers.set('origin', this.origin);
		const response = await fetch(url, { ...init, headers, redirect: 'manual' });
		this.statuses.push(response.status);
		if (sameSite)
			for (const line of response.headers.getSetCookie()) {
				const [pair = ''] = line.split(';');
				const cut = pair.indexOf('=');
				const name = pair.slice(0, cut).trim();
				const value = pair.slice(cut + 1).trim();
				if (/max-age=0|expires=thu, 01 jan 1970/i.test(line) || value === '') this.jar.delete(name);
				else this.jar.set(name, value);
			}
		return response;
	}

	/** The add-to-cart button: POST /api/cart. */
	async add(listingId: number, quantity: number): Promise<AddOutcome> {
		const response = await this.send(`${this.origin}/api/cart`, {
			method: 'POST',
			headers: { 'content-type': 'application/json', accept: 'application/json' },
			body: JSON.stringify({ listingId, quantity })
		});
		const body = (await response.json().catch(() => ({}))) as { message?: string };
		if (response.ok) return { ok: true };
		return { ok: false, status: response.status, message: body.message ?? '' };
	}

	/** The checkout form posted: a 303 to the pay page, or the page again with its notice. */
	async checkout(form: CheckoutForm): Promise<CheckoutAnswer> {
		const fields = new URLSearchParams();
		for (const [key, value] of Object.entries(form)) {
			if (key === 'terms') {
				if (value) fields.set('terms', 'on');
			} else fields.set(key, String(value));
		}
		const response = await this.send(`${this.origin}/checkout`, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: HTML },
			body: fields.toString()
		});
		if (response.status === 303) {
			const payUrl = response.headers.get('location') ?? '';
			await response.arrayBuffer();
			const sessionId = /\/pay\/([^/?#]+)/.exec(payUrl)?.[1] ?? '';
			return { ok: true, payUrl, sessionId: decodeURIComponent(sessionId) };
		}
		return { ok: false, status: response.status, words: alertText(await response.text()) };
	}

	/** Stripe's pay page, paid with a test card: a 303 back to the shop's success page. */
	async pay(payUrl: string, card = PAYING_CARD): Promise<PayAnswer> {
		const response = await this.send(payUrl, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: new URLSearchParams({ card }).toString()
		});
		await response.arrayBuffer();
		if (response.status !== 303) return { ok: false, status: response.status };
		return { ok: true, doneUrl: response.headers.get('location') ?? '' };
	}

	/** Any page of the shop, as text. */
	async page(url: string): Promise<{ status: number; html: string }> {
		const response = await this.send(url, { headers: { accept: HTML } });
		return { status: response.status, html: await response.text() };
	}
}

const ENTITIES: Record<string, string> = {
	'&amp;': '&',
	'&lt;': '<',
	'&gt;': '>',
	'&quot;': '"',
	'&#39;': "'",
	'&#x27;': "'",
	'&nbsp;': ' '
};

/** The text of the page's role="alert" notices (what a screen reader announces), tags stripped. */
export function alertText(html: string): string {
	const found: string[] = [];
	const opening = /<div[^>]*\brole="alert"[^>]*>/g;
	for (let match = opening.exec(html); match; match = opening.exec(html)) {
		// Notices nest two levels of divs; take everything up to the notice's own close.
		let depth = 1;
		let at = match.index + match[0].length;
		const tags = /<\/?div\b[^>]*>/g;
		tags.lastIndex = at;
		for (let tag = tags.exec(html); tag && depth > 0; tag = tags.exec(html)) {
			depth += tag[0].startsWith('</') ? -1 : 1;
			at = tag.index;
		}
		found.push(html.slice(match.index + match[0].length, at));
	}
	return found
		.join(' ')
		.replace(/<!--[\s\S]*?-->/g, '')
		.replace(/<[^>]+>/g, ' ')
		.replace(/&[#\w]+;/g, (entity) => ENTITIES[entity] ?? entity)
		.replace(/\s+/g, ' ')
		.trim();
}

/** Runs `work` over `items` with at most `lanes` at once, in the items' order. */
export async function inLanes<T, R>(
	items: readonly T[],
	lanes: number,
	work: (item: T, index: number) => Promise<R>
): Promise<R[]> {
	const results: R[] = new Array<R>(items.length);
	let next = 0;
	await Promise.all(
		Array.from({ length: Math.min(lanes, items.length) }, async () => {
			while (next < items.length) {
				const index = next++;
				results[index] = await work(items[index]!, index);
			}
		})
	);
	return results;
}
