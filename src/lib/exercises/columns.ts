/**
 * An exercise's stored fields, written once. These columns make the `exercise` table
 * (src/lib/server/db/schema/programmes.ts adds what is the clinic's: id, clinic, author, times),
 * and the rest is derived from them:
 * - `ExerciseFields`, a stored exercise's fields (the columns' `$inferSelect`);
 * - the zod schema forms and endpoints check with ($lib/exercises/schema: drizzle-zod's schema of
 *   these columns, refined with our words and limits);
 * - the exercise form's text fields ($lib/exercises/form);
 * - what the library freezes and the programme builder is sent (the lists below).
 * Only Drizzle's column definitions are imported here (no database driver), so browser code may
 * load it; `$lib/server` may not be imported there. DEVELOPERS.md, "Adding a stored exercise
 * field (worked example)", walks a new field through.
 */
// Relative imports only: drizzle-kit loads this through the schema, without SvelteKit's aliases.
import { getTableColumns } from 'drizzle-orm';
import { integer, real, sqliteTable, text, type AnySQLiteColumn } from 'drizzle-orm/sqlite-core';
import { dosageColumns } from '../dosage/columns';
import type { DosageBounds, Progression } from '../dosage/types';
import { EXERCISE_SIDES, EXERCISE_STATUSES, MOVEMENT_TYPES, POSITIONS } from './vocabulary';

/** A coaching cue, in order; `atSeconds` points at the moment in the segment it describes. */
export interface CoachingCue {
	text: string;
	atSeconds?: number;
}

/**
 * The columns of an exercise that say what it is. `segment` is the column the demonstration's
 * foreign key points at (the table in $lib/server passes it; `exerciseFields` below has none).
 */
export function exerciseColumns(segment?: () => AnySQLiteColumn) {
	const segmentId = text('segment_id');
	return {
		/** The demonstration; kept null (not deleted) if its recording goes, so programmes survive. */
		segmentId: segment ? segmentId.references(segment, { onDelete: 'set null' }) : segmentId,
		title: text('title').notNull(),
		description: text('description').notNull().default(''),
		bodyRegion: text('body_region').notNull(),
		side: text('side', { enum: EXERCISE_SIDES }).notNull().default('not applicable'),
		position: text('position', { enum: POSITIONS }).notNull(),
		movementType: text('movement_type', { enum: MOVEMENT_TYPES }).notNull(),
		equipment: text('equipment', { mode: 'json' }).notNull().$type<string[]>().default([]),
		/** Protocol phase from 1 (earliest); see lib/clinical/phases. */
		phase: integer('phase').notNull().default(1),
		coachingCues: text('coaching_cues', { mode: 'json' })
			.notNull()
			.$type<CoachingCue[]>()
			.default([]),
		/** Markdown; rendered with marked and cleaned with sanitize-html on an allow-list. */
		safetyNotes: text('safety_notes').notNull().default(''),
		precautionTags: text('precaution_tags', { mode: 'json' })
			.notNull()
			.$type<string[]>()
			.default([]),
		...dosageColumns(),
		dosageBounds: text('dosage_bounds', { mode: 'json' }).$type<DosageBounds>(),
		progression: text('progression', { mode: 'json' })
			.notNull()
			.$type<Progression>()
			.default({ kind: 'none' }),
		/** Seconds one repetition takes, when the segment's length per rep would mislead. */
		secondsPerRep: real('seconds_per_rep'),
		status: text('status', { enum: EXERCISE_STATUSES }).notNull().default('draft')
	};
}

/**
 * The same columns as a table object of their own, for drizzle-zod and the types. Never created
 * (the migrations know only `exercises` in $lib/server/db/schema, which drizzle-kit reads).
 */
export const exerciseFields = sqliteTable('exercise', exerciseColumns());

/** A stored exercise's own fields (a row of `exercises` has these and the clinic's columns). */
export type ExerciseFields = typeof exerciseFields.$inferSelect;
export type ExerciseField = keyof ExerciseFields;

/** Each stored field's column: its type, whether it may be null, its default. */
export const EXERCISE_COLUMNS = getTableColumns(exerciseFields);

/** The field names in column order. */
export const EXERCISE_FIELDS = Object.keys(EXERCISE_COLUMNS) as ExerciseField[];

/**
 * The fields a library submission freezes into its snapshot: what the public reads. Nothing of
 * the clinic's own workings (status, demonstration id, pace, progression, dosage range); the
 * starting dosage goes as the snapshot's `dosage`. A field added here reaches every new
 * snapshot; snapshots frozen before lack it (lib/library/types types it optional).
 */
export const LIBRARY_FIELDS = [
	'title',
	'description',
	'bodyRegion',
	'side',
	'position',
	'movementType',
	'equipment',
	'phase',
	'coachingCues',
	'safetyNotes',
	'precautionTags'
] as const satisfies readonly ExerciseField[];
export type LibraryField = (typeof LIBRARY_FIELDS)[number];

/**
 * The fields the programme builder is sent for each exercise it offers (kept short: the page
 * carries a clinic's whole catalogue). The starting dosage and progression go as
 * `defaultDosage` and `defaultProgression`.
 */
export const BUILDER_FIELDS = [
	'title',
	'bodyRegion',
	'position',
	'movementType',
	'phase',
	'equipment',
	'precautionTags',
	'dosageBounds',
	'secondsPerRep',
	'status'
] as const satisfies readonly ExerciseField[];
export type BuilderField = (typeof BUILDER_FIELDS)[number];

/** A copy of the named fields of an exercise (a stored row may carry more). */
export function pickFields<K extends ExerciseField>(
	exercise: Pick<ExerciseFields, K>,
	fields: readonly K[]
): Pick<ExerciseFields, K> {
	return structuredClone(Object.fromEntries(fields.map((f) => [f, exercise[f]]))) as Pick<
		ExerciseFields,
		K
	>;
}
