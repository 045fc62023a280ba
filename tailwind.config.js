// Burndown's look: our own palette, type scale and a dark theme for night use in the cockpit.
// Semantic colours are CSS variables set by the base layer below, so one class works in both
// themes; `data-theme="dark"` on <html> switches (the account menu and the OS preference set it).
import plugin from 'tailwindcss/plugin';

const palette = {
	// "Chart room" neutrals: slightly blue-grey paper and ink.
	paper: { 50: '#f6f7f9', 100: '#eceff3', 200: '#d9dee6', 300: '#b9c1ce', 400: '#8c97a8', 500: '#677386', 600: '#4d586a', 700: '#394252', 800: '#252c38', 900: '#161b23', 950: '#0d1016' },
	// Avgas blue for the brand and interactive elements.
	dye: { 300: '#8fb8ff', 400: '#5c95f5', 500: '#3a74e0', 600: '#2a5cc0', 700: '#21489a' },
	// Status: steady, watch, act.
	// The 600s are text on white in the day theme: at least 4.5:1 (WCAG 2.2, 1.4.3).
	steady: { 400: '#3fbf9a', 600: '#17735a' },
	watch: { 400: '#f2b33d', 600: '#8f5e00' },
	act: { 400: '#f26b5b', 600: '#c43a2b' }
};

const light = {
	'--bd-bg': palette.paper[50],
	'--bd-surface': '#ffffff',
	'--bd-raised': palette.paper[100],
	'--bd-line': palette.paper[200],
	'--bd-ink': palette.paper[900],
	'--bd-muted': palette.paper[600],
	'--bd-brand': palette.dye[600],
	'--bd-brand-ink': '#ffffff',
	'--bd-steady': palette.steady[600],
	'--bd-watch': palette.watch[600],
	'--bd-act': palette.act[600]
};

// Night: low luminance, no pure white, warm enough not to spoil dark adaptation.
const dark = {
	'--bd-bg': palette.paper[950],
	'--bd-surface': palette.paper[900],
	'--bd-raised': palette.paper[800],
	'--bd-line': palette.paper[700],
	'--bd-ink': '#d7dbe2',
	'--bd-muted': palette.paper[400],
	'--bd-brand': palette.dye[400],
	'--bd-brand-ink': palette.paper[950],
	'--bd-steady': palette.steady[400],
	'--bd-watch': palette.watch[400],
	'--bd-act': palette.act[400]
};

const v = (name) => `var(--bd-${name})`;

/** @type {import('tailwindcss').Config} */
export default {
	content: ['./src/**/*.{html,svelte,ts,js}'],
	theme: {
		extend: {
			colors: {
				...palette,
				bg: v('bg'),
				surface: v('surface'),
				raised: v('raised'),
				line: v('line'),
				ink: v('ink'),
				muted: v('muted'),
				brand: v('brand'),
				'brand-ink': v('brand-ink'),
				steady: { ...palette.steady, DEFAULT: v('steady') },
				watch: { ...palette.watch, DEFAULT: v('watch') },
				act: { ...palette.act, DEFAULT: v('act') }
			},
			fontFamily: {
				sans: ['"Inter Variable"', 'system-ui', 'sans-serif'],
				mono: ['"JetBrains Mono Variable"', 'ui-monospace', 'monospace']
			},
			// A compact scale for dense tables, and large figures readable at arm's length.
			fontSize: {
				label: ['0.75rem', { lineHeight: '1rem', letterSpacing: '0.02em' }],
				body: ['0.9375rem', { lineHeight: '1.4rem' }],
				figure: ['1.75rem', { lineHeight: '2rem', fontWeight: '600' }],
				hero: ['2.5rem', { lineHeight: '2.75rem', fontWeight: '650' }]
			},
			borderRadius: { card: '0.75rem' }
		}
	},
	plugins: [
		plugin(({ addBase }) => {
			addBase({
				':root': { ...light, 'color-scheme': 'light' },
				':root[data-theme="dark"]': { ...dark, 'color-scheme': 'dark' }
			});
		})
	]
};
