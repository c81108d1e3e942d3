import { and, eq, gt, lt, or } from 'drizzle-orm';
import { lockoutFor, type Lockout } from '$lib/auth/lockout';
import { config } from '../config';
import { db, schema } from '../db';
import { recordAudit } from '../audit';

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

/**
 * Whether another sign-in link may be e-mailed to `email` now: at most SIGN_IN_MAX_FAILURES links
 * per account in the window, so the form cannot be used to flood someone's inbox. Counted from
 * the audit trail, where every link request is recorded.
 */
export function linkRequestAllowed(email: string, now = Date.now()): boolean {
	const { SIGN_IN_WINDOW_MINUTES, SIGN_IN_MAX_FAILURES } = config();
	const windowMs = SIGN_IN_WINDOW_MINUTES * 60_000;
	const sent = db()
		.select({ createdAt: schema.auditEvents.createdAt })
		.from(schema.auditEvents)
		.where(
			and(
				eq(schema.auditEvents.kind, 'sign-in-link-requested'),
				eq(schema.auditEvents.subject, email),
				gt(schema.auditEvents.createdAt, new Date(now - windowMs))
			)
		)
		.all();
	return !lockoutFor(
		sent.map((row) => row.createdAt.getTime()),
		now,
		windowMs,
		SIGN_IN_MAX_FAILURES
	).locked;
}

export function recordLinkRequest(email: string, address: string): void {
	recordAudit({ kind: 'sign-in-link-requested', subject: email, detail: { address } });
}
