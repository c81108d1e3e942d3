import { index, integer, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { timestampNow } from './columns';

export const AUDIT_KINDS = [
	'sign-in',
	'sign-in-failed',
	'sign-in-link-requested',
	'sign-out',
	'sessions-ended',
	'invitation-sent',
	'invitation-accepted',
	'invitation-revoked',
	'role-changed',
	'member-removed'
] as const;
export type AuditKind = (typeof AUDIT_KINDS)[number];

/**
 * Who did what, when. Rows are only ever inserted. Ids are kept as plain text (no foreign keys)
 * so the trail survives the removal of the people and clinics it mentions.
 */
export const auditEvents = sqliteTable(
	'audit_event',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		kind: text('kind', { enum: AUDIT_KINDS }).notNull(),
		clinicId: text('clinic_id'),
		actorUserId: text('actor_user_id'),
		/** The e-mail address or record the event is about. */
		subject: text('subject').notNull().default(''),
		detail: text('detail', { mode: 'json' }).$type<Record<string, unknown>>(),
		createdAt: timestampNow('created_at')
	},
	(a) => [index('audit_clinic_time').on(a.clinicId, a.createdAt)]
);

export const SIGN_IN_ATTEMPT_KINDS = ['password-failure', 'link-request'] as const;
export type SignInAttemptKind = (typeof SIGN_IN_ATTEMPT_KINDS)[number];

/**
 * Sign-in attempts that count against the limits: failed passwords and e-mailed link requests,
 * each counted per account and per client address (src/lib/server/auth/sign-in-limits.ts).
 */
export const signInAttempts = sqliteTable(
	'sign_in_attempt',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		kind: text('kind', { enum: SIGN_IN_ATTEMPT_KINDS }).notNull().default('password-failure'),
		email: text('email').notNull(),
		address: text('address').notNull(),
		createdAt: timestampNow('created_at')
	},
	(f) => [
		index('sign_in_attempt_email_time').on(f.kind, f.email, f.createdAt),
		index('sign_in_attempt_address_time').on(f.kind, f.address, f.createdAt)
	]
);
