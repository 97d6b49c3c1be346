import { describe, expect, it } from 'vitest';
import { createLogger, inJobContext, requestIdFor, withLogContext } from './log';
import { CARD_REDACTED, REDACTED } from './log-scrub';

function memoryLogger(knownSecrets: string[] = [], level = 'info') {
	const written: string[] = [];
	const logger = createLogger({
		destination: { write: (line: string) => void written.push(line) },
		knownSecrets,
		level
	});
	const lines = () => written.map((line) => JSON.parse(line) as Record<string, unknown>);
	return { logger, written, lines };
}

// RFC 9562's layout of a version-4 UUID (what crypto.randomUUID makes).
const UUID_V4 = /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/;

describe('the logger', () => {
	it('writes one JSON object per line with a level name, an ISO time and the message', () => {
		const { logger, written, lines } = memoryLogger();
		logger.info({ orderId: 12 }, 'paid');
		expect(written).toHaveLength(1);
		expect(written[0]!.endsWith('\n')).toBe(true);
		const [line] = lines();
		expect(line).toMatchObject({ level: 'info', msg: 'paid', orderId: 12 });
		expect(new Date(line!.time as string).toISOString()).toBe(line!.time);
	});

	it('puts the request id on every line logged inside its context, awaited work included', async () => {
		const { logger, lines } = memoryLogger();
		logger.info('before');
		await withLogContext({ requestId: 'req-aaaa-1111' }, async () => {
			logger.info('first');
			await new Promise((resolve) => setTimeout(resolve, 1));
			logger.child({ area: 'cart' }).warn('after a wait');
		});
		logger.info('after');
		expect(lines().map((line) => [line.msg, line.requestId])).toEqual([
			['before', undefined],
			['first', 'req-aaaa-1111'],
			['after a wait', 'req-aaaa-1111'],
			['after', undefined]
		]);
	});

	it('keeps two interleaved requests apart', async () => {
		const { logger, lines } = memoryLogger();
		const serve = (id: string, delays: number[]) =>
			withLogContext({ requestId: id }, async () => {
				for (const ms of delays) {
					await new Promise((resolve) => setTimeout(resolve, ms));
					logger.info(`step of ${id}`);
				}
			});
		await Promise.all([serve('req-one-0001', [3, 1, 3]), serve('req-two-0002', [1, 3, 1])]);
		for (const line of lines()) expect(line.msg).toBe(`step of ${line.requestId as string}`);
		expect(lines()).toHaveLength(6);
	});

	it("puts a job's id and queue on its lines", async () => {
		const { logger, lines } = memoryLogger();
		await inJobContext({ id: 'job-42', name: 'mail-send' }, async () => logger.warn('retrying'));
		expect(lines()[0]).toMatchObject({ msg: 'retrying', jobId: 'job-42', queue: 'mail-send' });
	});

	it('lets a line name its own request id over the context', () => {
		const { logger, lines } = memoryLogger();
		withLogContext({ requestId: 'req-context-1' }, () =>
			logger.error({ requestId: 'req-explicit-1' }, 'failed')
		);
		expect(lines()[0]!.requestId).toBe('req-explicit-1');
	});

	it('never prints a secret, a cookie or a card number, wherever it sits', () => {
		const secret = 'unit-test-auth-secret-0123456789abcdef';
		const { logger, written, lines } = memoryLogger([secret]);
		const failure = new Error(`charge for 4242 4242 4242 4242 refused; key sk_test_abcdef`);
		logger.error(
			{
				err: failure,
				headers: { authorization: 'Bearer abc.def', cookie: `hatchlot.session=s3ss10n` },
				body: { email: 'ada@example.com', password: 'correct horse battery' }
			},
			`signing with ${secret}`
		);
		const text = written.join('');
		for (const leak of [
			secret,
			'4242 4242 4242 4242',
			'sk_test_abcdef',
			'abc.def',
			's3ss10n',
			'correct horse battery'
		])
			expect(text, leak).not.toContain(leak);
		const [line] = lines();
		expect(line!.msg).toBe(`signing with ${REDACTED}`);
		expect((line!.err as { message: string }).message).toBe(
			`charge for ${CARD_REDACTED} refused; key ${REDACTED}`
		);
		expect(line!.body).toEqual({ email: 'ada@example.com', password: REDACTED });
	});

	it('writes nothing below its level', () => {
		const { logger, written } = memoryLogger([], 'warn');
		logger.info('routine');
		logger.warn('odd');
		expect(written).toHaveLength(1);
	});
});

describe('requestIdFor', () => {
	it("keeps a caller's short plain id", () => {
		for (const id of ['lb-7f3a9c21', '0f8fad5b-d9cb-469f-a165-70867728950e', 'edge:fra:000123'])
			expect(requestIdFor(id)).toBe(id);
	});

	it('makes a fresh one for a missing, short, long or unsafe id', () => {
		for (const offered of [
			null,
			undefined,
			'',
			'short',
			'x'.repeat(65),
			'two words here',
			'id\nforged-line',
			'{"level":"fatal"}',
			'<script>alert(1)</script>'
		])
			expect(requestIdFor(offered), String(offered)).toMatch(UUID_V4);
	});
});
