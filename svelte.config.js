import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	compilerOptions: { runes: true },
	kit: {
		adapter: adapter({ out: 'build' }),
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
