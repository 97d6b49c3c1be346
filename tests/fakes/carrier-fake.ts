// The local carrier stand-in for `npm start` and the browser tests (see
// tests/fakes/carrier/server.ts for what it does and its test controls).
//
//   node_modules/.bin/tsx tests/fakes/carrier-fake.ts
//
// env: CARRIER_FAKE_PORT (2597), TRACKING_WEBHOOK_URL (the shop's tracking endpoint),
// TRACKING_WEBHOOK_SECRET (signs the updates); it listens on 127.0.0.1 only.
import { DEFAULT_TRACKING_SECRET, startCarrierFake } from './carrier/server';
import { runFake, stopOnSignal } from './stop-on-signal';

function portFrom(value: string | undefined, fallback: number): number {
	if (value === undefined || value.trim() === '') return fallback;
	const port = Number(value);
	if (!Number.isInteger(port) || port < 0 || port > 65535) {
		throw new RangeError(`CARRIER_FAKE_PORT must be a port number, got ${value}`);
	}
	return port;
}

const setting = (value: string | undefined) =>
	value === undefined || value.trim() === '' ? undefined : value.trim();

async function main(): Promise<void> {
	const webhookUrl = setting(process.env.TRACKING_WEBHOOK_URL);
	const fake = await startCarrierFake({
		port: portFrom(process.env.CARRIER_FAKE_PORT, 2597),
		webhookUrl,
		webhookSecret: setting(process.env.TRACKING_WEBHOOK_SECRET) ?? DEFAULT_TRACKING_SECRET,
		log: (line) => console.log(line)
	});
	console.log(
		`[carrier-fake] controls on ${fake.url}/test/updates; updates to ${webhookUrl ?? '(no TRACKING_WEBHOOK_URL set)'}`
	);
	stopOnSignal('carrier-fake', fake);
}

runFake('carrier-fake', main);
