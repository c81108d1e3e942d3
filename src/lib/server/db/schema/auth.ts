import { integer, primaryKey, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';

/**
 * The tables Auth.js's Drizzle adapter expects (users, accounts, sessions, verification tokens),
 * plus our own password hash on the user. Sessions are JWTs, so the sessions table stays empty
 * unless the strategy changes; the adapter still requires it.
 */
export const users = sqliteTable('user', {
	id: uuidPrimaryKey(),
	name: text('name'),
	email: text('email').notNull().unique(),
	emailVerified: integer('emailVerified', { mode: 'timestamp_ms' }),
	image: text('image'),
	/** argon2id hash (PHC string); null for someone who signs in by e-mailed link only. */
	passwordHash: text('password_hash'),
	createdAt: timestampNow('created_at')
});

export const accounts = sqliteTable(
	'account',
	{
		userId: text('userId')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		type: text('type').notNull(),
		provider: text('provider').notNull(),
		providerAccountId: text('providerAccountId').notNull(),
		refresh_token: text('refresh_token'),
		access_token: text('access_token'),
		expires_at: integer('expires_at'),
		token_type: text('token_type'),
		scope: text('scope'),
		id_token: text('id_token'),
		session_state: text('session_state')
	},
	(account) => [primaryKey({ columns: [account.provider, account.providerAccountId] })]
);

export const sessions = sqliteTable('session', {
	sessionToken: text('sessionToken').primaryKey(),
	userId: text('userId')
		.notNull()
		.references(() => users.id, { onDelete: 'cascade' }),
	expires: integer('expires', { mode: 'timestamp_ms' }).notNull()
});

export const verificationTokens = sqliteTable(
	'verificationToken',
	{
		identifier: text('identifier').notNull(),
		token: text('token').notNull(),
		expires: integer('expires', { mode: 'timestamp_ms' }).notNull()
	},
	(vt) => [primaryKey({ columns: [vt.identifier, vt.token] })]
);

export type User = typeof users.$inferSelect;
