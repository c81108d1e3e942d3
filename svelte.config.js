import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	compilerOptions: { runes: true },
	kit: {
		adapter: adapter(),
		typescript: {
			// The fakes and scripts are TypeScript too; type-check and lint them with the app.
			config: (tsconfig) => ({
				...tsconfig,
				include: [...tsconfig.include, '../fakes/**/*.ts', '../drizzle.config.ts']
			})
		},
		// The patient pages register it themselves (src/lib/offline/register.ts): staff never get it.
		serviceWorker: { register: false },
		// Served at the site root: resolve() gives root paths ('/patients'), in rendered links and
		// in redirects alike, rather than ones relative to the page being rendered ('../patients').
		paths: { relative: false },
		// Auth.js relies on SvelteKit's Origin check for form posts (on by default; never turn it off).
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				'media-src': ['self', 'blob:'],
				'font-src': ['self'],
				'connect-src': ['self'],
				'worker-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
