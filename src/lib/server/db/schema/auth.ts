import { index, integer, primaryKey, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { timestampNow, uuidPrimaryKey } from './columns';

/**
 * The tables Auth.js's Drizzle adapter expects (users, accounts, sessions, verification tokens),
 * plus our own password hash on the user. Sessions are JWTs, so Auth.js's sessions table stays
 * empty unless the strategy changes (the adapter still requires it); the server's own record of
 * each session, which lets a session be ended, is `user_session` below.
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

/**
 * One row per signed-in session: the session token (a JWT, which Auth.js's password sign-in
 * requires) carries this id, and a token whose row is gone or past its limits is refused. Sign-out
 * deletes the row; a password change, a role change or a removal deletes a person's rows.
 * Limits per role are in src/lib/auth/session-policy.ts.
 */
export const userSessions = sqliteTable(
	'user_session',
	{
		/** Random, 32 bytes base64url; only ever inside the encrypted token. */
		id: text('id').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		createdAt: timestampNow('created_at'),
		lastSeenAt: integer('last_seen_at', { mode: 'timestamp_ms' }).notNull(),
		/** The absolute end, fixed at sign-in. */
		expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
		/** How long the session may go unused, fixed at sign-in from the person's role. */
		idleSeconds: integer('idle_seconds').notNull()
	},
	(s) => [index('user_session_user').on(s.userId)]
);

export type User = typeof users.$inferSelect;
export type UserSession = typeof userSessions.$inferSelect;
