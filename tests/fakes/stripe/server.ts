// The local stand-in for the Stripe endpoints the shop calls, reached by the real
// `stripe` npm package configured with host/port/protocol. Objects follow the shapes in
// Stripe's API reference (Checkout Session, PaymentIntent, Charge, Refund, Event) with
// the fields the shop reads; amounts are integers in the currency's smallest unit.
//
//   POST /v1/checkout/sessions               GET /v1/checkout/sessions/:id
//   POST /v1/checkout/sessions/:id/expire    GET /v1/payment_intents/:id
//   POST /v1/refunds                         GET /v1/refunds/:id
//   GET|POST /pay/:session                   the pay page at the session's `url`
//
// Requests are form-encoded with bracket keys; `Authorization: Bearer <apiKey>` is
// required; `Idempotency-Key` replays a 2xx answer to the same body and refuses another
// body (400 idempotency_error). Errors are `{ error: { type, code, message, param } }`.
//
// Events (checkout.session.completed / .expired / .async_payment_failed, charge.refunded,
// refund.updated) are POSTed to the webhook URL, signed `Stripe-Signature: t=…,v1=…`;
// a non-2xx answer or a network error is retried after each of `retryDelaysMs`.
//
// Test controls (this fake only, JSON bodies):
//   POST /test/reset                    objects, logs, holds and modes cleared
//   GET  /test/requests                 API requests received {method, path, idempotencyKey, body, status}
//   GET  /test/events                   events made, each with its delivery attempts
//   POST /test/events/:id/deliver       {times?, delayMs?, concurrent?} deliver again (twice, late)
//   POST /test/webhook                  {url?, delayMs?} where events go; delay before each first try
//   POST /test/hold  /  POST /test/release {order?: 'created'|'reverse'|[event ids]}  out of order
//   POST /test/mode                     {mode: 'ok'|'fail'|'close'} fail = API answers 500, close = hangs up
//   POST /test/sessions/:id/pay         {card} pay without the browser (402 with the decline)
//   POST /test/sessions/:id/async-payment-failed   completes unpaid, then the delayed payment fails
//   POST /test/refunds/:id/fail         the refund fails later (refund.updated, money back on the charge)
//   POST /test/payment-intents          {id, amount, currency?, amountRefunded?} a card payment made
//                                       before this fake started (the demo's seeded orders), so it
//                                       can be looked up and refunded
// GET /health answers while it runs.
import { randomBytes } from 'node:crypto';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { z } from 'zod';
import { FormBodyError, parseFormBody, type FormObject, type FormValue } from './form';
import { missingPageHtml, payPageHtml } from './pay-page';
import { stripeSignatureHeader } from './signature';

const HOST = '127.0.0.1';
/** The API version stripe@23.1.0 sends by default; events carry it as `api_version`. */
export const FAKE_API_VERSION = '2026-10-28.endive';
export const DEFAULT_API_KEY = 'sk_test_local_fake_hatchlot';
export const DEFAULT_WEBHOOK_SECRET = 'whsec_local_fake_hatchlot';
const DEFAULT_RETRY_DELAYS_MS = [1_000, 5_000, 30_000, 120_000];
const DAY_SECONDS = 86_400;
const MAX_BODY = 256 * 1024;

/** Stripe's published test card numbers this fake accepts. */
export const TEST_CARDS = {
	paid: '4242424242424242',
	declined: '4000000000000002',
	insufficientFunds: '4000000000009995'
} as const;

export type StripeFakeMode = 'ok' | 'fail' | 'close';
type Json = Record<string, unknown>;

export interface StripeFakeOptions {
	/** 0 picks a free port; `url` has the real one. */
	port: number;
	/** Where events are POSTed; none keeps them undelivered until one is set. */
	webhookUrl?: string;
	webhookSecret?: string;
	/** The one secret key the fake accepts as `Authorization: Bearer …`. */
	apiKey?: string;
	/** Waits before the 2nd, 3rd, … delivery attempt; its length bounds the retries. */
	retryDelaysMs?: number[];
	/** How long one delivery may take before it counts as failed. */
	deliveryTimeoutMs?: number;
	now?: () => Date;
	log?: (line: string) => void;
}

export interface DeliveryAttempt {
	eventId: string;
	type: string;
	attempt: number;
	at: string;
	/** The receiver's HTTP status; null after a network error or timeout. */
	status: number | null;
	ok: boolean;
	error?: string;
}

export interface FakeEvent {
	id: string;
	type: string;
	event: Json;
	deliveries: DeliveryAttempt[];
}

export interface ReceivedRequest {
	method: string;
	path: string;
	idempotencyKey: string | null;
	body: FormObject;
	status: number;
}

export type PayResult =
	{ paid: true; session: Json } | { paid: false; status: number; error: StripeErrorBody };

export interface StripeErrorBody {
	type: 'invalid_request_error' | 'card_error' | 'idempotency_error' | 'api_error';
	message: string;
	code?: string;
	decline_code?: string;
	param?: string;
}

/** A succeeded card payment the fake did not take itself; amounts in cents (USD's minor unit). */
export interface AdoptedPayment {
	id: string;
	amount: number;
	currency?: string;
	amountRefunded?: number;
}

