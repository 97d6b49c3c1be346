// A plain HTTP visitor of the built app for the fault tests: keeps its own cookies, sends
// the shop's origin on posts as a browser does (SvelteKit's cross-site form check), and
// never waits long: a request that hangs fails the test instead of stalling it.
import type { CheckoutForm } from '../../../src/lib/checkout/schema';

/** The longest a request may take before it counts as hung. */
export const HANG_MS = 10_000;

export type Answer = { status: number; body: string; location: string | null; ms: number };

export class ShopClient {
	private readonly jar = new Map<string, string>();

	constructor(
		readonly origin: string,
		cookie?: string
	) {
		if (cookie) {
			const cut = cookie.indexOf('=');
			this.jar.set(cookie.slice(0, cut), cookie.slice(cut + 1));
		}
	}

	async request(path: string, init: RequestInit = {}): Promise<Answer> {
		const headers = new Headers(init.headers);
		if (this.jar.size > 0)
			headers.set('cookie', [...this.jar].map(([name, value]) => `${name}=${value}`).join('; '));
		if (init.method && init.method !== 'GET') headers.set('origin', this.origin);
		const started = Date.now();
		const response = await fetch(`${this.origin}${path}`, {
			...init,
			headers,
			redirect: 'manual',
			signal: AbortSignal.timeout(HANG_MS)
		});
		for (const line of response.headers.getSetCookie()) {
			const [pair = ''] = line.split(';');
			const cut = pair.indexOf('=');
			const name = pair.slice(0, cut).trim();
			const value = pair.slice(cut + 1).trim();
			if (/max-age=0|expires=thu, 01 jan 1970/i.test(line) || value === '') this.jar.delete(name);
			else this.jar.set(name, value);
		}
		const body = await response.text();
		return {
			status: response.status,
			body,
			location: response.headers.get('location'),
			ms: Date.now() - started
		};
	}

	/** A page as a browser asks for it. */
	page(path: string): Promise<Answer> {
		return this.request(path, { headers: { accept: 'text/html,application/xhtml+xml' } });
	}

	/** A JSON route; `body` makes it a POST. */
	api(path: string, body?: unknown): Promise<Answer> {
		return this.request(
			path,
			body === undefined
				? { headers: { accept: 'application/json' } }
				: {
						method: 'POST',
						headers: { accept: 'application/json', 'content-type': 'application/json' },
						body: JSON.stringify(body)
					}
		);
	}

	/** The add-to-cart button: POST /api/cart. */
	addToCart(listingId: number, quantity: number): Promise<Answer> {
		return this.api('/api/cart', { listingId, quantity });
	}

	/** The checkout form posted without JavaScript: a 303 to the pay page when it works. */
	async checkout(form: CheckoutForm): Promise<Answer & { sessionId: string | null }> {
		const fields = new URLSearchParams();
		for (const [key, value] of Object.entries(form)) {
			if (key !== 'terms') fields.set(key, String(value));
			else if (value) fields.set('terms', 'on');
		}
		const answer = await this.request('/checkout', {
			method: 'POST',
			headers: {
				accept: 'text/html,application/xhtml+xml',
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: fields.toString()
		});
		const paid = answer.status === 303 ? /\/pay\/([^/?#]+)/.exec(answer.location ?? '') : null;
		return { ...answer, sessionId: paid?.[1] ? decodeURIComponent(paid[1]) : null };
	}
}

/** A checkout form for a buyer in Knoxville (ZIP 37902, the shop's own city), overnight. */
export function knoxvilleBuyer(email: string): CheckoutForm {
	return {
		email,
		ship_name: 'Fault Test Buyer',
		ship_line1: '12 Market Square',
		ship_line2: '',
		ship_city: 'Knoxville',
		ship_state: 'TN',
		ship_zip: '37902',
		service: 'overnight',
		terms: true
	};
}

/** Polls `probe` until `accept` holds or `ms` runs out (then throws with the last value). */
export async function waitFor<T>(
	probe: () => Promise<T>,
	accept: (value: T) => boolean,
	ms: number,
	what: string
): Promise<T> {
	const deadline = Date.now() + ms;
	let last: T | undefined;
	for (;;) {
		try {
			last = await probe();
			if (accept(last)) return last;
		} catch {
			// Not answering yet counts as not there yet.
		}
		if (Date.now() > deadline)
			throw new Error(`gave up waiting for ${what}; last: ${JSON.stringify(last)?.slice(0, 400)}`);
		await new Promise((resolve) => setTimeout(resolve, 150));
	}
}
