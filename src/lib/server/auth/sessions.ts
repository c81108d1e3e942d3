import { randomBytes } from 'node:crypto';
import { and, eq, lt, ne, sql } from 'drizzle-orm';
import type { Role } from '$lib/auth/roles';
import { sessionLifetime, sessionState, shouldTouch } from '$lib/auth/session-policy';
import { recordAudit } from '../audit';
import { db, prepared, schema } from '../db';

/**
 * The server's record of each signed-in session (table `user_session`). The session token is an
 * encrypted JWT holding the user id and this record's id; a token whose record is gone, idle too
 * long or past its absolute end is refused, so ending a session is deleting its row.
 */
export function createSession(userId: string, role: Role, now = Date.now()): string {
	const id = randomBytes(32).toString('base64url');
	const lifetime = sessionLifetime(role);
	// Sessions past their absolute end are gone for good; a sign-in clears this person's.
	db()
		.delete(schema.userSessions)
		.where(
			and(eq(schema.userSessions.userId, userId), lt(schema.userSessions.expiresAt, new Date(now)))
		)
		.run();
	db()
		.insert(schema.userSessions)
		.values({
			id,
			userId,
			createdAt: new Date(now),
			lastSeenAt: new Date(now),
			expiresAt: new Date(now + lifetime.absoluteSeconds * 1000),
			idleSeconds: lifetime.idleSeconds
		})
		.run();
	return id;
}

// Every signed-in request runs the first; the second at most once a minute per session.
const statements = prepared((store) => ({
	find: store
		.select()
		.from(schema.userSessions)
		.where(eq(schema.userSessions.id, sql.placeholder('id')))
		.prepare(),
	touch: store
		.update(schema.userSessions)
		.set({ lastSeenAt: sql`${sql.placeholder('now')}` })
		.where(eq(schema.userSessions.id, sql.placeholder('id')))
		.prepare()
}));

/**
 * Whether the session `sessionId` is alive for `userId`; records its use (at most once a
 * minute), and deletes it when it has run out.
 */
export function sessionIsAlive(
	sessionId: string | undefined,
	userId: string,
	now = Date.now()
): boolean {
	if (!sessionId) return false;
	const row = statements().find.get({ id: sessionId });
	if (!row || row.userId !== userId) return false;
	if (sessionState(row, now) !== 'active') {
		endSession(sessionId);
		return false;
	}
	if (shouldTouch(row, now)) statements().touch.run({ id: sessionId, now });
	return true;
}

export function endSession(sessionId: string | undefined): void {
	if (!sessionId) return;
	db().delete(schema.userSessions).where(eq(schema.userSessions.id, sessionId)).run();
}

/**
 * Ends every session of a person (all but `keep`, when given): after a password change, a role
 * change, a removal, or "sign out everywhere". Returns how many were ended.
 */
export function endSessionsOf(
	userId: string,
	reason: 'password-changed' | 'role-changed' | 'removed' | 'signed-out-everywhere',
	options: { keep?: string; by?: { id: string; clinicId: string } } = {}
): number {
	const { keep, by } = options;
	const ended = db()
		.delete(schema.userSessions)
		.where(
			keep
				? and(eq(schema.userSessions.userId, userId), ne(schema.userSessions.id, keep))
				: eq(schema.userSessions.userId, userId)
		)
		.run().changes;
	recordAudit({
		kind: 'sessions-ended',
		clinicId: by?.clinicId ?? null,
		actorUserId: by?.id ?? userId,
		subject: userId,
		detail: { reason, ended }
	});
	return ended;
}

/** How many of a person's sessions are still alive (ended or run-out ones do not count). */
export function sessionCountOf(userId: string, now = Date.now()): number {
	return db()
		.select()
		.from(schema.userSessions)
		.where(eq(schema.userSessions.userId, userId))
		.all()
		.filter((row) => sessionState(row, now) === 'active').length;
}
