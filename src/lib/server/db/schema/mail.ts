import { index, integer, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';

/**
 * Every e-mail the app sends, written here first and then handed to SMTP. A message the mail
 * server could not take stays until a later try succeeds (mail/outbox.ts), so a mail outage
 * loses no invitation or sign-in link. Once delivered, its words are cleared: a sign-in link is
 * not kept after it has gone.
 */
export const mailOutbox = sqliteTable(
	'mail_outbox',
	{
		id: uuidPrimaryKey(),
		/** The clinic it is sent for (the development inbox scopes by it). */
		clinicId: text('clinic_id').notNull(),
		recipients: text('recipients', { mode: 'json' }).$type<string[]>().notNull(),
		subject: text('subject').notNull(),
		/** Null once delivered. */
		text: text('text'),
		html: text('html'),
		attempts: integer('attempts').notNull().default(0),
		nextAttemptAt: timestampNow('next_attempt_at'),
		sentAt: integer('sent_at', { mode: 'timestamp_ms' }),
		lastError: text('last_error'),
		createdAt: timestampNow('created_at')
	},
	(m) => [index('mail_outbox_due').on(m.sentAt, m.nextAttemptAt)]
);

export type OutboxMessage = typeof mailOutbox.$inferSelect;
