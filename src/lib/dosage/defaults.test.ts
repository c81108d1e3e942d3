import { describe, expect, it } from 'vitest';
import { STARTING_DOSAGE_BASIS, suggestedStartingDosage } from './defaults';
import { describeDosage } from './describe';
import { dosageSchema } from './schema';

describe('suggested starting dosage', () => {
	it('starts a movement at one set of about 8, a few sessions a day (common practice: start at one set of about 8, a few sessions a day)', () => {
		const d = suggestedStartingDosage();
		expect(d.sets).toBe(1);
		expect(d.reps).toBeGreaterThanOrEqual(6);
		expect(d.reps).toBeLessThanOrEqual(10);
		expect(d.sessionsPerDay).toBeGreaterThanOrEqual(2);
		expect(d.sessionsPerDay).toBeLessThanOrEqual(4);
		// ACSM flexibility guidance (REFERENCES.md): 2–3 days a week minimum.
		expect(d.daysPerWeek).toBeGreaterThanOrEqual(2);
		expect(dosageSchema.parse(d)).toEqual(d);
	});

	it('holds a stretch 10–30 s, 30–60 s for older adults, at least 2–3 days a week (ACSM flexibility guidance, REFERENCES.md)', () => {
		const adult = suggestedStartingDosage('stretch');
		expect(adult.holdSeconds).toBeGreaterThanOrEqual(10);
		expect(adult.holdSeconds).toBeLessThanOrEqual(30);
		expect(adult.daysPerWeek).toBeGreaterThanOrEqual(3);
		const older = suggestedStartingDosage('stretch', { olderAdult: true });
		expect(older.holdSeconds).toBeGreaterThanOrEqual(30);
		expect(older.holdSeconds).toBeLessThanOrEqual(60);
		expect(older.daysPerWeek).toBeGreaterThanOrEqual(3);
		// Garber et al. 2011 (secondary, REFERENCES.md): 2–4 repetitions.
		for (const d of [adult, older]) {
			expect(d.reps).toBeGreaterThanOrEqual(2);
			expect(d.reps).toBeLessThanOrEqual(4);
			expect(dosageSchema.parse(d)).toEqual(d);
		}
	});

	it('says where each starting point comes from', () => {
		expect(STARTING_DOSAGE_BASIS.movement).toMatch(/^Common practice/);
		expect(STARTING_DOSAGE_BASIS.stretch).toMatch(/ACSM/);
	});

	it('reads as the patient sees it', () => {
		expect(describeDosage(suggestedStartingDosage())).toBe(
			'1 set of 8 reps; 3 times a day, every day.'
		);
		expect(describeDosage(suggestedStartingDosage('stretch', { olderAdult: true }))).toBe(
			'1 set of 2 reps, hold 30 seconds; once a day, every day.'
		);
		expect(
			describeDosage({
				sets: 3,
				reps: 1,
				holdSeconds: 1,
				restSeconds: 45,
				sessionsPerDay: 2,
				daysPerWeek: 3
			})
		).toBe(
			'3 sets of 1 rep, hold 1 second, rest 45 seconds between sets; twice a day, 3 days a week.'
		);
	});
});
