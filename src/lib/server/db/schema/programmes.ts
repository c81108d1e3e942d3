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
import type { Progression } from '../../../dosage/types';
import type { Weekday } from '../../../clinical/calendar';
import type { RangeGuide } from '../../../clinical/range-guides';
import { ARM_POSITIONS, ROM_INSTRUMENTS } from '../../../clinical/rom';
import { dosageColumns } from '../../../dosage/columns';
import { exerciseColumns } from '../../../exercises/columns';
import { users } from './auth';
import { clinics } from './clinics';
import { patients } from './patients';
import { segments } from './segments';

export const PROGRAMME_STATUSES = ['draft', 'published', 'ended'] as const;
export const ROM_MODES = ['active', 'passive'] as const;

/** An exercise a clinic prescribes: a segment of a demonstration plus what to do and what to mind. */
export const exercises = sqliteTable(
	'exercise',
	{
		id: uuidPrimaryKey(),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		// What the exercise is (its demonstration, words, dosage, status) is written once, in
		// lib/exercises/columns.
		...exerciseColumns(() => segments.id),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestampNow('created_at'),
		updatedAt: timestampNow('updated_at')
	},
	(e) => [
		index('exercise_clinic').on(e.clinicId, e.status),
		index('exercise_segment').on(e.segmentId)
	]
);

/** A patient's home programme. Dates are 'YYYY-MM-DD' in the patient's time zone. */
export const programmes = sqliteTable(
	'programme',
	{
		id: uuidPrimaryKey(),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		patientId: text('patient_id')
			.notNull()
			.references(() => patients.id, { onDelete: 'cascade' }),
		title: text('title').notNull(),
		status: text('status', { enum: PROGRAMME_STATUSES }).notNull().default('draft'),
		startDate: text('start_date').notNull(),
		endDate: text('end_date'),
		/** A note to the patient shown on Today and the printed sheet. */
		note: text('note').notNull().default(''),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestampNow('created_at'),
		updatedAt: timestampNow('updated_at'),
		publishedAt: integer('published_at', { mode: 'timestamp_ms' })
	},
	(p) => [
		index('programme_patient').on(p.patientId, p.status),
		index('programme_clinic').on(p.clinicId)
	]
);

/** One exercise in a programme, in order, with this patient's own dosage and progression. */
export const programmeItems = sqliteTable(
	'programme_item',
	{
		id: uuidPrimaryKey(),
		programmeId: text('programme_id')
			.notNull()
			.references(() => programmes.id, { onDelete: 'cascade' }),
		exerciseId: text('exercise_id')
			.notNull()
			.references(() => exercises.id, { onDelete: 'restrict' }),
		position: integer('position').notNull(),
		...dosageColumns(),
		/** The weekdays the clinician chose; null for any `days_per_week` days of each week. */
		weekdays: text('weekdays', { mode: 'json' }).$type<Weekday[]>(),
		/** Range targets and limits in degrees for this patient (lib/clinical/range-guides). */
		rangeGuides: text('range_guides', { mode: 'json' }).notNull().$type<RangeGuide[]>().default([]),
		progression: text('progression', { mode: 'json' })
			.notNull()
			.$type<Progression>()
			.default({ kind: 'none' })
	},
	(i) => [index('programme_item_programme').on(i.programmeId, i.position)]
);

/** Days a programme is paused (illness, a review visit): no sessions are due on them. */
export const programmePauses = sqliteTable(
	'programme_pause',
	{
		id: uuidPrimaryKey(),
		programmeId: text('programme_id')
			.notNull()
			.references(() => programmes.id, { onDelete: 'cascade' }),
		fromDate: text('from_date').notNull(),
		toDate: text('to_date').notNull(),
		reason: text('reason').notNull().default('')
	},
	(p) => [index('programme_pause_programme').on(p.programmeId)]
);

/**
 * One session a patient did. `clientId` is made on the patient's device, so a log sent again after
 * a dropped connection (or from the offline queue) is stored once.
 */
