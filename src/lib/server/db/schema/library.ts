import {
	index,
	integer,
	primaryKey,
	real,
	sqliteTable,
	text,
	uniqueIndex
} from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';
import type { StoredVersion } from '../../../media/ladder';
import {
	COLLECTION_STATUSES,
	DECISIONS,
	ENTRY_STATUSES,
	LICENCES,
	SUBMISSION_KINDS,
	SUBMISSION_STATUSES,
	type ExerciseSnapshot
} from '../../../library/types';
import type { Checklist } from '../../../library/checklist';
import { users } from './auth';
import { clinics } from './clinics';
import { exercises } from './programmes';
import { segments } from './segments';

/**
 * A public exercise of the library: its address (slug) and whether the public may see it. What
 * it shows lives in its versions; `currentVersionId` names the one on show. The slug never
 * changes, so links shared before a new version keep working.
 */
export const libraryExercises = sqliteTable(
	'library_exercise',
	{
		id: uuidPrimaryKey(),
		slug: text('slug').notNull().unique(),
		/** The clinic that contributed it; never shown to the public. */
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		sourceExerciseId: text('source_exercise_id').references(() => exercises.id, {
			onDelete: 'set null'
		}),
		status: text('status', { enum: ENTRY_STATUSES }).notNull().default('published'),
		currentVersionId: text('current_version_id'),
		createdAt: timestampNow('created_at'),
		updatedAt: timestampNow('updated_at'),
		retiredAt: integer('retired_at', { mode: 'timestamp_ms' })
	},
	(e) => [
		index('library_exercise_status').on(e.status),
		index('library_exercise_source').on(e.sourceExerciseId)
	]
);

/**
 * What a clinician sent for review: the exercise frozen as it was (`snapshot`), with consent
 * and licence. Database triggers (drizzle/0005_library_search.sql and
 * 0012_library_caption_revision_guard.sql) refuse any change to the kind, snapshot, consent or
 * licence once written; only the status moves on, and links may only be cleared.
 *
 * A caption revision (`kind` 'captions') revises one published version (`revisesVersionId`):
 * its snapshot is that version's with the segment's captions as they are now, so approving it
 * publishes the same clip and words with new captions.
 */
