import { index, integer, real, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';
import type { Cue } from '../../../captions/types';
import type { StoredVersion } from '../../../media/ladder';
import { users } from './auth';
import { clinics } from './clinics';
import { recordings } from './recordings';

export const SEGMENT_STATUSES = ['cutting', 'ready', 'failed'] as const;
export type SegmentStatus = (typeof SEGMENT_STATUSES)[number];

/**
 * One exercise's part of a recording, confirmed by a clinician and cut to its own clip. A segment's
 * times and cues never change once confirmed: confirming again makes new rows and marks the old
 * ones superseded, so exercises (and published library versions) built on a segment keep working.
 */
export const segments = sqliteTable(
	'segment',
	{
		id: uuidPrimaryKey(),
		recordingId: text('recording_id')
			.notNull()
			.references(() => recordings.id, { onDelete: 'cascade' }),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		/** Order within the recording, from 0. */
		position: integer('position').notNull(),
		title: text('title').notNull(),
		startSeconds: real('start_seconds').notNull(),
		endSeconds: real('end_seconds').notNull(),
		status: text('status', { enum: SEGMENT_STATUSES }).notNull().default('cutting'),
		/** Length of the cut clip as ffprobe measured it. */
		clipDurationSeconds: real('clip_duration_seconds'),
		clipSize: integer('clip_size'),
		/**
		 * The clip's smaller versions of the bitrate ladder (src/lib/media/ladder.ts), beside the
		 * clip itself; null for a clip cut before the ladder, which has only the one.
		 */
		clipVersions: text('clip_versions', { mode: 'json' }).$type<StoredVersion[]>(),
		posterCount: integer('poster_count').notNull().default(0),
		/** The recording's captions clipped to this segment and shifted to start at zero. */
		cues: text('cues', { mode: 'json' }).notNull().$type<Cue[]>().default([]),
		/** Which captions track version the cues came from (0 when the recording had none). */
		captionsVersion: integer('captions_version').notNull().default(0),
		captionsLanguage: text('captions_language').notNull().default('en'),
		failureReason: text('failure_reason'),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestampNow('created_at'),
		supersededAt: integer('superseded_at', { mode: 'timestamp_ms' })
	},
	(s) => [
		index('segment_recording').on(s.recordingId, s.position),
		index('segment_clinic').on(s.clinicId)
	]
);

export type SegmentRow = typeof segments.$inferSelect;

/**
 * What the detectors found in a recording's rendition: stretches of silence and the times the
 * picture changed. Finding them takes two ffmpeg passes over the whole rendition (tens of seconds
 * for a long recording), while turning them into suggestions with the current cues takes
 * milliseconds; so they are kept here, measured once per rendition and per detector settings, and
 * a caption save or a restart never runs the detectors again.
 */
export const recordingSignals = sqliteTable('recording_signals', {
	recordingId: text('recording_id')
		.primaryKey()
		.references(() => recordings.id, { onDelete: 'cascade' }),
	/** The rendition measured: the recording's ready_at when it was made. */
	renditionReadyAt: integer('rendition_ready_at', { mode: 'timestamp_ms' }).notNull(),
	/** The detector settings used, e.g. `silence -45 dB 1.5 s; scene 0.3`; others mean measure again. */
	settings: text('settings').notNull(),
	silences: text('silences', { mode: 'json' }).notNull().$type<{ start: number; end: number }[]>(),
	sceneChanges: text('scene_changes', { mode: 'json' }).notNull().$type<number[]>(),
	detectedAt: timestampNow('detected_at')
});

export type RecordingSignals = typeof recordingSignals.$inferSelect;
