// End-to-end tests in Debian's Chromium (never a downloaded browser) against
// the production build, served on its own port over the seeded test database.
import { defineConfig, devices } from '@playwright/test';

const port = Number(process.env.E2E_PORT ?? 3197);
const baseURL = `http://127.0.0.1:${port}`;
// The e2e run's own mail catcher, on ports apart from the one npm start uses.
const catcherSmtp = 2526;
const catcherHttp = 2581;
export const outboxApi = `http://127.0.0.1:${catcherHttp}`;
// The e2e run's own forecast fake (its /test/* controls set places and failures).
const weatherPort = 2591;
export const weatherApi = `http://127.0.0.1:${weatherPort}`;
// The e2e run's own Stripe stand-in (its /test/* controls pay, deliver and fail on demand).
const stripePort = 2596;
export const stripeApi = `http://127.0.0.1:${stripePort}`;
export const stripeSecretKey = 'sk_test_local_fake_e2e';
export const stripeWebhookSecret = 'whsec_local_fake_e2e';
// The e2e run's own carrier stand-in (POST /test/updates signs and posts a tracking update).
const carrierPort = 2598;
export const carrierApi = `http://127.0.0.1:${carrierPort}`;
export const trackingWebhookSecret = 'tracking_local_fake_e2e';

/** Root in a container has no sandbox; the rest keeps Chromium off the closed network. */
export const CHROMIUM_ARGS = [
	'--no-sandbox',
	'--disable-gpu',
	'--disable-quic',
	'--no-first-run',
	'--disable-background-networking',
	'--disable-component-update',
	'--disable-sync'
];

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
			args: CHROMIUM_ARGS
		}
	},
	projects: [
		{ name: 'phone', use: { ...devices['Desktop Chrome'], viewport: { width: 390, height: 844 } } },
		{
			name: 'desktop',
			use: { ...devices['Desktop Chrome'], viewport: { width: 1280, height: 900 } }
		}
	],
	webServer: [
		{
			command: 'node_modules/.bin/tsx tests/fakes/mail-catcher.ts',
			cwd: '../..',
			url: `${outboxApi}/health`,
			reuseExistingServer: false,
			timeout: 30_000,
			env: {
				MAIL_CATCHER_SMTP_PORT: String(catcherSmtp),
				MAIL_CATCHER_HTTP_PORT: String(catcherHttp),
				MAIL_CATCHER_STORE: '.data/e2e-caught.jsonl'
			}
		},
		{
			command: 'node_modules/.bin/tsx tests/fakes/weather-fake.ts',
			cwd: '../..',
			url: `${weatherApi}/health`,
			reuseExistingServer: false,
			timeout: 30_000,
			env: { WEATHER_FAKE_PORT: String(weatherPort) }
		},
		{
			command: 'node_modules/.bin/tsx tests/fakes/stripe-fake.ts',
			cwd: '../..',
			url: `${stripeApi}/health`,
			reuseExistingServer: false,
			timeout: 30_000,
			env: {
				STRIPE_FAKE_PORT: String(stripePort),
				STRIPE_SECRET_KEY: stripeSecretKey,
				STRIPE_WEBHOOK_SECRET: stripeWebhookSecret,
				STRIPE_WEBHOOK_URL: `${baseURL}/api/stripe/webhook`,
				// The seeded demo orders' payments, so the admin can refund them in the browser tests.
				STRIPE_FAKE_DEMO_DATABASE_URL: process.env.DATABASE_URL ?? ''
			}
		},
		{
			command: 'node_modules/.bin/tsx tests/fakes/carrier-fake.ts',
			cwd: '../..',
			url: `${carrierApi}/health`,
			reuseExistingServer: false,
			timeout: 30_000,
			env: {
				CARRIER_FAKE_PORT: String(carrierPort),
				TRACKING_WEBHOOK_SECRET: trackingWebhookSecret,
				TRACKING_WEBHOOK_URL: `${baseURL}/api/shipments/tracking`
			}
		},
		{
			command: 'node build',
			cwd: '../..',
			url: `${baseURL}/api/health`,
			reuseExistingServer: false,
			timeout: 60_000,
			env: {
				HOST: '127.0.0.1',
				PORT: String(port),
				ORIGIN: baseURL,
				DATABASE_URL: process.env.DATABASE_URL ?? '',
				AUTH_SECRET: process.env.AUTH_SECRET ?? 'e2e-only-secret-0123456789abcdef0123456789',
				SMTP_URL: `smtp://127.0.0.1:${catcherSmtp}`,
				MAIL_CATCHER_URL: outboxApi,
				WEATHER_API_URL: weatherApi,
				STRIPE_SECRET_KEY: stripeSecretKey,
				STRIPE_WEBHOOK_SECRET: stripeWebhookSecret,
				STRIPE_API_HOST: '127.0.0.1',
				STRIPE_API_PORT: String(stripePort),
				STRIPE_API_PROTOCOL: 'http',
				TRACKING_WEBHOOK_SECRET: trackingWebhookSecret,
				SHOP_TIME_ZONE: 'America/New_York'
			}
		}
	]
});
