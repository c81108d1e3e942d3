import type { Cookies } from '@sveltejs/kit';
import { encode } from '@auth/core/jwt';
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
