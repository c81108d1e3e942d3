import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { suggestedStartingDosage } from './defaults';
import { describeProgression, dosageForWeek, weekReachingCeiling } from './progression';
import type { Dosage, Progression } from './types';

const start = suggestedStartingDosage(); // common practice: one set of 8, a few sessions a day

describe('progression by week', () => {
	it('raises reps from 8 toward 15 over four weeks (DESIGN.md worked example: 8 + 2 a week, capped at 15)', () => {
		const rule: Progression = { kind: 'reps', addPerWeek: 2, ceiling: 15 };
		const reps = [1, 2, 3, 4, 5, 6].map((w) => dosageForWeek(start, rule, w).reps);
		expect(reps).toEqual([8, 10, 12, 14, 15, 15]);
		expect(weekReachingCeiling(start, rule)).toBe(5);
		expect(dosageForWeek(start, rule, 4)).toEqual({ ...start, reps: 14 });
	});

	it('treats weeks before the start as week 1 and refuses part weeks', () => {
		const rule: Progression = { kind: 'reps', addPerWeek: 2, ceiling: 15 };
		expect(dosageForWeek(start, rule, 0).reps).toBe(8);
		expect(dosageForWeek(start, rule, -3).reps).toBe(8);
		expect(() => dosageForWeek(start, rule, 1.5)).toThrow('whole number');
	});

	it('adds sets every few weeks (common practice: one more set every 2 weeks, up to 3)', () => {
		const rule: Progression = { kind: 'sets', addAfterWeeks: 2, add: 1, ceiling: 3 };
		const sets = [1, 2, 3, 4, 5, 6, 9].map((w) => dosageForWeek(start, rule, w).sets);
		expect(sets).toEqual([1, 1, 2, 2, 3, 3, 3]);
		expect(weekReachingCeiling(start, rule)).toBe(5);
	});

	it('lengthens a stretch hold within the ACSM 10–30 s range (ACSM flexibility guidance, REFERENCES.md)', () => {
		const stretch: Dosage = { ...suggestedStartingDosage('stretch'), holdSeconds: 10 };
		const rule: Progression = { kind: 'hold', addPerWeek: 5, ceiling: 30 };
		const holds = [1, 2, 3, 4, 5, 8].map((w) => dosageForWeek(stretch, rule, w).holdSeconds);
		expect(holds).toEqual([10, 15, 20, 25, 30, 30]);
		expect(weekReachingCeiling(stretch, rule)).toBe(5);
	});

	it('leaves the dosage alone with no rule, or when it already starts at the ceiling', () => {
		expect(dosageForWeek(start, { kind: 'none' }, 7)).toEqual(start);
		expect(weekReachingCeiling(start, { kind: 'none' })).toBeNull();
		const high = { ...start, reps: 20 };
		expect(dosageForWeek(high, { kind: 'reps', addPerWeek: 2, ceiling: 15 }, 6).reps).toBe(20);
		expect(weekReachingCeiling(high, { kind: 'reps', addPerWeek: 2, ceiling: 15 })).toBe(1);
	});

	it('never passes the ceiling, never falls, and changes only its own field (property)', () => {
		const rule = fc.oneof(
			fc.record({
				kind: fc.constant('reps' as const),
				addPerWeek: fc.integer({ min: 1, max: 20 }),
				ceiling: fc.integer({ min: 1, max: 100 })
			}),
			fc.record({
				kind: fc.constant('hold' as const),
				addPerWeek: fc.integer({ min: 1, max: 60 }),
				ceiling: fc.integer({ min: 1, max: 300 })
			}),
			fc.record({
				kind: fc.constant('sets' as const),
				addAfterWeeks: fc.integer({ min: 1, max: 12 }),
				add: fc.integer({ min: 1, max: 5 }),
				ceiling: fc.integer({ min: 1, max: 10 })
			})
		);
		const dosage = fc.record({
			sets: fc.integer({ min: 1, max: 10 }),
			reps: fc.integer({ min: 1, max: 100 }),
			holdSeconds: fc.integer({ min: 0, max: 300 }),
			restSeconds: fc.integer({ min: 0, max: 600 }),
			sessionsPerDay: fc.integer({ min: 1, max: 12 }),
			daysPerWeek: fc.integer({ min: 1, max: 7 })
		});
		fc.assert(
			fc.property(dosage, rule, fc.integer({ min: 1, max: 104 }), (d, p, week) => {
				const field = p.kind === 'hold' ? 'holdSeconds' : p.kind;
				const now = dosageForWeek(d, p, week);
				const next = dosageForWeek(d, p, week + 1);
				expect(now[field]).toBeLessThanOrEqual(Math.max(p.ceiling, d[field]));
				expect(next[field]).toBeGreaterThanOrEqual(now[field]);
				expect(now[field]).toBeGreaterThanOrEqual(d[field]);
				expect({ ...now, [field]: d[field] }).toEqual(d);
				const reached = weekReachingCeiling(d, p);
				expect(reached).not.toBeNull();
				if (d[field] < p.ceiling && reached !== null) {
					expect(dosageForWeek(d, p, reached)[field]).toBe(p.ceiling);
					expect(dosageForWeek(d, p, reached - 1)[field]).toBeLessThan(p.ceiling);
				}
			})
		);
	});

	it('says each rule in words', () => {
		expect(describeProgression({ kind: 'reps', addPerWeek: 2, ceiling: 15 })).toBe(
			'Add 2 reps each week, up to 15.'
		);
		expect(describeProgression({ kind: 'sets', addAfterWeeks: 2, add: 1, ceiling: 3 })).toBe(
			'Add 1 set every 2 weeks, up to 3.'
		);
		expect(describeProgression({ kind: 'sets', addAfterWeeks: 1, add: 2, ceiling: 6 })).toBe(
			'Add 2 sets every week, up to 6.'
		);
		expect(describeProgression({ kind: 'hold', addPerWeek: 5, ceiling: 30 })).toBe(
			'Hold 5 seconds longer each week, up to 30 seconds.'
		);
		expect(describeProgression({ kind: 'none' })).toBe('Stays the same each week.');
	});
});
