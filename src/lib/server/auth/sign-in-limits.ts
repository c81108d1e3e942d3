import { and, eq, gt, lt, or } from 'drizzle-orm';
import { lockoutFor, type Lockout } from '$lib/auth/lockout';
import type { SignInAttemptKind } from '../db/schema/audit';
import { config } from '../config';
import { db, schema } from '../db';
import { recordAudit } from '../audit';

/** Attempts from one client address across all accounts allowed before the address waits too. */
const ADDRESS_FACTOR = 5;

/**
 * Whether another attempt of `kind` for `email` from `address` must wait. Counted per account (so
 * a slow spread-out guess at one account stops, and one inbox cannot be flooded with links) and
 * per client address (so one client cannot walk through many accounts), each over the configured
 * sliding window: SIGN_IN_MAX_FAILURES per account, five times that per address.
 *
 * These run inside Auth.js's own callbacks (src/auth.ts), so every way into a sign-in is counted;
 * the sign-in page asks first only to answer with 429 and the wait in words.
 */
export function attemptLockout(
	kind: SignInAttemptKind,
	email: string,
	address: string,
	now = Date.now()
): Lockout {
	const { SIGN_IN_WINDOW_MINUTES, SIGN_IN_MAX_FAILURES } = config();
	const windowMs = SIGN_IN_WINDOW_MINUTES * 60_000;
	const table = schema.signInAttempts;
	const rows = db()
		.select()
		.from(table)
		.where(
			and(
				eq(table.kind, kind),
				gt(table.createdAt, new Date(now - windowMs)),
				or(eq(table.email, email), eq(table.address, address))
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

function recordAttempt(kind: SignInAttemptKind, email: string, address: string): void {
	const store = db();
	const table = schema.signInAttempts;
	store.insert(table).values({ kind, email, address }).run();
	// Old rows only ever matter inside the window; trimming here keeps the table small.
	const cutoff = new Date(Date.now() - config().SIGN_IN_WINDOW_MINUTES * 60_000 * 2);
	store.delete(table).where(lt(table.createdAt, cutoff)).run();
}

/**
 * Counts a password attempt before its (slow) check. Counting only after the check would let
 * every request that arrives during the hashing time pass the limit: hundreds sent at once would
 * all be checked. A success clears the account's count again (`clearPasswordFailures`).
 */
export function countPasswordAttempt(email: string, address: string): void {
	recordAttempt('password-failure', email, address);
}

export function auditPasswordFailure(email: string, address: string, reason: string): void {
	recordAudit({
		kind: 'sign-in-failed',
		subject: email,
		detail: { method: 'password', address, reason }
	});
}

/** A successful sign-in clears the account's failed passwords (not the address's). */
export function clearPasswordFailures(email: string): void {
	const table = schema.signInAttempts;
	db()
		.delete(table)
		.where(and(eq(table.kind, 'password-failure'), eq(table.email, email)))
		.run();
}

/** Counts a link request as it is let through, in the same step as its check (see above). */
export function countLinkRequest(email: string, address: string): void {
	recordAttempt('link-request', email, address);
}

export function auditLinkRequest(email: string, address: string, sent: boolean): void {
	recordAudit({ kind: 'sign-in-link-requested', subject: email, detail: { address, sent } });
}

/** "Wait 3 minutes": the wait in words, for the sign-in page. */
export function waitInWords(lockout: Lockout): string {
	const minutes = Math.max(1, Math.ceil(lockout.retryAfterSeconds / 60));
	return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}
