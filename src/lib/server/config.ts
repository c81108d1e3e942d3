import { availableParallelism } from 'node:os';
import { z } from 'zod';

/**
 * Every environment variable Kinelume reads, in one place, with defaults for the one-machine
 * setup (SQLite file under .data/, the storage and mail fakes on loopback). Pointing these at a
 * real S3-compatible service and a real SMTP relay is all a deployment needs. `.env.example`
 * documents each variable.
 */
const bool = z
	.enum(['true', 'false', '1', '0', 'yes', 'no'])
	.transform((v) => v === 'true' || v === '1' || v === 'yes');

/** An empty value (`NAME=` in an env file) counts as unset, so the default applies. */
const unsetWhenEmpty = <T extends z.ZodType>(type: T) =>
	z.preprocess((v) => (v === '' ? undefined : v), type);

const schema = z.object({
	DATABASE_PATH: z.string().min(1).default('.data/kinelume.db'),
	ORIGIN: z.url().default('http://localhost:3000'),
	AUTH_SECRET: z.string().min(32, 'must be at least 32 characters').optional(),
	S3_ENDPOINT: z.union([z.url(), z.literal('')]).default('http://127.0.0.1:4569'),
	S3_REGION: z.string().min(1).default('us-east-1'),
	S3_BUCKET: z
		.string()
		.regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, 'must be a valid bucket name')
		.default('kinelume'),
	S3_ACCESS_KEY_ID: z.string().min(1).default('S3RVER'),
	S3_SECRET_ACCESS_KEY: z.string().min(1).default('S3RVER'),
	S3_FORCE_PATH_STYLE: bool.default(true),
	// How long a storage address handed to a browser for media works, in seconds. Every media
	// request is authorised by the app and answered with a redirect to such an address
	// (storage/media-urls.ts); a player left open longer asks the app again.
	MEDIA_URL_LIFETIME_SECONDS: z.coerce.number().int().min(2).max(3600).default(300),
	SMTP_HOST: z.string().min(1).default('127.0.0.1'),
	SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
	SMTP_SECURE: bool.default(false),
	SMTP_USER: z.string().default(''),
	SMTP_PASSWORD: z.string().default(''),
	MAIL_FROM: z.string().min(3).default('Kinelume <no-reply@kinelume.invalid>'),
	// The development inbox (/inbox, the mail fake's messages): off unless set, which the demo
	// and the tests do; refused outright under NODE_ENV=production (readConfig).
	DEV_INBOX_URL: z.union([z.url(), z.literal('')]).default(''),
	INVITATION_TTL_HOURS: z.coerce
		.number()
		.int()
		.min(1)
		.max(24 * 30)
		.default(72),
	SIGN_IN_MAX_FAILURES: z.coerce.number().int().min(1).max(100).default(5),
	SIGN_IN_WINDOW_MINUTES: z.coerce
		.number()
		.int()
		.min(1)
		.max(24 * 60)
		.default(15),
	// Recordings: uploads, their sweep, and the media job worker.
	UPLOAD_SWEEP_MINUTES: z.coerce
		.number()
		.int()
		.min(1)
		.max(24 * 60)
		.default(5),
	UPLOAD_IDLE_HOURS: z.coerce
		.number()
		.min(0.01)
		.max(24 * 30)
		.default(24),
	MEDIA_JOB_CONCURRENCY: z.coerce.number().int().min(1).max(16).default(1),
	// The job queue's engine (jobs/engine.ts): `sqlite`, the job table in the database file, for
	// one machine; `bullmq`, BullMQ on the Redis server at REDIS_URL, for workers on several
	// machines that share only Redis and the storage with the app.
	QUEUE_ENGINE: z.enum(['sqlite', 'bullmq']).default('sqlite'),
	REDIS_URL: z.union([z.url({ protocol: /^rediss?$/ }), z.literal('')]).default(''),
	// Whether the app process also runs the job worker. Unset: only under `vite dev`; a production
	// server leaves the work to `npm run worker` (hooks.server.ts).
	WORKER_IN_APP: unsetWhenEmpty(bool.optional()),
	JOB_HEARTBEAT_SECONDS: z.coerce.number().min(0.2).max(300).default(5),
	JOB_STALE_SECONDS: z.coerce.number().min(1).max(3600).default(60),
	JOB_RETRY_BASE_SECONDS: z.coerce.number().min(0).max(3600).default(10),
	MEDIA_WORK_DIR: z.string().default(''),
	// ffmpeg and ffprobe executables; empty means Debian's (/usr/bin) when installed, else the
	// binaries inside the npm installer packages (media/tools.ts).
	FFMPEG_PATH: z.string().default(''),
	FFPROBE_PATH: z.string().default(''),
	// ffmpeg runs at once on this machine, counted across every process sharing the database
	// (media/slots.ts). Default: the number of cores.
	FFMPEG_MAX_CONCURRENT: unsetWhenEmpty(
		z.coerce
			.number()
			.int()
			.min(1)
			.max(256)
			.default(() => Math.max(1, availableParallelism()))
	),
	MEDIA_JOB_TIMEOUT_SECONDS: z.coerce
		.number()
		.int()
		.min(1)
		.max(24 * 60 * 60)
		.default(1800),
	// A JSON file of extra segment word lists per language, e.g. {"en": {"announcing": ["up next"]}};
	// empty means the built-in lists only (src/lib/captions/suggest.ts).
	SEGMENT_WORD_LISTS_FILE: z.string().default(''),
	// The clinicians' weekly digest: due from this ISO weekday (1 = Monday) and hour, on each
	// clinic's own clock (its time zone, set on /clinic).
	DIGEST_WEEKDAY: z.coerce.number().int().min(1).max(7).default(1),
	DIGEST_HOUR: z.coerce.number().int().min(0).max(23).default(7),
	DIGEST_ENABLED: bool.default(true),
	// Speech to text for the studio's timing drafts: the base URL (up to and including /v1) of a
	// server offering the OpenAI-compatible audio transcription endpoint. Empty (the default):
	// drafts are timed from the sound alone with blank cues, and no audio leaves Kinelume.
	SPEECH_TO_TEXT_URL: z.union([z.url({ protocol: /^https?$/ }), z.literal('')]).default(''),
	SPEECH_TO_TEXT_API_KEY: z.string().default(''),
	// The server's name for its transcription model; required once SPEECH_TO_TEXT_URL is set.
	SPEECH_TO_TEXT_MODEL: z.string().trim().default(''),
	SPEECH_TO_TEXT_TIMEOUT_SECONDS: z.coerce.number().int().min(5).max(3600).default(600)
});

