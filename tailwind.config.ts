import type { Config } from 'tailwindcss';

/**
 * Kinelume's own palette (DESIGN.md §6). Every text pair used on screen keeps a WCAG contrast
 * ratio of at least 4.5:1; src/lib/a11y/contrast.test.ts checks the pairs against the formula.
 */
export const palette = {
	ink: '#1c2230',
	paper: '#faf8f4',
	lichen: '#2d6a56',
	'lichen-deep': '#1f4d3e',
	ember: '#b3471f',
	dusk: '#3b4f7a',
	ochre: '#7a5c12',
	berry: '#9e2a3a',
	slate: '#5a6272',
	mist: '#e8eee9'
} as const;

export default {
	content: ['./src/**/*.{html,svelte,ts}'],
	theme: {
		extend: {
			colors: palette,
			fontFamily: {
				sans: ['"Atkinson Hyperlegible"', 'system-ui', 'sans-serif']
			},
			minHeight: { target: '44px' },
			minWidth: { target: '44px' }
		}
	}
} satisfies Config;
