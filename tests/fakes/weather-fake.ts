// The local forecast service for `npm start` and the browser tests (see
// tests/fakes/weather/server.ts for what it serves and its test controls).
//
//   node_modules/.bin/tsx tests/fakes/weather-fake.ts
//
// env: WEATHER_FAKE_PORT (2590); it listens on 127.0.0.1 only.
import { startWeatherFake } from './weather/server';
import { runFake, stopOnSignal } from './stop-on-signal';

function portFrom(value: string | undefined, fallback: number): number {
	if (value === undefined || value.trim() === '') return fallback;
	const port = Number(value);
	if (!Number.isInteger(port) || port < 0 || port > 65535) {
		throw new RangeError(`WEATHER_FAKE_PORT must be a port number, got ${value}`);
	}
	return port;
}

async function main(): Promise<void> {
	const fake = await startWeatherFake({
		port: portFrom(process.env.WEATHER_FAKE_PORT, 2590),
		log: (line) => console.log(line)
	});
	console.log(`[weather-fake] forecasts on ${fake.url}/v1/forecast`);
	stopOnSignal('weather-fake', fake);
}

runFake('weather-fake', main);
