import { describe, expect, it } from 'vitest';
import { paceFor, programmeFigures, weekAfterOperation, type FigureExercise } from './figures';

const exercise = (over: Partial<FigureExercise> = {}): FigureExercise => ({
	title: 'Heel slides',
	phase: 2,
	precautionTags: [],
	dosageBounds: null,
	secondsPerRep: null,
	segmentSeconds: null,
	defaultReps: 8,
	...over
});

const knee = {
	operationDate: '2026-11-10',
	protocol: 'knee-replacement',
	protocolShiftWeeks: 0,
	precautions: ['no-kneeling'],
	precautionDetails: {}
};

const dose = {
	sets: 1,
	reps: 8,
	holdSeconds: 0,
	restSeconds: 30,
	sessionsPerDay: 3,
	daysPerWeek: 7
};

describe('paceFor', () => {
	it('prefers the exercise’s own seconds per rep, then the demonstration, then common practice', () => {
		expect(paceFor(exercise({ secondsPerRep: 6, segmentSeconds: 40 })).pace).toEqual({
			secondsPerRep: 6
		});
		expect(paceFor(exercise({ segmentSeconds: 40 })).pace).toEqual({
			segmentSeconds: 40,
			repsShown: 8
		});
		// Common practice: a slow, controlled rep of about 4 s (DEFAULT_SECONDS_PER_REP).
		const fallback = paceFor(exercise());
		expect(fallback.pace).toEqual({ secondsPerRep: 4 });
		expect(fallback.basis).toMatch(/common practice/);
	});
});

describe('weekAfterOperation', () => {
	it('counts completed weeks from the operation to the start and says so', () => {
		const week = weekAfterOperation(knee, '2026-11-17');
		expect(week).toMatchObject({ weeks: 1, days: 7, operationDate: '2026-11-10' });
		expect(week?.basis).toBe(
			'week 1 after the operation (7 days), counted from 10 Nov 2026 to the start on 17 Nov 2026'
		);
		// The knee table (common practice, see lib/clinical/phases) puts weeks 0–2 in early motion.
		expect(week?.hint?.phase).toBe('early-motion');
		expect(week?.hint?.caution).toMatch(/surgeon's protocol/);
	});

	it('gives no hint without a phase table, or before the operation, and says why', () => {
		const noTable = weekAfterOperation({ ...knee, protocol: '' }, '2026-11-17');
		expect(noTable?.hint).toBeNull();
		expect(noTable?.noHintReason).toMatch(/No phase table/);
		const before = weekAfterOperation(knee, '2026-11-01');
		expect(before?.hint).toBeNull();
		expect(before?.basis).toMatch(/9 days before the operation/);
		expect(weekAfterOperation({ ...knee, operationDate: null }, '2026-11-17')).toBeNull();
	});
});

describe('programmeFigures', () => {
	it('sums volume and minutes and raises the three kinds of flag', () => {
		const figures = programmeFigures(knee, '2026-11-17', [
			{ exercise: exercise({ secondsPerRep: 4 }), dosage: dose },
			{
				exercise: exercise({
					title: 'Kneeling stretch',
					phase: 4,
					precautionTags: ['kneeling'],
					dosageBounds: { reps: { max: 15 } },
					segmentSeconds: 40
				}),
				dosage: { ...dose, sets: 2, reps: 20 }
			}
		]);
		const [first, second] = figures.items;
		expect(first.volume).toEqual({
			sessionsPerWeek: 21,
			repsPerSession: 8,
			repsPerWeek: 168,
			holdSecondsPerSession: 0
		});
		// 1 set × 8 reps × 4 s = 32 s, no rest after the last set.
		expect(first.minutes).toBeCloseTo(32 / 60, 10);
		expect(first.phaseFlag).toBeNull();
		expect(first.conflicts).toEqual([]);
		expect(first.bounds).toEqual([]);

		// 40 s over 8 reps = 5 s a rep: 2 × 20 × 5 + 1 × 30 rest = 230 s.
		expect(second.minutes).toBeCloseTo(230 / 60, 10);
		expect(second.phaseFlag?.message).toMatch(/strengthening/);
		expect(second.conflicts).toHaveLength(1);
		expect(second.conflicts[0].reason).toMatch(/kneeling/i);
		expect(second.bounds).toEqual([
			expect.objectContaining({ field: 'reps', value: 20, limit: 15, side: 'above' })
		]);

		expect(figures.totalMinutesPerSession).toBeCloseTo((32 + 230) / 60, 10);
		expect(figures.totalRepsPerWeek).toBe(168 + 2 * 20 * 21);
		expect(figures.precautionCaution).toMatch(/clinician/);
	});

	it('raises no clash for a precaution that ended before the programme starts', () => {
		const item = {
			exercise: exercise({ precautionTags: ['kneeling'] }),
			dosage: {
				sets: 1,
				reps: 8,
				holdSeconds: 0,
				restSeconds: 0,
				sessionsPerDay: 1,
				daysPerWeek: 7
			}
		};
		const ended = {
			...knee,
			precautionDetails: { 'no-kneeling': { untilWeek: 6, untilDate: null, degrees: null } }
		};
		// Operation 2026-11-10: week 6 begins 2026-12-22.
		expect(programmeFigures(ended, '2026-12-21', [item]).items[0].conflicts).toHaveLength(1);
		expect(programmeFigures(ended, '2026-12-22', [item]).items[0].conflicts).toHaveLength(0);
		// A programme that started earlier is judged today.
		expect(programmeFigures(ended, '2026-12-01', [item], '2026-12-30').items[0].conflicts).toEqual(
			[]
		);
	});

	it('moves the phase flag with the surgeon’s timing', () => {
		const later = { ...knee, protocolShiftWeeks: 2 };
		// Week 2 after a knee replacement: the table's active motion starts at 2, the surgeon's at 4.
		expect(weekAfterOperation(knee, '2026-11-24')?.hint?.phase).toBe('active-motion');
		expect(weekAfterOperation(later, '2026-11-24')?.hint?.phase).toBe('early-motion');
	});

	it('says why there is no week when the operation date is missing', () => {
		const figures = programmeFigures({ ...knee, operationDate: null }, '2026-11-17', []);
		expect(figures.week).toBeNull();
		expect(figures.noWeekReason).toMatch(/No operation or injury date/);
		expect(figures.totalMinutesPerSession).toBe(0);
	});
});
