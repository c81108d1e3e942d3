import type { Cookies } from '@sveltejs/kit';
import { decode, encode, type JWT } from '@auth/core/jwt';
import { authSecret } from './secret';

/** How long a session lasts; the same as Auth.js's own `session.maxAge` in src/auth.ts. */
export const SESSION_MAX_AGE_SECONDS = 12 * 60 * 60;

/** Auth.js's session cookie name: `__Secure-` prefixed when the site is served over https. */
export function sessionCookieName(url: URL): string {
	return `${url.protocol === 'https:' ? '__Secure-' : ''}authjs.session-token`;
}

/**
 * Signs a person in on this response, as Auth.js would after a successful sign-in: an encrypted
 * session token carrying only the user id (hooks.server.ts reloads role and clinic from it on
 * every request). Used once an invitation link has proved the address, so a patient who joins
 * without a password does not have to ask for a second e-mail.
 */
export async function startSession(
	cookies: Cookies,
	url: URL,
	user: { id: string; email: string; name: string }
): Promise<void> {
	const name = sessionCookieName(url);
	const token = await encode({
		token: { sub: user.id, email: user.email, name: user.name },
		secret: authSecret(),
		salt: name,
		maxAge: SESSION_MAX_AGE_SECONDS
	});
	cookies.set(name, token, {
		path: '/',
		httpOnly: true,
		sameSite: 'lax',
		secure: url.protocol === 'https:',
		maxAge: SESSION_MAX_AGE_SECONDS
	});
}

/** How many read tokens are remembered; each is a few hundred bytes. */
const READ_TOKENS_KEPT = 2000;
const readTokens = new Map<string, { userId: string; expiresAt: number }>();

/**
 * The user id in the request's session token, read without Auth.js's session round trip: that
 * decrypts the token and encrypts a renewed one on every call (about 3 ms of CPU here), which a
 * `<track>`, a poster or a media range request pays for nothing. A token is immutable and carries
 * its expiry, so once decrypted it is remembered until then. Page loads and every change still
 * go through Auth.js and renew the session (hooks.server.ts decides which path a request takes).
 *
 * Returns null when there is no valid session, and 'chunked' when Auth.js had to split the token
 * over several cookies; the caller then asks Auth.js.
 */
export async function readSessionUserId(
	cookies: Pick<Cookies, 'get'>,
	url: URL
): Promise<string | null | 'chunked'> {
	const name = sessionCookieName(url);
	const token = cookies.get(name);
	if (!token) return cookies.get(`${name}.0`) ? 'chunked' : null;
	const nowSeconds = Date.now() / 1000;
	const known = readTokens.get(token);
	if (known) {
		if (known.expiresAt > nowSeconds) return known.userId;
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
	if (readTokens.size >= READ_TOKENS_KEPT) {
		const oldest = readTokens.keys().next().value;
		if (oldest !== undefined) readTokens.delete(oldest);
	}
	readTokens.set(token, { userId: payload.sub, expiresAt: payload.exp });
	return payload.sub;
}
