import { index, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';
import { users } from './auth';

export const STAFF_ROLES = ['admin', 'clinician', 'educator'] as const;
export type StaffRole = (typeof STAFF_ROLES)[number];

export const clinics = sqliteTable('clinic', {
	id: uuidPrimaryKey(),
	name: text('name').notNull(),
	/** The captioning guideline profile the studio checks against by default (lib/captions/checks). */
	captionProfile: text('caption_profile', { enum: ['bbc', 'dcmp'] })
		.notNull()
		.default('bbc'),
	/** IANA time zone the clinic's pages show times in (patients have their own). */
	timeZone: text('time_zone').notNull().default('Europe/London'),
	createdAt: timestampNow('created_at')
});

/**
 * A staff member's role in a clinic. A user belongs to at most one clinic (one membership), which
 * keeps "which clinic is this request for" unambiguous; see DEVELOPERS.md.
 */
export const memberships = sqliteTable(
	'membership',
	{
		id: uuidPrimaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		clinicId: text('clinic_id')
			.notNull()
			.references(() => clinics.id, { onDelete: 'cascade' }),
		role: text('role', { enum: STAFF_ROLES }).notNull(),
		createdAt: timestampNow('created_at')
	},
	(m) => [
		uniqueIndex('membership_user_unique').on(m.userId),
		index('membership_clinic').on(m.clinicId)
	]
);

export type Clinic = typeof clinics.$inferSelect;
export type Membership = typeof memberships.$inferSelect;
