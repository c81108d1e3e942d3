import { index, integer, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';
import { TRACK_KINDS, type Cue, type TrackKind } from '../../../captions/types';
import { users } from './auth';
import { clinics } from './clinics';
import { recordings } from './recordings';

export const VERSION_SOURCES = ['import', 'edit', 'restore', 'generated'] as const;
export type VersionSource = (typeof VERSION_SOURCES)[number];

/**
 * One caption track of a recording. Its cues live only in its versions; `currentVersion` names the
 * newest, and 0 means nothing has been saved yet. The clinic is kept on the row so every query can
 * be scoped without a join.
 */
export const captionTracks = sqliteTable(
	'caption_track',
	{
		id: uuidPrimaryKey(),
		recordingId: text('recording_id')
			.notNull()
			.references(() => recordings.id, { onDelete: 'cascade' }),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		kind: text('kind', { enum: TRACK_KINDS }).notNull().$type<TrackKind>(),
		language: text('language').notNull(),
		label: text('label').notNull(),
		currentVersion: integer('current_version').notNull().default(0),
		createdAt: timestampNow('created_at'),
		updatedAt: timestampNow('updated_at')
	},
	(t) => [
		uniqueIndex('caption_track_recording_kind_language').on(t.recordingId, t.kind, t.language),
		index('caption_track_clinic').on(t.clinicId)
	]
);

/** A saved state of a track. Rows are only ever inserted: a restore is a new version too. */
export const captionTrackVersions = sqliteTable(
	'caption_track_version',
	{
		id: uuidPrimaryKey(),
		trackId: text('track_id')
			.notNull()
			.references(() => captionTracks.id, { onDelete: 'cascade' }),
		version: integer('version').notNull(),
		cues: text('cues', { mode: 'json' }).notNull().$type<Cue[]>(),
		source: text('source', { enum: VERSION_SOURCES }).notNull(),
		note: text('note').notNull().default(''),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestampNow('created_at')
	},
	(v) => [uniqueIndex('caption_track_version_track_version').on(v.trackId, v.version)]
);

export type CaptionTrack = typeof captionTracks.$inferSelect;
export type CaptionTrackVersion = typeof captionTrackVersions.$inferSelect;
