import { createHash } from 'node:crypto';

/**
 * The key of one sign-in's offline copies on the patient's phone: a one-way digest of the
 * server's session record id (so the id itself never reaches a script), or of the person when a
 * token carries no record. A new sign-in gets a new key, so its pages never read another's copies.
 */
export function offlineKey(sessionId: string | null, userId: string): string {
	return createHash('sha256')
		.update(`kinelume-offline\0${sessionId ?? `user:${userId}`}`)
		.digest('hex')
		.slice(0, 32);
}
