import { randomBytes } from 'node:crypto';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';
import { startMailFake } from '../../fakes/mail/server';
import { startSpeechFake } from '../../fakes/speech/server';
import { startStorageFake } from '../../fakes/storage/server';

/** The environment the app modules read in tests: the fakes' real addresses and a scratch database. */
export interface TestEnv {
	S3_ENDPOINT: string;
	S3_REGION: string;
	S3_BUCKET: string;
	S3_ACCESS_KEY_ID: string;
	S3_SECRET_ACCESS_KEY: string;
	S3_FORCE_PATH_STYLE: string;
	SMTP_HOST: string;
	SMTP_PORT: string;
	SMTP_SECURE: string;
	SMTP_USER: string;
	SMTP_PASSWORD: string;
	MAIL_FROM: string;
	DEV_INBOX_URL: string;
	DATABASE_PATH: string;
	SPEECH_TO_TEXT_URL: string;
	SPEECH_TO_TEXT_API_KEY: string;
	SPEECH_TO_TEXT_MODEL: string;
}

declare module 'vitest' {
	export interface ProvidedContext {
		testEnv: TestEnv;
		fakesDirectory: string;
	}
}

export default async function setup(project: TestProject) {
	const root = await mkdtemp(join(tmpdir(), 'kinelume-tests-'));
	// Keys other than the fake's built-in S3RVER pair prove the app sends the configured ones.
	const accessKeyId = 'kinelume-test';
	const secretAccessKey = randomBytes(20).toString('hex');
	const bucket = 'kinelume-test';

	const storage = await startStorageFake({
		port: 0,
		directory: join(root, 'storage'),
		bucket,
		accessKeyId,
		secretAccessKey
	});
	const mail = await startMailFake({ smtpPort: 0, apiPort: 0, directory: join(root, 'mail') });
	// A key of its own, so the tests prove the app sends the configured one.
	const speechKey = randomBytes(12).toString('hex');
	const speech = await startSpeechFake({ port: 0, apiKey: speechKey });

	const env: TestEnv = {
		S3_ENDPOINT: storage.url,
		S3_REGION: 'us-east-1',
		S3_BUCKET: bucket,
		S3_ACCESS_KEY_ID: accessKeyId,
		S3_SECRET_ACCESS_KEY: secretAccessKey,
		S3_FORCE_PATH_STYLE: 'true',
		SMTP_HOST: '127.0.0.1',
		SMTP_PORT: String(mail.smtpPort),
		SMTP_SECURE: 'false',
		SMTP_USER: '',
		SMTP_PASSWORD: '',
		MAIL_FROM: 'Kinelume Tests <tests@kinelume.invalid>',
		DEV_INBOX_URL: mail.apiUrl,
		DATABASE_PATH: join(root, 'kinelume.db'),
		SPEECH_TO_TEXT_URL: speech.url,
		SPEECH_TO_TEXT_API_KEY: speechKey,
		SPEECH_TO_TEXT_MODEL: 'stand-in'
	};
	// Workers inherit the environment of this process, so plain process.env reaches app modules;
	// provide() is the documented channel and lets env.ts re-apply it if that ever changes.
	Object.assign(process.env, env);
	project.provide('testEnv', env);
	project.provide('fakesDirectory', root);

	return async () => {
		await Promise.all([storage.close(), mail.close(), speech.close()]);
		await rm(root, { recursive: true, force: true });
	};
}
