/**
 * The whole product for the end-to-end tests: fresh data folder, storage, mail and speech fakes,
 * the database migrated and seeded with the demo scenario, and the production server (`node
 * build`). Speech to text points at the speech stand-in, so drafts carry its placeholder words.
 */
import { spawn } from 'node:child_process';
import { mkdirSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { E2E } from './ports';

rmSync(E2E.dataDir, { recursive: true, force: true });
mkdirSync(E2E.dataDir, { recursive: true });

const env = {
	DATABASE_PATH: E2E.databasePath,
	ORIGIN: E2E.origin,
	S3_ENDPOINT: `http://127.0.0.1:${E2E.storagePort}`,
	SMTP_PORT: String(E2E.smtpPort),
	DEV_INBOX_URL: E2E.mailApi,
	SPEECH_TO_TEXT_URL: `http://127.0.0.1:${E2E.speechPort}/v1`,
	SPEECH_TO_TEXT_API_KEY: 'e2e-speech-key',
	SPEECH_TO_TEXT_MODEL: 'stand-in',
	AUTH_SECRET: 'e2e-only-secret-that-is-long-enough-0123456789',
	MEDIA_URL_LIFETIME_SECONDS: String(E2E.mediaUrlLifetimeSeconds),
	// The app runs the job worker itself here, as in the demo (production runs `npm run worker`).
	WORKER_IN_APP: 'true'
};
Object.assign(process.env, env);

const { startStorageFake } = await import('../../fakes/storage/server');
const { startMailFake } = await import('../../fakes/mail/server');
const { startSpeechFake } = await import('../../fakes/speech/server');
const storage = await startStorageFake({
	port: E2E.storagePort,
	directory: resolve(E2E.dataDir, 'storage'),
	bucket: 'kinelume',
	accessKeyId: 'S3RVER',
	secretAccessKey: 'S3RVER',
	allowedOrigins: [E2E.origin]
});
const mail = await startMailFake({
	smtpPort: E2E.smtpPort,
	apiPort: E2E.mailApiPort,
	directory: resolve(E2E.dataDir, 'mail')
});
const speech = await startSpeechFake({ port: E2E.speechPort, apiKey: env.SPEECH_TO_TEXT_API_KEY });

const { seedDemo } = await import('../../src/scripts/demo/seed');
const { closeDatabase } = await import('../../src/lib/server/db');
await seedDemo();
closeDatabase();

const app = spawn(process.execPath, ['build'], {
	stdio: 'inherit',
	env: { ...process.env, PORT: String(E2E.appPort), HOST: '127.0.0.1' }
});

async function stop() {
	app.kill('SIGTERM');
	await Promise.allSettled([storage.close(), mail.close(), speech.close()]);
	process.exit(0);
}
process.on('SIGINT', () => void stop());
process.on('SIGTERM', () => void stop());
app.on('exit', (code) => {
	void Promise.allSettled([storage.close(), mail.close(), speech.close()]).then(() =>
		process.exit(code ?? 1)
	);
});
