import { defineConfig } from '@playwright/test';
import { E2E } from './ports';

/**
 * End-to-end tests run against the production build (`vite build` first), with the storage and
 * mail fakes and a fresh SQLite file, all started by stack.ts. The browser is Debian's chromium
 * (never a downloaded one); CHROMIUM_PATH overrides its location.
 */
export default defineConfig({
	testDir: '.',
	testMatch: '**/*.e2e.ts',
	outputDir: '../.run/e2e-results',
	fullyParallel: false,
	workers: 1,
	retries: 0,
	timeout: 60_000,
	reporter: [['list']],
	use: {
		baseURL: E2E.origin,
		browserName: 'chromium',
		launchOptions: {
			executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
			args: [
				'--no-sandbox',
				'--disable-gpu',
				'--disable-quic',
				'--no-first-run',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync'
			]
		},
		trace: 'off',
		screenshot: 'only-on-failure'
	},
	webServer: {
		command: 'node_modules/.bin/tsx tests/e2e/stack.ts',
		cwd: '../..',
		url: `${E2E.origin}/api/health`,
		timeout: 120_000,
		reuseExistingServer: false,
		stdout: 'pipe',
		stderr: 'pipe'
	}
});
