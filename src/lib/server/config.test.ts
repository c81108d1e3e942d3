import { availableParallelism } from 'node:os';
import { describe, expect, it } from 'vitest';
import { readConfig } from './config';

describe('readConfig', () => {
	it('has working one-machine defaults', () => {
		const config = readConfig({});
		expect(config.DATABASE_PATH).toBe('.data/kinelume.db');
		expect(config.S3_ENDPOINT).toBe('http://127.0.0.1:4569');
		expect(config.S3_FORCE_PATH_STYLE).toBe(true);
		expect(config.SMTP_PORT).toBe(2525);
		expect(config.INVITATION_TTL_HOURS).toBe(72);
		expect(config.WORKER_IN_APP).toBeUndefined();
	});

	it('limits ffmpeg runs to the number of cores unless told otherwise, and never below one', () => {
		expect(readConfig({}).FFMPEG_MAX_CONCURRENT).toBe(Math.max(1, availableParallelism()));
		expect(readConfig({ FFMPEG_MAX_CONCURRENT: '' }).FFMPEG_MAX_CONCURRENT).toBe(
			Math.max(1, availableParallelism())
		);
		expect(readConfig({ FFMPEG_MAX_CONCURRENT: '3' }).FFMPEG_MAX_CONCURRENT).toBe(3);
		expect(() => readConfig({ FFMPEG_MAX_CONCURRENT: '0' })).toThrow(/FFMPEG_MAX_CONCURRENT/);
		expect(readConfig({ WORKER_IN_APP: 'true' }).WORKER_IN_APP).toBe(true);
		expect(readConfig({ WORKER_IN_APP: '' }).WORKER_IN_APP).toBeUndefined();
	});

	it('queues in SQLite unless told to use BullMQ, which needs a Redis address', () => {
		expect(readConfig({}).QUEUE_ENGINE).toBe('sqlite');
		expect(() => readConfig({ QUEUE_ENGINE: 'bullmq' })).toThrow(
			/REDIS_URL is invalid .*when QUEUE_ENGINE is bullmq/
		);
		expect(
			readConfig({ QUEUE_ENGINE: 'bullmq', REDIS_URL: 'redis://10.0.0.5:6379' }).REDIS_URL
		).toBe('redis://10.0.0.5:6379');
		expect(() => readConfig({ QUEUE_ENGINE: 'bullmq', REDIS_URL: 'http://10.0.0.5' })).toThrow(
			/REDIS_URL/
		);
		expect(() => readConfig({ QUEUE_ENGINE: 'rabbit' })).toThrow(/QUEUE_ENGINE/);
	});

	it('keeps the development inbox off unless set, and never lets it on in production', () => {
		expect(readConfig({}).DEV_INBOX_URL).toBe('');
		expect(readConfig({ DEV_INBOX_URL: 'http://127.0.0.1:2526' }).DEV_INBOX_URL).toBe(
			'http://127.0.0.1:2526'
		);
		expect(() =>
			readConfig({ NODE_ENV: 'production', DEV_INBOX_URL: 'http://127.0.0.1:2526' })
		).toThrow(/DEV_INBOX_URL is invalid .*must be empty when NODE_ENV is production/);
		expect(readConfig({ NODE_ENV: 'production' }).DEV_INBOX_URL).toBe('');
	});

	it('reads values and converts types', () => {
		const config = readConfig({
			SMTP_PORT: '587',
			SMTP_SECURE: 'true',
			S3_FORCE_PATH_STYLE: 'false'
		});
		expect(config.SMTP_PORT).toBe(587);
		expect(config.SMTP_SECURE).toBe(true);
		expect(config.S3_FORCE_PATH_STYLE).toBe(false);
	});

	it('stops with a sentence naming each bad variable', () => {
		expect(() => readConfig({ SMTP_PORT: 'twenty' })).toThrow(
			/The environment variable SMTP_PORT is invalid \("twenty"\)/
		);
		expect(() => readConfig({ ORIGIN: 'not a url', S3_BUCKET: 'Bad_Bucket' })).toThrow(
			/ORIGIN.*S3_BUCKET|S3_BUCKET.*ORIGIN/
		);
		expect(() => readConfig({ AUTH_SECRET: 'short' })).toThrow(
			/AUTH_SECRET is invalid.*at least 32 characters/
		);
	});

	it('ignores variables it does not own', () => {
		expect(() => readConfig({ PATH: '/usr/bin', HOME: '/root' })).not.toThrow();
	});
});
