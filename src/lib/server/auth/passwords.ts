import { hash, verify } from '@node-rs/argon2';

/** @node-rs/argon2's default algorithm is argon2id; passwords.test.ts checks the PHC prefix. */
export async function hashPassword(password: string): Promise<string> {
	return hash(password);
}

// Verifying against a real hash when the account does not exist keeps the response time the
// same for known and unknown addresses, so timing does not reveal who has an account.
let decoyHash: Promise<string> | undefined;

/** True when `password` matches `passwordHash`; spends the same effort when there is no hash. */
export async function verifyPassword(
	passwordHash: string | null,
	password: string
): Promise<boolean> {
	if (!passwordHash) {
		decoyHash ??= hash('not-a-real-password-decoy');
		await verify(await decoyHash, password);
		return false;
	}
	try {
		return await verify(passwordHash, password);
	} catch {
		return false;
	}
}

export const PASSWORD_MIN_LENGTH = 10;
