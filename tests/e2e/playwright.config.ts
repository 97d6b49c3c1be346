// End-to-end tests in Debian's Chromium (never a downloaded browser) against
// the production build, served on its own port over the seeded test database.
import { defineConfig, devices } from '@playwright/test';

const port = Number(process.env.E2E_PORT ?? 3197);
const baseURL = `http://127.0.0.1:${port}`;

export default defineConfig({
	testDir: '.',
	testMatch: '**/*.e2e.ts',
	outputDir: '../../test-results',
	fullyParallel: true,
	workers: 2,
	retries: 0,
	reporter: [['list']],
	timeout: 30_000,
	use: {
		baseURL,
		trace: 'retain-on-failure',
		launchOptions: {
			executablePath: '/usr/bin/chromium',
			// Root in a container has no sandbox; the rest keeps Chromium off the closed network.
			args: [
				'--no-sandbox',
				'--disable-gpu',
				'--disable-quic',
				'--no-first-run',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync'
			]
		}
	},
	projects: [
		{ name: 'phone', use: { ...devices['Desktop Chrome'], viewport: { width: 390, height: 844 } } },
		{
			name: 'desktop',
			use: { ...devices['Desktop Chrome'], viewport: { width: 1280, height: 900 } }
		}
	],
	webServer: {
		command: 'node build',
		cwd: '../..',
		url: `${baseURL}/api/health`,
		reuseExistingServer: false,
		timeout: 60_000,
		env: {
			HOST: '127.0.0.1',
			PORT: String(port),
			ORIGIN: baseURL,
			DATABASE_URL: process.env.DATABASE_URL ?? ''
		}
	}
});
