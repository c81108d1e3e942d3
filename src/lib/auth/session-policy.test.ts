import { describe, expect, it } from 'vitest';
import {
	LONGEST_SESSION_SECONDS,
	SESSION_LIFETIMES,
	SESSION_TOUCH_INTERVAL_MS,
	sessionLifetime,
	sessionState,
	shouldTouch
} from './session-policy';

// The limits are our own choice (DEVELOPERS.md, Security); these tests pin the arithmetic at
// their edges, not the numbers' origin.
const start = Date.UTC(2026, 11, 1, 9, 0, 0);
const staff = SESSION_LIFETIMES.staff;

function session(lastSeenAt: number, createdAt = start) {
	return {
		lastSeenAt: new Date(lastSeenAt),
		expiresAt: new Date(createdAt + staff.absoluteSeconds * 1000),
		idleSeconds: staff.idleSeconds
	};
}

describe('sessionState', () => {
	it('is active just before the idle limit and ends exactly at it', () => {
		const idleMs = staff.idleSeconds * 1000;
		expect(sessionState(session(start), start + idleMs - 1)).toBe('active');
		expect(sessionState(session(start), start + idleMs)).toBe('idle-too-long');
	});

	it('ends at the absolute limit however recently it was used', () => {
		const endMs = start + staff.absoluteSeconds * 1000;
		expect(sessionState(session(endMs - 1000), endMs - 1)).toBe('active');
		expect(sessionState(session(endMs - 1000), endMs)).toBe('expired');
	});
});

describe('sessionLifetime', () => {
	it('gives staff the shorter limits and patients the longer ones', () => {
		for (const role of ['admin', 'clinician', 'educator'] as const) {
			expect(sessionLifetime(role)).toEqual(staff);
		}
		expect(sessionLifetime('patient')).toEqual(SESSION_LIFETIMES.patient);
		expect(SESSION_LIFETIMES.patient.idleSeconds).toBeGreaterThan(staff.idleSeconds);
		expect(LONGEST_SESSION_SECONDS).toBe(SESSION_LIFETIMES.patient.absoluteSeconds);
	});

	it('never lets the idle limit outlast the absolute one', () => {
		for (const lifetime of Object.values(SESSION_LIFETIMES)) {
			expect(lifetime.idleSeconds).toBeLessThan(lifetime.absoluteSeconds);
		}
	});
});

describe('shouldTouch', () => {
	it('writes the last use at most once per interval', () => {
		const s = session(start);
		expect(shouldTouch(s, start + SESSION_TOUCH_INTERVAL_MS - 1)).toBe(false);
		expect(shouldTouch(s, start + SESSION_TOUCH_INTERVAL_MS)).toBe(true);
	});
});
