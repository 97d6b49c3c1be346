// Runs the production build (build/index.js) on a free loopback port for a test.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';

const BUILD = path.resolve(import.meta.dirname, '../../../build/index.js');
export const TEST_AUTH_SECRET = 'integration-tests-only-secret-0123456789abcdef';

export async function freePort(): Promise<number> {
	const server = net.createServer();
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
	const { port } = server.address() as net.AddressInfo;
	await new Promise((resolve) => server.close(resolve));
	return port;
}

/** A TCP relay to 127.0.0.1:targetPort: started late, it stands in for "the database host coming up". */
export function relayTo(targetPort: number): net.Server {
	return net.createServer((inbound) => {
		const outbound = net.connect(targetPort, '127.0.0.1');
		inbound.pipe(outbound).pipe(inbound);
		inbound.on('error', () => outbound.destroy());
		outbound.on('error', () => inbound.destroy());
	});
}

export type RunningApp = {
	port: number;
	origin: string;
	stop: () => Promise<void>;
	output: () => string;
};

export async function startApp(env: Record<string, string>): Promise<RunningApp> {
	if (!existsSync(BUILD))
		throw new Error('build/index.js is missing: run `npm run build` first (npm test does).');
	const port = await freePort();
	const origin = `http://127.0.0.1:${port}`;
	let output = '';
	const child: ChildProcess = spawn(process.execPath, [BUILD], {
		env: {
			...process.env,
			HOST: '127.0.0.1',
			PORT: String(port),
			ORIGIN: origin,
			AUTH_SECRET: TEST_AUTH_SECRET,
			// Nothing listens here unless a test says so: mail jobs just retry.
			SMTP_URL: 'smtp://127.0.0.1:9',
			MAIL_CATCHER_URL: '',
			...env
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	child.stdout?.on('data', (chunk) => (output += chunk));
	child.stderr?.on('data', (chunk) => (output += chunk));
	const deadline = Date.now() + 20_000;
	for (;;) {
		if (child.exitCode !== null) throw new Error(`the app exited during start-up:\n${output}`);
		const up = await new Promise<boolean>((resolve) => {
			const socket = net.connect(port, '127.0.0.1', () => {
				socket.end();
				resolve(true);
			});
			socket.on('error', () => resolve(false));
		});
		if (up) break;
		if (Date.now() > deadline) throw new Error(`the app did not start listening:\n${output}`);
		await new Promise((resolve) => setTimeout(resolve, 100));
	}
	return {
		port,
		origin,
		output: () => output,
		stop: async () => {
			if (child.exitCode !== null) return;
			const exited = new Promise((resolve) => child.once('exit', resolve));
			child.kill('SIGTERM');
			await Promise.race([exited, new Promise((resolve) => setTimeout(resolve, 5_000))]);
			if (child.exitCode === null) child.kill('SIGKILL');
		}
	};
}
