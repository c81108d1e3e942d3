import { describe, expect, it } from 'vitest';
import { hashPassword, verifyPassword } from './passwords';

describe('passwords', () => {
	it('hashes with argon2id in PHC string format (RFC 9106 names argon2id the primary variant)', async () => {
		const hashed = await hashPassword('correct horse battery');
		expect(hashed.startsWith('$argon2id$')).toBe(true);
		expect(await verifyPassword(hashed, 'correct horse battery')).toBe(true);
		expect(await verifyPassword(hashed, 'Correct horse battery')).toBe(false);
	});

	it('refuses when there is no hash and when the hash is malformed', async () => {
		expect(await verifyPassword(null, 'anything')).toBe(false);
		expect(await verifyPassword('not a hash', 'anything')).toBe(false);
	});
});
