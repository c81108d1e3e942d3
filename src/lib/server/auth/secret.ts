import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { config } from '../config';

let cached: string | undefined;

/**
 * The key that signs session tokens. A deployment sets AUTH_SECRET; on one machine (not
 * production) a random key is made once and kept beside the database, so sessions survive
 * restarts without anyone having to invent a secret.
 */
export function authSecret(): string {
	if (cached) return cached;
	const { AUTH_SECRET, DATABASE_PATH } = config();
	if (AUTH_SECRET) return (cached = AUTH_SECRET);
	if (process.env.NODE_ENV === 'production') {
		throw new Error(
			'The environment variable AUTH_SECRET must be set in production (32 or more random characters).'
		);
	}
	const file = join(dirname(resolve(DATABASE_PATH)), 'auth-secret');
	if (!existsSync(file)) {
		mkdirSync(dirname(file), { recursive: true });
		writeFileSync(file, randomBytes(32).toString('base64url'), { mode: 0o600 });
	}
	return (cached = readFileSync(file, 'utf8').trim());
}
