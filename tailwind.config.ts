import type { Config } from 'tailwindcss';

/**
 * Benchcall's theme. Wired into Tailwind 4 with `@config` in src/app.css.
 * Sized for a bench tablet at arm's length (1280×800) first, a phone second.
 */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			colors: {
				// Cool graphite for text and chrome.
				ink: {
					50: '#f4f6f7',
					100: '#e6eaec',
					200: '#cdd4d8',
					300: '#a9b4ba',
					400: '#7d8c94',
					500: '#5f6f78',
					600: '#4a5860',
					700: '#3b464d',
					800: '#2b3338',
					900: '#1c2226',
					950: '#111518'
				},
				// Benchcall's own accent: a deep petrol blue-green.
				petrol: {
					50: '#eefbf9',
					100: '#d3f3ef',
					200: '#a9e6df',
					300: '#74d1c8',
					400: '#43b4ac',
					500: '#289891',
					600: '#1e7a76',
					700: '#1c625f',
					800: '#1a4f4d',
					900: '#184241',
					950: '#082626'
				},
				// Verdicts. Never colour alone: each badge also carries a word and a shape.
				inspec: { light: '#e3f6e8', DEFAULT: '#1f7a3a', dark: '#14532a' },
				under: { light: '#e6eefc', DEFAULT: '#2850a8', dark: '#1b3774' },
				over: { light: '#fde8e4', DEFAULT: '#b3261e', dark: '#7f1a15' },
				nospec: { light: '#eef0f2', DEFAULT: '#5f6f78', dark: '#3b464d' },
				caution: { light: '#fff4d6', DEFAULT: '#a35f00', dark: '#6e4000' }
			},
			fontFamily: {
				sans: ['"Inter Variable"', 'system-ui', 'sans-serif'],
				mono: ['"JetBrains Mono"', 'ui-monospace', 'monospace']
			},
			spacing: {
				// Minimum hit target for gloved or greasy fingers.
				hit: '3rem',
				// Height of the call bar.
				bar: '4.5rem'
			},
			fontSize: {
				// Readable at arm's length on the bench tablet.
				bench: ['1.375rem', { lineHeight: '1.9rem' }],
				value: ['1.75rem', { lineHeight: '2.1rem', fontWeight: '600' }]
			},
			maxWidth: {
				page: '80rem'
			}
		}
	}
} satisfies Config;
