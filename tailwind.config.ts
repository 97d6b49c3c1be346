// Hatchlot's design tokens. Tailwind 4 reads this through `@config` in src/app.css.
// The palette replaces Tailwind's own colours, so every colour on screen is one of ours.
import type { Config } from 'tailwindcss';

/** Warm off-white paper for pages and panels. */
const page = {
	DEFAULT: '#faf7f0',
	50: '#fdfcf8',
	100: '#faf7f0',
	200: '#f2ece0',
	300: '#e6ddcb',
	400: '#d5c8b0'
};

/** Text: a warm near-black, never pure black on the off-white page. */
const ink = {
	DEFAULT: '#24221d',
	300: '#b4ad9f',
	400: '#8f887a',
	500: '#6b6558', // muted text; 5.4:1 on page-100
	600: '#524d42',
	700: '#3b3830',
	800: '#24221d',
	900: '#171612'
};

/** Deep moss green: primary actions and healthy, moving-along states. */
const moss = {
	DEFAULT: '#2f5227',
	50: '#eff4eb',
	100: '#dbe7d2',
	200: '#b9d0aa',
	300: '#8fb27c',
	400: '#6a9557',
	500: '#4e7a3f',
	600: '#3d6532',
	700: '#2f5227', // primary buttons; white text on it is 8.9:1 (WCAG contrast)
	800: '#243f1e',
	900: '#1a2e16'
};

/** Loam brown: secondary surfaces, quiet chrome, waiting states. */
const loam = {
	DEFAULT: '#6c533b',
	50: '#f4efe6',
	100: '#e8dfcf',
	200: '#d4c4a8',
	300: '#baa07e',
	400: '#9d805c',
	500: '#836749',
	600: '#6c533b',
	700: '#55412f',
	800: '#3f3023',
	900: '#2b2119'
};

/** Amber: anything that needs care now (a weather hold, a due task, a paused clutch). */
const amber = {
	DEFAULT: '#a86b0c',
	50: '#fdf6e4',
	100: '#f9e7bb',
	200: '#f1cd7c',
	300: '#e6b04a',
	400: '#d39628',
	500: '#bd7e14',
	600: '#a86b0c',
	700: '#82520c', // amber-700 text on amber-50 is 6.2:1
	800: '#603d0d',
	900: '#412a0a'
};

/** Brick red: only for loss and refusal (cancelled, refunded, declined, losses). */
const brick = {
	DEFAULT: '#a4402b',
	50: '#fbefeb',
	100: '#f5d6cd',
	200: '#e9ae9e',
	300: '#d8826b',
	400: '#c4614a',
	500: '#b04b34',
	600: '#a4402b',
	700: '#7f3121', // brick-700 text on brick-50 is 7.9:1
	800: '#5e2619',
	900: '#411b12'
};

/** A type step: size, and the line height that goes with it. */
type TypeStep = [fontSize: string, options: { lineHeight: string }];

// A calm scale with generous leading: body text breathes, headings stay tight.
const fontSize: Record<'xs' | 'sm' | 'base' | 'lg' | 'xl' | '2xl' | '3xl' | '4xl', TypeStep> = {
	xs: ['0.8125rem', { lineHeight: '1.45' }],
	sm: ['0.9375rem', { lineHeight: '1.55' }],
	base: ['1.0625rem', { lineHeight: '1.65' }],
	lg: ['1.25rem', { lineHeight: '1.55' }],
	xl: ['1.5rem', { lineHeight: '1.35' }],
	'2xl': ['1.875rem', { lineHeight: '1.25' }],
	'3xl': ['2.375rem', { lineHeight: '1.15' }],
	'4xl': ['3rem', { lineHeight: '1.08' }]
};

export default {
	content: ['./src/**/*.{html,svelte,ts}'],
	theme: {
		colors: {
			transparent: 'transparent',
			current: 'currentColor',
			white: '#ffffff',
			page,
			ink,
			moss,
			loam,
			amber,
			brick
		},
		fontFamily: {
			sans: ['"Source Sans 3"', 'ui-sans-serif', 'system-ui', 'sans-serif'],
			mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'Consolas', 'monospace']
		},
		fontSize,
		borderRadius: {
			none: '0',
			sm: '0.25rem',
			DEFAULT: '0.375rem',
			md: '0.5rem',
			lg: '0.75rem',
			xl: '1.125rem',
			full: '9999px'
		},
		extend: {
			spacing: {
				// The smallest comfortable touch target (WCAG 2.5.5 asks for 44 × 44 CSS px).
				touch: '2.75rem',
				gutter: '1.25rem'
			},
			minHeight: { touch: '2.75rem' },
			minWidth: { touch: '2.75rem' },
			maxWidth: { prose: '38rem', shell: '80rem' },
			boxShadow: {
				card: '0 1px 2px rgb(36 34 29 / 0.06), 0 2px 8px rgb(36 34 29 / 0.05)',
				lifted: '0 2px 4px rgb(36 34 29 / 0.08), 0 8px 24px rgb(36 34 29 / 0.08)'
			},
			outlineWidth: { focus: '3px' },
			outlineOffset: { focus: '2px' },
			outlineColor: { focus: moss[500] },
			letterSpacing: { label: '0.04em' }
		}
	}
} satisfies Config;
