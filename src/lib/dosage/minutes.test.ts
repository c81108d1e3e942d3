import { describe, expect, it } from 'vitest';
import { suggestedStartingDosage } from './defaults';
import { describeMinutes, secondsPerRep, sessionMinutes, sessionSeconds } from './minutes';

describe('minutes per session', () => {
	it('times a starting dosage at the default pace (common practice: about 4 s for a slow rep)', () => {
		// 1 set × 8 reps × 4 s = 32 s; one set, so no rest is counted.
		expect(sessionSeconds(suggestedStartingDosage())).toBe(32);
		expect(describeMinutes(sessionMinutes(suggestedStartingDosage()))).toBe('under a minute');
	});

	it('adds holds to each rep and rests between sets only (worked example)', () => {
		const d = {
			sets: 3,
			reps: 10,
			holdSeconds: 5,
			restSeconds: 60,
			sessionsPerDay: 1,
			daysPerWeek: 7
		};
		// 3 × 10 × (4 + 5) = 270 s, plus 2 rests of 60 s = 390 s = 6.5 min.
		expect(sessionSeconds(d, { secondsPerRep: 4 })).toBe(390);
		expect(sessionMinutes(d, { secondsPerRep: 4 })).toBe(6.5);
		expect(describeMinutes(6.5)).toBe('about 7 minutes');
	});

	it('adds rests between reps when asked', () => {
		const d = {
			sets: 2,
			reps: 5,
			holdSeconds: 0,
			restSeconds: 30,
			sessionsPerDay: 1,
			daysPerWeek: 7
		};
		// 2 × 5 × 4 = 40, + 2 sets × 4 gaps × 3 s = 24, + 1 rest of 30 = 94 s.
		expect(sessionSeconds(d, { secondsPerRep: 4 }, { restBetweenRepsSeconds: 3 })).toBe(94);
	});

	it('reads the pace from a demonstration segment', () => {
		expect(secondsPerRep({ segmentSeconds: 36, repsShown: 6 })).toBe(6);
		const stretch = suggestedStartingDosage('stretch');
		// 3 reps × (6 s movement + 20 s hold) = 78 s.
		expect(sessionSeconds(stretch, { segmentSeconds: 36, repsShown: 6 })).toBe(78);
		expect(describeMinutes(sessionMinutes(stretch, { segmentSeconds: 36, repsShown: 6 }))).toBe(
			'about 1 minute'
		);
	});

	it('refuses a pace with no length', () => {
		expect(() => secondsPerRep({ segmentSeconds: 36, repsShown: 0 })).toThrow('some time');
		expect(() => secondsPerRep({ secondsPerRep: 0 })).toThrow('some time');
		expect(() => secondsPerRep({ secondsPerRep: Number.NaN })).toThrow('some time');
	});
});
