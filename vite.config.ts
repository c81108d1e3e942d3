import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	test: {
		expect: { requireAssertions: true },
		// Integration tests share one storage and mail fake started in globalSetup.
		globalSetup: ['tests/integration/global-setup.ts'],
		include: ['src/**/*.test.ts', 'tests/integration/**/*.test.ts'],
		environment: 'node',
		testTimeout: 20_000
	}
});
