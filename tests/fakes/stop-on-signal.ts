// How every local stand-in runs from the command line: stop cleanly on Ctrl-C or a
// TERM from the start script, and exit non-zero when it cannot start or stop.

/** Stops `fake` once on SIGINT or SIGTERM, then exits; `name` prefixes the log lines. */
export function stopOnSignal(name: string, fake: { stop(): Promise<void> }): void {
	let stopping = false;
	const stop = (signal: string) => {
		if (stopping) return;
		stopping = true;
		fake
			.stop()
			.then(() => {
				console.log(`[${name}] stopped (${signal})`);
				process.exit(0);
			})
			.catch((error: Error) => {
				console.error(`[${name}] could not stop cleanly: ${error.message}`);
				process.exit(1);
			});
	};
	process.on('SIGINT', () => stop('SIGINT'));
	process.on('SIGTERM', () => stop('SIGTERM'));
}

/** Runs a stand-in's `main`, logging why it could not start and exiting 1. */
export function runFake(name: string, main: () => Promise<void>): void {
	main().catch((error: Error) => {
		console.error(`[${name}] ${error.message}`);
		process.exit(1);
	});
}
