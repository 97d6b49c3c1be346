// The cart as the browser holds it between fetches: the drawer, the cart page and every
// "add to cart" share this one state. A change shows at once (the quantity moves, the line
// goes) and is sent to /api/cart; the server's answer — the whole cart, priced there —
// replaces it, and a refusal puts the cart back as it was with the reason beside the line.
// Money is never worked out here: while a change is on its way, totals show as pending.
import { browser } from '$app/environment';
import type { CartView } from './types';

export type CartFailure = { listingId: number | null; message: string };

interface Answer {
	ok: boolean;
	cart: CartView | null;
	message: string;
}

async function ask(method: string, url: string, body?: unknown): Promise<Answer> {
	let response: Response;
	try {
		response = await fetch(url, {
			method,
			headers: body === undefined ? {} : { 'content-type': 'application/json' },
			body: body === undefined ? undefined : JSON.stringify(body)
		});
	} catch {
		return {
			ok: false,
			cart: null,
			message: 'The shop could not be reached. Check your connection and try again.'
		};
	}
	const payload: unknown = await response.json().catch(() => null);
	if (response.ok) return { ok: true, cart: payload as CartView, message: '' };
	const refusal = (payload ?? {}) as { message?: string; cart?: CartView | null };
	return {
		ok: false,
		cart: refusal.cart ?? null,
		message:
			response.status === 429
				? 'Too many changes at once; wait a moment and try again.'
				: (refusal.message ?? 'That change could not be made. Please try again.')
	};
}

class CartClient {
	/** The last cart the server sent, with any optimistic change laid over it. */
	view = $state<CartView | null>(null);
	/** Listings with a change on its way. */
	pending = $state<number[]>([]);
	/** Something cart-wide is on its way (a hold, a refresh). */
	busy = $state(false);
	failure = $state<CartFailure | null>(null);
	drawerOpen = $state(false);

	#service(): string {
		return this.view?.service ?? 'overnight';
	}

	#track(listingId: number, on: boolean): void {
		this.pending = on
			? [...this.pending, listingId]
			: this.pending.filter((id) => id !== listingId);
	}

	isPending(listingId: number): boolean {
		return this.pending.includes(listingId);
	}

	/** Start from the cart a page's load gave us (server-rendered), without a fetch. */
	seed(view: CartView): void {
		// Module state outlives a request on the server; only a browser may keep a cart here.
		if (browser && this.pending.length === 0) this.view = view;
	}

	async refresh(service: string = this.#service()): Promise<void> {
		this.busy = true;
		const answer = await ask('GET', `/api/cart?service=${encodeURIComponent(service)}`);
		this.busy = false;
		if (answer.cart) this.view = answer.cart;
		else if (!answer.ok) this.failure = { listingId: null, message: answer.message };
	}

	/** Add to the cart; resolves true when the server took it. */
	async add(listingId: number, quantity: number): Promise<boolean> {
		this.failure = null;
		this.#track(listingId, true);
		const answer = await ask('POST', `/api/cart?service=${this.#service()}`, {
			listingId,
			quantity
		});
		this.#track(listingId, false);
		if (answer.cart) this.view = answer.cart;
		if (!answer.ok) this.failure = { listingId, message: answer.message };
		return answer.ok;
	}

	/** Set a line's quantity: shown at once, undone if the server refuses. */
	async setQuantity(listingId: number, quantity: number): Promise<boolean> {
		const before = this.view;
		this.failure = null;
		if (before) {
			this.view = {
				...before,
				lines: before.lines.map((line) =>
					line.listingId === listingId ? { ...line, quantity } : line
				),
				itemCount: before.lines.reduce(
					(sum, line) => sum + (line.listingId === listingId ? quantity : line.quantity),
					0
				)
			};
		}
		this.#track(listingId, true);
		const answer = await ask('PATCH', `/api/cart?service=${this.#service()}`, {
			listingId,
			quantity
		});
		this.#track(listingId, false);
		if (answer.ok && answer.cart) this.view = answer.cart;
		else {
			this.view = answer.cart ?? before;
			this.failure = { listingId, message: answer.message };
		}
		return answer.ok;
	}

	async remove(listingId: number): Promise<boolean> {
		const before = this.view;
		this.failure = null;
		if (before) {
			const lines = before.lines.filter((line) => line.listingId !== listingId);
			this.view = {
				...before,
				lines,
				itemCount: lines.reduce((sum, line) => sum + line.quantity, 0)
			};
		}
		this.#track(listingId, true);
		const answer = await ask(
			'DELETE',
			`/api/cart?service=${this.#service()}&listingId=${encodeURIComponent(listingId)}`
		);
		this.#track(listingId, false);
		if (answer.ok && answer.cart) this.view = answer.cart;
		else {
			this.view = before;
			this.failure = { listingId, message: answer.message };
		}
		return answer.ok;
	}

	/** Checkout starts: hold the cart's stock. Resolves with the refusal's message, or null. */
	async hold(): Promise<{
		message: string;
		lines: Array<{ listingId: number; problem: string }>;
	} | null> {
		this.busy = true;
		this.failure = null;
		let response: Response;
		try {
			response = await fetch(`/api/cart/hold?service=${this.#service()}`, { method: 'POST' });
		} catch {
			this.busy = false;
			return {
				message: 'The shop could not be reached. Check your connection and try again.',
				lines: []
			};
		}
		const payload: unknown = await response.json().catch(() => null);
		this.busy = false;
		if (response.ok && payload) {
			this.view = payload as CartView;
			return null;
		}
		const refusal = (payload ?? {}) as {
			message?: string;
			lines?: Array<{ listingId: number; problem: string }>;
			cart?: CartView;
		};
		if (refusal.cart) this.view = refusal.cart;
		return {
			message: refusal.message ?? 'Your cart could not be held. Please try again.',
			lines: refusal.lines ?? []
		};
	}

	async release(): Promise<void> {
		this.busy = true;
		const answer = await ask('DELETE', `/api/cart/hold?service=${this.#service()}`);
		this.busy = false;
		if (answer.cart) this.view = answer.cart;
		if (!answer.ok) this.failure = { listingId: null, message: answer.message };
	}

	/** Totals for another service: the server prices it. */
	async chooseService(service: 'overnight' | 'two_day'): Promise<void> {
		await this.refresh(service);
	}
}

/** One cart per browser tab. Only ever filled by fetches in the browser, never on the server. */
export const cart = new CartClient();
