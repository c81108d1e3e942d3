import { LRUCache } from 'lru-cache';
import type { Cookies } from '@sveltejs/kit';
import { decode, encode, type JWT } from '@auth/core/jwt';
import type { Role } from '$lib/auth/roles';
import { LONGEST_SESSION_SECONDS } from '$lib/auth/session-policy';
import { authSecret } from './secret';
import { createSession } from './sessions';

/** Auth.js's session cookie name: `__Secure-` prefixed when the site is served over https. */
export function sessionCookieName(url: URL): string {
	return `${url.protocol === 'https:' ? '__Secure-' : ''}authjs.session-token`;
}

/**
 * Signs a person in on this response, as Auth.js would after a successful sign-in: a server
 * session record and an encrypted token carrying the user id and that record's id
 * (hooks.server.ts checks the record and reloads role and clinic on every request). Used once an
 * invitation link has proved the address, so a patient who joins without a password does not have
 * to ask for a second e-mail.
 */
export async function startSession(
	cookies: Cookies,
	url: URL,
	user: { id: string; email: string; name: string; role: Role }
): Promise<void> {
	const name = sessionCookieName(url);
	const token = await encode({
		token: {
			sub: user.id,
			email: user.email,
			name: user.name,
			sid: createSession(user.id, user.role)
		},
		secret: authSecret(),
		salt: name,
		maxAge: LONGEST_SESSION_SECONDS
	});
	cookies.set(name, token, {
		path: '/',
		httpOnly: true,
		sameSite: 'lax',
		secure: url.protocol === 'https:',
		maxAge: LONGEST_SESSION_SECONDS
	});
}

/** Who a session token names: the user and the server's session record. */
export interface SessionClaim {
	userId: string;
	sessionId: string | undefined;
}

/** How many read tokens are remembered; each is a few hundred bytes. */
const readTokens = new LRUCache<string, SessionClaim & { expiresAt: number }>({ max: 2000 });

/**
 * The user and session ids in the request's session token, read without Auth.js's session round
 * trip: that
 * decrypts the token and encrypts a renewed one on every call (about 3 ms of CPU here), which a
 * `<track>`, a poster or a media range request pays for nothing. A token is immutable and carries
 * its expiry, so once decrypted it is remembered until then. Page loads and every change still
 * go through Auth.js and renew the session (hooks.server.ts decides which path a request takes).
 * Remembering a token never skips the check of its session record, which the caller makes.
 *
 * Returns null when there is no valid session, and 'chunked' when Auth.js had to split the token
 * over several cookies; the caller then asks Auth.js.
 */
export async function readSessionClaim(
	cookies: Pick<Cookies, 'get'>,
	url: URL
): Promise<SessionClaim | null | 'chunked'> {
	const name = sessionCookieName(url);
	const token = cookies.get(name);
	if (!token) return cookies.get(`${name}.0`) ? 'chunked' : null;
	const nowSeconds = Date.now() / 1000;
	const known = readTokens.get(token);
	if (known) {
		if (known.expiresAt > nowSeconds) return { userId: known.userId, sessionId: known.sessionId };
		readTokens.delete(token);
		return null;
	}
	let payload: JWT | null;
	try {
		payload = await decode({ token, secret: authSecret(), salt: name });
	} catch {
		// Tampered, made with another key, or expired: as Auth.js would, treat it as no session.
		return null;
	}
	if (!payload?.sub || typeof payload.exp !== 'number' || payload.exp <= nowSeconds) return null;
	const claim = {
		userId: payload.sub,
		sessionId: typeof payload.sid === 'string' ? payload.sid : undefined
	};
	readTokens.set(token, { ...claim, expiresAt: payload.exp });
	return claim;
}