export const librarySubmissions = sqliteTable(
	'library_submission',
	{
		id: uuidPrimaryKey(),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		exerciseId: text('exercise_id').references(() => exercises.id, { onDelete: 'set null' }),
		segmentId: text('segment_id').references(() => segments.id, { onDelete: 'set null' }),
		/** The public exercise this would update; null until the exercise was first approved. */
		libraryExerciseId: text('library_exercise_id').references(() => libraryExercises.id, {
			onDelete: 'set null'
		}),
		kind: text('kind', { enum: SUBMISSION_KINDS }).notNull().default('exercise'),
		/**
		 * For a caption revision: the published version whose captions it replaces. Not a foreign
		 * key: drizzle-kit adds a referencing column to an existing table without its delete
		 * rule, and a version is never deleted on its own — only with its public exercise.
		 */
		revisesVersionId: text('revises_version_id'),
		snapshot: text('snapshot', { mode: 'json' }).notNull().$type<ExerciseSnapshot>(),
		/** That everyone filmed agreed to publication. */
		consentConfirmed: integer('consent_confirmed', { mode: 'boolean' }).notNull(),
		/** Where the signed agreement is kept (for the reviewer; never public). */
		consentDetails: text('consent_details').notNull().default(''),
		licence: text('licence', { enum: LICENCES }).notNull(),
		/** The credit line shown with the exercise. */
		attribution: text('attribution').notNull(),
		noteToReviewer: text('note_to_reviewer').notNull().default(''),
		status: text('status', { enum: SUBMISSION_STATUSES }).notNull().default('waiting'),
		submittedBy: text('submitted_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestampNow('created_at'),
		decidedAt: integer('decided_at', { mode: 'timestamp_ms' })
	},
	(s) => [
		index('library_submission_status').on(s.status, s.createdAt),
		index('library_submission_exercise').on(s.exerciseId, s.createdAt),
		index('library_submission_clinic').on(s.clinicId)
	]
);

/** An educator's decision on a submission, with the computed checklist as it stood then. */
export const libraryReviews = sqliteTable(
	'library_review',
	{
		id: uuidPrimaryKey(),
		submissionId: text('submission_id')
			.notNull()
			.references(() => librarySubmissions.id, { onDelete: 'cascade' }),
		reviewerId: text('reviewer_id').references(() => users.id, { onDelete: 'set null' }),
		decision: text('decision', { enum: DECISIONS }).notNull(),
		/** To the clinician (e-mailed with the decision). */
		comment: text('comment').notNull().default(''),
		checklist: text('checklist', { mode: 'json' }).notNull().$type<Checklist>(),
		/** The educator's own judgement items they ticked. */
		judgement: text('judgement', { mode: 'json' }).notNull().$type<string[]>().default([]),
		createdAt: timestampNow('created_at')
	},
	(r) => [index('library_review_submission').on(r.submissionId, r.createdAt)]
);

/**
 * One approved state of a public exercise. Rows are only ever inserted (a trigger refuses
 * updates): a later approval adds the next version. The filter columns copy the snapshot's.
 * Its clip and posters are copies under `library/<version id>/` in storage.
 */
export const libraryVersions = sqliteTable(
	'library_version',
	{
		id: uuidPrimaryKey(),
		libraryExerciseId: text('library_exercise_id')
			.notNull()
			.references(() => libraryExercises.id, { onDelete: 'cascade' }),
		version: integer('version').notNull(),
		submissionId: text('submission_id').references(() => librarySubmissions.id, {
			onDelete: 'set null'
		}),
		title: text('title').notNull(),
		bodyRegion: text('body_region').notNull(),
		position: text('position').notNull(),
		movementType: text('movement_type').notNull(),
		phase: integer('phase').notNull(),
		equipment: text('equipment', { mode: 'json' }).notNull().$type<string[]>(),
		snapshot: text('snapshot', { mode: 'json' }).notNull().$type<ExerciseSnapshot>(),
		licence: text('licence', { enum: LICENCES }).notNull(),
		attribution: text('attribution').notNull(),
		posterCount: integer('poster_count').notNull().default(0),
		clipDurationSeconds: real('clip_duration_seconds'),
		clipSize: integer('clip_size'),
		/** The public copies of the clip's smaller versions; null when the clip had none. */
		clipVersions: text('clip_versions', { mode: 'json' }).$type<StoredVersion[]>(),
		publishedBy: text('published_by').references(() => users.id, { onDelete: 'set null' }),
		publishedAt: timestampNow('published_at')
	},
	(v) => [
		uniqueIndex('library_version_number').on(v.libraryExerciseId, v.version),
		index('library_version_filters').on(v.bodyRegion, v.position, v.movementType, v.phase)
	]
);

/** An ordered set of public exercises an educator puts together, with an introduction. */
export const libraryCollections = sqliteTable(
	'library_collection',
	{
		id: uuidPrimaryKey(),
		slug: text('slug').notNull().unique(),
		title: text('title').notNull(),
		/** Markdown, rendered with renderSafetyNotes' allow-list. */
		introduction: text('introduction').notNull().default(''),
		status: text('status', { enum: COLLECTION_STATUSES }).notNull().default('draft'),
		/** The cover is a poster of one of its exercises (a public copy already). */
		coverLibraryExerciseId: text('cover_library_exercise_id').references(
			() => libraryExercises.id,
			{ onDelete: 'set null' }
		),
		coverPoster: integer('cover_poster').notNull().default(0),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestampNow('created_at'),
		updatedAt: timestampNow('updated_at'),
		publishedAt: integer('published_at', { mode: 'timestamp_ms' })
	},
	(c) => [index('library_collection_status').on(c.status)]
);

export const libraryCollectionItems = sqliteTable(
	'library_collection_item',
	{
		collectionId: text('collection_id')
			.notNull()
			.references(() => libraryCollections.id, { onDelete: 'cascade' }),
		libraryExerciseId: text('library_exercise_id')
			.notNull()
			.references(() => libraryExercises.id, { onDelete: 'cascade' }),
		position: integer('position').notNull()
	},
	(i) => [
		primaryKey({ columns: [i.collectionId, i.libraryExerciseId] }),
		index('library_collection_item_order').on(i.collectionId, i.position)
	]
);

export type LibraryExercise = typeof libraryExercises.$inferSelect;
export type LibrarySubmission = typeof librarySubmissions.$inferSelect;
export type LibraryReview = typeof libraryReviews.$inferSelect;
export type LibraryVersion = typeof libraryVersions.$inferSelect;
export type LibraryCollection = typeof libraryCollections.$inferSelect;
export type LibraryCollectionItem = typeof libraryCollectionItems.$inferSelect;
