import js from '@eslint/js';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

export default ts.config(
	{
		ignores: [
			'build/',
			'.svelte-kit/',
			'.data/',
			'node_modules/',
			'test-results/',
			'playwright-report/',
			'tests/artifacts/'
		]
	},
	js.configs.recommended,
	...ts.configs.recommended,
	...svelte.configs.recommended,
	{
		languageOptions: { globals: { ...globals.browser, ...globals.node } }
	},
	{
		files: ['**/*.ts', '**/*.svelte', '**/*.svelte.ts'],
		languageOptions: {
			parserOptions: {
				projectService: true,
				extraFileExtensions: ['.svelte'],
				parser: ts.parser,
				svelteConfig,
				tsconfigRootDir: import.meta.dirname
			}
		},
		rules: {
			'@typescript-eslint/no-floating-promises': 'error',
			'@typescript-eslint/no-unused-vars': [
				'error',
				{ argsIgnorePattern: '^_', varsIgnorePattern: '^_' }
			]
		}
	},
	{
		// The server writes through the pino logger ($lib/server/log), which scrubs secrets and
		// card numbers and tags each line with its request or job id; console bypasses both.
		files: ['src/lib/server/**/*.ts', 'src/hooks.server.ts', 'src/routes/**/+*.server.ts'],
		ignores: ['**/*.test.ts'],
		rules: { 'no-console': 'error' }
	},
	{
		files: ['**/*.js'],
		...ts.configs.disableTypeChecked
	}
);