export type Config = z.infer<typeof schema>;

/** Reads and validates the environment; a bad value throws a sentence naming the variable. */
export function readConfig(env: Record<string, string | undefined> = process.env): Config {
	const present = Object.fromEntries(
		Object.entries(env).filter(([key, value]) => key in schema.shape && value !== undefined)
	);
	const parsed = schema
		.superRefine((c, ctx) => {
			if (env.NODE_ENV === 'production' && c.DEV_INBOX_URL !== '')
				ctx.addIssue({
					code: 'custom',
					path: ['DEV_INBOX_URL'],
					message:
						'must be empty when NODE_ENV is production: the development inbox shows sign-in links'
				});
			if (c.QUEUE_ENGINE === 'bullmq' && c.REDIS_URL === '')
				ctx.addIssue({
					code: 'custom',
					path: ['REDIS_URL'],
					message: 'must name the Redis server (redis://host:6379) when QUEUE_ENGINE is bullmq'
				});
			if (c.SPEECH_TO_TEXT_URL !== '' && c.SPEECH_TO_TEXT_MODEL === '')
				ctx.addIssue({
					code: 'custom',
					path: ['SPEECH_TO_TEXT_MODEL'],
					message:
						'must name the speech-to-text server’s transcription model when SPEECH_TO_TEXT_URL is set'
				});
		})
		.safeParse(present);
	if (!parsed.success) {
		const sentences = parsed.error.issues.map((issue) => {
			const name = String(issue.path[0]);
			return `The environment variable ${name} is invalid (${JSON.stringify(env[name])}): ${issue.message}.`;
		});
		throw new Error(sentences.join(' '));
	}
	return parsed.data;
}

let cached: Config | undefined;

/** The process's configuration, read once on first use. */
export function config(): Config {
	cached ??= readConfig();
	return cached;
}
