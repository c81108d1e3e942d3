import {
	index,
	integer,
	primaryKey,
	sqliteTable,
	text,
	uniqueIndex
} from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';
import { users } from './auth';
import { clinics } from './clinics';
import type { PrecautionDetail } from '../../../clinical/precautions';
import { SEXES } from '../../../clinical/rom';
import { PATIENT_SIDES } from '../../../patients/vocabulary';

/** A patient's caption look; colours are #rrggbb, checked for contrast before saving. */
export interface CaptionStyle {
	sizePercent: number;
	color: string;
	background: string;
}

/**
 * A person under a clinic's care. The record exists from the moment a clinician invites them;
 * `userId` is filled when they accept the invitation and gain a sign-in.
 */
export const patients = sqliteTable(
	'patient',
	{
		id: uuidPrimaryKey(),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		userId: text('user_id').references(() => users.id, { onDelete: 'set null' }),
		fullName: text('full_name').notNull(),
		email: text('email').notNull(),
		affectedSide: text('affected_side', { enum: PATIENT_SIDES })
			.notNull()
			.default('not applicable'),
		/** What the programme is for, in the clinician's words, e.g. "left total knee replacement". */
		condition: text('condition').notNull().default(''),
		/** The operation or injury date, 'YYYY-MM-DD' in the patient's time zone, when there is one. */
		operationDate: text('operation_date'),
		/** The protocol the programme follows, e.g. a phase table id from lib/clinical/phases. */
		protocol: text('protocol').notNull().default(''),
		/** Precautions the clinician recorded (lib/clinical/precautions vocabulary or free text). */
		precautions: text('precautions', { mode: 'json' }).notNull().$type<string[]>().default([]),
		/** An end (week after the operation, or a date) and degrees for precautions, by the precaution as stored. */
		precautionDetails: text('precaution_details', { mode: 'json' })
			.notNull()
			.$type<Record<string, PrecautionDetail>>()
			.default({}),
		/** Weeks the surgeon's protocol runs later (+) or earlier (−) than the protocol table. */
		protocolShiftWeeks: integer('protocol_shift_weeks').notNull().default(0),
		/** The last day of the sling between sessions, 'YYYY-MM-DD', when the clinician set one. */
		slingUntil: text('sling_until'),
		/** Optional, so that age- and sex-specific normal values can apply. */
		birthYear: integer('birth_year'),
		sex: text('sex', { enum: SEXES }),
		/** IANA time zone for the patient's calendar days (adherence, reminders). */
		timeZone: text('time_zone').notNull().default('Europe/London'),
		/** The patient's caption look on the replay screen (size, colours), chosen by them. */
		captionStyle: text('caption_style', { mode: 'json' }).$type<CaptionStyle>(),
		createdAt: timestampNow('created_at')
	},
	(p) => [
		uniqueIndex('patient_user_unique').on(p.userId),
		uniqueIndex('patient_clinic_email_unique').on(p.clinicId, p.email),
		index('patient_clinic').on(p.clinicId)
	]
);

/** Which clinicians look after which patient (many to many, within one clinic). */
export const patientClinicians = sqliteTable(
	'patient_clinician',
	{
		patientId: text('patient_id')
			.notNull()
			.references(() => patients.id, { onDelete: 'cascade' }),
		clinicianUserId: text('clinician_user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' })
	},
	(pc) => [primaryKey({ columns: [pc.patientId, pc.clinicianUserId] })]
);

export type Patient = typeof patients.$inferSelect;
