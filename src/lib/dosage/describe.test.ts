import { describe, expect, it } from 'vitest';
import { describeDosage } from './describe';

const dosage = {
	sets: 1,
	reps: 8,
	holdSeconds: 0,
	restSeconds: 0,
	sessionsPerDay: 3,
	daysPerWeek: 2
};

describe('a dosage in words', () => {
	it('says any N days a week, or names the weekdays the clinician chose', () => {
		expect(describeDosage(dosage)).toBe('1 set of 8 reps; 3 times a day, 2 days a week.');
		expect(describeDosage(dosage, [2, 5])).toBe(
			'1 set of 8 reps; 3 times a day, on Tuesday and Friday.'
		);
		expect(describeDosage({ ...dosage, daysPerWeek: 7 }, null)).toBe(
			'1 set of 8 reps; 3 times a day, every day.'
		);
	});
});