export interface StripeFake {
	/** Base URL of the API and the pay pages. */
	url: string;
	port: number;
	host: string;
	apiKey: string;
	webhookSecret: string;
	setMode(mode: StripeFakeMode): void;
	setWebhook(settings: { url?: string; delayMs?: number }): void;
	requests(): ReceivedRequest[];
	events(): FakeEvent[];
	/** Pay an open session with a card number, as the pay page does. */
	pay(sessionId: string, card: string): PayResult;
	failAsyncPayment(sessionId: string): Json;
	failRefund(refundId: string): Json;
	/** Know a succeeded card payment made elsewhere (a seeded order's), so it can be refunded. */
	adoptPayment(payment: AdoptedPayment): Json;
	/** Deliver an event again, `times` times (one after another unless `concurrent`). */
	redeliver(
		eventId: string,
		options?: { times?: number; delayMs?: number; concurrent?: boolean }
	): Promise<void>;
	/** Keep new events from delivery until `release`. */
	hold(): void;
	/** Deliver held events one after another, in the order given; returns their ids. */
	release(order?: 'created' | 'reverse' | string[]): Promise<string[]>;
	/** Resolves when no delivery (or retry wait) is under way. */
	idle(): Promise<void>;
	reset(): void;
	stop(): Promise<void>;
}

class StripeApiError extends Error {
	constructor(
		readonly status: number,
		readonly body: StripeErrorBody
	) {
		super(body.message);
	}
}

const invalid = (message: string, param?: string, code?: string) =>
	new StripeApiError(400, { type: 'invalid_request_error', message, param, code });

const missing = (kind: string, id: string, param = 'id') =>
	new StripeApiError(404, {
		type: 'invalid_request_error',
		code: 'resource_missing',
		message: `No such ${kind}: '${id}'`,
		param
	});

/** A regular expression's first group (always present where these routes use it). */
const first = (match: RegExpExecArray) => match[1] ?? '';

const ALPHANUMERIC = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';
/** An id with Stripe's prefix and 24 random alphanumerics. */
export function stripeId(prefix: string): string {
	const bytes = randomBytes(24);
	let tail = '';
	for (const byte of bytes) tail += ALPHANUMERIC[byte % ALPHANUMERIC.length];
	return `${prefix}${tail}`;
}

/** Luhn's check digit test (ISO/IEC 7812-1), which every card number passes. */
export function passesLuhn(digits: string): boolean {
	let sum = 0;
	for (let index = 0; index < digits.length; index++) {
		let digit = Number(digits[digits.length - 1 - index]);
		if (index % 2 === 1) {
			digit *= 2;
			if (digit > 9) digit -= 9;
		}
		sum += digit;
	}
	return sum % 10 === 0;
}

// --- reading parameters -------------------------------------------------------------

const asText = (value: FormValue | undefined, param: string): string | undefined => {
	if (value === undefined) return undefined;
	if (typeof value !== 'string') throw invalid(`Invalid string: ${param} must be a string`, param);
	return value;
};

function asInteger(value: FormValue | undefined, param: string, min: number): number | undefined {
	const text = asText(value, param);
	if (text === undefined) return undefined;
	if (!/^-?\d+$/.test(text))
		throw invalid(`Invalid integer: ${text}`, param, 'parameter_invalid_integer');
	const number = Number(text);
	if (!Number.isSafeInteger(number) || number < min) {
		throw invalid(
			`This value must be greater than or equal to ${min}.`,
			param,
			'parameter_invalid_integer'
		);
	}
	return number;
}

const required = <T>(value: T | undefined, param: string): T => {
	if (value === undefined || value === '') {
		throw invalid(`Missing required param: ${param}.`, param, 'parameter_missing');
	}
	return value;
};

function asObject(value: FormValue | undefined, param: string): FormObject | undefined {
	if (value === undefined) return undefined;
	if (typeof value === 'string' && value === '') return {};
	if (typeof value !== 'object' || Array.isArray(value)) {
		throw invalid(`Invalid object: ${param}`, param);
	}
	return value;
}

function asUrl(value: FormValue | undefined, param: string): string | undefined {
	const text = asText(value, param);
	if (text === undefined) return undefined;
	let parsed: URL;
	try {
		// `{CHECKOUT_SESSION_ID}` is a documented placeholder, not part of a real URL.
		parsed = new URL(text.replaceAll('{CHECKOUT_SESSION_ID}', 'x'));
	} catch {
		throw invalid('Not a valid URL', param, 'url_invalid');
	}
	if (parsed.protocol !== 'http:' && parsed.protocol !== 'https:') {
		throw invalid('Not a valid URL', param, 'url_invalid');
	}
	return text;
}

/** Stripe's documented metadata limits: 50 keys, names up to 40 and values up to 500 characters. */
function asMetadata(value: FormValue | undefined, param: string): Record<string, string> {
	const object = asObject(value, param) ?? {};
	const entries = Object.entries(object);
	if (entries.length > 50) throw invalid('Metadata can have at most 50 keys.', param);
	const metadata: Record<string, string> = {};
	for (const [key, entry] of entries) {
		const text = asText(entry, `${param}[${key}]`) ?? '';
		if (key.length > 40)
			throw invalid('Metadata keys can be at most 40 characters.', `${param}[${key}]`);
		if (text.length > 500) {
			throw invalid('Metadata values can be at most 500 characters.', `${param}[${key}]`);
		}
		// An empty value unsets a key in Stripe's metadata.
		if (text !== '') metadata[key] = text;
	}
	return metadata;
}

function expandList(params: FormObject): string[] {
	const expand = params.expand;
	if (expand === undefined) return [];
	if (!Array.isArray(expand) || expand.some((item) => typeof item !== 'string')) {
		throw invalid('Invalid array', 'expand');
	}
	return expand as string[];
}

// --- the fake -------------------------------------------------------------------------

interface SessionRecord {
	session: Json;
	lineItems: Json[];
	paymentIntentMetadata: Record<string, string>;
}

