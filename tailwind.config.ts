import type { Config } from 'tailwindcss';

/**
 * Patchwright's own palette, named after the trade: slate ink, clay (vitrified clay
 * pipe) as the brand accent, resin amber for highlights and progress, water blue-green
 * for tests and verification, on warm paper. Safety colours follow ISO 3864 meaning and
 * are used only for safety messages.
 */
export default {
	content: ['./src/**/*.{html,js,svelte,ts,md}', './content/**/*.md'],
	theme: {
		extend: {
			colors: {
				slate: {
					50: '#f5f7f8',
					100: '#e8ecef',
					200: '#cfd7dd',
					300: '#a9b7c1',
					400: '#7b8e9c',
					500: '#5a6e7e',
					600: '#455766',
					700: '#364452',
					800: '#252f39',
					900: '#171f27',
					950: '#0d1217'
				},
				clay: {
					50: '#fbf2ee',
					100: '#f5e0d6',
					200: '#eabda9',
					300: '#dc9676',
					400: '#cc724d',
					500: '#b65833',
					600: '#9a4628',
					700: '#7b3822',
					800: '#5d2b1c',
					900: '#432015'
				},
				resin: {
					50: '#fff8ea',
					100: '#feebc6',
					200: '#fcd68a',
					300: '#f8bd4d',
					400: '#f0a229',
					500: '#d78613',
					600: '#b2690c',
					700: '#8a4f0e',
					800: '#693d11',
					900: '#4b2c0f'
				},
				water: {
					50: '#edf9f8',
					100: '#cfefec',
					200: '#a2dfda',
					300: '#6bc6c1',
					400: '#3aa8a5',
					500: '#228b8b',
					600: '#1a6f72',
					700: '#185a5d',
					800: '#16484c',
					900: '#12393c'
				},
				paper: { DEFAULT: '#fbf8f2', deep: '#f2ede3', line: '#e4dccd' },
				danger: { DEFAULT: '#b3141f', soft: '#fdecec' },
				warning: { DEFAULT: '#c2410c', soft: '#fff1e6' },
				caution: { DEFAULT: '#e8b100', soft: '#fff9db', ink: '#4a3800' }
			},
			fontFamily: {
				serif: ['Lora', 'Georgia', 'serif'],
				sans: ['system-ui', '-apple-system', 'Segoe UI', 'Roboto', 'Helvetica Neue', 'Arial', 'sans-serif']
			},
			fontSize: {
				base: ['1.0625rem', { lineHeight: '1.7' }],
				lg: ['1.1875rem', { lineHeight: '1.7' }]
			},
			minHeight: { touch: '44px' },
			minWidth: { touch: '44px' },
			maxWidth: { prose: '68ch' }
		}
	}
} satisfies Config;
