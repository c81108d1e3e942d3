import './env';
import { encode } from '@auth/core/jwt';
import { afterEach, describe, expect, it, vi } from 'vitest';

const { readSessionClaim, sessionCookieName } = await import('../../src/lib/server/auth/session');
const { authSecret } = await import('../../src/lib/server/auth/secret');

const url = new URL('http://127.0.0.1/api/tracks/x/captions.vtt');
const name = sessionCookieName(url);

/** A session token exactly as Auth.js writes it (the same encode, salt and secret). */
function tokenFor(sub: string, maxAge: number, secret = authSecret()) {
	return encode({
		token: { sub, email: `${sub}@example.test`, name: sub, sid: `session-of-${sub}` },
		secret,
		salt: name,
		maxAge
	});
}

function jar(values: Record<string, string>) {
	return { get: (key: string) => values[key] };
}

afterEach(() => {
	vi.useRealTimers();
});

describe('reading the session token for API reads', () => {
	it('gives the user and session ids of a token Auth.js would accept', async () => {
		const token = await tokenFor('user-a', 3600);
		const claim = { userId: 'user-a', sessionId: 'session-of-user-a' };
		expect(await readSessionClaim(jar({ [name]: token }), url)).toEqual(claim);
		// Read again: remembered, the same answer (the caller still checks the session record).
		expect(await readSessionClaim(jar({ [name]: token }), url)).toEqual(claim);
	});

	it('gives no user without a cookie, for a token made with another key, or for a tampered one', async () => {
		expect(await readSessionClaim(jar({}), url)).toBeNull();
		const foreign = await tokenFor('user-b', 3600, 'another key of at least thirty-two characters');
		expect(await readSessionClaim(jar({ [name]: foreign }), url)).toBeNull();
		const token = await tokenFor('user-c', 3600);
		const tampered = token.slice(0, -4) + (token.endsWith('AAAA') ? 'BBBB' : 'AAAA');
		expect(await readSessionClaim(jar({ [name]: tampered }), url)).toBeNull();
	});

	it('stops accepting a remembered token once it expires', async () => {
		vi.useFakeTimers({ toFake: ['Date'] });
		vi.setSystemTime(new Date('2026-12-02T09:00:00Z'));
		const token = await tokenFor('user-d', 60);
		expect((await readSessionClaim(jar({ [name]: token }), url)) as unknown).toMatchObject({
			userId: 'user-d'
		});
		vi.setSystemTime(new Date('2026-12-02T09:01:01Z'));
		expect(await readSessionClaim(jar({ [name]: token }), url)).toBeNull();
	});

	it('leaves a token split over several cookies to Auth.js', async () => {
		expect(await readSessionClaim(jar({ [`${name}.0`]: 'part', [`${name}.1`]: 'part' }), url)).toBe(
			'chunked'
		);
	});

	it('reads the __Secure- cookie on https', async () => {
		const secureUrl = new URL('https://clinic.example.test/api/x');
		const secureName = sessionCookieName(secureUrl);
		expect(secureName).toBe('__Secure-authjs.session-token');
		const token = await encode({
			token: { sub: 'user-e' },
			secret: authSecret(),
			salt: secureName,
			maxAge: 3600
		});
		// A token from before session records names no session: the caller refuses it.
		expect(await readSessionClaim(jar({ [secureName]: token }), secureUrl)).toEqual({
			userId: 'user-e',
			sessionId: undefined
		});
		// The salt is the cookie name: a token written for http is no session over https.
		expect(
			await readSessionClaim(jar({ [secureName]: await tokenFor('user-e', 3600) }), secureUrl)
		).toBeNull();
	});
});
