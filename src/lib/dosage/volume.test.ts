import { describe, expect, it } from 'vitest';
import { suggestedStartingDosage } from './defaults';
import {
	holdSecondsPerSession,
	repsPerSession,
	repsPerWeek,
	sessionsPerWeek,
	weeklyVolume
} from './volume';

describe('weekly volume', () => {
	it('multiplies out a starting dosage (common practice: one set of 8, three sessions a day)', () => {
		const d = suggestedStartingDosage();
		expect(sessionsPerWeek(d)).toBe(21);
		expect(repsPerSession(d)).toBe(8);
		expect(repsPerWeek(d)).toBe(168);
	});

	it('counts fewer days and more sets', () => {
		const d = {
			sets: 3,
			reps: 10,
			holdSeconds: 5,
			restSeconds: 60,
			sessionsPerDay: 1,
			daysPerWeek: 3
		};
		expect(weeklyVolume(d)).toEqual({
			sessionsPerWeek: 3,
			repsPerSession: 30,
			repsPerWeek: 90,
			holdSecondsPerSession: 150
		});
	});

	it('counts about 60 s of holding for a stretch (Garber et al. 2011, via REFERENCES.md: 2–4 reps accumulating about 60 s)', () => {
		expect(holdSecondsPerSession(suggestedStartingDosage('stretch'))).toBe(60);
		expect(holdSecondsPerSession(suggestedStartingDosage('stretch', { olderAdult: true }))).toBe(
			60
		);
	});
});
