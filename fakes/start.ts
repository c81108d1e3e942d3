import { join, resolve } from 'node:path';
import { readConfig } from '../src/lib/server/config';
import { startMailFake, type MailFake } from './mail/server';
import { startSpeechFake, type SpeechFake } from './speech/server';
import { startStorageFake, type StorageFake } from './storage/server';

function port(name: string, fallback: number): number {
	const raw = process.env[name];
	if (raw === undefined || raw === '') return fallback;
	const value = Number(raw);
	if (!Number.isInteger(value) || value < 0 || value > 65535) {
		throw new Error(
			`The environment variable ${name} must be a port number (0-65535), not ${JSON.stringify(raw)}.`
		);
	}
	return value;
}

async function main() {
	// Only the S3_* variables matter here, so an unrelated bad variable does not stop the fakes.
	const s3 = readConfig({
		S3_BUCKET: process.env.S3_BUCKET,
		S3_ACCESS_KEY_ID: process.env.S3_ACCESS_KEY_ID,
		S3_SECRET_ACCESS_KEY: process.env.S3_SECRET_ACCESS_KEY
	});
	const dataDir = resolve(process.env.FAKES_DATA_DIR || '.data/fakes');
	const storageDir = join(dataDir, 'storage');
	const mailDir = join(dataDir, 'mail');
	const storagePort = port('STORAGE_FAKE_PORT', 4569);
	const smtpPort = port('MAIL_FAKE_SMTP_PORT', 2525);
	const apiPort = port('MAIL_FAKE_API_PORT', 2526);
	const speechPort = port('SPEECH_FAKE_PORT', 4570);

	const storage: StorageFake = await startStorageFake({
		port: storagePort,
		directory: storageDir,
		bucket: s3.S3_BUCKET,
		accessKeyId: s3.S3_ACCESS_KEY_ID,
		secretAccessKey: s3.S3_SECRET_ACCESS_KEY
	});
	let mail: MailFake;
	try {
		mail = await startMailFake({ smtpPort, apiPort, directory: mailDir });
	} catch (error) {
		await storage.close();
		throw error;
	}
	let speech: SpeechFake;
	try {
		// The app sends SPEECH_TO_TEXT_API_KEY; when it is set, the stand-in checks it.
		speech = await startSpeechFake({
			port: speechPort,
			apiKey: process.env.SPEECH_TO_TEXT_API_KEY || undefined
		});
	} catch (error) {
		await Promise.all([storage.close(), mail.close()]);
		throw error;
	}

	console.log(`storage fake  ${storage.url}  bucket ${s3.S3_BUCKET}, data in ${storageDir}`);
	console.log(
		`mail fake     smtp 127.0.0.1:${mail.smtpPort}, inbox ${mail.apiUrl}/messages, data in ${mailDir}`
	);
	console.log(
		`speech fake   ${speech.url}/audio/transcriptions (placeholder words; set SPEECH_TO_TEXT_URL=${speech.url} and SPEECH_TO_TEXT_MODEL=stand-in to use it)`
	);
	console.log('Ctrl-C stops them all.');

	let stopping = false;
	async function stop(signal: NodeJS.Signals) {
		// A second signal means the user does not want to wait for open connections.
		if (stopping) process.exit(1);
		stopping = true;
		console.log(`${signal}: stopping the fakes`);
		await Promise.all([storage.close(), mail.close(), speech.close()]);
		process.exit(0);
	}
	process.on('SIGINT', (signal) => void stop(signal));
	process.on('SIGTERM', (signal) => void stop(signal));
}

main().catch((error: unknown) => {
	const code = (error as NodeJS.ErrnoException).code;
	const message = error instanceof Error ? error.message : String(error);
	console.error(
		code === 'EADDRINUSE'
			? `Cannot start the fakes: ${message}. Are they already running? Set STORAGE_FAKE_PORT, MAIL_FAKE_SMTP_PORT, MAIL_FAKE_API_PORT or SPEECH_FAKE_PORT to move them.`
			: `Cannot start the fakes: ${message}`
	);
	process.exit(1);
});
