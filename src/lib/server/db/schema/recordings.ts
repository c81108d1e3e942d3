import { index, integer, real, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';
import type { StoredVersion } from '../../../media/ladder';
import { users } from './auth';
import { clinics } from './clinics';
import type { SpriteLayout } from '../../../media/sprite';

export const RECORDING_STATUSES = ['processing', 'ready', 'failed'] as const;
export type RecordingStatus = (typeof RECORDING_STATUSES)[number];

/**
 * A multipart upload in flight. Kept apart from `recording` so that a refused or abandoned upload
 * never leaves a recording row behind: the row goes when the upload completes, is refused, is
 * aborted, or is swept after a day without activity.
 */
export const uploads = sqliteTable(
	'upload',
	{
		id: uuidPrimaryKey(),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		/** Where the object will live once completed; the recording id is chosen up front. */
		recordingId: text('recording_id').notNull(),
		objectKey: text('object_key').notNull(),
		s3UploadId: text('s3_upload_id').notNull(),
		filename: text('filename').notNull(),
		contentType: text('content_type').notNull(),
		sizeBytes: integer('size_bytes').notNull(),
		partSize: integer('part_size').notNull(),
		/**
		 * SHA-256 (hex) of the file's first and last MiB, computed by the browser: with the user,
		 * file name and size it finds this upload again when the same file is chosen in any browser.
		 * Null for uploads started without one (no Web Crypto), which cannot be found that way.
		 */
		fingerprint: text('fingerprint'),
		createdAt: timestampNow('created_at'),
		lastActivityAt: timestampNow('last_activity_at')
	},
	(u) => [
		index('upload_clinic').on(u.clinicId),
		index('upload_activity').on(u.lastActivityAt),
		index('upload_owner_file').on(u.clinicId, u.userId, u.sizeBytes)
	]
);

/** A stored video that passed validation; its web outputs appear as its job runs. */
export const recordings = sqliteTable(
	'recording',
	{
		id: uuidPrimaryKey(),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		uploadedBy: text('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
		title: text('title').notNull(),
		originalFilename: text('original_filename').notNull(),
		contentType: text('content_type').notNull(),
		sizeBytes: integer('size_bytes').notNull(),
		status: text('status', { enum: RECORDING_STATUSES }).notNull().default('processing'),
		durationSeconds: real('duration_seconds').notNull(),
		width: integer('width').notNull(),
		height: integer('height').notNull(),
		videoCodec: text('video_codec').notNull(),
		audioCodec: text('audio_codec'),
		frameRate: real('frame_rate'),
		rotation: integer('rotation').notNull().default(0),
		hasAudio: integer('has_audio', { mode: 'boolean' }).notNull().default(false),
		renditionSize: integer('rendition_size'),
		/** The rendition's smaller versions (src/lib/media/ladder.ts); null when made before the ladder. */
		renditionVersions: text('rendition_versions', { mode: 'json' }).$type<StoredVersion[]>(),
		posterCount: integer('poster_count').notNull().default(0),
		sprite: text('sprite', { mode: 'json' }).$type<SpriteLayout>(),
		waveformKey: text('waveform_key'),
		failureReason: text('failure_reason'),
		createdAt: timestampNow('created_at'),
		readyAt: integer('ready_at', { mode: 'timestamp_ms' })
	},
	(r) => [index('recording_clinic_created').on(r.clinicId, r.createdAt)]
);

export type Upload = typeof uploads.$inferSelect;
export type Recording = typeof recordings.$inferSelect;
