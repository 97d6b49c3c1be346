// Stripe's request bodies are application/x-www-form-urlencoded with bracket keys, the
// way the `qs` library writes them: `line_items[0][price_data][unit_amount]=1800`,
// `metadata[order]=A-17`, `expand[0]=line_items`. This reads such a body back into
// nested objects and arrays; every leaf stays a string, as it arrives on the wire.

export type FormValue = string | FormValue[] | { [key: string]: FormValue };
export type FormObject = { [key: string]: FormValue };

// Keys that would reach Object.prototype if written through; never a Stripe parameter.
const FORBIDDEN = new Set(['__proto__', 'constructor', 'prototype']);
const MAX_DEPTH = 8;

export class FormBodyError extends Error {}

/** `a[b][0]` → ['a', 'b', '0']; `a[]` pushes onto a list (qs's brackets format). */
export function keyPath(key: string): string[] {
	const open = key.indexOf('[');
	if (open <= 0) {
		if (key === '' || key.includes(']')) throw new FormBodyError(`Malformed key ${key}`);
		return [key];
	}
	const parts = [key.slice(0, open)];
	let rest = key.slice(open);
	while (rest.length > 0) {
		const match = /^\[([^[\]]*)\]/.exec(rest);
		if (!match) throw new FormBodyError(`Malformed key ${key}`);
		parts.push(match[1] ?? '');
		rest = rest.slice(match[0].length);
	}
	if (parts.length > MAX_DEPTH) throw new FormBodyError(`Key ${key} is nested too deeply`);
	return parts;
}

const decode = (text: string) => {
	try {
		return decodeURIComponent(text.replace(/\+/g, ' '));
	} catch {
		throw new FormBodyError(`Malformed percent-encoding in ${text}`);
	}
};

type Tree = Map<string, Tree | string>;

/** Lists come back as arrays only when their keys are exactly 0 … n-1. */
function settle(tree: Tree): FormObject | FormValue[] {
	const keys = [...tree.keys()];
	const values = keys.map((key) => {
		const value = tree.get(key) as Tree | string;
		return typeof value === 'string' ? value : settle(value);
	});
	if (keys.length > 0 && keys.every((key, index) => key === String(index))) return values;
	const object: FormObject = {};
	keys.forEach((key, index) => {
		object[key] = values[index] as FormValue;
	});
	return object;
}

export function parseFormBody(body: string): FormObject {
	const root: Tree = new Map();
	for (const pair of body.split('&')) {
		if (pair === '') continue;
		const equals = pair.indexOf('=');
		const rawKey = equals === -1 ? pair : pair.slice(0, equals);
		const value = equals === -1 ? '' : decode(pair.slice(equals + 1));
		const path = keyPath(decode(rawKey));
		let node = root;
		path.forEach((part, depth) => {
			if (FORBIDDEN.has(part)) throw new FormBodyError(`Key ${rawKey} is not allowed`);
			// `list[]=x` appends: its index is the list's current length.
			const name = part === '' && depth > 0 ? String(node.size) : part;
			if (name === '') throw new FormBodyError(`Malformed key ${rawKey}`);
			const last = depth === path.length - 1;
			const existing = node.get(name);
			if (last) {
				if (existing instanceof Map)
					throw new FormBodyError(`Key ${rawKey} is both a value and a group`);
				node.set(name, value);
				return;
			}
			if (typeof existing === 'string') {
				throw new FormBodyError(`Key ${rawKey} is both a value and a group`);
			}
			const next = existing ?? new Map();
			node.set(name, next);
			node = next;
		});
	}
	return settle(root) as FormObject;
}
