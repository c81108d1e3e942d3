import { index, integer, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';
import { recordings } from './recordings';
import { segments } from './segments';

export const JOB_KINDS = ['process-recording', 'cut-segment', 'detect-signals'] as const;
export type JobKind = (typeof JOB_KINDS)[number];
export const JOB_STATUSES = ['queued', 'running', 'succeeded', 'failed', 'cancelled'] as const;
export type JobStatus = (typeof JOB_STATUSES)[number];

/**
 * Durable work: a worker in any process claims a queued row with one UPDATE, keeps `heartbeatAt`
 * fresh while it runs, and a row whose heartbeat went stale (the process died) is queued again.
 */
export const jobs = sqliteTable(
	'job',
	{
		id: uuidPrimaryKey(),
		kind: text('kind', { enum: JOB_KINDS }).notNull(),
		recordingId: text('recording_id')
			.notNull()
			.references(() => recordings.id, { onDelete: 'cascade' }),
		/** For a cut-segment job: the segment whose clip, posters and captions it makes. */
		segmentId: text('segment_id').references(() => segments.id, { onDelete: 'cascade' }),
		status: text('status', { enum: JOB_STATUSES }).notNull().default('queued'),
		attempts: integer('attempts').notNull().default(0),
		maxAttempts: integer('max_attempts').notNull().default(3),
		runAfter: timestampNow('run_after'),
		progress: real('progress').notNull().default(0),
		stage: text('stage').notNull().default('waiting'),
		lastError: text('last_error'),
		lockedBy: text('locked_by'),
		heartbeatAt: integer('heartbeat_at', { mode: 'timestamp_ms' }),
		/** Set by a cancel request; the worker running the job sees it at its next heartbeat. */
		cancelRequested: integer('cancel_requested', { mode: 'boolean' }).notNull().default(false),
		/**
		 * For work that must happen once whoever asks (a rendition's detection): the one row with
		 * this key is that work, whichever process queued it first. Null for the other kinds.
		 */
		uniqueKey: text('unique_key'),
		createdAt: timestampNow('created_at'),
		finishedAt: integer('finished_at', { mode: 'timestamp_ms' })
	},
	(j) => [
		index('job_claim').on(j.status, j.runAfter),
		index('job_recording').on(j.recordingId),
		uniqueIndex('job_unique_key').on(j.uniqueKey)
	]
);

export type Job = typeof jobs.$inferSelect;

/**
 * The ffmpeg runs going on now on this machine, one row each, across every process sharing the
 * database (media/slots.ts). A row whose holder stopped renewing it lapses at `expiresAt`.
 */
export const mediaSlots = sqliteTable('media_slot', {
	id: uuidPrimaryKey(),
	/** host:pid of the process running it, for reading the table by hand. */
	holder: text('holder').notNull(),
	acquiredAt: timestampNow('acquired_at'),
	expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull()
});
