import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	compilerOptions: { runes: true },
	kit: {
		adapter: adapter({ out: 'build' }),
		// Every page is rendered per request, so 'auto' gives each response a fresh nonce
		// for SvelteKit's start-up script; no other inline script may run.
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				// Svelte writes style attributes and chart.js sizes its canvases; styles cannot run code.
				'style-src': ['self', 'unsafe-inline'],
				// data: for the icon in app.html; photos come from our own /photos route.
				'img-src': ['self', 'data:'],
				'font-src': ['self'],
				'connect-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'frame-ancestors': ['none']
				// form-action stays open: without JavaScript, checkout's post is answered with a
				// redirect to Stripe's pay page, whose origin is set at run time, and browsers
				// check that redirect against form-action.
			}
		},
		typescript: {
			// Type-check the code that runs outside the app bundle too.
			config: (tsconfig) => {
				tsconfig.include.push(
					'../migrations/**/*.ts',
					'../scripts/**/*.ts',
					'../seed/**/*.ts',
					'../tailwind.config.ts',
					'../tests/e2e/playwright.config.ts'
				);
			}
		}
	}
};

export default config;
