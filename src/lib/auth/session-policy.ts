import type { Role } from './roles';

/**
 * How long a signed-in session lasts, by role. Our choice, written down in DEVELOPERS.md
 * (Security): staff use shared clinic computers and see every patient of the clinic, so an unused
 * session ends after 12 hours and any session after 7 days; a patient signs in on their own phone,
 * often from an e-mailed link, and sees only their own programme, so theirs end after 7 days unused
 * and 30 days in all. Either ends at once on sign-out, "sign out everywhere", a password change,
 * a role change or a removal.
 */
export interface SessionLifetime {
	idleSeconds: number;
	absoluteSeconds: number;
}

const HOUR = 60 * 60;
const DAY = 24 * HOUR;

export const SESSION_LIFETIMES: Record<'staff' | 'patient', SessionLifetime> = {
	staff: { idleSeconds: 12 * HOUR, absoluteSeconds: 7 * DAY },
	patient: { idleSeconds: 7 * DAY, absoluteSeconds: 30 * DAY }
};

/** The longest any session can live: the session cookie's own lifetime. */
export const LONGEST_SESSION_SECONDS = Math.max(
	...Object.values(SESSION_LIFETIMES).map((l) => l.absoluteSeconds)
);

export function sessionLifetime(role: Role): SessionLifetime {
	return role === 'patient' ? SESSION_LIFETIMES.patient : SESSION_LIFETIMES.staff;
}

/** A session's last use is written at most this often, so a busy page costs no write per request. */
export const SESSION_TOUCH_INTERVAL_MS = 60_000;

export interface SessionTimes {
	lastSeenAt: Date;
	expiresAt: Date;
	idleSeconds: number;
}

export type SessionState = 'active' | 'idle-too-long' | 'expired';

export function sessionState(session: SessionTimes, now: number): SessionState {
	if (now >= session.expiresAt.getTime()) return 'expired';
	if (now >= session.lastSeenAt.getTime() + session.idleSeconds * 1000) return 'idle-too-long';
	return 'active';
}

/** Whether this use should be written as the session's last use. */
export function shouldTouch(session: Pick<SessionTimes, 'lastSeenAt'>, now: number): boolean {
	return now - session.lastSeenAt.getTime() >= SESSION_TOUCH_INTERVAL_MS;
}
