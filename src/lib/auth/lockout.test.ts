import { describe, expect, it } from 'vitest';
import { lockoutFor } from './lockout';

const MINUTE = 60_000;
const WINDOW = 15 * MINUTE;

describe('lockoutFor', () => {
	it('accepts attempts while fewer than the limit failed in the window', () => {
		const now = 100 * MINUTE;
		const four = [now - 4 * MINUTE, now - 3 * MINUTE, now - 2 * MINUTE, now - MINUTE];
		expect(lockoutFor(four, now, WINDOW, 5)).toEqual({ locked: false, retryAfterSeconds: 0 });
	});

	it('refuses the sixth attempt and says when the oldest failure leaves the window', () => {
		const now = 100 * MINUTE;
		const five = [1, 2, 3, 4, 5].map((m) => now - m * MINUTE);
		// Oldest counted failure was 5 minutes ago, so 10 minutes remain.
		expect(lockoutFor(five, now, WINDOW, 5)).toEqual({ locked: true, retryAfterSeconds: 600 });
	});

	it('forgets failures older than the window', () => {
		const now = 100 * MINUTE;
		const old = [20, 19, 18, 17, 16].map((m) => now - m * MINUTE);
		expect(lockoutFor(old, now, WINDOW, 5).locked).toBe(false);
	});

	it('with more failures than the limit, waits for enough of them to expire', () => {
		const now = 100 * MINUTE;
		const seven = [14, 12, 10, 8, 6, 4, 2].map((m) => now - m * MINUTE);
		// Opening needs only 4 left: the 3 oldest (14, 12, 10 min ago) must go; the third leaves in 5 min.
		expect(lockoutFor(seven, now, WINDOW, 5)).toEqual({ locked: true, retryAfterSeconds: 300 });
	});
});
