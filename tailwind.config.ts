import type { Config } from 'tailwindcss';

/**
 * Wrenchroll's palette comes from the workshop bench: primer grey for ink and frames,
 * bare zinc for surfaces, shop-manual paper for the page, and one signal accent.
 * Caution cards use hazard yellow on ink, the way a warning decal reads.
 */
export default {
	content: ['./src/**/*.{html,svelte,ts,js}'],
	theme: {
		extend: {
			colors: {
				ink: '#1b1f22',
				primer: {
					50: '#f2f3f3',
					100: '#e1e3e4',
					200: '#c4c8ca',
					300: '#a3a9ad',
					400: '#7d8589',
					500: '#5f676c',
					600: '#4a5155',
					700: '#383e41',
					800: '#2a2e31',
					900: '#1f2326'
				},
				zinc: {
					50: '#f4f6f7',
					100: '#e8ecee',
					200: '#d3dade',
					300: '#b7c1c7'
				},
				paper: '#f7f6f2',
				signal: {
					DEFAULT: '#c2410c',
					dark: '#9a330a',
					light: '#fde3d3'
				},
				hazard: {
					DEFAULT: '#f5c518',
					light: '#fff6cc'
				},
				go: {
					DEFAULT: '#2a7049',
					light: '#dff1e6'
				},
				stop: {
					DEFAULT: '#b42318',
					light: '#fde4e1'
				}
			},
			fontFamily: {
				sans: ['"Space Grotesk"', 'ui-sans-serif', 'system-ui', 'sans-serif'],
				mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace']
			},
			borderRadius: {
				plate: '3px'
			},
			boxShadow: {
				plate: '0 1px 0 rgba(27,31,34,0.08), 0 0 0 1px rgba(27,31,34,0.10)'
			}
		}
	}
} satisfies Config;
