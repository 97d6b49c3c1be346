import { describe, expect, it } from 'vitest';
import { FormBodyError, keyPath, parseFormBody } from './form';

// Bodies are built with URLSearchParams (the WHATWG URL standard's form encoder), so the
// percent-encoding under test is the standard's, not ours.
const encode = (pairs: [string, string][]) => new URLSearchParams(pairs).toString();

describe('keyPath', () => {
	it('splits bracket keys', () => {
		expect(keyPath('line_items[0][price_data][unit_amount]')).toEqual([
			'line_items',
			'0',
			'price_data',
			'unit_amount'
		]);
		expect(keyPath('mode')).toEqual(['mode']);
		expect(keyPath('expand[]')).toEqual(['expand', '']);
	});

	it('refuses malformed keys', () => {
		for (const key of ['a[b', 'a]b', '[a]', 'a[b]c', '']) {
			expect(() => keyPath(key), key).toThrow(FormBodyError);
		}
	});
});

describe('parseFormBody', () => {
	it('reads a checkout session body into nested objects and arrays', () => {
		const body = encode([
			['mode', 'payment'],
			['line_items[0][price_data][currency]', 'usd'],
			['line_items[0][price_data][unit_amount]', '1800'],
			['line_items[0][price_data][product_data][name]', 'Pink toe tarantula, sling'],
			['line_items[0][quantity]', '3'],
			['line_items[1][price_data][unit_amount]', '4500'],
			['line_items[1][quantity]', '1'],
			['metadata[order]', 'A-17 & co'],
			['success_url', 'http://127.0.0.1:3000/checkout/done?session={CHECKOUT_SESSION_ID}']
		]);
		expect(parseFormBody(body)).toEqual({
			mode: 'payment',
			line_items: [
				{
					price_data: {
						currency: 'usd',
						unit_amount: '1800',
						product_data: { name: 'Pink toe tarantula, sling' }
					},
					quantity: '3'
				},
				{ price_data: { unit_amount: '4500' }, quantity: '1' }
			],
			metadata: { order: 'A-17 & co' },
			success_url: 'http://127.0.0.1:3000/checkout/done?session={CHECKOUT_SESSION_ID}'
		});
	});

	it('keeps unencoded brackets, plus as space, empty values and appended lists', () => {
		expect(parseFormBody('expand[0]=line_items&expand[1]=payment_intent')).toEqual({
			expand: ['line_items', 'payment_intent']
		});
		expect(parseFormBody('expand[]=a&expand[]=b&note=two+words&metadata[x]=')).toEqual({
			expand: ['a', 'b'],
			note: 'two words',
			metadata: { x: '' }
		});
		expect(parseFormBody('')).toEqual({});
	});

	it('keeps numbered keys that are not a 0…n-1 list as an object', () => {
		expect(parseFormBody('metadata[1]=a&metadata[3]=b')).toEqual({ metadata: { 1: 'a', 3: 'b' } });
	});

	it('refuses prototype keys, clashes and bad encoding', () => {
		expect(() => parseFormBody('__proto__[polluted]=1')).toThrow(FormBodyError);
		expect(() => parseFormBody('metadata[constructor]=1')).toThrow(FormBodyError);
		expect(() => parseFormBody('a=1&a[b]=2')).toThrow(FormBodyError);
		expect(() => parseFormBody('a[b]=2&a=1')).toThrow(FormBodyError);
		expect(() => parseFormBody('a=%E0%A4%A')).toThrow(FormBodyError);
		expect(({} as Record<string, unknown>).polluted).toBeUndefined();
	});
});
