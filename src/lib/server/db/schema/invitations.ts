import { index, integer, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';
import { users } from './auth';
import { clinics } from './clinics';
import { patients } from './patients';

export const INVITED_ROLES = ['admin', 'clinician', 'educator', 'patient'] as const;
export type InvitedRole = (typeof INVITED_ROLES)[number];

/**
 * An e-mailed invitation to join a clinic. Only a SHA-256 of the link's token is stored, so a
 * copy of the database cannot be used to accept invitations. A link works once (acceptedAt) and
 * until expiresAt.
 */
export const invitations = sqliteTable(
	'invitation',
	{
		id: uuidPrimaryKey(),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		email: text('email').notNull(),
		role: text('role', { enum: INVITED_ROLES }).notNull(),
		/** For a patient invitation, the patient record it completes. */
		patientId: text('patient_id').references(() => patients.id, { onDelete: 'cascade' }),
		tokenHash: text('token_hash').notNull(),
		invitedByUserId: text('invited_by_user_id').references(() => users.id, {
			onDelete: 'set null'
		}),
		expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
		acceptedAt: integer('accepted_at', { mode: 'timestamp_ms' }),
		revokedAt: integer('revoked_at', { mode: 'timestamp_ms' }),
		createdAt: timestampNow('created_at')
	},
	(i) => [
		uniqueIndex('invitation_token_unique').on(i.tokenHash),
		index('invitation_clinic').on(i.clinicId)
	]
);

export type Invitation = typeof invitations.$inferSelect;
