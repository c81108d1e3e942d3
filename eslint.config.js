import js from '@eslint/js';
import prettier from 'eslint-config-prettier';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

export default ts.config(
	{ ignores: ['build/', '.svelte-kit/', '.data/', 'drizzle/', 'tests/.run/', 'node_modules/'] },
	js.configs.recommended,
	...ts.configs.recommended,
	...svelte.configs.recommended,
	prettier,
	...svelte.configs.prettier,
	{
		languageOptions: { globals: { ...globals.browser, ...globals.node } },
		rules: {
			'no-undef': 'off'
		}
	},
	{
		files: ['**/*.ts', '**/*.svelte', '**/*.svelte.ts'],
		languageOptions: {
			parserOptions: {
				projectService: true,
				extraFileExtensions: ['.svelte'],
				parser: ts.parser,
				svelteConfig
			}
		},
		rules: { '@typescript-eslint/no-floating-promises': 'error' }
	},
	{
		// The app runs ffmpeg only through src/lib/server/media/ffmpeg.ts, and never carries the
		// demo renderer or other script code (src/scripts), so none of it reaches the build.
		files: ['src/lib/**', 'src/routes/**', 'src/hooks.*.ts', 'src/auth.ts'],
		ignores: ['src/lib/server/media/ffmpeg.ts'],
		rules: {
			'no-restricted-imports': [
				'error',
				{
					paths: [
						{ name: 'node:child_process', message: 'Run ffmpeg through $lib/server/media/ffmpeg.' },
						{ name: 'child_process', message: 'Run ffmpeg through $lib/server/media/ffmpeg.' },
						{ name: '@ffmpeg-installer/ffmpeg', message: 'Use ffmpegPath() from media/ffmpeg.' },
						{ name: '@ffprobe-installer/ffprobe', message: 'Use ffprobePath() from media/ffmpeg.' },
						{ name: '@napi-rs/canvas', message: 'Drawing belongs to the demo scripts.' }
					],
					patterns: [
						{
							regex: '^(\\.\\./)+scripts/',
							message: 'Script code (src/scripts) stays out of the app.'
						}
					]
				}
			]
		}
	}
);
