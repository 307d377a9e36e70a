import type { Config } from 'tailwindcss';

// A bench notebook: warm paper, graphite ink, one verdigris accent, amber only for cautions.
export default {
	content: ['./src/**/*.{html,svelte,ts}'],
	theme: {
		extend: {
			colors: {
				paper: { DEFAULT: '#f7f2e7', deep: '#efe7d6', rule: '#ddd2bd' },
				ink: { DEFAULT: '#2a2926', soft: '#57544d', faint: '#8a857a' },
				verdigris: { DEFAULT: '#2c7a6b', dark: '#1f5c50', light: '#d6ebe5' },
				caution: { DEFAULT: '#b26b00', light: '#fbecd0' },
				danger: { DEFAULT: '#a3352b', light: '#f6dcd8' }
			},
			fontFamily: {
				sans: ['"IBM Plex Sans"', 'system-ui', 'sans-serif'],
				mono: ['"IBM Plex Mono"', 'ui-monospace', 'monospace']
			}
		}
	}
} satisfies Config;
