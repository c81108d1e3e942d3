/**
 * Sign-in lockout arithmetic: given the times of recent failures, is the next attempt refused,
 * and for how long? A sliding window: an attempt is refused while `maxFailures` or more failures
 * fall inside the last `windowMs`; it opens again when the oldest of those leaves the window.
 */
export interface Lockout {
	locked: boolean;
	/** Whole seconds until an attempt would be accepted again (0 when not locked). */
	retryAfterSeconds: number;
}

export function lockoutFor(
	failureTimes: readonly number[],
	now: number,
	windowMs: number,
	maxFailures: number
): Lockout {
	const recent = failureTimes.filter((t) => t > now - windowMs && t <= now).sort((a, b) => a - b);
	if (recent.length < maxFailures) return { locked: false, retryAfterSeconds: 0 };
	// The attempt opens again once only maxFailures - 1 failures remain in the window.
	const unlockingFailure = recent[recent.length - maxFailures];
	const retryAfterMs = unlockingFailure + windowMs - now;
	return { locked: true, retryAfterSeconds: Math.max(1, Math.ceil(retryAfterMs / 1000)) };
}