export const sessionLogs = sqliteTable(
	'session_log',
	{
		id: uuidPrimaryKey(),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		patientId: text('patient_id')
			.notNull()
			.references(() => patients.id, { onDelete: 'cascade' }),
		programmeItemId: text('programme_item_id')
			.notNull()
			.references(() => programmeItems.id, { onDelete: 'cascade' }),
		clientId: text('client_id').notNull(),
		/** When the patient pressed "done" (their device's clock). */
		doneAt: integer('done_at', { mode: 'timestamp_ms' }).notNull(),
		/** The patient's calendar day of `doneAt`, in their time zone. */
		localDate: text('local_date').notNull(),
		setsDone: integer('sets_done').notNull(),
		repsDone: integer('reps_done').notNull(),
		/** 0–10 on the numeric rating scale. */
		pain: integer('pain').notNull(),
		/** The patient ticked "sharp or new pain": flagged at once, like a severe score. */
		sharpPain: integer('sharp_pain', { mode: 'boolean' }).notNull().default(false),
		note: text('note').notNull().default(''),
		/**
		 * The captions the patient was shown: the recording's track and its version when the
		 * session was logged (segment captions follow the track). Null when it had none.
		 */
		captionsTrackId: text('captions_track_id'),
		captionsVersion: integer('captions_version'),
		createdAt: timestampNow('created_at')
	},
	(l) => [
		uniqueIndex('session_log_client').on(l.patientId, l.clientId),
		index('session_log_patient_date').on(l.patientId, l.localDate),
		index('session_log_item').on(l.programmeItemId)
	]
);

/**
 * That the clinicians were e-mailed about a patient's severe or sharp pain on one of the
 * patient's days: at most one such e-mail a patient a day. Claimed (inserted) before sending and
 * given back if sending fails, so two logs at once never send twice.
 */
export const painAlertMails = sqliteTable(
	'pain_alert_mail',
	{
		patientId: text('patient_id')
			.notNull()
			.references(() => patients.id, { onDelete: 'cascade' }),
		localDate: text('local_date').notNull(),
		sessionLogId: text('session_log_id')
			.notNull()
			.references(() => sessionLogs.id, { onDelete: 'cascade' }),
		createdAt: timestampNow('created_at')
	},
	(a) => [primaryKey({ columns: [a.patientId, a.localDate] })]
);

/** That a patient read an exercise's safety notes before its first replay. */
export const safetyAcknowledgements = sqliteTable(
	'safety_acknowledgement',
	{
		patientId: text('patient_id')
			.notNull()
			.references(() => patients.id, { onDelete: 'cascade' }),
		exerciseId: text('exercise_id')
			.notNull()
			.references(() => exercises.id, { onDelete: 'cascade' }),
		acknowledgedAt: timestampNow('acknowledged_at')
	},
	(a) => [primaryKey({ columns: [a.patientId, a.exerciseId] })]
);

/** A range-of-motion reading taken by a clinician. `motion` names an entry of lib/clinical/rom. */
export const romMeasurements = sqliteTable(
	'rom_measurement',
	{
		id: uuidPrimaryKey(),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		patientId: text('patient_id')
			.notNull()
			.references(() => patients.id, { onDelete: 'cascade' }),
		motion: text('motion').notNull(),
		side: text('side', { enum: ['left', 'right'] }).notNull(),
		mode: text('mode', { enum: ROM_MODES }).notNull(),
		degrees: real('degrees').notNull(),
		/** What measured it: the measurement error depends on it. Older readings were goniometer ones. */
		instrument: text('instrument', { enum: ROM_INSTRUMENTS }).notNull().default('goniometer'),
		/** For shoulder rotations: where the arm was, since normal values depend on it. */
		armPosition: text('arm_position', { enum: ARM_POSITIONS }),
		measuredOn: text('measured_on').notNull(),
		note: text('note').notNull().default(''),
		recordedBy: text('recorded_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestampNow('created_at')
	},
	(m) => [index('rom_patient').on(m.patientId, m.motion, m.measuredOn)]
);

/** Which weekly digests went out, so a restart or a second worker never sends one twice. */
export const weeklyDigests = sqliteTable(
	'weekly_digest',
	{
		id: uuidPrimaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		weekStart: text('week_start').notNull(),
		sentAt: timestampNow('sent_at')
	},
	(d) => [uniqueIndex('weekly_digest_user_week').on(d.userId, d.weekStart)]
);

export type Exercise = typeof exercises.$inferSelect;
export type Programme = typeof programmes.$inferSelect;
export type ProgrammeItem = typeof programmeItems.$inferSelect;
export type SessionLog = typeof sessionLogs.$inferSelect;
export type RomMeasurement = typeof romMeasurements.$inferSelect;
