import { resolve } from 'node:path';

/** Where the end-to-end stack listens and keeps its data; kept apart from the demo's ports. */
export const E2E = {
	appPort: 4173,
	origin: 'http://localhost:4173',
	storagePort: 4669,
	smtpPort: 2625,
	mailApiPort: 2626,
	speechPort: 4670,
	// Storage addresses for media work this long here (300 s by default), so that the tests meet
	// players left open past it (media-expiry.e2e.ts).
	mediaUrlLifetimeSeconds: 6,
	dataDir: resolve(import.meta.dirname, '../.run/e2e'),
	get databasePath() {
		return resolve(this.dataDir, 'kinelume.db');
	},
	get mailApi() {
		return `http://127.0.0.1:${this.mailApiPort}`;
	}
} as const;
