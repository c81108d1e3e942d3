import { and, eq, gt, lt, or } from 'drizzle-orm';
import { lockoutFor, type Lockout } from '$lib/auth/lockout';
import { config } from '../config';
import { db, schema } from '../db';

/** Failures from one address across all accounts allowed before the address waits too. */
const ADDRESS_FACTOR = 5;

/**
 * Whether a password sign-in for `email` from `address` must wait. Counted per account (so a
 * slow spread-out guess at one account stops) and per address (so one client cannot walk through
 * many accounts), each over the configured sliding window.
 */
export function signInLockout(email: string, address: string, now = Date.now()): Lockout {
	const { SIGN_IN_WINDOW_MINUTES, SIGN_IN_MAX_FAILURES } = config();
	const windowMs = SIGN_IN_WINDOW_MINUTES * 60_000;
	const since = new Date(now - windowMs);
	const rows = db()
		.select()
		.from(schema.signInFailures)
		.where(
			and(
				gt(schema.signInFailures.createdAt, since),
				or(eq(schema.signInFailures.email, email), eq(schema.signInFailures.address, address))
			)
		)
		.all();
	const byAccount = lockoutFor(
		rows.filter((r) => r.email === email).map((r) => r.createdAt.getTime()),
		now,
		windowMs,
		SIGN_IN_MAX_FAILURES
	);
	const byAddress = lockoutFor(
		rows.filter((r) => r.address === address).map((r) => r.createdAt.getTime()),
		now,
		windowMs,
		SIGN_IN_MAX_FAILURES * ADDRESS_FACTOR
	);
	return byAccount.retryAfterSeconds >= byAddress.retryAfterSeconds ? byAccount : byAddress;
}

export function recordSignInFailure(email: string, address: string): void {
	const store = db();
	store.insert(schema.signInFailures).values({ email, address }).run();
	// Old rows only ever matter inside the window; trimming here keeps the table small.
	const cutoff = new Date(Date.now() - config().SIGN_IN_WINDOW_MINUTES * 60_000 * 2);
	store.delete(schema.signInFailures).where(lt(schema.signInFailures.createdAt, cutoff)).run();
}

/** A successful sign-in clears the account's failures (not the address's). */
export function clearSignInFailures(email: string): void {
	db().delete(schema.signInFailures).where(eq(schema.signInFailures.email, email)).run();
}