const control = {
	deliver: z.object({
		times: z.number().int().min(1).max(20).optional(),
		delayMs: z.number().int().min(0).max(600_000).optional(),
		concurrent: z.boolean().optional()
	}),
	webhook: z.object({
		url: z.string().url().optional(),
		delayMs: z.number().int().min(0).max(600_000).optional()
	}),
	release: z.object({
		order: z.union([z.enum(['created', 'reverse']), z.array(z.string())]).optional()
	}),
	mode: z.object({ mode: z.enum(['ok', 'fail', 'close']) }),
	adopt: z.object({
		id: z.string().regex(/^pi_[A-Za-z0-9_]{1,240}$/),
		amount: z.number().int().min(1),
		currency: z
			.string()
			.regex(/^[a-z]{3}$/)
			.optional(),
		amountRefunded: z.number().int().min(0).optional()
	}),
	pay: z.object({ card: z.string().max(40) })
};

export async function startStripeFake(options: StripeFakeOptions): Promise<StripeFake> {
	const clock = options.now ?? (() => new Date());
	const seconds = () => Math.floor(clock().getTime() / 1000);
	const log = options.log ?? (() => undefined);
	const apiKey = options.apiKey ?? DEFAULT_API_KEY;
	const webhookSecret = options.webhookSecret ?? DEFAULT_WEBHOOK_SECRET;
	const retryDelaysMs = options.retryDelaysMs ?? DEFAULT_RETRY_DELAYS_MS;
	const deliveryTimeoutMs = options.deliveryTimeoutMs ?? 10_000;

	let webhookUrl = options.webhookUrl;
	let webhookDelayMs = 0;
	let mode: StripeFakeMode = 'ok';
	let holding = false;
	let held: string[] = [];
	let baseUrl = '';
	let stopped = false;
	// The API request now running, named in the events it causes (`request` on an event).
	let causing: { id: string; idempotency_key: string | null } | null = null;

	const sessions = new Map<string, SessionRecord>();
	const paymentIntents = new Map<string, Json>();
	const charges = new Map<string, Json>();
	const refunds = new Map<string, Json>();
	const events = new Map<string, FakeEvent>();
	const received: ReceivedRequest[] = [];
	const idempotent = new Map<string, { fingerprint: string; status: number; body: unknown }>();
	const timers = new Set<NodeJS.Timeout>();
	const running = new Set<Promise<void>>();

	const snapshot = <T>(value: T): T => structuredClone(value);

	function sleep(ms: number): Promise<void> {
		if (ms <= 0 || stopped) return Promise.resolve();
		return new Promise((resolve) => {
			const timer = setTimeout(() => {
				timers.delete(timer);
				resolve();
			}, ms);
			timers.add(timer);
		});
	}

	function track(work: Promise<void>): Promise<void> {
		running.add(work);
		void work.finally(() => running.delete(work));
		return work;
	}

	async function attempt(record: FakeEvent, number: number): Promise<boolean> {
		const at = clock();
		const entry: DeliveryAttempt = {
			eventId: record.id,
			type: record.type,
			attempt: number,
			at: at.toISOString(),
			status: null,
			ok: false
		};
		record.deliveries.push(entry);
		if (!webhookUrl) {
			entry.error = 'no webhook URL set';
			return false;
		}
		// Stripe sends the event pretty-printed and signs each attempt afresh.
		const payload = JSON.stringify(record.event, null, 2);
		try {
			const response = await fetch(webhookUrl, {
				method: 'POST',
				headers: {
					'content-type': 'application/json; charset=utf-8',
					'stripe-signature': stripeSignatureHeader(
						payload,
						webhookSecret,
						Math.floor(at.getTime() / 1000)
					),
					'user-agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)'
				},
				body: payload,
				signal: AbortSignal.timeout(deliveryTimeoutMs)
			});
			await response.arrayBuffer().catch(() => undefined);
			entry.status = response.status;
			entry.ok = response.ok;
		} catch (error) {
			entry.error = error instanceof Error ? error.message : String(error);
		}
		log(
			`[stripe-fake] ${record.type} ${record.id} attempt ${number}: ${entry.status ?? entry.error}`
		);
		return entry.ok;
	}

	/** One delivery with its retries; the attempt numbers go on from earlier ones. */
	async function deliverWithRetries(record: FakeEvent, delayMs: number): Promise<void> {
		await sleep(delayMs);
		// With nowhere to send it, the event is only kept (and listed under /test/events).
		if (!webhookUrl) return;
		for (let retry = 0; !stopped; retry++) {
			if (await attempt(record, record.deliveries.length + 1)) return;
			if (retry >= retryDelaysMs.length) return;
			await sleep(retryDelaysMs[retry] ?? 0);
		}
	}

	function emit(type: string, object: Json, previous?: Json): FakeEvent {
		const event: Json = {
			id: stripeId('evt_'),
			object: 'event',
			api_version: FAKE_API_VERSION,
			created: seconds(),
			data: previous
				? { object: snapshot(object), previous_attributes: previous }
				: { object: snapshot(object) },
			livemode: false,
			pending_webhooks: webhookUrl ? 1 : 0,
			request: causing ? { ...causing } : { id: null, idempotency_key: null },
			type
		};
		const record: FakeEvent = { id: event.id as string, type, event, deliveries: [] };
		events.set(record.id, record);
		if (holding) held.push(record.id);
		else void track(deliverWithRetries(record, webhookDelayMs));
		return record;
	}

	// --- objects ---

	function createSession(params: FormObject): Json {
		const mode = required(asText(params.mode, 'mode'), 'mode');
		if (mode !== 'payment') {
			throw invalid(
				'This local stand-in serves only mode=payment.',
				'mode',
				'parameter_invalid_string'
			);
		}
		const items = params.line_items;
		if (items === undefined)
			throw invalid('Missing required param: line_items.', 'line_items', 'parameter_missing');
		if (!Array.isArray(items) || items.length === 0 || items.length > 100) {
			throw invalid('line_items must be a list of 1 to 100 items.', 'line_items');
		}
		let currency: string | undefined;
		const lineItems = items.map((item, index) => {
			const param = `line_items[${index}]`;
			const line = required(asObject(item, param), param);
			if (line.price !== undefined) {
				throw invalid('This local stand-in takes price_data, not saved prices.', `${param}[price]`);
			}
			const priceData = required(
				asObject(line.price_data, `${param}[price_data]`),
				`${param}[price_data]`
			);
			const lineCurrency = required(
				asText(priceData.currency, `${param}[price_data][currency]`),
				`${param}[price_data][currency]`
			).toLowerCase();
			if (!/^[a-z]{3}$/.test(lineCurrency)) {
				throw invalid(`Invalid currency: ${lineCurrency}`, `${param}[price_data][currency]`);
			}
			if (currency !== undefined && currency !== lineCurrency) {
				throw invalid(
					'All line items must use the same currency.',
					`${param}[price_data][currency]`
				);
			}
			currency = lineCurrency;
			const unitAmount = required(
				asInteger(priceData.unit_amount, `${param}[price_data][unit_amount]`, 0),
				`${param}[price_data][unit_amount]`
			);
			const product = required(
				asObject(priceData.product_data, `${param}[price_data][product_data]`),
				`${param}[price_data][product_data]`
			);
			const name = required(
				asText(product.name, `${param}[price_data][product_data][name]`),
				`${param}[price_data][product_data][name]`
			);
			const quantity = required(
				asInteger(line.quantity, `${param}[quantity]`, 1),
				`${param}[quantity]`
			);
			const total = unitAmount * quantity;
			return {
				id: stripeId('li_'),
				object: 'item',
				amount_discount: 0,
				amount_subtotal: total,
				amount_tax: 0,
				amount_total: total,
				currency: lineCurrency,
				description: name,
				price: {
					id: stripeId('price_'),
					object: 'price',
					active: false,
					currency: lineCurrency,
					product: stripeId('prod_'),
					type: 'one_time',
					unit_amount: unitAmount
				},
				quantity
			};
		});
		const successUrl = required(asUrl(params.success_url, 'success_url'), 'success_url');
		const cancelUrl = asUrl(params.cancel_url, 'cancel_url') ?? null;
		const clientReferenceId = asText(params.client_reference_id, 'client_reference_id') ?? null;
		if (clientReferenceId !== null && clientReferenceId.length > 200) {
			throw invalid('client_reference_id can be at most 200 characters.', 'client_reference_id');
		}
		const customerEmail = asText(params.customer_email, 'customer_email') ?? null;
		const now = seconds();
		// Stripe's documented window for expires_at: 30 minutes to 24 hours after creation.
		const expiresAt = asInteger(params.expires_at, 'expires_at', 0) ?? now + DAY_SECONDS;
		if (expiresAt < now + 1800 || expiresAt > now + DAY_SECONDS) {
			throw invalid(
				'The `expires_at` timestamp must be between 30 minutes and 24 hours from Checkout Session creation.',
				'expires_at'
			);
		}
		const paymentIntentData = asObject(params.payment_intent_data, 'payment_intent_data') ?? {};
		const amountTotal = lineItems.reduce((sum, line) => sum + line.amount_total, 0);
		const id = stripeId('cs_test_');
		const session: Json = {
			id,
			object: 'checkout.session',
			amount_subtotal: amountTotal,
			amount_total: amountTotal,
			cancel_url: cancelUrl,
			client_reference_id: clientReferenceId,
			created: now,
			currency,
			customer: null,
			customer_details: null,
			customer_email: customerEmail,
			expires_at: expiresAt,
			livemode: false,
			metadata: asMetadata(params.metadata, 'metadata'),
			mode: 'payment',
			payment_intent: null,
			payment_method_types: ['card'],
			payment_status: 'unpaid',
			status: 'open',
			success_url: successUrl,
			total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
			ui_mode: 'hosted',
			url: `${baseUrl}/pay/${id}`
		};
		sessions.set(id, {
			session,
			lineItems,
			paymentIntentMetadata: asMetadata(paymentIntentData.metadata, 'payment_intent_data[metadata]')
		});
		return session;
	}

	function sessionRecord(id: string): SessionRecord {
		const record = sessions.get(id);
		if (!record) throw missing('checkout.session', id);
		return record;
	}

	function sessionView(record: SessionRecord, expand: string[]): Json {
		const view = snapshot(record.session);
		if (expand.includes('line_items')) {
			view.line_items = {
				object: 'list',
				data: snapshot(record.lineItems),
				has_more: false,
				url: `/v1/checkout/sessions/${record.session.id as string}/line_items`
			};
		}
		if (expand.includes('payment_intent') && typeof view.payment_intent === 'string') {
			view.payment_intent = snapshot(paymentIntents.get(view.payment_intent) ?? null);
		}
		return view;
	}

	function expireSession(record: SessionRecord): Json {
		const session = record.session;
		if (session.status !== 'open') {
			throw invalid(
				`Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${String(session.status)}".`,
				'session'
			);
		}
		session.status = 'expired';
		session.url = null;
		emit('checkout.session.expired', session);
		return session;
	}

	function makePaymentIntent(record: SessionRecord, status: string, lastError: Json | null): Json {
		const session = record.session;
		const paymentIntent: Json = {
			id: stripeId('pi_'),
			object: 'payment_intent',
			amount: session.amount_total,
			amount_capturable: 0,
			amount_received: status === 'succeeded' ? session.amount_total : 0,
			canceled_at: null,
			capture_method: 'automatic_async',
			created: seconds(),
			currency: session.currency,
			last_payment_error: lastError,
			latest_charge: null,
			livemode: false,
			metadata: { ...record.paymentIntentMetadata },
			payment_method: stripeId('pm_'),
			payment_method_types: ['card'],
			status
		};
		paymentIntents.set(paymentIntent.id as string, paymentIntent);
		session.payment_intent = paymentIntent.id;
		return paymentIntent;
	}

	function declineFor(digits: string): StripeErrorBody | null {
		if (!/^\d{12,19}$/.test(digits) || !passesLuhn(digits)) {
			return {
				type: 'card_error',
				code: 'incorrect_number',
				message: 'Your card number is incorrect.',
				param: 'number'
			};
		}
		if (digits === TEST_CARDS.paid) return null;
		if (digits === TEST_CARDS.insufficientFunds) {
			return {
				type: 'card_error',
				code: 'card_declined',
				decline_code: 'insufficient_funds',
				message: 'Your card has insufficient funds.'
			};
		}
		if (digits === TEST_CARDS.declined) {
			return {
				type: 'card_error',
				code: 'card_declined',
				decline_code: 'generic_decline',
				message: 'Your card was declined.'
			};
		}
		return {
			type: 'card_error',
			code: 'card_declined',
			decline_code: 'test_mode_live_card',
			message: 'Your card was declined. This local test page takes only Stripe test card numbers.'
		};
	}

	function pay(sessionId: string, card: string): PayResult {
		const record = sessions.get(sessionId);
		if (!record)
			return { paid: false, status: 404, error: missing('checkout.session', sessionId).body };
		const session = record.session;
		if (session.status !== 'open') {
			return {
				paid: false,
				status: 400,
				error: {
					type: 'invalid_request_error',
					code: 'checkout_session_not_open',
					message: `This Checkout Session is ${String(session.status)} and can no longer be paid.`
				}
			};
		}
		const digits = card.replace(/[\s-]/g, '');
		const decline = declineFor(digits);
		if (decline) return { paid: false, status: 402, error: decline };
		const paymentIntent = makePaymentIntent(record, 'succeeded', null);
		const charge: Json = {
			id: stripeId('ch_'),
			object: 'charge',
			amount: session.amount_total,
			amount_captured: session.amount_total,
			amount_refunded: 0,
			balance_transaction: stripeId('txn_'),
			captured: true,
			created: seconds(),
			currency: session.currency,
			livemode: false,
			metadata: {},
			paid: true,
			payment_intent: paymentIntent.id,
			payment_method_details: { type: 'card', card: { brand: 'visa', last4: digits.slice(-4) } },
			refunded: false,
			status: 'succeeded'
		};
		charges.set(charge.id as string, charge);
		paymentIntent.latest_charge = charge.id;
		session.status = 'complete';
		session.payment_status = 'paid';
		session.url = null;
		session.customer_details = { email: session.customer_email, name: null, phone: null };
		emit('checkout.session.completed', session);
		return { paid: true, session: snapshot(session) };
	}

	function adoptPayment(payment: AdoptedPayment): Json {
		const refunded = payment.amountRefunded ?? 0;
		if (refunded > payment.amount)
			throw invalid('amountRefunded is more than the amount.', 'amountRefunded');
		const currency = payment.currency ?? 'usd';
		const known = paymentIntents.get(payment.id);
		if (known) return snapshot(known);
		const chargeId = stripeId('ch_');
		const paymentIntent: Json = {
			id: payment.id,
			object: 'payment_intent',
			amount: payment.amount,
			amount_capturable: 0,
			amount_received: payment.amount,
			canceled_at: null,
			capture_method: 'automatic_async',
			created: seconds(),
			currency,
			last_payment_error: null,
			latest_charge: chargeId,
			livemode: false,
			metadata: {},
			payment_method: stripeId('pm_'),
			payment_method_types: ['card'],
			status: 'succeeded'
		};
		charges.set(chargeId, {
			id: chargeId,
			object: 'charge',
			amount: payment.amount,
			amount_captured: payment.amount,
			amount_refunded: refunded,
			balance_transaction: stripeId('txn_'),
			captured: true,
			created: seconds(),
			currency,
			livemode: false,
			metadata: {},
			paid: true,
			payment_intent: payment.id,
			payment_method_details: { type: 'card', card: { brand: 'visa', last4: '4242' } },
			refunded: refunded === payment.amount,
			status: 'succeeded'
		});
		paymentIntents.set(payment.id, paymentIntent);
		return snapshot(paymentIntent);
	}

	function failAsyncPayment(sessionId: string): Json {
		const record = sessionRecord(sessionId);
		const session = record.session;
		if (session.status !== 'open')
			throw invalid(`This Checkout Session is ${String(session.status)}.`, 'session');
		makePaymentIntent(record, 'requires_payment_method', {
			type: 'invalid_request_error',
			code: 'payment_method_provider_decline',
			message: 'The delayed payment did not go through.'
		});
		session.status = 'complete';
		session.url = null;
		// A delayed method completes the session unpaid first, then reports the failure.
		emit('checkout.session.completed', session);
		emit('checkout.session.async_payment_failed', session);
		return snapshot(session);
	}

	function createRefund(params: FormObject): Json {
		const chargeParam = asText(params.charge, 'charge');
		const intentParam = asText(params.payment_intent, 'payment_intent');
		if (!chargeParam && !intentParam) {
			throw invalid(
				'One of `charge` or `payment_intent` is required.',
				'payment_intent',
				'parameter_missing'
			);
		}
		let charge: Json | undefined;
		if (chargeParam) {
			charge = charges.get(chargeParam);
			if (!charge) throw missing('charge', chargeParam, 'charge');
		} else if (intentParam) {
			const intent = paymentIntents.get(intentParam);
			if (!intent) throw missing('payment_intent', intentParam, 'payment_intent');
			charge =
				typeof intent.latest_charge === 'string' ? charges.get(intent.latest_charge) : undefined;
			if (!charge || intent.status !== 'succeeded') {
				throw invalid(
					`This PaymentIntent (${intentParam}) does not have a successful charge to refund.`,
					'payment_intent'
				);
			}
		}
		if (!charge) throw invalid('Nothing to refund.', 'payment_intent');
		const remaining = (charge.amount_captured as number) - (charge.amount_refunded as number);
		const amount = asInteger(params.amount, 'amount', 1) ?? remaining;
		if (remaining === 0) {
			throw invalid(
				`Charge ${String(charge.id)} has already been refunded.`,
				'charge',
				'charge_already_refunded'
			);
		}
		if (amount > remaining) {
			// Stripe's wording for this case, from memory; the code is from its published error codes.
			throw invalid(
				`Refund amount (${amount}) is greater than unrefunded amount on charge (${remaining})`,
				'amount',
				'amount_too_large'
			);
		}
		const reason = asText(params.reason, 'reason') ?? null;
		if (reason !== null && !['duplicate', 'fraudulent', 'requested_by_customer'].includes(reason)) {
			throw invalid(
				`Invalid reason: must be one of duplicate, fraudulent, or requested_by_customer`,
				'reason'
			);
		}
		const refund: Json = {
			id: stripeId('re_'),
			object: 'refund',
			amount,
			balance_transaction: stripeId('txn_'),
			charge: charge.id,
			created: seconds(),
			currency: charge.currency,
			metadata: asMetadata(params.metadata, 'metadata'),
			payment_intent: charge.payment_intent,
			reason,
			receipt_number: null,
			status: 'succeeded'
		};
		refunds.set(refund.id as string, refund);
		charge.amount_refunded = (charge.amount_refunded as number) + amount;
		charge.refunded = charge.amount_refunded === charge.amount_captured;
		emit('charge.refunded', charge);
		return refund;
	}

	function failRefund(refundId: string): Json {
		const refund = refunds.get(refundId);
		if (!refund) throw missing('refund', refundId);
		if (refund.status !== 'succeeded' && refund.status !== 'pending') {
			throw invalid(`Refund ${refundId} is ${String(refund.status)}.`, 'refund');
		}
		refund.status = 'failed';
		refund.failure_reason = 'expired_or_canceled_card';
		refund.failure_balance_transaction = stripeId('txn_');
		const charge = charges.get(refund.charge as string);
		if (charge) {
			charge.amount_refunded = (charge.amount_refunded as number) - (refund.amount as number);
			charge.refunded = false;
		}
		emit('refund.updated', refund, { status: 'succeeded', failure_reason: null });
		return snapshot(refund);
	}

	function expireDueSessions(): void {
		const now = seconds();
		for (const record of sessions.values()) {
			if (record.session.status === 'open' && (record.session.expires_at as number) <= now) {
				expireSession(record);
			}
		}
	}
	const sweep = setInterval(expireDueSessions, 1000);
	sweep.unref();

	// --- HTTP ---

	function sendJson(
		response: ServerResponse,
		status: number,
		body: unknown,
		headers: Record<string, string> = {}
	) {
		const text = JSON.stringify(body, null, 2);
		response.writeHead(status, {
			'content-type': 'application/json',
			'content-length': Buffer.byteLength(text),
			'cache-control': 'no-cache, no-store',
			'request-id': stripeId('req_'),
			'stripe-version': FAKE_API_VERSION,
			...headers
		});
		response.end(text);
	}

	function sendHtml(response: ServerResponse, status: number, html: string) {
		response.writeHead(status, {
			'content-type': 'text/html; charset=utf-8',
			'content-length': Buffer.byteLength(html),
			'cache-control': 'no-store'
		});
		response.end(html);
	}

	async function readBody(request: IncomingMessage): Promise<string> {
		const chunks: Buffer[] = [];
		let size = 0;
		for await (const chunk of request) {
			size += (chunk as Buffer).length;
			if (size > MAX_BODY) throw invalid('Request body too large.');
			chunks.push(chunk as Buffer);
		}
		return Buffer.concat(chunks).toString('utf8');
	}

	async function readControl<T>(
		request: IncomingMessage,
		schema: z.ZodType<T>,
		usage: string
	): Promise<T> {
		const text = await readBody(request);
		let json: unknown;
		try {
			json = text.trim() === '' ? {} : JSON.parse(text);
		} catch {
			throw invalid(`send JSON: ${usage}`);
		}
		const parsed = schema.safeParse(json);
		if (!parsed.success) throw invalid(`send JSON: ${usage}`);
		return parsed.data;
	}

	function authorize(request: IncomingMessage): void {
		const header = request.headers.authorization ?? '';
		const match = /^Bearer (.+)$/.exec(header);
		if (!match) {
			throw new StripeApiError(401, {
				type: 'invalid_request_error',
				message:
					'You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth.'
			});
		}
		if (first(match) !== apiKey) {
			const shown =
				first(match).length > 12
					? `${first(match).slice(0, 8)}********${first(match).slice(-4)}`
					: '****';
			throw new StripeApiError(401, {
				type: 'invalid_request_error',
				code: 'api_key_invalid',
				message: `Invalid API Key provided: ${shown}`
			});
		}
	}

	/** The API routes: [status, body] for a request already authorised. */
	function api(method: string, path: string, params: FormObject): [number, unknown] {
		let match: RegExpExecArray | null;
		if (method === 'POST' && path === '/v1/checkout/sessions') return [200, createSession(params)];
		if ((match = /^\/v1\/checkout\/sessions\/([^/]+)$/.exec(path)) && method === 'GET') {
			return [200, sessionView(sessionRecord(first(match)), expandList(params))];
		}
		if ((match = /^\/v1\/checkout\/sessions\/([^/]+)\/expire$/.exec(path)) && method === 'POST') {
			return [
				200,
				sessionView(
					{ ...sessionRecord(first(match)), session: expireSession(sessionRecord(first(match))) },
					expandList(params)
				)
			];
		}
		if ((match = /^\/v1\/payment_intents\/([^/]+)$/.exec(path)) && method === 'GET') {
			const intent = paymentIntents.get(first(match));
			if (!intent) throw missing('payment_intent', first(match));
			const view = snapshot(intent);
			if (expandList(params).includes('latest_charge') && typeof view.latest_charge === 'string') {
				view.latest_charge = snapshot(charges.get(view.latest_charge) ?? null);
			}
			return [200, view];
		}
		if (method === 'POST' && path === '/v1/refunds') return [200, createRefund(params)];
		if ((match = /^\/v1\/refunds\/([^/]+)$/.exec(path)) && method === 'GET') {
			const refund = refunds.get(first(match));
			if (!refund) throw missing('refund', first(match));
			return [200, snapshot(refund)];
		}
		throw new StripeApiError(404, {
			type: 'invalid_request_error',
			message: `Unrecognized request URL (${method}: ${path}). This local stand-in serves only the endpoints the shop calls.`
		});
	}

	async function handleApi(
		request: IncomingMessage,
		response: ServerResponse,
		url: URL,
		method: string
	) {
		if (mode === 'close') {
			request.socket.destroy();
			return;
		}
		const raw = method === 'POST' ? await readBody(request) : '';
		const idempotencyKey =
			method === 'POST'
				? ((request.headers['idempotency-key'] as string | undefined) ?? null)
				: null;
		const entry: ReceivedRequest = {
			method,
			path: url.pathname,
			idempotencyKey,
			body: {},
			status: 0
		};
		received.push(entry);
		const answer = (status: number, body: unknown, headers?: Record<string, string>) => {
			entry.status = status;
			sendJson(response, status, body, headers);
		};
		if (mode === 'fail') {
			// Told not to retry, so a client sees the outage at once rather than after its backoff.
			return answer(
				500,
				{ error: { type: 'api_error', message: 'The local Stripe stand-in is in fail mode.' } },
				{ 'stripe-should-retry': 'false' }
			);
		}
		try {
			authorize(request);
			const params = parseFormBody(method === 'POST' ? raw : url.search.slice(1));
			entry.body = params;
			const fingerprint = `${method} ${url.pathname}\n${raw}`;
			if (idempotencyKey) {
				const earlier = idempotent.get(idempotencyKey);
				if (earlier && earlier.fingerprint !== fingerprint) {
					throw new StripeApiError(400, {
						type: 'idempotency_error',
						message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idempotencyKey}' if you meant to execute a different request.`
					});
				}
				if (earlier) return answer(earlier.status, earlier.body, { 'idempotent-replayed': 'true' });
			}
			const requestId = stripeId('req_');
			causing = { id: requestId, idempotency_key: idempotencyKey };
			let outcome: [number, unknown];
			try {
				outcome = api(method, url.pathname, params);
			} finally {
				causing = null;
			}
			const [status, body] = outcome;
			// Only answers from an endpoint that ran to success are kept for replay.
			if (idempotencyKey)
				idempotent.set(idempotencyKey, { fingerprint, status, body: snapshot(body) });
			return answer(status, body, { 'request-id': requestId });
		} catch (error) {
			if (error instanceof StripeApiError) return answer(error.status, { error: error.body });
			if (error instanceof FormBodyError) {
				return answer(400, { error: { type: 'invalid_request_error', message: error.message } });
			}
			throw error;
		}
	}

	async function handlePayPage(
		request: IncomingMessage,
		response: ServerResponse,
		sessionId: string,
		method: string
	) {
		const record = sessions.get(sessionId);
		if (!record) return sendHtml(response, 404, missingPageHtml());
		const model = () => ({
			sessionId,
			status: record.session.status as 'open' | 'complete' | 'expired',
			currency: record.session.currency as string,
			amountTotal: record.session.amount_total as number,
			lines: record.lineItems.map((line) => ({
				name: line.description as string,
				quantity: line.quantity as number,
				amountTotal: line.amount_total as number
			})),
			cancelUrl: record.session.cancel_url as string | null,
			successUrl: record.session.success_url as string | null
		});
		if (method === 'GET') return sendHtml(response, 200, payPageHtml(model()));
		let card: string;
		try {
			const form = parseFormBody(await readBody(request));
			card = typeof form.card === 'string' ? form.card : '';
		} catch {
			card = '';
		}
		const result = pay(sessionId, card);
		if (result.paid) {
			const target = (record.session.success_url as string).replaceAll(
				'{CHECKOUT_SESSION_ID}',
				sessionId
			);
			response.writeHead(303, { location: target, 'cache-control': 'no-store' });
			response.end();
			return;
		}
		return sendHtml(
			response,
			result.status === 402 ? 402 : 200,
			payPageHtml({
				...model(),
				card,
				decline: result.status === 402 ? result.error.message : undefined
			})
		);
	}

	async function handleTest(request: IncomingMessage, response: ServerResponse, route: string) {
		let match: RegExpExecArray | null;
		if (route === 'POST /test/reset') {
			fake.reset();
			return sendJson(response, 200, { reset: true });
		}
		if (route === 'GET /test/requests')
			return sendJson(response, 200, { requests: fake.requests() });
		if (route === 'GET /test/events') return sendJson(response, 200, { events: fake.events() });
		if ((match = /^POST \/test\/events\/([^/]+)\/deliver$/.exec(route))) {
			const body = await readControl(
				request,
				control.deliver,
				'{"times"?, "delayMs"?, "concurrent"?}'
			);
			if (!events.has(first(match))) throw missing('event', first(match));
			// Answers at once; the deliveries go on in the background.
			void fake.redeliver(first(match), body);
			return sendJson(response, 202, { event: first(match), ...body });
		}
		if (route === 'POST /test/webhook') {
			const body = await readControl(request, control.webhook, '{"url"?, "delayMs"?}');
			fake.setWebhook(body);
			return sendJson(response, 200, { url: webhookUrl ?? null, delayMs: webhookDelayMs });
		}
		if (route === 'POST /test/hold') {
			fake.hold();
			return sendJson(response, 200, { holding: true });
		}
		if (route === 'POST /test/release') {
			const body = await readControl(
				request,
				control.release,
				'{"order"?: "created"|"reverse"|[ids]}'
			);
			const order = held.slice();
			holding = false;
			void fake.release(body.order);
			return sendJson(response, 202, { releasing: order.length });
		}
		if (route === 'POST /test/mode') {
			const body = await readControl(request, control.mode, '{"mode": "ok"|"fail"|"close"}');
			fake.setMode(body.mode);
			return sendJson(response, 200, { mode });
		}
		if ((match = /^POST \/test\/sessions\/([^/]+)\/pay$/.exec(route))) {
			const body = await readControl(request, control.pay, '{"card": "4242 4242 4242 4242"}');
			const result = pay(first(match), body.card);
			return result.paid
				? sendJson(response, 200, result.session)
				: sendJson(response, result.status, { error: result.error });
		}
		if ((match = /^POST \/test\/sessions\/([^/]+)\/async-payment-failed$/.exec(route))) {
			return sendJson(response, 200, failAsyncPayment(first(match)));
		}
		if (route === 'POST /test/payment-intents') {
			const body = await readControl(
				request,
				control.adopt,
				'{"id": "pi_…", "amount": 1200, "currency"?: "usd", "amountRefunded"?: 0}'
			);
			return sendJson(response, 200, adoptPayment(body));
		}
		if ((match = /^POST \/test\/refunds\/([^/]+)\/fail$/.exec(route))) {
			return sendJson(response, 200, failRefund(first(match)));
		}
		return sendJson(response, 404, {
			error: { type: 'invalid_request_error', message: `No route ${route}` }
		});
	}

	const http = createServer((request, response) => {
		const url = new URL(request.url ?? '/', `http://${HOST}`);
		const method = request.method ?? 'GET';
		const path = url.pathname.replace(/\/+$/, '') || '/';
		const route = `${method} ${path}`;
		const handle = async () => {
			if (route === 'GET /health') return sendJson(response, 200, { status: 'ok', mode });
			if (path.startsWith('/v1/')) return handleApi(request, response, url, method);
			const payMatch = /^\/pay\/([^/]+)$/.exec(path);
			if (payMatch && (method === 'GET' || method === 'POST')) {
				return handlePayPage(request, response, decodeURIComponent(first(payMatch)), method);
			}
			if (path.startsWith('/test/')) {
				try {
					return await handleTest(request, response, route);
				} catch (error) {
					if (error instanceof StripeApiError)
						return sendJson(response, error.status, { error: error.body });
					throw error;
				}
			}
			return sendJson(response, 404, {
				error: { type: 'invalid_request_error', message: `No route ${route}` }
			});
		};
		handle().catch((error: Error) => {
			log(`[stripe-fake] ${route}: ${error.message}`);
			if (!response.headersSent)
				sendJson(response, 500, { error: { type: 'api_error', message: error.message } });
			else response.destroy();
		});
	});

	await new Promise<void>((resolve, reject) => {
		http.once('error', reject);
		http.listen(options.port, HOST, () => resolve());
	});
	const port = (http.address() as AddressInfo).port;
	baseUrl = `http://${HOST}:${port}`;

	const fake: StripeFake = {
		url: baseUrl,
		port,
		host: HOST,
		apiKey,
		webhookSecret,
		setMode(next) {
			mode = next;
		},
		setWebhook(settings) {
			if (settings.url !== undefined) webhookUrl = settings.url;
			if (settings.delayMs !== undefined) webhookDelayMs = settings.delayMs;
		},
		requests: () => snapshot(received),
		events: () => [...events.values()].map((record) => snapshot(record)),
		pay,
		failAsyncPayment,
		failRefund,
		adoptPayment,
		redeliver(eventId, settings = {}) {
			const record = events.get(eventId);
			if (!record) return Promise.reject(new Error(`No event ${eventId}`));
			const times = settings.times ?? 1;
			const delayMs = settings.delayMs ?? 0;
			if (settings.concurrent) {
				return track(
					Promise.all(
						Array.from({ length: times }, () => deliverWithRetries(record, delayMs))
					).then(() => undefined)
				);
			}
			return track(
				(async () => {
					for (let index = 0; index < times; index++) await deliverWithRetries(record, delayMs);
				})()
			);
		},
		hold() {
			holding = true;
		},
		release(order = 'created') {
			holding = false;
			const waiting = held;
			held = [];
			let ids: string[];
			if (order === 'created') ids = waiting;
			else if (order === 'reverse') ids = waiting.slice().reverse();
			else
				ids = [
					...order.filter((id) => waiting.includes(id)),
					...waiting.filter((id) => !order.includes(id))
				];
			return track(
				(async () => {
					for (const id of ids) {
						const record = events.get(id);
						if (record) await deliverWithRetries(record, 0);
					}
				})()
			).then(() => ids);
		},
		async idle() {
			while (running.size > 0) await Promise.allSettled([...running]);
		},
		reset() {
			sessions.clear();
			paymentIntents.clear();
			charges.clear();
			refunds.clear();
			events.clear();
			received.length = 0;
			idempotent.clear();
			held = [];
			holding = false;
			mode = 'ok';
			webhookDelayMs = 0;
			webhookUrl = options.webhookUrl;
		},
		async stop() {
			stopped = true;
			clearInterval(sweep);
			for (const timer of timers) clearTimeout(timer);
			timers.clear();
			http.closeAllConnections();
			await new Promise<void>((resolve) => http.close(() => resolve()));
		}
	};
	return fake;
}
